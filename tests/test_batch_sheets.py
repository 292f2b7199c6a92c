"""A class set whose kits are on sheets of different sizes gets a print
file a stock and sheet (#12): a printer is never sent one job that mixes
paper sizes, which it would print scaled or cut to the paper loaded, and
no part at its true scale.

References: the sheet sizes of ISO 216 (A4 210 x 297 mm, A5 148 x 210 mm)
and ANSI/ASME Y14.1 (Letter 8.5 x 11 in, 215.9 x 279.4 mm), from memory;
pypdf reads the print files and each kit's own PDF; Python's csv module
(RFC 4180) the manifest.
"""

from __future__ import annotations

import csv
import re

import pytest
import yaml
from pypdf import PdfReader

from kitgen.batch import run_set
from kitgen.template_files import shipped_tree

PT_PER_MM = 72.0 / 25.4
SHEETS_MM = {"a4": (210.0, 297.0), "a5": (148.0, 210.0), "letter": (215.9, 279.4)}

KITS = [{"owner": "Ada Fernhill", "sheet": "a4"},
        {"owner": "Bo Marsh", "sheet": "letter", "language": "fr"},
        {"owner": "Cleo Fernhill", "sheet": "a4"},
        {"owner": "Dev Rowan", "sheet": "a5", "copies": 2}]


@pytest.fixture(scope="module")
def mixed_set(tmp_path_factory):
    root = tmp_path_factory.mktemp("sheets")
    (root / "set.yaml").write_text(yaml.safe_dump({
        "defaults": {"epoch": 2027, "latitude": 47.4, "title": "Lakeside Astronomy Club"}, "kits": KITS},
        allow_unicode=True), encoding="utf-8")
    summary = run_set(root / "set.yaml", root / "out", jobs=1, quiet=True)
    assert summary.exit_status == 0
    with open(root / "out" / "manifest.csv", newline="", encoding="utf-8-sig") as fh:
        return root / "out", list(csv.DictReader(fh))


def test_a_print_file_a_stock_and_sheet(mixed_set):
    out, rows = mixed_set
    names = sorted(p.name for p in out.iterdir() if p.suffix == ".pdf")
    assert names == sorted(f"print-{m}-{s}.pdf" for m in ("paper", "card", "film") for s in ("a4", "a5", "letter"))
    assert [r["sheet"] for r in rows] == [k["sheet"] for k in KITS]
    for name in names:
        sheet = re.fullmatch(r"print-\w+-(\w+)\.pdf", name).group(1)
        want = sorted(v * PT_PER_MM for v in SHEETS_MM[sheet])
        for page in PdfReader(out / name).pages:
            got = sorted(float(v) for v in (page.mediabox.width, page.mediabox.height))
            assert got == pytest.approx(want, abs=0.5), (name, got)


def test_each_kits_pages_are_in_its_sheets_files(mixed_set):
    out, rows = mixed_set
    for row, kit in zip(rows, KITS):
        own = PdfReader(out / row["file"]).pages
        for material in ("card", "film"):
            printed = PdfReader(out / f"print-{material}-{row['sheet']}.pdf").pages
            cells = row[f"{material}_print_pages"].split(" ")
            assert len(cells) == kit.get("copies", 1)
            for cell in cells:
                numbers = [int(v) for v in re.findall(r"\d+", cell)]   # "5–8", or "3" for one page
                first, last = numbers[0], numbers[-1]
                assert last - first + 1 == int(row[f"{material}_pages"])
                for page in printed[first - 1:last]:
                    sizes = [sorted((float(p.mediabox.width), float(p.mediabox.height))) for p in own]
                    assert sorted((float(page.mediabox.width), float(page.mediabox.height))) in sizes
                    stamp = shipped_tree(row["language"])["batch"]["stamp"].format(number=row["kit"], name=row["owner"])
                    assert stamp in page.extract_text()   # the kit's own stamp


def test_one_sheet_keeps_one_file_a_stock(tmp_path):
    (tmp_path / "set.yaml").write_text(yaml.safe_dump({"defaults": {"epoch": 2027, "latitude": -12.0},
                                                       "kits": [{"owner": "Ema"}, {"owner": "Ivo"}]}))
    run_set(tmp_path / "set.yaml", tmp_path / "out", jobs=1, quiet=True)
    assert sorted(p.name for p in (tmp_path / "out").iterdir() if p.suffix == ".pdf") == [
        "print-card.pdf", "print-film.pdf", "print-paper.pdf"]
