"""Previews: one PNG per page, decoded by Pillow (an independent PNG
decoder) as a valid PNG (ISO/IEC 15948:2004) with the page's aspect
ratio (the PDF's MediaBox, read by pypdf), showing the page's drawing.
"""

from __future__ import annotations

import io
import subprocess
import sys

import numpy as np
import pytest

pypdf = pytest.importorskip("pypdf")
Image = pytest.importorskip("PIL.Image")

from kitgen.kit import build_kit  # noqa: E402
from kitgen.recipe.load import parse_recipe_text  # noqa: E402
from kitgen.render.pdf import build_pdf  # noqa: E402
from kitgen.render.preview import encode_png, render_previews  # noqa: E402

PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"  # ISO/IEC 15948:2004, 5.2
# A 230 mm kit on A4 puts its alidade on a landscape page: both shapes of page.
RECIPE = "latitude: 52.2\nepoch: 2027\nsheet: a4\ndiameter_mm: 230\ntitle: Larkspur Valley School\n"
DPI = 30.0


@pytest.fixture(scope="module")
def printed():
    kit = build_kit(parse_recipe_text(RECIPE))
    pages, pdf = build_pdf(kit)
    return pages, pdf, render_previews(pdf, DPI)


def test_one_png_per_page_with_the_page_aspect_ratio(printed):
    pages, pdf, pngs = printed
    reader = pypdf.PdfReader(io.BytesIO(pdf))
    assert len(pngs) == len(reader.pages) == len(pages)
    assert any(p.landscape for p in pages) and any(not p.landscape for p in pages)
    for png, pdf_page in zip(pngs, reader.pages):
        assert png.startswith(PNG_SIGNATURE)
        im = Image.open(io.BytesIO(png))
        im.load()
        assert im.format == "PNG" and im.mode == "RGB"
        w_pt, h_pt = float(pdf_page.mediabox.width), float(pdf_page.mediabox.height)
        w, h = im.size
        # pixels = points x dpi / 72 (1 pt = 1/72 in), each side rounded to a whole pixel
        assert abs(w - w_pt * DPI / 72) <= 1 and abs(h - h_pt * DPI / 72) <= 1
        # so the ratio agrees to within what a pixel on each side allows
        assert abs(w / h - w_pt / h_pt) <= (1.0 + w / h) / h
        pixels = np.asarray(im)
        assert pixels.min() < 100 and np.median(pixels) > 200  # dark lines on white paper
        assert im.info.get("Software") == "kitgen"


def test_the_png_holds_exactly_the_rendered_pixels():
    rng = np.random.default_rng(7)
    rgb = rng.integers(0, 256, size=(13, 17, 3), dtype=np.uint8)
    decoded = np.asarray(Image.open(io.BytesIO(encode_png(rgb))).convert("RGB"))
    assert decoded.shape == rgb.shape and (decoded == rgb).all()


def test_same_pdf_same_pictures(printed):
    _, pdf, pngs = printed
    assert render_previews(pdf, DPI) == pngs


def _run(*args, cwd):
    return subprocess.run([sys.executable, "-m", "kitgen", *args], capture_output=True, text=True, cwd=cwd, timeout=120)


def test_preview_command(tmp_path):
    recipe = tmp_path / "larkspur.yaml"
    recipe.write_text(RECIPE)
    run = _run("preview", "larkspur.yaml", "-o", "look", "--dpi", "30", cwd=tmp_path)
    assert run.returncode == 0, run.stderr
    files = sorted((tmp_path / "look").iterdir())
    assert [f.name for f in files] == [f"larkspur-page-{k:02d}.png" for k in range(1, len(files) + 1)]
    assert len(files) == len(build_pdf(build_kit(parse_recipe_text(RECIPE)))[0])
    # again, over its own pictures: fine
    assert _run("preview", "larkspur.yaml", "-o", "look", "--dpi", "30", cwd=tmp_path).returncode == 0
    # never over a user's file, never a traceback
    mine = tmp_path / "look" / "larkspur-page-01.png"
    mine.write_bytes(b"my holiday photo")
    for args in (["-o", "look"], ["-o", "look", "--dpi", "5"]):
        run = _run("preview", "larkspur.yaml", *args, cwd=tmp_path)
        assert run.returncode == 2 and len(run.stderr.strip().splitlines()) == 1, (args, run.stderr)
        assert "Traceback" not in run.stderr
    assert mine.read_bytes() == b"my holiday photo"
