"""A named kit's PDF: its shared pages, with the owner's name laid over.

A class set's pupils of one school get the same kit but for the name on
its parts (#12).  The kit is drawn once without the name, with room for
it (``Kit.nameless``, kitgen.kit), and that PDF is kept; each pupil's
name is then drawn alone, on pages of the same size with the same page
and part transforms, into a small PDF of its own, and each of those
pages is laid over its page of the shared PDF as a form XObject
(ISO 32000-1:2008, 8.10), with its own resources (so its font subset
never meets the shared one's), in an incremental update (7.5.6): the
shared file's bytes come first, unchanged.  A single ``kitgen build``
of a named kit takes the same way, so a kit of a set is the same, byte
for byte, as when built alone.
"""

from __future__ import annotations

import io
import operator
from dataclasses import dataclass, replace

from reportlab.lib.units import mm

from ..kept import kept_for
from . import pdf_objects, pdf_text
from .pdf_canvas import new_canvas

#: The name of the owner's form in a page's resources.
OWNER_FORM = b"/KitgenOwner"


def is_owner(el) -> bool:
    """Whether an element is (a line of) the owner's name, or a piece of a
    plate's line drawn again beside it (kitgen.parts.owner.plate_owner)."""
    return el.role == "owner" or bool(el.values.get("beside_owner"))


def owner_pages(kit, pages, draw_placement, page_transform, font: str) -> tuple[list[int], bytes]:
    """The indices of the pages that carry the owner's name, and a PDF of
    those pages holding the name alone, drawn by ``draw_placement``
    (kitgen.render.pdf's, given a filter) after ``page_transform``, the
    canvas's first font ``font`` (a shipped one).  Each part is handed to
    ``draw_placement`` with its owner's elements alone
    (:func:`owner_elements`), so the thousands of others are not looked at."""
    pdf_text.register_fonts()
    buf = io.BytesIO()
    first = pages[0]
    c = new_canvas(buf, (first.media_mm[0] * mm, first.media_mm[1] * mm), lang=kit.words.language,
                   initialFontName=font, initialFontSize=10)   # never a standard-14 font
    c.setCreator("kitgen")
    bases = {p.id: p for p in kit.nameless.parts} if kit.nameless is not None else {}
    owned: dict[str, tuple] = {}
    chosen = []
    for k, page in enumerate(pages):
        placed = []
        for pl in page.placements:
            if pl.part.id not in owned:
                owned[pl.part.id] = owner_elements(pl.part, bases.get(pl.part.id))
            if owned[pl.part.id]:
                placed.append(replace(pl, part=replace(pl.part, elements=owned[pl.part.id])))
        if not placed:
            continue
        chosen.append(k)
        c.setPageSize((page.media_mm[0] * mm, page.media_mm[1] * mm))
        c.saveState()
        page_transform(c, page)
        for placement in placed:
            draw_placement(c, placement, kit.dims, kit.words, kit.plan.printing, only=is_owner)
        c.restoreState()
        c.showPage()
    if not chosen:
        return [], b""
    c.save()
    return chosen, buf.getvalue()


def owner_elements(part, base) -> tuple:
    """The owner's elements of ``part`` (:func:`is_owner`), in order.
    ``base`` is the same part of the kit's nameless kit (kitgen.kit):
    the plate, the rete and the mater are that part's very elements with
    the owner's set in among them, one run (kitgen.parts.owner), so the
    run is found from the two ends, by identity, and only its elements
    are tested; a part drawn again with the name (the rule, the
    alidade) or one without that shape is tested element by element."""
    if part is base:
        return ()
    named = part.elements
    extra = len(named) - len(base.elements) if base is not None else 0
    if extra > 0:
        plain = base.elements
        tail = 0
        while tail < len(plain) and named[-1 - tail] is plain[-1 - tail]:
            tail += 1
        head = len(plain) - tail
        run = named[head:head + extra]
        if all(map(is_owner, run)) and all(map(operator.is_, named[:head], plain[:head])) \
                and all(map(operator.is_, named[head + extra:], plain[head:])):
            return run
    return tuple(e for e in named if is_owner(e))


@dataclass(frozen=True)
class Layers:
    """A kit's PDF and, for a named kit on shared pages, what it was made
    of: the shared PDF, the indices of the pages that carry the name and
    the name's own PDF (:func:`owner_pages`); empty for any other kit."""

    pdf: bytes
    shared: bytes = b""
    indices: tuple[int, ...] = ()
    overlay: bytes = b""


def lay_over(shared: bytes, indices, overlay: bytes) -> bytes:
    """``shared`` with page ``indices[i]`` of it carrying page i of
    ``overlay`` on top, as an incremental update of ``shared``
    (ISO 32000-1:2008, 7.5.6), written by hand
    (:mod:`kitgen.render.pdf_objects`): the shared file is read once
    (kept for the last few), and each pupil's update holds only the
    name's objects (its fonts, copied once for all its pages), a form
    XObject a page, the two streams that wrap a page's own content and
    the pages' dictionaries, each its old one with the form added."""
    if not indices:
        return shared
    base = _written(shared)
    out = pdf_objects.Out(shared + b"\n", base.size)
    copier = pdf_objects.Copier(pdf_objects.Written(overlay), out)
    layering = Layering(out)
    for k, page in zip(indices, copier.source.pages()):
        number = base.pages()[k]
        out.put(number, layering.page(base.head(number), [(OWNER_FORM, form_of(copier, page), None)]))
    trailer = b"/Root %d 0 R /Info %d 0 R /ID %s /Prev %d" % (base.root, base.info, base.id_text, base.xref_at)
    return out.finish(trailer)


#: The shared PDFs read, by the bytes' identity: ``id -> (bytes, Written)``.
_WRITTEN: dict[int, tuple] = {}


def _written(pdf: bytes) -> pdf_objects.Written:
    return kept_for(_WRITTEN, pdf, lambda: pdf_objects.Written(pdf), 4)


def form_of(copier: pdf_objects.Copier, page: int) -> int:
    """Page ``page`` of the copier's source as a form XObject (8.10) in
    its output: the page's content stream as it is, its resources (fonts
    and all) copied; the form's number."""
    head = copier.source.head(page)
    contents = copier.source.body(int(pdf_objects.value(head, b"/Contents").split()[0]))
    resources = copier.renumbered(pdf_objects.value(head, b"/Resources"))
    entries = b"/Type /XObject /Subtype /Form /BBox %s /Resources %s\n" % (pdf_objects.value(head, b"/MediaBox"),
                                                                         resources)
    return copier.out.add(b"<<\n" + entries + contents[2:].lstrip())


class Layering:
    """Forms laid over pages written to one :class:`~kitgen.render.pdf_objects.Out`:
    a page's own content between a stream that saves the graphics state
    and one that restores it and draws the forms (so the page's content
    is left as it is, and a page shared with others keeps its own), each
    such stream written once for all the pages it serves."""

    def __init__(self, out: pdf_objects.Out):
        self.out = out
        self._streams: dict[bytes, int] = {}

    def _stream(self, data: bytes) -> int:
        if data not in self._streams:
            self._streams[data] = self.out.stream(data)
        return self._streams[data]

    def page(self, head: bytes, forms) -> bytes:
        """The page dictionary ``head`` with ``forms``, ``(name, number,
        at_pt)`` each, laid over it in order as XObjects of those names,
        each moved to ``at_pt`` (x, y) unless that is None; the forms go
        into the page's resources (inline, as reportlab writes them)."""
        draw = b"".join(b"q %s%s Do Q\n" % (b"" if at is None else b"1 0 0 1 %.3f %.3f cm " % at, name)
                        for name, _, at in forms)
        wrap = (self._stream(b"q\n"), self._stream(b"\nQ\n" + draw))
        contents = pdf_objects.value(head, b"/Contents")
        inner = contents[1:-1].strip() if contents.startswith(b"[") else contents
        head = pdf_objects.with_value(head, b"/Contents", b"[ %d 0 R %s %d 0 R ]" % (wrap[0], inner, wrap[1]))
        resources = pdf_objects.value(head, b"/Resources")
        xobjects = pdf_objects.value(resources, b"/XObject") or b"<< >>"
        xobjects = xobjects[:-2].rstrip() + b"".join(b" %s %d 0 R" % (name, number) for name, number, _ in forms)
        resources = pdf_objects.with_value(resources, b"/XObject", xobjects + b" >>")
        return pdf_objects.with_value(head, b"/Resources", resources)
