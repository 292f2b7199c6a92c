"""A class set's manifest tells, kit by kit, what the build thinned or
left out to keep every scale legible (#12): the very notes a single
``kitgen build`` of the same recipe says on stderr, in the kit's language,
so a coordinator learns of a label without room without building each kit
alone.

Reference: the single build's own notes (``kitgen build``'s stderr, the
template's ``notes.report`` line), which test_legibility checks against
the drawing itself.  The schools and pupils are invented.
"""

from __future__ import annotations

import csv

import yaml

from kitgen.batch.manifest import NOTE_SEPARATOR
from kitgen.cli import main
from kitgen.words.templates import load_words

KITS = [{"owner": "Nilo Ferraz", "latitude": -22.9, "language": "pt", "diameter_mm": 80},
        {"owner": "Ada Brookfield", "latitude": 51.5, "language": "en"},
        {"owner": "Ines Okafor", "latitude": 51.5, "language": "en", "diameter_mm": 80}]


def _single_notes(tmp_path, recipe: dict, k: int, capsys) -> list[str]:
    path = tmp_path / f"single-{k}.yaml"
    path.write_text(yaml.safe_dump({"epoch": 2027, **recipe}, allow_unicode=True), encoding="utf-8")
    capsys.readouterr()
    assert main(["build", str(path), "-o", str(tmp_path / f"single-{k}.pdf")]) == 0
    before, after = load_words(recipe["language"]).template("notes.report").split("{message}")
    lines = capsys.readouterr().err.splitlines()
    return [line[len(before):len(line) - len(after)] for line in lines if line.startswith(before)]


def test_each_kits_notes_are_its_single_builds(tmp_path, capsys):
    (tmp_path / "set.yaml").write_text(yaml.safe_dump({"defaults": {"epoch": 2027}, "kits": KITS},
                                                      allow_unicode=True), encoding="utf-8")
    assert main(["batch", str(tmp_path / "set.yaml"), "-o", str(tmp_path / "out"), "--jobs", "1", "--quiet"]) == 0
    with open(tmp_path / "out" / "manifest.csv", newline="", encoding="utf-8-sig") as fh:
        rows = list(csv.DictReader(fh))
    for k, (row, recipe) in enumerate(zip(rows, KITS)):
        said = _single_notes(tmp_path, recipe, k, capsys)
        assert (row["notes"].split(NOTE_SEPARATOR) if row["notes"] else []) == said, recipe
    assert rows[0]["notes"] and rows[2]["notes"]   # 80 mm: thinned scales, at least
    assert rows[1]["notes"] != rows[2]["notes"]
