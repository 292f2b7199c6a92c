"""A class set's print files follow each kit's own printing steps (#12):
a worksheet's answer key goes to the teacher's file, never among the
pupils' pages, and a duplex mater's two sides go to a file of their own,
each kit's pair front then back, so that printing the file two-sided
puts every front behind its own back.

References: pypdf reads the files and the kits' pages (text and content
streams); the kit's own printing steps (its "print_answers" and
"duplex_long" sentences, read from the PDF's text) say which page is
the key and which pages are the two sides.  Printing the two sides of a
sheet from pages 2k-1 and 2k of a file is how printers pair pages when
they print two-sided (common practice).
"""

from __future__ import annotations

import csv
import io
import re

import pypdf
import pytest
import yaml

from kitgen.cli import main
from kitgen.kit import build_kit
from kitgen.layout.instructions import answer_key_page
from kitgen.layout.pages import layout_kit
from kitgen.recipe.load import parse_recipe_text
from kitgen.render.pdf import build_pdf
from kitgen.words.templates import load_words

DEFAULTS = {"latitude": 47.4, "epoch": 2027, "diameter_mm": 80, "stars": {"brightest": 6},
            "title": "Brookmere Science Club"}
KITS = [{"owner": "Ada Brookfield", "worksheet": True, "accuracy_page": True},
        {"owner": "Rui Amendoeira", "duplex": "long_edge", "copies": 2},
        {"owner": "Teodora Valcorvo", "worksheet": True}]


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    root = tmp_path_factory.mktemp("stocks")
    (root / "set.yaml").write_text(yaml.safe_dump({"defaults": DEFAULTS, "kits": KITS}), encoding="utf-8")
    assert main(["batch", str(root / "set.yaml"), "-o", str(root / "out"), "--jobs", "1", "--quiet"]) == 0
    with open(root / "out" / "manifest.csv", newline="", encoding="utf-8-sig") as fh:
        return root / "out", list(csv.DictReader(fh))


def _texts(path) -> list[str]:
    return [p.extract_text() for p in pypdf.PdfReader(path).pages]


def _key_heading() -> str:
    return load_words("en").template("worksheet.key_heading").split("{")[0].strip()


def test_the_answer_key_named_in_the_steps_is_the_keys_page():
    """A single build with a worksheet and the accuracy page: the page the
    printing steps name as the key holds the key's heading, alone."""
    kit = build_kit(parse_recipe_text(yaml.safe_dump({**DEFAULTS, **KITS[0]})))
    texts = [p.extract_text() for p in pypdf.PdfReader(io.BytesIO(build_pdf(kit)[1])).pages]
    said = load_words("en").template("instructions.print_answers").split("{page}")
    named = [int(m) for m in re.findall(re.escape(said[0]) + r"(\d+)" + re.escape(said[1][:12]), texts[0])]
    assert named, texts[0][:400]
    holding = [k + 1 for k, t in enumerate(texts) if _key_heading() in t]
    assert holding == named
    assert answer_key_page(kit, layout_kit(kit)).number == named[0]


def test_answer_keys_go_to_the_teachers_file_only(built):
    out, rows = built
    paper, answers = _texts(out / "print-paper.pdf"), _texts(out / "print-answers.pdf")
    assert not any(_key_heading() in t for t in paper)
    assert len(answers) == 2 and all(_key_heading() in t for t in answers)
    assert [int(r["answers_pages"]) for r in rows] == [1, 0, 1]
    assert [r["answers_print_pages"] for r in rows] == ["1", "", "2"]


def test_duplex_sides_pair_in_their_own_file(built):
    out, rows = built
    duplex = pypdf.PdfReader(out / "print-duplex.pdf").pages
    kit = pypdf.PdfReader(out / rows[1]["file"]).pages
    texts = [p.extract_text() for p in kit]
    said = load_words("en").template("printing.duplex_long").split("{front}")[1].split("{back}")[0]
    front = next(int(m.group(1)) for t in texts for m in [re.search(r"(\d+)" + re.escape(said) + r"(\d+)", t)] if m)
    assert len(duplex) == 4 and rows[1]["duplex_print_pages"] == "1\u20132 3\u20134"
    for first in (0, 2):   # each copy: its front on an odd page, its back on the next
        assert kit[front - 1].get_contents().get_data() in duplex[first].get_contents().get_data()
        assert kit[front].get_contents().get_data() in duplex[first + 1].get_contents().get_data()
    card = _texts(out / "print-card.pdf")
    assert int(rows[1]["card_pages"]) == len(kit) - int(rows[1]["paper_pages"]) - 2 - int(rows[1]["film_pages"])
    assert sum(int(r["card_pages"]) * int(r["copies"]) for r in rows) == len(card)


def test_one_answer_key_a_school(tmp_path):
    """Three pupils of one school (one with two copies), a kit of
    another and a kit of the first without a name: the teacher's file holds
    each school's key once, without a pupil's name or a kit's stamp, and
    every kit's manifest row names its school's key."""
    school = {**DEFAULTS, "worksheet": True}
    kits = [{"owner": "Ada Brookfield"}, {"owner": "Rui Amendoeira", "copies": 2},
            {"owner": "Mirela Tavira", "latitude": -33.9}, {"owner": "Teodora Valcorvo"}, {"copies": 1}]
    (tmp_path / "set.yaml").write_text(yaml.safe_dump({"defaults": school, "kits": kits}), encoding="utf-8")
    assert main(["batch", str(tmp_path / "set.yaml"), "-o", str(tmp_path / "out"), "--jobs", "1", "--quiet"]) == 0
    with open(tmp_path / "out" / "manifest.csv", newline="", encoding="utf-8-sig") as fh:
        rows = list(csv.DictReader(fh))
    answers = _texts(tmp_path / "out" / "print-answers.pdf")
    assert len(answers) == 2 and all(_key_heading() in t for t in answers)
    assert [r["answers_print_pages"] for r in rows] == ["1", "1", "2", "1", "1"]
    for row in rows:   # each pupil's own key page is the one printed (its content stream, read by pypdf)
        own = pypdf.PdfReader(tmp_path / "out" / row["file"]).pages
        key = next(p for p in own if _key_heading() in p.extract_text())
        printed = pypdf.PdfReader(tmp_path / "out" / "print-answers.pdf").pages[
            int(row["answers_print_pages"]) - 1]
        assert key.get_contents().get_data() in printed.get_contents().get_data()
    # no pupil's name, no kit's stamp: the key's heading names the place and year
    assert not any(k["owner"] in t for t in answers for k in kits if k.get("owner"))
    stamp = load_words("en").template("batch.stamp").split("{")[0]
    assert not any(stamp in t for t in answers)
