"""The set's print files, one a stock (:data:`MATERIALS`): every kit's
instruction pages (plain paper), then in files of their own the answer
keys (one a school: :data:`ONCE_A_SCHOOL`), the two-sided mater sheets,
the card pages and the film pages, in kit order, each kit as many times
as its copies, each page stamped with the kit's number and owner (#12).

A set whose kits are on sheets of more than one size has a print file a
stock and sheet (:func:`print_file_name`: ``print-card-a4.pdf``,
``print-card-letter.pdf``), so that a printer is never sent a job that
mixes paper sizes, which it would print scaled or cut to the one loaded,
and no part at its true scale.

The files are written by hand (:mod:`kitgen.render.pdf_objects`): a
page's objects are copied from its kit's PDF as they are, content and
fonts untouched, and the stamp (:mod:`kitgen.batch.stamp`; a school's
stamps, with their font, copied once) is laid over it as a form XObject
(ISO 32000-1:2008, 8.10), so a page in a print file prints exactly as in
its kit.  A named kit's pages come from its
school's shared PDF, each object of which is copied into a print file
once for all the school's pupils, with the pupil's name laid over them
as in the pupil's own PDF (:mod:`kitgen.render.pdf_owner`).  The output
is deterministic: the pages go in a fixed order, and the files have no
identifier (``/ID``, 14.4) and fixed document information.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from ..render import pdf_objects
from ..render.pdf_objects import Copier, Written
from ..render.pdf_owner import OWNER_FORM, Layering, form_of
from .stamp import STAMP_FORM, stamp_at

#: The stocks a kit's pages are printed on, as its own printing steps say
#: (kitgen.layout.instructions): the instructions on plain paper, the
#: worksheet's answer key on plain paper for the teacher alone, the
#: mater's two faces on the two sides of one sheet of card (``duplex``,
#: each kit's pair front then back, so the file pairs them whatever the
#: kits before), the other parts on card and on film: a print file each
#: (:data:`FILE_NAMES`), written only when some kit has such pages.
MATERIALS = ("paper", "answers", "duplex", "card", "film")
FILE_NAMES = {m: f"print-{m}.pdf" for m in MATERIALS}

#: A print file's name: a stock's (:data:`FILE_NAMES`), or with its sheet
#: where a set mixes sheets (:func:`print_file_name`).
_FILE_NAME = re.compile(r"print-(%s)(-[a-z0-9.]+)?\.pdf" % "|".join(MATERIALS))


def print_file_name(material: str, sheet: str, several_sheets: bool) -> str:
    """The print file of ``material`` on ``sheet`` (:func:`sheet_key`): the
    stock's file, or ``print-card-a4.pdf`` where the set's kits are on
    several sheets."""
    return f"print-{material}-{sheet}.pdf" if several_sheets else FILE_NAMES[material]


def is_print_file_name(name: str) -> bool:
    """Whether ``name`` is one :func:`print_file_name` gives."""
    return _FILE_NAME.fullmatch(name) is not None


def sheet_key(sheet) -> str:
    """A recipe's sheet as print files and the manifest name it: a sheet's
    name (``a4``), or a custom sheet's size (``200x250mm``)."""
    if isinstance(sheet, str):
        return sheet
    width_mm, height_mm = sheet
    return f"{width_mm:g}x{height_mm:g}mm"

#: Stocks printed once for kits the same but for their owner (a
#: school's pupils), whatever their copies: the teacher needs one answer
#: key for a class, not one a pupil.  The key is printed without a
#: pupil's name or a kit's stamp (its heading names the place and year),
#: and each of the school's kits names its pages in the manifest.
ONCE_A_SCHOOL = ("answers",)


@dataclass(frozen=True)
class PrintedKit:
    """What the print files need of one built kit."""

    number: int
    pdf: bytes
    stamp: bytes            # the kit's school's stamps (kitgen.batch.stamp.stamps_pdf)
    materials: tuple[str, ...]
    margin_mm: float
    copies: int
    #: A named kit on its school's shared pages: the shared PDF, the pages
    #: that carry the name and the name's PDF (kitgen.render.pdf_owner).
    shared: bytes = b""
    owner_pages: tuple[int, ...] = ()
    overlay: bytes = b""
    stamp_page: int = 0     # the kit's own stamp's page in ``stamp``
    #: The kit's school (kitgen.kit.school_of: its recipe but for the
    #: owner), for the stocks printed once a school; None: the kit alone.
    school: object = None
    #: The kit's sheet (:func:`sheet_key`), whose print files it goes in.
    sheet: str = "a4"


class PrintFiles:
    """The print files, filled kit by kit in kit order (so that they
    can grow while later kits are still being built): :meth:`add` each
    built kit, then :meth:`finish`."""

    def __init__(self):
        #: {(material, sheet): its file}, made as kits on the sheet come.
        self.files: dict[tuple[str, str], _File] = {}
        #: {kit number: {material: [(first, last), ...]}}, page numbers
        #: from 1, in the file of the kit's sheet.
        self.ranges: dict[int, dict[str, list[tuple[int, int]]]] = {}

    def add(self, kit: PrintedKit) -> None:
        """Add a kit's pages.  A named kit on its school's shared pages
        takes them from the shared PDF, copied once for the school, and
        lays its name over them as its own PDF does: so its pages print
        as in its own PDF, while the school's pupils share the pages'
        content and fonts in the print files."""
        spans = self.ranges.setdefault(kit.number, {m: [] for m in MATERIALS})
        for material in MATERIALS:
            chosen = [i for i, m in enumerate(kit.materials) if m == material]
            if not chosen:
                continue
            file = self.files.setdefault((material, kit.sheet), _File())
            once = material in ONCE_A_SCHOOL
            if once:
                key = kit.school if kit.school is not None else ("kit", kit.number)
                printed = file.printed.get(key)
                if printed is not None:
                    spans[material] = list(printed)
                    continue
            pages = file.shared(kit.shared) if kit.shared else Copier(Written(kit.pdf), file.out)
            stamp = file.shared(kit.stamp)
            form = form_of(stamp, stamp.source.pages()[kit.stamp_page])
            width_pt = _media_box(stamp.source.head(stamp.source.pages()[kit.stamp_page]))[2]
            names = Copier(Written(kit.overlay), file.out) if kit.overlay else None
            owner_forms = {i: form_of(names, names.source.pages()[k])
                           for k, i in enumerate(kit.owner_pages) if i in chosen and not once}
            for _ in range(1 if once else kit.copies):
                first = len(file.pages) + 1
                for i in chosen:
                    number = pages.source.pages()[i]
                    at = stamp_at(_media_box(pages.source.head(number)), width_pt, kit.margin_mm)
                    forms = [(OWNER_FORM, owner_forms[i], None)] if i in owner_forms else []
                    file.page(pages, number, forms + ([] if once else [(STAMP_FORM, form, at)]))
                spans[material].append((first, len(file.pages)))
            if once:
                file.printed[key] = tuple(spans[material])

    def finish(self) -> dict[str, bytes]:
        """``{file name: pdf bytes}`` (:func:`print_file_name`) for each
        stock and sheet that has pages, by stock, the sheets in the order
        the kits brought them."""
        filled = [key for key in self.files if self.files[key].pages]
        several = len({sheet for _, sheet in filled}) > 1
        order = sorted(filled, key=lambda key: MATERIALS.index(key[0]))
        return {print_file_name(m, sheet, several): self.files[(m, sheet)].finish() for m, sheet in order}


class _File:
    """One print file being written: its objects, its pages' numbers and
    the copiers of the schools' shared PDFs and stamps."""

    def __init__(self):
        self.out = pdf_objects.Out(pdf_objects.HEADER, 1)
        self.catalog, self.tree, self.info = self.out.number(), self.out.number(), self.out.number()
        self.layering = Layering(self.out)
        self.pages: list[int] = []
        self._shared: dict[bytes, Copier] = {}
        #: {a kit's school (or its number): the spans of its pages} for
        #: the stocks printed once a school (:data:`ONCE_A_SCHOOL`).
        self.printed: dict[tuple, tuple] = {}

    def shared(self, pdf: bytes) -> Copier:
        """The copier of a PDF a school's kits share (its shared pages, its
        stamps), kept for the whole set: a roster may list its schools'
        pupils mixed, and each object goes into the file once all the same."""
        copier = self._shared.get(pdf)
        if copier is None:
            copier = self._shared[pdf] = Copier(Written(pdf), self.out)
        return copier

    def page(self, copier: Copier, number: int, forms) -> None:
        """Page ``number`` of the copier's source, its objects copied (each
        once), with ``forms`` laid over it (:class:`~kitgen.render.pdf_owner.Layering`)."""
        head = pdf_objects.with_value(copier.source.head(number), b"/Parent", b"null")
        head = pdf_objects.with_value(copier.renumbered(head), b"/Parent", b"%d 0 R" % self.tree)
        self.pages.append(self.out.add(self.layering.page(head, forms)))

    def finish(self) -> bytes:
        """The file: its page tree, a catalog that asks print dialogs for
        actual size as each kit's own PDF does (12.2, table 150; #9),
        fixed document information, no file identifier."""
        kids = b" ".join(b"%d 0 R" % n for n in self.pages)
        self.out.put(self.tree, b"<<\n/Type /Pages /Count %d /Kids [ %s ]\n>>" % (len(self.pages), kids))
        self.out.put(self.catalog, b"<<\n/Type /Catalog /Pages %d 0 R /ViewerPreferences << /PrintScaling /None >>"
                                   b"\n>>" % self.tree)
        self.out.put(self.info, b"<<\n/Creator (kitgen) /Producer (kitgen)\n>>")
        return self.out.finish(b"/Root %d 0 R /Info %d 0 R" % (self.catalog, self.info))


def _media_box(head: bytes) -> tuple[float, ...]:
    """A page dictionary's media box (x0, y0, x1, y1), in points."""
    return tuple(float(v) for v in pdf_objects.value(head, b"/MediaBox").strip(b"[] ").split())


def print_files(kits) -> tuple[dict[str, bytes], dict[int, dict[str, list[tuple[int, int]]]]]:
    """``({file name: pdf bytes}, {kit number: {material: [(first, last), ...]}})``:
    the print files of ``kits`` (in kit order) and where each copy of
    each kit's pages landed in them (page numbers from 1)."""
    files = PrintFiles()
    for kit in kits:
        files.add(kit)
    return files.finish(), files.ranges
