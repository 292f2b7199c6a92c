"""The instructions' words: what the first page says, as paragraphs.

Written here, from the kit's plan and its laid-out pages, with the kit's
:class:`~kitgen.words.templates.Words`; a backend only sets the paragraphs
(:func:`kitgen.render.pdf_text.draw_blocks`).
"""

from __future__ import annotations

from dataclasses import dataclass

from .pages import CHECK_BAR_MM
from ..parts.format import latitude_text


@dataclass(frozen=True)
class Block:
    """A paragraph of the text pages: ``kind`` is ``title``, ``heading``,
    ``body``, ``item`` or ``caution``; ``bullet`` is printed before an item."""

    kind: str
    text: str
    bullet: str = ""


def kit_title(kit) -> str:
    return kit.plan.title or kit.words("kit.default_title")


def kit_latitudes(kit) -> str:
    """The latitude of each plate, as a list in the kit's language."""
    w = kit.words
    return w("page.list_separator").join(latitude_text(w, p.latitude_deg) for p in kit.plan.plates)


def kit_line(kit) -> str:
    """The kit's title, its plates' latitudes and its epoch, in one line."""
    w = kit.words
    return w("page.kit_line", title=kit_title(kit), latitude=kit_latitudes(kit), year=w.number(kit.plan.epoch))


def plates_blocks(kit) -> list[Block]:
    """On a kit of several plates, which plate to put in for which place."""
    plates = kit.plan.plates
    if len(plates) < 2:
        return []
    w = kit.words
    out = [Block("body", w("plate.plates_intro"))]
    for p in plates:
        latitude = latitude_text(w, p.latitude_deg)
        text = (w("plate.plates_item_place", number=w.number(p.number), place=p.place, latitude=latitude) if p.place
                else w("plate.plates_item", number=w.number(p.number), latitude=latitude))
        out.append(Block("item", text, "\u2022"))
    return out


def _page_list(words, pages, kind) -> tuple[int, str]:
    numbers = [words.number(p.number) for p in pages if p.kind == kind]
    return len(numbers), words("page.list_separator").join(numbers)


def print_notes(kit, pages) -> list[str]:
    """What the first page says about how the kit was drawn for printing:
    for grey-scale or colour, which side of the film takes the ink, for
    which print scale."""
    w = kit.words
    notes = [w("printing.colour") if kit.plan.printing.colour else w("printing.greyscale")]
    film = [p for p in pages if p.kind == "film"]
    if film:
        notes.append(w("printing.film_mirrored") if any(p.mirrored for p in film) else w("printing.film_plain"))
    front = next((p for p in pages if p.duplex == "front"), None)
    if front is not None:
        key = "printing.duplex_long" if kit.plan.printing.duplex == "long_edge" else "printing.duplex_short"
        notes.append(w(key, front=w.number(front.number), back=w.number(front.number + 1)))
    sx, sy = pages[0].print_scale
    if (sx, sy) != (1.0, 1.0):
        notes.append(w("printing.scaled", x=_percent(w, sx), y=_percent(w, sy), length=w.number(CHECK_BAR_MM)))
    return notes


def _percent(words, factor: float) -> str:
    """A scale factor as a percentage, with the fewest decimals (up to
    two) that write it."""
    p = factor * 100.0
    decimals = next((d for d in (0, 1) if abs(round(p, d) - p) < 1e-9), 2)
    return words.number(p, decimals)


def story(kit, pages) -> list[Block]:
    """The instructions page, as paragraphs for pdf_text.draw_blocks."""
    w = kit.words
    length = w.number(CHECK_BAR_MM)

    def numbered(key):
        return [Block("item", s, w.number(k) + ".") for k, s in enumerate(w.items(key), start=1)]

    out = [Block("title", w("instructions.title")),
           Block("body", kit_line(kit))]
    out += plates_blocks(kit)
    out.append(Block("heading", w("instructions.cautions_heading")))
    out += [Block("caution", s, "!") for s in w.items("instructions.cautions")]
    out.append(Block("heading", w("instructions.print_heading")))
    for kind, key in (("card", "instructions.print_card"), ("film", "instructions.print_film")):
        n, listed = _page_list(w, pages, kind)
        if n:
            out.append(Block("item", w(key + ("_one" if n == 1 else "_many"), pages=listed), "\u2022"))
    out.append(Block("item", w("instructions.print_scale", length=length, percent=w.number(100)), "\u2022"))
    out += [Block("item", s, "\u2022") for s in print_notes(kit, pages)]
    out += [Block("heading", w("instructions.cut_heading")), Block("body", w("instructions.cut"))]
    if any(pl.piece is not None for p in pages for pl in p.placements):
        out.append(Block("body", w("printing.tiles")))
    out += [Block("heading", w("instructions.stack_heading")), Block("body", w("instructions.stack_intro"))]
    out += numbered("instructions.stack")
    out.append(Block("body", w("instructions.fastener")))
    out.append(Block("heading", w("instructions.time_heading")))
    out += numbered("instructions.time_steps")
    out.append(Block("body", w("instructions.time_note")))
    out.append(Block("heading", w("instructions.height_heading")))
    out += numbered("instructions.height_steps")
    return out
