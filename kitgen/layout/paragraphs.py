"""Paragraphs set into lines and shared out over pages.

The instructions (and any text page) are written as :class:`Block`
paragraphs (:mod:`kitgen.layout.instructions`); here they are wrapped at
spaces with the widths of the real fonts (the words layer's shaping, the
same advances the PDF draws), sized, and split over as many pages as they
need, never below :data:`MIN_BODY_PT`.  The result is a list of
:class:`SetLine` per page, in millimetres on the page: a backend only
draws them.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

from ..paper import MM_PER_PT, PT_PER_MM
from ..words.shaping import line_width_em, plain_advances, set_line


@dataclass(frozen=True)
class Block:
    """A paragraph of the text pages: ``kind`` is ``title``, ``heading``,
    ``body``, ``item``, ``caution`` or ``answer`` (its text a label, then a
    line to write on to the column's end, :func:`writing_line`; without a
    label, a further line of the answer above it), or
    :data:`PAGE_BREAK`, which starts a new page; ``bullet`` is printed
    before an item.  A ``figure`` block is a picture
    (:class:`kitgen.layout.figures.Figure`, built for the column's width)
    under its caption ``text``, never split across pages.
    A ``row`` is one of a table's rows, which a run of them makes
    (:data:`TABLE_KEEPS_ROWS`).  A paragraph split over two pages
    (:func:`_split_paragraph`) is two blocks, the second ``continued``:
    without the bullet, at the top of the next page."""

    kind: str
    text: str
    bullet: str = ""
    figure: Any = None
    row: bool = False
    continued: bool = False


@dataclass(frozen=True)
class SetFigure:
    """A picture as set: its figure's box has its bottom-left corner at
    ``(x_mm, y_mm)`` on the page."""

    figure: Any
    x_mm: float
    y_mm: float


@dataclass(frozen=True)
class SetLine:
    """One line of text as set: where its baseline starts (``align`` =
    ``left``) or ends (``right``), in mm on the page, its size and style."""

    text: str
    x_mm: float
    baseline_mm: float
    size_pt: float
    style: str
    align: str


class TextOverflow(ValueError):
    """The paragraphs need more pages than they were given."""


#: A block of this kind ends the page: what follows starts a new one.
PAGE_BREAK = "page_break"
#: Per kind: (size relative to the body, style, space before and after in
#: body sizes, indent of the text in body sizes).
KINDS = {
    "title": (1.8, "bold", 0.0, 0.4, 0.0),
    "heading": (1.2, "bold", 0.7, 0.2, 0.0),
    "body": (1.0, "body", 0.0, 0.3, 0.0),
    "item": (1.0, "body", 0.0, 0.15, 1.8),
    "caution": (1.0, "bold", 0.0, 0.15, 1.8),
    "answer": (1.0, "body", 0.5, 0.6, 1.8),
    "figure": (1.0, "bold", 0.6, 0.6, 0.0),
}
#: Line height in body sizes (common practice for body text: 120 to 130 %).
LEADING = 1.25
#: Body sizes (pt) tried, largest first.  9 pt is the smallest a class
#: reads comfortably on paper held at arm's length (common practice for
#: school texts; from memory); more pages rather than smaller text.
MIN_BODY_PT = 9.0
BODY_SIZES_PT = (10.5, 10.0, 9.5, MIN_BODY_PT)


def width_pt(string: str, size_pt: float, words, style: str = "body") -> float:
    """Width (pt) of one line of ``string`` as the shipped fonts set it."""
    return set_line(string, words.script, style, words.rtl).width_em * size_pt


def wrap(text: str, width_limit_pt: float, size_pt: float, words, style: str) -> list[str]:
    """Break ``text`` at spaces into lines no wider than the limit (a
    greedy first fit, as a typewriter does; a single word wider than the
    limit stands alone).  A plain paragraph (Latin, Greek, Cyrillic) is
    measured from its characters' advances, read once: each trial line's
    width is the sum of its advances, exactly what setting it would give
    (:func:`kitgen.words.shaping.plain_advances`); any other sets a few
    trial lines a line (:func:`_longest_fit`).  The lines depend on nothing but the arguments and the
    language's script and direction, so they are kept for the next ask:
    the pages' split measures each paragraph several times, and a class
    set the same paragraphs for each kit of a language (#12)."""
    return list(_wrap(text, width_limit_pt, size_pt, words.script, words.rtl, style))


#: Where a line may break: the ASCII spaces and line ends, never a NO-BREAK
#: SPACE (U+00A0, line breaking class GL, Unicode Standard Annex #14), which
#: keeps a number and its unit ("100 mm") on one line; Python's own
#: ``str.split`` would break there.
_BREAKS = re.compile(r"[ \t\n\r\f\v]+")


def line_words(text: str) -> list[str]:
    """The pieces of ``text`` between the places a line may break."""
    return [w for w in _BREAKS.split(text) if w]


#: Paragraphs kept wrapped: those of every shipped language at the sizes
#: and widths a set's sheets give, a few megabytes.
@lru_cache(maxsize=4096)
def _wrap(text: str, width_limit_pt: float, size_pt: float, script: str, rtl: bool, style: str) -> tuple[str, ...]:
    joined = " ".join(line_words(text))
    advances = plain_advances(joined, script, style)
    if advances is not None:
        return tuple(_wrap_plain(joined, advances, width_limit_pt, size_pt))
    words, lines, start, guess = line_words(text), [], 0, 1

    def fits(end: int) -> bool:
        return line_width_em(" ".join(words[start:end]), script, style, rtl) * size_pt <= width_limit_pt

    while start < len(words):
        end = _longest_fit(fits, start + 1, len(words), start + guess)
        lines.append(" ".join(words[start:end]))
        guess, start = end - start, end
    return tuple(lines)


def _longest_fit(fits, least: int, most: int, guess: int) -> int:
    """The greatest ``end`` from ``least`` to ``most`` with ``fits(end)``
    (``least`` taken as fitting: a word wider than the line stands alone),
    searched from ``guess`` outwards and then by halves.  A line's width
    grows with each word added to it (by a space's advance at least), so
    this is the line the typewriter's first fit makes word by word, with
    a few trial lines instead of one a word: the last line's length is
    the guess, and lines of a paragraph are much alike."""
    guess = min(max(guess, least), most)
    if guess > least and not fits(guess):
        lo, hi = least, guess          # lo fits, hi does not
    else:
        lo, step = guess, 1
        while lo < most and fits(min(lo + step, most)):
            lo, step = min(lo + step, most), step * 2
        if lo == most:
            return most
        hi = min(lo + step, most)
    while hi - lo > 1:
        mid = (lo + hi) // 2
        lo, hi = (mid, hi) if fits(mid) else (lo, mid)
    return lo


def _wrap_plain(joined: str, advances: list[float], width_limit_pt: float, size_pt: float) -> list[str]:
    """:func:`wrap` of a plain paragraph whose words are ``joined`` by
    single spaces: the same first fit, each trial line ``joined[start:end]``
    measured as ``sum(advances[start:end])``."""
    lines, start, end = [], 0, None
    pos = 0
    for word in joined.split(" ") if joined else ():
        stop = pos + len(word)
        if end is not None and sum(advances[start:stop]) * size_pt > width_limit_pt:
            lines.append(joined[start:end])
            start = pos
        end = stop
        pos = stop + 1
    if end is not None:
        lines.append(joined[start:end])
    return lines


def _laid(blocks, width_limit_pt: float, body_pt: float, words):
    """(block, size, style, lines, space before, space after, indent) of each block."""
    out = []
    for k, b in enumerate(blocks):
        scale, style, before, after, indent = KINDS[b.kind]
        size = body_pt * scale
        if b.kind == "answer":
            lines = [writing_line(b.text, width_limit_pt - indent * body_pt, size, words)]
        else:
            lines = wrap(b.text, width_limit_pt - indent * body_pt, size, words, style)
        out.append((b, size, style, lines, before * body_pt if k else 0.0, after * body_pt, indent * body_pt))
    return out


#: What an ``answer`` block's line is drawn with after its label, to
#: the end of the column: the low line of a form's blank to write on.
WRITING_MARK = "_"


def writing_line(label: str, width_limit_pt: float, size_pt: float, words) -> str:
    """``label`` and a blank to write on (:data:`WRITING_MARK`), as long
    as the column's width holds; without a label, the blank alone (an
    answer's further line)."""
    lead = f"{label} " if label else ""
    n = max(0, int((width_limit_pt - width_pt(lead, size_pt, words)) // width_pt(WRITING_MARK, size_pt, words)))
    while n and width_pt(lead + WRITING_MARK * n, size_pt, words) > width_limit_pt:
        n -= 1
    return lead + WRITING_MARK * n


def _figure_pt(block) -> float:
    """Height (pt) of a block's picture (none for a paragraph)."""
    return block.figure.height_mm * PT_PER_MM if block.figure is not None else 0.0


def _height_pt(laid_block, before: float) -> float:
    """Height (pt) of one laid block (an item of :func:`_laid`) with
    ``before`` of space above it, its space after included."""
    b, size, _, lines, _, after, _ = laid_block
    return before + len(lines) * size * LEADING + _figure_pt(b) + after


def blocks_height_pt(blocks, width_limit_pt: float, body_pt: float, words) -> float:
    """Height (pt) the blocks take, set one after another."""
    return sum(_height_pt(laid, laid[4]) for laid in _laid(blocks, width_limit_pt, body_pt, words))


def set_blocks(blocks, box_mm, words, body_pt: float) -> tuple[SetLine, ...]:
    """The blocks set from the top of ``box_mm`` = (x0, y0, x1, y1) down at
    ``body_pt``, flush left (flush right in a right-to-left language), each
    bullet before its item's first line."""
    return set_page(blocks, box_mm, words, body_pt)[0]


def set_page(blocks, box_mm, words, body_pt: float) -> tuple[tuple[SetLine, ...], tuple[SetFigure, ...]]:
    """:func:`set_blocks`, and the pictures of the figure blocks, each
    centred in the column under its caption."""
    x0, _, x1, y1 = box_mm
    width = (x1 - x0) * PT_PER_MM
    rtl = words.rtl
    align = "right" if rtl else "left"
    out, figures = [], []
    y = y1 * PT_PER_MM
    for block, s, style, lines, before, after, indent in _laid(blocks, width, body_pt, words):
        y -= before
        for k, text in enumerate(lines):
            lead = s * LEADING
            baseline = y - lead + (lead - s) / 2 + 0.22 * s
            x = x1 * PT_PER_MM - indent if rtl else x0 * PT_PER_MM + indent
            out.append(SetLine(text, x * MM_PER_PT, baseline * MM_PER_PT, s, style, align))
            if k == 0 and block.bullet:
                bx = body_pt * 0.4
                bxx = x1 * PT_PER_MM - bx if rtl else x0 * PT_PER_MM + bx
                out.append(SetLine(block.bullet, bxx * MM_PER_PT, baseline * MM_PER_PT, s, "bold", align))
            y -= lead
        if block.figure is not None:
            y -= _figure_pt(block)
            fx = x0 + ((x1 - x0) - block.figure.width_mm) / 2.0
            figures.append(SetFigure(block.figure, fx, y * MM_PER_PT))
        y -= after
    return tuple(out), tuple(figures)


def fitting_size(blocks, box_mm, words, sizes=(10.5, 10.0, 9.5, 9.0, 8.5, 8.0, 7.5, 7.0, 6.5, 6.0)) -> float:
    """The largest of ``sizes`` at which the blocks fit ``box_mm`` on one
    page (the smallest if none does: a fixed page such as the calibration
    sheet, whose words are few)."""
    x0, y0, x1, y1 = box_mm
    width, height = (x1 - x0) * PT_PER_MM, (y1 - y0) * PT_PER_MM
    return next((s for s in sizes if blocks_height_pt(blocks, width, s, words) <= height), sizes[-1])


def split_blocks(blocks, width_pt: float, height_pt: float, words, n_pages: int):
    """``(size_pt, chunks)``: the largest body size at which the blocks,
    taken in order, fill at most ``n_pages`` boxes of this size (a heading
    never left at the foot of a page without :data:`HEADING_KEEPS_LINES`
    lines of its text, :func:`_kept_with_next`; a :data:`PAGE_BREAK` block
    starts a new page), and the blocks of each page; or ``None`` when even
    :data:`MIN_BODY_PT` needs more pages."""
    story = blocks
    breaks = {k for k, b in enumerate(story) if b.kind == PAGE_BREAK}
    if n_pages == 1 and breaks:
        return None
    # (#12) No page holds more than its height: where the blocks, each
    # measured at the top of a page at the smallest size, take more than
    # all the pages, no size fits, and the sizes are not tried.
    smallest = _alone_and_after_pt(story, breaks, width_pt, MIN_BODY_PT, words)
    if sum(smallest[0]) > n_pages * height_pt:
        return None
    for size in BODY_SIZES_PT:
        if n_pages == 1:   # the common case: one measure of the whole
            if blocks_height_pt(story, width_pt, size, words) <= height_pt:
                return size, [list(story)]
            continue
        blocks = list(story)   # and the halves of paragraphs split over two pages, as they are made
        measured = smallest if size == MIN_BODY_PT else _alone_and_after_pt(blocks, breaks, width_pt, size, words)
        alone, after, lines = (list(column) for column in measured)
        chunks, current, used = [], [], 0.0
        order, at = list(range(len(blocks))), 0
        split_from = {}   # a first half's index: the block it was split from
        while at < len(order):
            k = order[at]
            if k in breaks:
                if current:
                    chunks.append(current)
                current, used = [], 0.0
                at += 1
                continue
            if current and used + after[k] > height_pt:
                picture = blocks[k].figure is not None
                pulled = _floated_past(blocks, order, at, height_pt - used, after) if picture else []
                if pulled:   # the text first, then the picture comes up again
                    order[at:at + 1 + len(pulled)] = pulled + [k]
                    continue
                halves = _split_paragraph(blocks[k], height_pt - used, width_pt, size, words)
                if halves is not None:   # its first lines here, the rest on the next page
                    measured = _alone_and_after_pt(halves, (), width_pt, size, words)
                    for column, values in zip((blocks, alone, after, lines), (halves,) + tuple(measured)):
                        column.extend(values)
                    order[at:at + 1] = [len(blocks) - 2, len(blocks) - 1]
                    split_from[len(blocks) - 2] = k
                    continue
                moved = _kept_with_next(blocks, current, lines)
                if not moved:
                    going = _going_with(blocks, current, k)
                    moved = _kept_with_next(blocks, current[:len(current) - len(going)], lines) + going
                chunks.append(current[:len(current) - len(moved)])
                current = moved
                used = alone[moved[0]] + sum(after[i] for i in moved[1:]) if moved else 0.0
            used += after[k] if current else alone[k]
            current.append(k)
            at += 1
        chunks = [ch for ch in chunks + [current] if ch]
        heights = [alone[ch[0]] + sum(after[i] for i in ch[1:]) for ch in chunks]
        if len(chunks) <= n_pages and max(heights) <= height_pt:
            return size, [[blocks[i] for i in _rejoined(ch, split_from)] for ch in chunks]
    return None


def _rejoined(chunk: list[int], split_from: dict) -> list[int]:
    """A page's blocks (indices) with each paragraph split over two pages
    whose halves both ended on this one made whole again: a heading kept
    with its text (:func:`_kept_with_next`) can take a first half to the
    next page, where its rest already goes (#12 review: a German worked
    example broken after a colon in mid-page).  A whole paragraph takes no
    more room than its two halves."""
    out = list(chunk)
    j = 0
    while j < len(out) - 1:
        first = out[j]
        if first in split_from and out[j + 1] == first + 1:
            out[j:j + 2] = [split_from[first]]
            j = max(0, j - 1)   # (the whole may itself be a half of an earlier split)
            continue
        j += 1
    return out


#: Kinds of paragraph a picture may float past (:func:`_floated_past`)
#: and that may be split over two pages (:func:`_split_paragraph`).
FLOWING_KINDS = ("body", "item", "caution")


def _flowing(block) -> bool:
    """Whether ``block`` is running text (:data:`FLOWING_KINDS`): not a
    picture nor a table's row."""
    return block.kind in FLOWING_KINDS and block.figure is None and not block.row


def _floated_past(blocks, order, at: int, room_pt: float, after) -> list[int]:
    """The paragraphs that go before the picture ``order[at]``, which does
    not fit the ``room_pt`` left at the page's foot: those that follow it
    in its own section (up to the next heading, picture, table, answer or
    page break), in order, as many as fill the room, but never the last
    of them, nor a list's items but two on either side of the picture,
    nor last one that leads in to what follows it (:func:`_leads_in`),
    which the picture would part from its list.
    The picture then floats to the top of the next page, its section's
    text filling the foot of this one, where a page had been left a third
    empty, and some of that text still follows it there (common practice
    in typesetting: a figure that does not fit floats to the top of the
    next page, and the text runs on; here never past a heading, nor past
    the end of its section, so that a picture stays in the section it
    illustrates and never stands over the next one's heading)."""
    section = []
    for k in order[at + 1:]:
        if not _flowing(blocks[k]):
            break
        section.append(k)
    out, used = [], 0.0
    for k in section[:-1]:
        if used + after[k] > room_pt:
            break
        out.append(k)
        used += after[k]
    kind = _run_kind(blocks[out[-1]]) if out and len(out) < len(section) else None
    if kind is not None and _run_kind(blocks[section[len(out)]]) == kind:   # a list cut by the picture
        before = _run_length(blocks, out[::-1], kind)
        beyond = _run_length(blocks, section[len(out):], kind)
        out = out[:len(out) - _items_to_move(before, beyond, LIST_KEEPS_ITEMS)]
    while out and _leads_in(blocks[out[-1]]):   # (#12: a Greek lead-in over the picture, its steps under it)
        out.pop()
    return out


def _run_length(blocks, indices, kind: str) -> int:
    """How many of the blocks ``indices``, from the first, are of the run
    ``kind`` (:func:`_run_kind`)."""
    return next((n for n, k in enumerate(indices) if _run_kind(blocks[k]) != kind), len(indices))


def _items_to_move(before: int, beyond: int, keep: int) -> int:
    """How many of the ``before`` items of a list ahead of a break go on
    past it, so that each side keeps ``keep`` of them, the ``beyond``
    items past it included: none where both sides have enough; enough to
    make up the far side where the near side can spare them; else all."""
    if before >= keep and beyond >= keep:
        return 0
    if beyond < keep and before - (keep - beyond) >= keep:
        return keep - beyond
    return before


#: Lines of a paragraph split over two pages left on each: its first line
#: is never alone at a page's foot, nor its last alone at the next page's
#: top (common practice in typesetting: no orphan, no widow).
PARAGRAPH_KEEPS_LINES = 2


def _split_paragraph(block, room_pt: float, width_pt: float, body_pt: float, words):
    """``(first, rest)``: the paragraph ``block`` split where its lines
    fill ``room_pt`` at a page's foot, ``rest`` ``continued`` on the next
    page without the bullet, at least :data:`PARAGRAPH_KEEPS_LINES` lines
    on each; or None, for a block that is not running text
    (:data:`FLOWING_KINDS`; a picture, a table's row and an answer's line
    are never split) or too short to split there.  Each half is its
    lines joined again, which the same first fit wraps into the very
    same lines (checked)."""
    if not _flowing(block):
        return None
    _, size, style, text_lines, before, after, indent = _laid([_PROBE, block], width_pt, body_pt, words)[1]
    lead = size * LEADING
    most = min(len(text_lines) - PARAGRAPH_KEEPS_LINES, int((room_pt - before - after) // lead))
    while most >= PARAGRAPH_KEEPS_LINES and before + most * lead + after > room_pt:
        most -= 1   # the floor's rounding
    if most < PARAGRAPH_KEEPS_LINES:
        return None
    first = Block(block.kind, " ".join(text_lines[:most]), block.bullet, continued=block.continued)
    rest = Block(block.kind, " ".join(text_lines[most:]), "", continued=True)
    limit = width_pt - indent
    if (wrap(first.text, limit, size, words, style) != list(text_lines[:most])
            or wrap(rest.text, limit, size, words, style) != list(text_lines[most:])):
        return None
    return first, rest


#: Lines of its text that a heading keeps under it on its page: a heading
#: is kept with its text, never left at the foot of a page with less than
#: the first two lines of what it heads (common practice in typesetting;
#: a lead-in of one line, such as a table's, is not enough).
HEADING_KEEPS_LINES = 2


def _kept_with_next(blocks, current, lines) -> list[int]:
    """The blocks at the end of the page ``current`` (their indices) that
    go on to the next page with the block that does not fit: the last
    heading, or paragraph that leads in to what follows it
    (:func:`_leads_in`), and what stands under it, when that is less than
    :data:`HEADING_KEEPS_LINES` lines.  The page's first block always
    stays, so that a page is never left empty."""
    start, under = len(current), 0
    for j in range(len(current) - 1, 0, -1):
        if blocks[current[j]].kind == "heading" or _leads_in(blocks[current[j]]):
            if under >= HEADING_KEEPS_LINES:
                break
            start, under = j, 0   # it goes on, and a heading over it with nothing else under it too
            continue
        under += lines[current[j]]
        if under >= HEADING_KEEPS_LINES:
            break
    return current[start:]


def _leads_in(block) -> bool:
    """Whether ``block`` is a paragraph that ends in a colon, which leads
    in to the list or paragraph after it and stays with it, as a heading
    does (common practice in typesetting; #12 review: "Stack the parts
    ..., from the back to the front:" at a page's foot, its steps on the
    next page)."""
    return block.kind == "body" and block.figure is None and block.text.rstrip().endswith(":")


#: Rows of a table that a page break leaves on each side of it: a table's
#: first row is not left alone at a page's foot, nor its last alone at the
#: top of the next page (common practice in typesetting, as for the lines
#: of a paragraph: no orphan, no widow).
TABLE_KEEPS_ROWS = 2
#: Items of a list (a run of ``item`` blocks: steps, bullets) that a page
#: break or a floated picture leaves on each side of it, as for a table's
#: rows (#12 review: "1. the alidade" alone at a page's foot, "5. the
#: rule" alone at the next page's top).
LIST_KEEPS_ITEMS = 2


def _run_kind(block) -> str | None:
    """The kind of run ``block`` belongs to: ``row`` (a table's), ``item``
    (a list's, a paragraph's second half aside, which goes where its first
    half went), else None."""
    if block.row:
        return "row"
    return "item" if block.kind == "item" and not block.continued else None


def _going_with(blocks, current, k: int) -> list[int]:
    """The blocks at the end of the page ``current`` that go on to the next
    page with the block ``k`` that does not fit: an answer's line takes
    its question and the answer's lines before it along, a table's row
    the rows :func:`_rows_kept_together` gives.  The page's first block
    always stays."""
    if blocks[k].kind == "answer":
        n = 1   # the answer's lines before this one, and its question
        while n < len(current) and blocks[current[-n]].kind == "answer":
            n += 1
        return current[-n:] if len(current) > n else []
    return _rows_kept_together(blocks, current, k)


def _rows_kept_together(blocks, current, k: int) -> list[int]:
    """The rows at the end of the page ``current`` (their indices) that go
    on to the next page with the row ``k`` that does not fit, so that
    each page holds at least :data:`TABLE_KEEPS_ROWS` of the table (a
    list's items: :data:`LIST_KEEPS_ITEMS` of the list), or the table's
    rows on this page all go where it has too few to give.  The page's
    first block always stays."""
    kind = _run_kind(blocks[k])
    if kind is None:
        return []
    keep = TABLE_KEEPS_ROWS if kind == "row" else LIST_KEEPS_ITEMS
    tail = _run_length(blocks, current[:0:-1], kind)   # the page's first block aside
    rest = _run_length(blocks, range(k, len(blocks)), kind)   # the run's blocks from k on
    go = _items_to_move(tail, rest, keep)
    return current[len(current) - go:] if go else []


#: A paragraph of one short line: what each block is measured after, for
#: the space between it and the block above.
_PROBE = Block("body", "x")


def _alone_and_after_pt(blocks, breaks, width_pt: float, body_pt: float, words):
    """Per block (0 for a :data:`PAGE_BREAK`): its height at the top of a
    page, what it adds under another block, each the very float
    :func:`blocks_height_pt` gives for ``[block]`` and for ``[probe,
    block]`` less ``[probe]``, and its lines (a picture counts as
    :data:`HEADING_KEEPS_LINES`), from one setting of the blocks (#12: the
    pages' split measured each block three times at each size)."""
    laid = iter(_laid([_PROBE] + [b for k, b in enumerate(blocks) if k not in breaks], width_pt, body_pt, words))
    base = _height_pt(next(laid), 0.0)
    alone, after, lines = [0.0] * len(blocks), [0.0] * len(blocks), [0] * len(blocks)
    for k in (k for k in range(len(blocks)) if k not in breaks):
        item = next(laid)
        alone[k] = _height_pt(item, 0.0)
        after[k] = (base + _height_pt(item, item[4])) - base
        lines[k] = HEADING_KEEPS_LINES if item[0].figure is not None else len(item[3])
    return alone, after, lines
