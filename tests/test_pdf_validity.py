"""Every PDF kitgen writes (kits and calibration pages) is a valid PDF for two strict, independent
parsers: pypdf in strict mode (every object of the cross-reference table
read, every page's content stream decoded and parsed) and qpdf's
``--check`` (the QPDF project's structural and stream check).

qpdf is a Debian package; ``.ci/run`` installs it.  Where it is missing
the qpdf half is skipped and says so; the pypdf half always runs.
"""

from __future__ import annotations

import io
import shutil
import subprocess
from pathlib import Path

import pytest
from pypdf import PdfReader
from pypdf.generic import ContentStream

from kitgen.cli import main
from kitgen.words.templates import available_languages

#: Kits that exercise every kind of page: each sheet, both hemispheres and
#: the degenerate latitudes, every shipped language (right-to-left and
#: complex scripts included), a kit tiled over several sheets, a film-only
#: kit and a long title.
CASES = {
    **{f"sheet-{s}": f"latitude: 40\nsheet: {s}\n" for s in ("a5", "a4", "a3", "letter", "legal", "tabloid")},
    "north-pole": "latitude: 90\n",
    "south-pole": "latitude: -90\nsheet: letter\n",
    "equator": "latitude: 0\n",
    "southern": "latitude: 33 52 S\n",
    **{f"language-{code}": f"latitude: 48.2\nlanguage: {code}\n" for code in available_languages()},
    "tiled": "latitude: 52.2\nsheet: a4\ndiameter_mm: 400\n",
    "custom-sheet": "latitude: 52.2\nsheet: {width_mm: 250, height_mm: 180}\n",
    "film-only": "latitude: 52.2\nparts: [rete]\n",
    "long-title": "latitude: 52.2\ntitle: '" + "Hilltop Science Club and Larkspur Valley School " * 2 + "'\n",
}


#: The calibration page (``kitgen calibrate``), on a named and a custom
#: sheet and in a right-to-left language.
CALIBRATIONS = {
    "calibrate-a4": ["--sheet", "a4"],
    "calibrate-custom": ["--sheet", "250x350mm", "--margin", "15"],
    "calibrate-ar": ["--sheet", "letter", "--language", "ar"],
}


@pytest.fixture(scope="module")
def pdfs(tmp_path_factory) -> dict[str, Path]:
    folder = tmp_path_factory.mktemp("pdfs")
    out = {}
    for name, text in CASES.items():
        recipe = folder / f"{name}.yaml"
        recipe.write_text(text + "epoch: 2027\n", encoding="utf-8")
        pdf = folder / f"{name}.pdf"
        assert main(["build", str(recipe), "-o", str(pdf)]) == 0, name
        out[name] = pdf
    for name, args in CALIBRATIONS.items():
        pdf = folder / f"{name}.pdf"
        assert main(["calibrate", *args, "-o", str(pdf)]) == 0, name
        out[name] = pdf
    return out


@pytest.mark.parametrize("name", [*CASES, *CALIBRATIONS])
def test_pypdf_strict(pdfs, name):
    data = pdfs[name].read_bytes()
    assert data.startswith(b"%PDF-1.") and data.rstrip().endswith(b"%%EOF")
    reader = PdfReader(io.BytesIO(data), strict=True)
    # Every object in the cross-reference table resolves.
    for generation, numbers in reader.xref.items():
        for number in numbers:
            assert reader.get_object(number) is not None
    assert len(reader.pages) >= (1 if name in CALIBRATIONS else 2)
    for page in reader.pages:
        box = [float(v) for v in page.mediabox]
        assert box[2] > box[0] and box[3] > box[1]
        stream = ContentStream(page.get_contents(), reader)
        assert stream.operations, "an empty page"
    assert reader.metadata.creator == "kitgen"


@pytest.mark.parametrize("name", [*CASES, *CALIBRATIONS])
def test_qpdf_check(pdfs, name):
    qpdf = shutil.which("qpdf")
    if qpdf is None:
        pytest.skip("qpdf is not installed (Debian package 'qpdf'; .ci/run installs it): "
                    "the qpdf check is skipped, the pypdf strict check still ran")
    p = subprocess.run([qpdf, "--check", str(pdfs[name])], capture_output=True, text=True, timeout=120)
    # qpdf exits 0 for a clean file, 3 for warnings, 2 for errors.
    assert p.returncode == 0, p.stdout + p.stderr
    assert "No syntax or stream encoding errors found" in p.stdout


def test_the_checks_catch_a_broken_pdf(pdfs, tmp_path):
    """A kit cut short by a few bytes (as a half-written file would be)
    fails both parsers."""
    broken = tmp_path / "broken.pdf"
    data = pdfs["sheet-a4"].read_bytes()
    broken.write_bytes(data[: len(data) // 2])
    with pytest.raises(Exception):
        reader = PdfReader(io.BytesIO(broken.read_bytes()), strict=True)
        for page in reader.pages:
            page.get_contents().get_data()
    qpdf = shutil.which("qpdf")
    if qpdf:
        assert subprocess.run([qpdf, "--check", str(broken)], capture_output=True).returncode != 0
