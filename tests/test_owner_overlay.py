"""A named kit's PDF is its school's shared PDF with the name laid over
(#12): the shared file's bytes first and unchanged, then an incremental
update (ISO 32000-1:2008, 7.5.6) whose pages carry the name as a form
XObject (8.10), read back here with pypdf, a general-purpose reference
reader of PDF, and checked by qpdf (the QPDF project's ``--check``); and
the name stands where the parts put it.  The update is written by hand
(kitgen.render.pdf_objects), so its reading of reportlab's files is
checked against pypdf's too."""

from __future__ import annotations

import io
import shutil
import subprocess

import pytest
from pypdf import PdfReader
from pypdf.generic import DictionaryObject

from kitgen.kit import build_kit
from kitgen.layout.pages import layout_kit
from kitgen.recipe.load import validate_recipe
from kitgen.render import pdf_objects
from kitgen.render.pdf import build_pdf, render_pdf

#: Invented pupils of an invented school (demo data).
PUPILS = ("Nadia Quillfeather", "Tomasz Ebberling")
SCHOOL = {"latitude": -33.9, "language": "es", "epoch": 2027, "sheet": "a4", "title": "Escuela Arroyo Claro"}


def _kit(owner: str):
    return build_kit(validate_recipe({**SCHOOL, "owner": owner}))


def test_each_pupils_pdf_is_the_shared_pdf_then_an_update():
    first, second = (_kit(name) for name in PUPILS)
    assert first.nameless is second.nameless   # the school's base, drawn once
    shared = render_pdf(first.nameless, layout_kit(first.nameless))
    for kit in (first, second):
        pdf = build_pdf(kit)[1]
        assert pdf.startswith(shared) and len(pdf) > len(shared)
        # the update adds a cross-reference section of its own after the shared one's %%EOF
        assert pdf[len(shared):].count(b"startxref") == 1


def test_the_update_reads_back_in_pypdf_and_qpdf(tmp_path):
    """Each page, as pypdf reads the updated file in strict mode, is the
    shared page; a page that carries the name has the shared page's
    content between ``q`` and ``Q``, then the form, whose content is the
    name's own page; the update's trailer points back to the shared
    file's cross-reference table (/Prev) and keeps its /Root, /Info and
    /ID (7.5.6); qpdf --check finds no error."""
    from kitgen.render.pdf import render_layers

    kit = _kit(PUPILS[0])
    layers = render_layers(kit, layout_kit(kit))
    reader = PdfReader(io.BytesIO(layers.pdf), strict=True)   # Reference: pypdf
    shared = PdfReader(io.BytesIO(layers.shared), strict=True)
    names = PdfReader(io.BytesIO(layers.overlay), strict=True)
    assert len(reader.pages) == len(shared.pages)
    for k, (page, alone) in enumerate(zip(reader.pages, shared.pages)):
        own = alone.get_contents().get_data()
        if k not in layers.indices:
            assert page.get_contents().get_data() == own
            continue
        assert page.get_contents().get_data() == b"q\n" + own + b"\nQ\nq /KitgenOwner Do Q\n"
        form = page["/Resources"]["/XObject"]["/KitgenOwner"].get_object()
        name_page = names.pages[layers.indices.index(k)]
        assert form.get_data() == name_page.get_contents().get_data()
        assert [float(v) for v in form["/BBox"]] == [float(v) for v in page.mediabox]
        fonts = form["/Resources"]["/Font"]
        assert all("/FontFile2" in f.get_object()["/FontDescriptor"] for f in fonts.values())
        # the shared page's fonts stay its own, the name's apart
        assert page["/Resources"].raw_get("/Font").idnum == alone["/Resources"].raw_get("/Font").idnum
        assert form["/Resources"].raw_get("/Font").idnum >= shared.trailer["/Size"]
    startxref = int(layers.shared.rsplit(b"startxref", 1)[1].split()[0])
    assert reader.trailer["/Prev"] == startxref
    assert reader.trailer["/ID"] == shared.trailer["/ID"] and reader.metadata.title == shared.metadata.title
    if shutil.which("qpdf") is None:
        pytest.skip("qpdf is not installed (.ci/run installs it): the pypdf half ran")
    (tmp_path / "kit.pdf").write_bytes(layers.pdf)
    done = subprocess.run(["qpdf", "--check", str(tmp_path / "kit.pdf")], capture_output=True, text=True)
    assert done.returncode == 0, done.stdout + done.stderr   # Reference: qpdf


def test_the_object_reader_agrees_with_pypdf():
    """kitgen.render.pdf_objects reads a reportlab file's objects as pypdf
    does: the same pages in order, each stream's data byte for byte, each
    object's references."""
    from pypdf.generic import IndirectObject, StreamObject

    kit = _kit(PUPILS[1])
    data = render_pdf(kit.nameless, layout_kit(kit.nameless))
    ours, theirs = pdf_objects.Written(data), PdfReader(io.BytesIO(data), strict=True)   # Reference: pypdf
    assert ours.pages() == [p.indirect_reference.idnum for p in theirs.pages]
    assert ours.size == theirs.trailer["/Size"] and ours.root == theirs.trailer.raw_get("/Root").idnum
    for number in range(1, ours.size):
        obj = theirs.get_object(number)
        body = ours.body(number)
        if isinstance(obj, StreamObject):
            assert body.endswith(b"\nstream\n" + obj._data + b"endstream")
        refs = sorted({v.idnum for v in _references(obj, IndirectObject)})
        assert sorted({int(n) for n in pdf_objects._REF.findall(ours.head(number))}) == refs, number
        if isinstance(obj, DictionaryObject):
            for key in obj:
                _same_value(pdf_objects.value(ours.head(number), key.encode("ascii")), obj.raw_get(key))


def _same_value(text: bytes, read) -> None:
    """A value's text as kitgen.render.pdf_objects.value takes it is what
    pypdf read there: the same name, reference or number, an array of the
    same length and numbers, a dictionary with the same keys."""
    from pypdf.generic import ArrayObject, FloatObject, IndirectObject, NameObject, NumberObject

    if isinstance(read, NameObject):
        assert text == read.encode("ascii")
    elif isinstance(read, IndirectObject):
        assert text == b"%d 0 R" % read.idnum
    elif isinstance(read, (FloatObject, NumberObject)):
        assert float(text) == float(read)
    elif isinstance(read, ArrayObject):
        items = text[1:-1].split()
        assert text.startswith(b"[") and text.endswith(b"]")
        if all(isinstance(v, (FloatObject, NumberObject)) for v in read):
            assert [float(v) for v in items] == [float(v) for v in read]
    elif isinstance(read, DictionaryObject):
        assert text.startswith(b"<<") and text.endswith(b">>")
        for key in read:
            _same_value(pdf_objects.value(text, key.encode("ascii")), read.raw_get(key))


def _references(obj, kind):
    """Every indirect reference written in ``obj`` (not followed)."""
    if isinstance(obj, kind):
        yield obj
    elif isinstance(obj, dict):
        for v in obj.values():
            yield from _references(v, kind)
    elif isinstance(obj, list):
        for v in obj:
            yield from _references(v, kind)


def test_the_name_is_on_every_page_of_a_part_that_carries_it():
    kit = _kit(PUPILS[0])
    pages, pdf = build_pdf(kit)
    reader = PdfReader(io.BytesIO(pdf))
    assert len(reader.pages) == len(pages)
    for page, read in zip(pages, reader.pages):
        named = any(e.role == "owner" for pl in page.placements for e in pl.part.elements)
        xobjects = read["/Resources"].get("/XObject", {})
        assert ("/KitgenOwner" in xobjects) == named
        if named:
            form = xobjects["/KitgenOwner"].get_object()
            assert form["/Subtype"] == "/Form"
            assert PUPILS[0].split()[0] in read.extract_text()
    kinds = {pl.part.kind for page in pages for pl in page.placements
             if any(e.role == "owner" for e in pl.part.elements)}
    assert {"plate", "rete", "mater_front", "mater_back", "rule", "alidade"} <= kinds


def test_the_base_is_the_named_kit_less_the_name():
    kit = _kit(PUPILS[1])
    for part, base in zip(kit.parts, kit.nameless.parts):
        assert part.id == base.id and part.bounds_mm == base.bounds_mm
        named = [e for e in part.elements if e.role != "owner" and not e.values.get("beside_owner")]
        assert sorted(map(repr, named)) == sorted(map(repr, base.elements))
        assert all(e.role != "owner" and not e.values.get("beside_owner") for e in base.elements)


def test_the_names_elements_found_without_a_scan_are_those_a_scan_finds():
    """owner_pages takes each part's owner's elements as the run the named
    part has beyond its nameless one: they are, in order, the elements
    that testing every element with is_owner finds."""
    from kitgen.render.pdf_owner import is_owner, owner_elements

    kit = _kit(PUPILS[0])
    bases = {p.id: p for p in kit.nameless.parts}
    for part in kit.parts:
        scanned = tuple(e for e in part.elements if is_owner(e))
        assert scanned, part.id
        assert owner_elements(part, bases[part.id]) == scanned, part.id
        assert owner_elements(bases[part.id], bases[part.id]) == ()


def test_a_schools_pupils_share_their_pages_in_the_print_files():
    """In a class set's print files, two pupils of one school share the
    shared pages' content streams (the same indirect objects, as pypdf
    reads them back), and each page still holds its kit's own content."""
    from kitgen.batch.printfiles import PrintedKit, PrintFiles
    from kitgen.batch.stamp import stamps_pdf
    from kitgen.batch.work import KitJob, build_one
    from kitgen.words.templates import load_words

    files = PrintFiles()
    results = [build_one(KitJob(k + 1, validate_recipe({**SCHOOL, "owner": name})))
               for k, name in enumerate(PUPILS)]
    stamps = stamps_pdf(load_words(SCHOOL.get("language", "en")), list(enumerate(PUPILS, 1)))
    for k, r in enumerate(results):
        assert r.shared and r.owner_pages and r.overlay
        files.add(PrintedKit(r.number, r.pdf, stamps, r.materials, r.margin_mm, 1, r.shared, r.owner_pages,
                             r.overlay, k))
    card = PdfReader(io.BytesIO(files.finish()["print-card.pdf"]))
    per_kit = len(card.pages) // 2
    for k in range(per_kit):
        a, b = card.pages[k], card.pages[per_kit + k]
        refs = [{o.idnum for o in p["/Contents"]} for p in (a, b)]
        assert refs[0] & refs[1], k      # the shared page's own content, once in the file
        kit_page = PdfReader(io.BytesIO(results[0].pdf)).pages[results[0].materials.index("card") + k]
        assert kit_page.get_contents().get_data() in a.get_contents().get_data()


def test_a_seam_across_the_name_is_broken_round_it():
    # A tiled mater (283 mm on Legal) whose back's seam runs across the
    # owner's line: the kit cannot be its school's shared pages with the
    # name laid over them, whose seam runs through the name (found by a
    # random kit of tests/test_no_word_crossed.py); it is drawn whole, and
    # its seam has a gap at the name (the words' measured boxes, 0.3 mm
    # clear: kitgen.layout.seams).  A kit of the same school whose name
    # meets no seam (a short name) still shares the school's pages.
    from kitgen.render.pdf import render_layers
    from kitgen.render.pdf_marks import seam_lines_mm
    from kitgen.layout.pages import shared_pages
    school = {"latitude": 15.2, "language": "de", "sheet": "legal", "diameter_mm": 283.2, "epoch": 2027}
    kit = build_kit(validate_recipe({**school, "owner": "Zofia Wrenhaven-Castellanos"}))   # invented
    pages = layout_kit(kit)
    layers = render_layers(kit, pages)
    assert layers.shared == b"" and layers.pdf == render_pdf(kit, pages)
    base = shared_pages(kit, pages)
    named = [(pl, bl) for page, b in zip(pages, base) for pl, bl in zip(page.placements, b.placements)
             if pl.piece is not None and pl.part.kind == "mater_back"
             and seam_lines_mm(pl, kit.words) != seam_lines_mm(bl, kit.words)]
    assert named   # the back's seam breaks round the name only where the name is
    for placed, nameless in named:
        assert len(seam_lines_mm(placed, kit.words)) > len(seam_lines_mm(nameless, kit.words))
    short = build_kit(validate_recipe({**school, "owner": "Ida Po"}))
    assert render_layers(short, layout_kit(short)).shared != b""
