"""The small stamp on every page of a set's print files: the kit's number
and its owner (or title), so a printed stack can be sorted (#12).

The stamps of a school's kits (kits equal but for their owner) are drawn
by reportlab into one PDF, a page a kit, with the school's words and
fonts (:mod:`kitgen.render.pdf_text`, so an Arabic or Hindi name is
shaped as on the kit), in invariant mode so that the same set gives the
same bytes: its font subset serves all the school's stamps.  A stamp is
then laid on each page of its kit as a form XObject (ISO 32000-1:2008,
8.10) in the top margin, right-aligned at the content area's edge, after
the page's own content wrapped in ``q``/``Q``; the page's content stream
itself is left as it is.
"""

from __future__ import annotations

import io

from reportlab.lib.units import mm

from ..kit import school_of
from ..plan.resolve import plan_words
from ..render import pdf_text
from ..render.pdf_canvas import new_canvas
from ..words import fonts

STAMP_PT = 6.0
#: The stamp's baseline above the top edge of the content area (mm); its
#: text stays in the margin, which is at least 6 mm.
STAMP_RISE_MM = 1.0
_PAD_PT = 2.0
#: The name of the stamp's form in a page's resources.
STAMP_FORM = b"/KitgenStamp"


def stamps_pdf(words, stamps) -> bytes:
    """A PDF holding the stamps ``stamps`` ((kit number, name) each) in
    ``words``' language, a page each in order: each page as wide as its
    stamp, the baseline at ``_PAD_PT`` above its foot, the left end at 0."""
    pdf_text.register_fonts([fonts.DEJAVU["body"]])   # a script's own font is registered when a line needs it
    buf = io.BytesIO()
    c = new_canvas(buf, (1.0, STAMP_PT + 2 * _PAD_PT), lang=words.language,
                   initialFontName=fonts.DEJAVU["body"].name, initialFontSize=STAMP_PT)
    c.setCreator("kitgen")
    for number, name in stamps:
        text = words("batch.stamp", number=words.number(number), name=name)
        c.setPageSize((pdf_text.width_pt(text, STAMP_PT, words, "body") + _PAD_PT, STAMP_PT + 2 * _PAD_PT))
        c.setFillGray(0.0)
        pdf_text.draw_at_baseline(c, 0.0, _PAD_PT, text, STAMP_PT, words, "body")
        c.showPage()
    c.save()
    return buf.getvalue()


class SchoolStamps:
    """The stamps of a set's kits (:class:`~kitgen.batch.setfile.SetKit`,
    those without errors), one PDF a school (:func:`stamps_pdf`, its kits
    in kit order).  The worker that builds a school's first kit draws
    them too, where its language's words are loaded already
    (:meth:`lists`, :meth:`give`); a school whose first kit brought none
    back (its kit failed) has them drawn here when a kit of it is first
    asked for.  They are the same bytes wherever they are drawn, so the
    print files are the same whichever worker built which kit."""

    def __init__(self, kits):
        self._place: dict[int, tuple] = {}   # kit number -> (its school, its page)
        self._kits: dict = {}
        for kit in kits:
            key = school_of(kit.recipe)
            school = self._kits.setdefault(key, [])
            self._place[kit.number] = (key, len(school))
            school.append(kit)
        self._pdfs: dict = {}

    def lists(self) -> dict[int, tuple[tuple[int, str], ...]]:
        """{a school's first kit's number: its stamps (kit number, name) in
        order}: what :func:`stamps_pdf` draws for the school."""
        return {kits[0].number: _stamps_of(kits) for kits in self._kits.values()}

    def give(self, number: int, pdf: bytes) -> None:
        """The stamps of kit ``number``'s school, drawn elsewhere."""
        if pdf:
            self._pdfs.setdefault(self._place[number][0], pdf)

    def of(self, number: int) -> tuple[bytes, int]:
        """(the PDF of kit ``number``'s school's stamps, its page in it)."""
        key, page = self._place[number]
        if key not in self._pdfs:   # kept for the set: a roster may list its schools' pupils mixed
            kits = self._kits[key]
            self._pdfs[key] = stamps_pdf(plan_words(kits[0].recipe), _stamps_of(kits))
        return self._pdfs[key], page


def _stamps_of(kits) -> tuple[tuple[int, str], ...]:
    """A school's stamps: (kit number, name) of each of its kits, in order."""
    return tuple((k.number, stamp_name(k)) for k in kits)


def stamp_name(kit) -> str:
    """What a kit's stamp names: its owner, else its title."""
    return kit.recipe.owner or kit.recipe.title


def stamp_at(media_box_pt, form_width_pt: float, margin_mm: float) -> tuple[float, float]:
    """Where the stamp's form (its lower left corner) goes on a page of
    media box ``media_box_pt`` (x0, y0, x1, y1): right-aligned at the
    content area's edge, its baseline :data:`STAMP_RISE_MM` above it."""
    x0, y0, x1, y1 = media_box_pt
    return x1 - margin_mm * mm - form_width_pt, y1 - margin_mm * mm + STAMP_RISE_MM * mm - _PAD_PT
