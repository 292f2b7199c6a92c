"""Print-scale calibration: the calibration page's bars are exact, and a
kit drawn for a printer that prints at 97 % across and 98.5 % down comes
out true on it.

A printer that prints at scale (sx, sy) turns each PDF coordinate (x, y)
into (sx x, sy y); the PDFs are read back with pypdf by the PDF
specification's rules (ISO 32000-1:2008, 8.3 and 8.4; see pdf_paths.py),
and 1 pt = 1/72 in = 25.4/72 mm (8.3.2.3).
"""

from __future__ import annotations

import io
import json
import math
import subprocess
import sys

import pytest

pypdf = pytest.importorskip("pypdf")

from kitgen.errors import UserError  # noqa: E402
from kitgen.kit import build_kit  # noqa: E402
from kitgen.layout.calibration import calibration_page  # noqa: E402
from kitgen.layout.pages import CHECK_BAR_MM, check_bar_mm  # noqa: E402
from kitgen.paper import make_sheet  # noqa: E402
from kitgen.recipe.load import parse_recipe_text  # noqa: E402
from kitgen.render.calibration_pdf import render_calibration_pdf  # noqa: E402
from kitgen.render.json_export import render_json  # noqa: E402
from kitgen.render.pdf import build_pdf, render_pdf  # noqa: E402
from kitgen.words.templates import load_words  # noqa: E402

from .pdf_paths import IDENTITY, mul, read_page  # noqa: E402
from .printed import page_text  # noqa: E402

PT_PER_MM = 72.0 / 25.4
SX, SY = 0.97, 0.985
RECIPE = "latitude: 48.2\nepoch: 2027\nsheet: a4\ntitle: Larkspur Valley School\n"


@pytest.fixture(scope="module")
def scaled():
    kit = build_kit(parse_recipe_text(RECIPE + f"print_scale: {{x: {SX}, y: {SY}}}\n"))
    pages, pdf = build_pdf(kit)
    reader = pypdf.PdfReader(io.BytesIO(pdf))
    return kit, pages, reader, [read_page(reader, p) for p in reader.pages]


def _same_ctm(m, n):
    """Equal transforms, to what reportlab writes (1e-4 pt; scales to 6 places)."""
    return all(abs(a - b) < 1e-5 for a, b in zip(m[:4], n[:4])) and all(abs(a - b) < 2e-3 for a, b in zip(m[4:], n[4:]))


def _printed(x_pt, y_pt):
    """Where the printer puts a PDF point, in mm."""
    return (x_pt * SX / PT_PER_MM, y_pt * SY / PT_PER_MM)


def _placement_ctm(pl):
    a = math.radians(pl.rotation_deg)
    c, s = round(math.cos(a), 12), round(math.sin(a), 12)
    return mul(mul((c, s, -s, c, 0.0, 0.0), (1.0, 0.0, 0.0, 1.0, pl.x_mm * PT_PER_MM, pl.y_mm * PT_PER_MM)),
               (1.0 / SX, 0.0, 0.0, 1.0 / SY, 0.0, 0.0))


def test_pages_are_the_sheet_and_the_layout_is_in_true_mm(scaled):
    """The PDF page is the A4 sheet (ISO 216: 210 x 297 mm); the layout's
    page, in mm as printed, is the sheet times the scale."""
    _, pages, reader, _ = scaled
    for page, pdf_page in zip(pages, reader.pages):
        w, h = (297.0, 210.0) if page.landscape else (210.0, 297.0)
        assert float(pdf_page.mediabox.width) == pytest.approx(w * PT_PER_MM, abs=0.01)
        assert float(pdf_page.mediabox.height) == pytest.approx(h * PT_PER_MM, abs=0.01)
        assert (page.width_mm, page.height_mm) == pytest.approx((w * SX, h * SY))


def test_printed_coordinates_are_the_true_ones(scaled):
    """Every point of every part, printed at 97 % x 98.5 %, lands where the
    layout puts it in true mm: printed = placement(part point); i.e. the
    PDF's coordinates are the true ones divided by the factors."""
    _, pages, _, read = scaled
    checked = 0
    for page, (paths, _) in zip(pages, read):
        for pl in page.placements:
            ctm = _placement_ctm(pl)
            mine = [p for p in paths if not p.clip and _same_ctm(p.ctm, ctm)]
            assert mine, (page.number, pl.part.kind)
            for p in mine:
                for (rx, ry), (dx, dy) in zip(p.points, p.device_points()):
                    want = pl.to_page(rx / PT_PER_MM, ry / PT_PER_MM)
                    assert _printed(dx, dy) == pytest.approx(want, abs=1e-3)
                    checked += 1
    assert checked > 1000


def test_the_check_bar_prints_100_mm(scaled):
    """The check bar is compensated too: 100 / 0.97 mm long in the PDF, so
    100 mm on paper, at the layout's place."""
    _, pages, _, read = scaled
    for page, (paths, _) in zip(pages, read):
        (x0, y0), (x1, _) = check_bar_mm(page)
        found = False
        for p in paths:
            pts = p.device_points()
            if len(pts) == 2 and abs(pts[0][1] - pts[1][1]) < 1e-6:
                a, b = _printed(*pts[0]), _printed(*pts[1])
                if abs(abs(b[0] - a[0]) - CHECK_BAR_MM) < 1e-3 and abs(a[1] - y0) < 1e-3:
                    assert abs(pts[1][0] - pts[0][0]) / PT_PER_MM == pytest.approx(CHECK_BAR_MM / SX, abs=1e-3)
                    assert min(a[0], b[0]) == pytest.approx(x0, abs=1e-3)
                    found = True
        assert found, page.number


def test_a_circle_prints_round_with_the_radius_of_the_geometry_export(scaled):
    """The mater's cut circle: in the PDF an ellipse, 2R/0.97 across and
    2R/0.985 down; printed, a circle of the radius the JSON export gives."""
    kit, pages, _, read = scaled
    radius = next(e["radius"] for p in json.loads(render_json(kit))["parts"] if p["kind"] == "mater_front"
                  for e in p["elements"] if e["role"] == "cut" and e["shape"] == "circle")
    k, pl = next((k, pl) for k, page in enumerate(pages) for pl in page.placements if pl.part.kind == "mater_front")
    ctm = _placement_ctm(pl)
    circles = [p for p in read[k][0] if _same_ctm(p.ctm, ctm)
               and any(abs(math.hypot(x, y) / PT_PER_MM - radius) < 1e-3 for x, y in p.nodes)]
    assert circles
    xs = [d[0] for d in circles[0].device_nodes()]
    ys = [d[1] for d in circles[0].device_nodes()]
    assert (max(xs) - min(xs)) / PT_PER_MM == pytest.approx(2 * radius / SX, abs=1e-3)
    assert (max(ys) - min(ys)) / PT_PER_MM == pytest.approx(2 * radius / SY, abs=1e-3)
    assert (max(xs) - min(xs)) * SX / PT_PER_MM == pytest.approx(2 * radius, abs=1e-3)
    assert (max(ys) - min(ys)) * SY / PT_PER_MM == pytest.approx(2 * radius, abs=1e-3)


def test_the_first_page_says_what_scale_the_kit_was_drawn_for(scaled):
    kit, _, reader, _ = scaled
    text = page_text(reader, 0)
    assert "prints 97 % across and 98.5 % down" in text


@pytest.mark.parametrize("value, words", [
    ("{x: 0.5, y: 1}", ["'print_scale'", "'x' is 0.5", "0.85 to 1.15"]),
    ("{x: 0.97}", ["'print_scale'", "both x"]),
    ("{x: 0.97, y: 0.98, z: 1}", ["'print_scale'", "'z'"]),
    ("fast", ["'print_scale'", "must be a number"]),
])
def test_bad_print_scale_is_one_line_naming_the_key(value, words):
    with pytest.raises(UserError) as info:
        parse_recipe_text(f"latitude: 40\nprint_scale: {value}\n")
    assert "\n" not in str(info.value)
    for w in words:
        assert w in str(info.value)


# -- the calibration page ------------------------------------------------------------

@pytest.mark.parametrize("sheet", ["a4", "letter", "a5"])
def test_calibration_bars_are_exact_in_both_directions_and_units(sheet):
    """Each bar is a straight stroke of its stated length, drawn at 100 %
    (no transformation), with its ticks at every millimetre (1 mm =
    72/25.4 pt) or eighth of an inch (9 pt; 1 in = 72 pt exactly)."""
    page = calibration_page(make_sheet(sheet))
    reader = pypdf.PdfReader(io.BytesIO(render_calibration_pdf(page, load_words("en"))))
    paths, _ = read_page(reader, reader.pages[0])
    segments = [p.device_points() for p in paths if p.ctm == IDENTITY and len(p.points) == 2]
    units = {b.unit for b in page.bars}
    assert units == {"mm", "in"} and {b.axis for b in page.bars} == {"x", "y"} and len(page.bars) == 4
    for bar in page.bars:
        along = 0 if bar.axis == "x" else 1
        length_pt = bar.length * (10 * PT_PER_MM if bar.unit == "mm" else 72.0)
        x0, y0 = (v * PT_PER_MM for v in bar.start_mm)
        lines = [s for s in segments if abs(abs(s[1][along] - s[0][along]) - length_pt) < 1e-3
                 and abs(s[0][1 - along] - s[1][1 - along]) < 1e-6
                 and abs(min(s[0][along], s[1][along]) - (x0, y0)[along]) < 1e-3
                 and abs(s[0][1 - along] - (x0, y0)[1 - along]) < 1e-3]
        assert len(lines) == 1, (sheet, bar)
        step_pt = PT_PER_MM if bar.unit == "mm" else 9.0
        n = round(length_pt / step_pt)
        origin = (x0, y0)[along]
        ticks = sorted(min(s[0][along], s[1][along]) for s in segments
                       if abs(s[0][along] - s[1][along]) < 1e-6 and origin - 1e-3 <= s[0][along] <= origin + length_pt + 1e-3
                       and min(s[0][1 - along], s[1][1 - along]) >= (x0, y0)[1 - along] - 7 * PT_PER_MM
                       and max(s[0][1 - along], s[1][1 - along]) <= (x0, y0)[1 - along] + 7 * PT_PER_MM
                       and (s[0][1 - along] == pytest.approx((x0, y0)[1 - along], abs=1e-3)
                            or s[1][1 - along] == pytest.approx((x0, y0)[1 - along], abs=1e-3)))
        assert len(ticks) == n + 1, (sheet, bar.unit, bar.axis)
        for k, t in enumerate(ticks):
            assert t - origin == pytest.approx(k * step_pt, abs=1e-3)
    # The bars are as long as the sheet allows, in whole centimetres or inches.
    s = make_sheet(sheet)
    across = next(b for b in page.bars if b.axis == "x" and b.unit == "mm")
    assert (across.length + 1) * 10 > s.usable_width_mm - 4


def _run(*args, cwd):
    return subprocess.run([sys.executable, "-m", "kitgen", *args], capture_output=True, text=True, cwd=cwd,
                          timeout=120)


def test_calibrate_command_writes_a_page_and_refuses_bad_input(tmp_path):
    run = _run("calibrate", "--sheet", "letter", cwd=tmp_path)
    assert run.returncode == 0, run.stderr
    out = tmp_path / "calibration-letter.pdf"
    page = pypdf.PdfReader(str(out)).pages[0]
    # ANSI/ASME Y14.1: Letter is 8.5 x 11 in.
    assert (float(page.mediabox.width), float(page.mediabox.height)) == pytest.approx((612.0, 792.0), abs=0.01)
    run = _run("calibrate", "--sheet", "250x350mm", "-o", "c.pdf", cwd=tmp_path)
    assert run.returncode == 0 and (tmp_path / "c.pdf").exists()
    for bad in (["--sheet", "20x30mm"], ["--margin", "3"]):
        run = _run("calibrate", *bad, "-o", "bad.pdf", cwd=tmp_path)
        assert run.returncode == 2 and len(run.stderr.strip().splitlines()) == 1, (bad, run.stderr)
        assert "Traceback" not in run.stderr and not (tmp_path / "bad.pdf").exists()
    mine = tmp_path / "notes.pdf"
    mine.write_bytes(b"my own notes")
    run = _run("calibrate", "-o", "notes.pdf", cwd=tmp_path)
    assert run.returncode == 2 and mine.read_bytes() == b"my own notes"
