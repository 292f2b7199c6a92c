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

from .stamp import stamp_form, stamp_page

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


def print_files(kits) -> tuple[dict[str, bytes], dict[int, dict[str, list[tuple[int, int]]]]]:
    """``({material: pdf bytes}, {kit number: {material: [(first, last), ...]}})``:
    the two print files and where each copy of each kit's pages landed in
    them (page numbers from 1)."""
    writers = {m: _writer() for m in MATERIALS}
    counts = {m: 0 for m in MATERIALS}
    ranges: dict[int, dict[str, list[tuple[int, int]]]] = {}
    readers = {k.number: PdfReader(io.BytesIO(k.pdf)) for k in kits}
    stamps = {k.number: PdfReader(io.BytesIO(k.stamp)).pages[0] for k in kits}
    for material in MATERIALS:
        writer = writers[material]
        for kit in kits:
            chosen = [i for i, m in enumerate(kit.materials) if m == material]
            spans = ranges.setdefault(kit.number, {m: [] for m in MATERIALS})[material]
            if not chosen:
                continue
            overlay = stamps[kit.number]
            form = stamp_form(writer, overlay)
            width = float(overlay.mediabox.right)
            for _ in range(kit.copies):
                first = counts[material] + 1
                for i in chosen:
                    page = writer.add_page(readers[kit.number].pages[i])
                    stamp_page(writer, page, form, width, kit.margin_mm)
                counts[material] += len(chosen)
                spans.append((first, counts[material]))
    files = {m: _bytes(writers[m]) for m in MATERIALS if counts[m]}
    return files, ranges


def _writer() -> PdfWriter:
    writer = PdfWriter()
    writer.add_metadata({"/Creator": "kitgen", "/Producer": "kitgen"})
    return writer


def _bytes(writer: PdfWriter) -> bytes:
    buf = io.BytesIO()
    writer.write(buf)
    data = buf.getvalue()
    if b"/ID [" in data or b"/ID[" in data:   # a pypdf that adds a random identifier
        raise AssertionError("pypdf wrote a file identifier: the print files would differ run to run")
    return data
