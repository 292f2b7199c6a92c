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
from dataclasses import dataclass

from pypdf import PdfReader, PdfWriter
from pypdf.generic import ArrayObject, DecodedStreamObject, DictionaryObject, FloatObject, NameObject
from reportlab.lib.units import mm

from . import pdf_text
from .pdf_canvas import new_canvas

_FORM = NameObject("/KitgenOwner")


def is_owner(el) -> bool:
    """Whether an element is (a line of) the owner's name, or a piece of a
    plate's line drawn again beside it (kitgen.parts.owner.plate_owner)."""
    return el.role == "owner" or bool(el.values.get("beside_owner"))


def owner_pages(kit, pages, draw_placement, page_transform, font: str) -> tuple[list[int], bytes]:
    """The indices of the pages that carry the owner's name, and a PDF of
    those pages holding the name alone, drawn by ``draw_placement``
    (kitgen.render.pdf's, given a filter) after ``page_transform``, the
    canvas's first font ``font`` (a shipped one)."""
    pdf_text.register_fonts()
    buf = io.BytesIO()
    first = pages[0]
    c = new_canvas(buf, (first.media_mm[0] * mm, first.media_mm[1] * mm), lang=kit.words.language,
                   initialFontName=font, initialFontSize=10)   # never a standard-14 font
    c.setCreator("kitgen")
    chosen = []
    for k, page in enumerate(pages):
        placed = [pl for pl in page.placements if any(is_owner(e) for e in pl.part.elements)]
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
    ``overlay`` on top, as an incremental update of ``shared``."""
    if not indices:
        return shared
    writer = PdfWriter(PdfReader(io.BytesIO(shared)), incremental=True)
    over = PdfReader(io.BytesIO(overlay))
    for k, o in zip(indices, over.pages):
        lay_form(writer, writer.pages[k], page_form(writer, o), _FORM)
    out = io.BytesIO()
    writer.write(out)
    return out.getvalue()


def page_form(writer, page):
    """A page of another PDF as a form XObject added to ``writer`` (its
    resources, fonts included, copied in); its reference."""
    form = DecodedStreamObject()
    form.set_data(page.get_contents().get_data())
    form.update({
        NameObject("/Type"): NameObject("/XObject"),
        NameObject("/Subtype"): NameObject("/Form"),
        NameObject("/BBox"): ArrayObject([FloatObject(float(v)) for v in page.mediabox]),
        NameObject("/Resources"): page["/Resources"].get_object().clone(writer),
    })
    return writer._add_object(form)


def lay_form(writer, page, form_ref, name=_FORM, at_pt=None) -> None:
    """Lay the form ``form_ref`` over ``page`` (a page of ``writer``) as
    the XObject ``name``, moved to ``at_pt`` (x, y) if given: the page's
    own content wrapped in ``q``/``Q``, then the form; the page gets
    resources of its own, so a page shared with others keeps its own."""
    resources = DictionaryObject(page[NameObject("/Resources")].get_object())
    xobjects = DictionaryObject(resources.get(NameObject("/XObject"), DictionaryObject()).get_object())
    xobjects[name] = form_ref
    resources[NameObject("/XObject")] = xobjects
    page[NameObject("/Resources")] = resources
    before, after = DecodedStreamObject(), DecodedStreamObject()
    before.set_data(b"q\n")
    move = "" if at_pt is None else f"1 0 0 1 {at_pt[0]:.3f} {at_pt[1]:.3f} cm "
    after.set_data(f"\nQ\nq {move}{name} Do Q\n".encode("ascii"))
    contents = page.get(NameObject("/Contents"))
    old = list(contents.get_object()) if isinstance(contents.get_object(), ArrayObject) else [contents]
    page[NameObject("/Contents")] = ArrayObject([writer._add_object(before), *old, writer._add_object(after)])
