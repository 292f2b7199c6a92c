"""The set's two print files: every kit's card pages, then every kit's
film pages, in kit order, each kit as many times as its copies, each page
stamped with the kit's number and owner (#12).

The pages are copied from the kits' own PDFs by pypdf, content untouched
(:mod:`kitgen.batch.stamp` adds the stamp beside it), so a page in a print
file prints exactly as in its kit.  The output is deterministic: the
pages go in a fixed order, pypdf writes no file identifier (``/ID``)
unless asked, and the document information is fixed.
"""

from __future__ import annotations

import io
from dataclasses import dataclass

from pypdf import PdfReader, PdfWriter
from pypdf.generic import NameObject

from ..render.pdf_owner import lay_form, page_form
from .stamp import stamp_page

MATERIALS = ("card", "film")


@dataclass(frozen=True)
class PrintedKit:
    """What the print files need of one built kit."""

    number: int
    pdf: bytes
    stamp: bytes
    materials: tuple[str, ...]
    margin_mm: float
    copies: int
    #: A named kit on its school's shared pages: the shared PDF, the pages
    #: that carry the name and the name's PDF (kitgen.render.pdf_owner).
    shared: bytes = b""
    owner_pages: tuple[int, ...] = ()
    overlay: bytes = b""


class PrintFiles:
    """The two print files, filled kit by kit in kit order (so that they
    can grow while later kits are still being built): :meth:`add` each
    built kit, then :meth:`finish`."""

    def __init__(self):
        self.writers = {m: _writer() for m in MATERIALS}
        self.counts = {m: 0 for m in MATERIALS}
        #: {kit number: {material: [(first, last), ...]}}, page numbers from 1.
        self.ranges: dict[int, dict[str, list[tuple[int, int]]]] = {}
        self._readers: dict[bytes, PdfReader] = {}

    def add(self, kit: PrintedKit) -> None:
        """Add a kit's pages.  A named kit on its school's shared pages
        takes them from the shared PDF, read once for the school, and
        lays its name over them as its own PDF does: so its pages print
        as in its own PDF, while the school's pupils share the pages'
        content and fonts in the print files (pypdf keeps one copy of
        what the pages of one reader share)."""
        named = bool(kit.shared)
        reader = self._shared(kit.shared) if named else PdfReader(io.BytesIO(kit.pdf))
        names = PdfReader(io.BytesIO(kit.overlay)).pages if named else []
        overlay = PdfReader(io.BytesIO(kit.stamp)).pages[0]
        spans = self.ranges.setdefault(kit.number, {m: [] for m in MATERIALS})
        for material in MATERIALS:
            chosen = [i for i, m in enumerate(kit.materials) if m == material]
            if not chosen:
                continue
            writer = self.writers[material]
            form = page_form(writer, overlay)
            owner_forms = {i: page_form(writer, names[k]) for k, i in enumerate(kit.owner_pages) if i in chosen}
            for _ in range(kit.copies):
                first = self.counts[material] + 1
                for i in chosen:
                    page = writer.add_page(reader.pages[i])
                    if i in owner_forms:
                        lay_form(writer, page, owner_forms[i])
                    stamp_page(writer, page, form, float(overlay.mediabox.right), kit.margin_mm)
                self.counts[material] += len(chosen)
                spans[material].append((first, self.counts[material]))

    def _shared(self, pdf: bytes) -> PdfReader:
        """The reader of a school's shared PDF, kept for the last two."""
        reader = self._readers.get(pdf)
        if reader is None:
            if len(self._readers) >= 2:
                del self._readers[next(iter(self._readers))]
            reader = self._readers[pdf] = PdfReader(io.BytesIO(pdf))
        return reader

    def finish(self) -> dict[str, bytes]:
        """``{material: pdf bytes}`` for each material that has pages."""
        return {m: _bytes(self.writers[m]) for m in MATERIALS if self.counts[m]}


def print_files(kits) -> tuple[dict[str, bytes], dict[int, dict[str, list[tuple[int, int]]]]]:
    """``({material: pdf bytes}, {kit number: {material: [(first, last), ...]}})``:
    the two print files of ``kits`` (in kit order) and where each copy of
    each kit's pages landed in them (page numbers from 1)."""
    files = PrintFiles()
    for kit in kits:
        files.add(kit)
    return files.finish(), files.ranges


def _writer() -> PdfWriter:
    writer = PdfWriter()
    writer.add_metadata({"/Creator": "kitgen", "/Producer": "kitgen"})
    # Print dialogs at actual size, as each kit's own PDF asks (ISO 32000-1:2008, 12.2, table 150; #9).
    writer.create_viewer_preferences().print_scaling = NameObject("/None")
    return writer


def _bytes(writer: PdfWriter) -> bytes:
    buf = io.BytesIO()
    writer.write(buf)
    data = buf.getvalue()
    if "/ID" in PdfReader(io.BytesIO(data)).trailer:   # a pypdf that adds a random identifier
        raise AssertionError("pypdf wrote a file identifier: the print files would differ run to run")
    return data
