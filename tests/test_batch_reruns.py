"""A coordinator's second run of a class set (#12): what a rerun keeps,
what a spreadsheet's roster may hold, and mistakes said once.

* A run whose every kit fails leaves an earlier set's folder as it was
  (the README's promise for a run that fails), where it had swapped in a
  folder holding only the manifest.
* The files a desktop's file manager leaves in a folder it showed
  (``.DS_Store``, ``Thumbs.db``, ``._`` companions; common practice of
  macOS Finder and Windows Explorer, no source) do not make the folder
  the user's; a file that does is named in the refusal.
* Language tags are case-insensitive (BCP 47, RFC 5646 section 2.1.1):
  ``EN`` is ``en``.
* A roster as a spreadsheet saves it: header names with capitals
  (``Owner``), empty trailing columns, a line break inside a quoted cell
  (RFC 4180 section 2, rule 6), a row numbered as the spreadsheet
  numbers it (a record, whatever lines it takes).
* A place in ``defaults:`` that the gazetteer (GeoNames) does not know is
  said once, with its line, and nothing is built.
"""

from __future__ import annotations

import csv
import hashlib

import yaml

from kitgen.cli import main

#: Small, quick kits (the rule and the alidade only), as invented demo data.
DEFAULTS = {"latitude": 52.2, "epoch": 2027, "parts": ["rule", "alidade"], "title": "Quarrybank Astronomy Club"}


def _hashes(folder) -> dict:
    return {p.relative_to(folder).as_posix(): hashlib.sha256(p.read_bytes()).hexdigest()
            for p in sorted(folder.rglob("*")) if p.is_file()}


def _batch(tmp_path, tree: dict, out="out") -> int:
    (tmp_path / "s.yaml").write_text(yaml.safe_dump(tree, allow_unicode=True), encoding="utf-8")
    return main(["batch", str(tmp_path / "s.yaml"), "-o", str(tmp_path / out), "--jobs", "1", "--quiet"])


def _manifest(folder) -> list[dict]:
    with open(folder / "manifest.csv", newline="", encoding="utf-8-sig") as fh:
        return list(csv.DictReader(fh))


def test_a_run_whose_every_kit_fails_keeps_the_earlier_set(tmp_path, capsys):
    assert _batch(tmp_path, {"defaults": DEFAULTS, "kits": [{"owner": "Ada"}, {"owner": "Bo"}]}) == 0
    before = _hashes(tmp_path / "out")
    assert "kits/001-Ada.pdf" in before
    capsys.readouterr()
    # a default mistyped for the rerun: every kit refused (latitude beyond 90)
    assert _batch(tmp_path, {"defaults": DEFAULTS, "kits": [{"owner": "Ada", "latitude": 95},
                                                           {"owner": "Bo", "latitude": 96}]}) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 3 and "95" in err[0] and "96" in err[1]
    assert "none of the 2 kits" in err[2] and str(tmp_path / "out") in err[2]
    assert _hashes(tmp_path / "out") == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out", "s.yaml"]   # no temporary folder left


def test_desktop_files_do_not_block_a_rerun(tmp_path, capsys):
    assert _batch(tmp_path, {"defaults": DEFAULTS, "kits": [{"owner": "Ada"}]}) == 0
    out = tmp_path / "out"
    for name in (".DS_Store", "Thumbs.db", "desktop.ini", "kits/._001-Ada.pdf", "kits/Thumbs.db"):
        (out / name).write_bytes(b"\0\1")
    assert _batch(tmp_path, {"defaults": DEFAULTS, "kits": [{"owner": "Ada"}, {"owner": "Bo"}]}) == 0
    assert sorted(_hashes(out)) == ["kits/001-Ada.pdf", "kits/002-Bo.pdf", "manifest.csv", "print-card.pdf",
                                    "print-paper.pdf"]
    # a file of the user's own is named, and keeps the folder as it is
    (out / "notes.txt").write_text("keep me")
    (out / ".DS_Store").write_bytes(b"\0")
    capsys.readouterr()
    assert _batch(tmp_path, {"defaults": DEFAULTS, "kits": [{"owner": "Cy"}]}) == 2
    (line,) = capsys.readouterr().err.strip().splitlines()
    assert "(notes.txt)" in line
    assert (out / "notes.txt").read_text() == "keep me" and (out / "kits" / "002-Bo.pdf").exists()


def test_language_tags_are_case_insensitive(tmp_path):
    assert _batch(tmp_path, {"defaults": DEFAULTS, "kits": [{"owner": "Ada", "language": "fr"}]}, "lower") == 0
    assert _batch(tmp_path, {"defaults": DEFAULTS, "kits": [{"owner": "Ada", "language": " FR"}]}, "upper") == 0
    assert _hashes(tmp_path / "lower") == _hashes(tmp_path / "upper")
    assert _manifest(tmp_path / "upper")[0]["language"] == "fr"


def test_a_roster_as_a_spreadsheet_saves_it(tmp_path, capsys):
    roster = ('Owner,Latitude,Language,Print Scale,,\r\n'
              'Ada,40,EN,,,\r\n'
              '"Bo\nBrennan",41,,\r\n'        # a line break in a cell; the empty columns' cells left out
              'Cy,95,,,,\r\n')                # record 4 of the file, on its fifth line
    (tmp_path / "pupils.csv").write_text(roster, encoding="utf-8")
    assert _batch(tmp_path, {"defaults": DEFAULTS, "roster": "pupils.csv"}) == 2
    rows = _manifest(tmp_path / "out")
    assert [(r["owner"], r["latitude"], r["language"], r["status"] == "ok") for r in rows] == [
        ("Ada", "40", "en", True), ("Bo Brennan", "41", "en", True), ("Cy", "95", "en", False)]
    assert "pupils.csv, row 4:" in rows[2]["status"]
    # a value in a column without a name is the header's mistake: one line, nothing built
    (tmp_path / "pupils.csv").write_text("owner,latitude,,\nAda,40,,x\n", encoding="utf-8")
    capsys.readouterr()
    assert _batch(tmp_path, {"defaults": DEFAULTS, "roster": "pupils.csv"}, "other") == 2
    (line,) = capsys.readouterr().err.strip().splitlines()
    assert "column 4" in line and not (tmp_path / "other").exists()


def test_an_unknown_place_in_the_defaults_is_said_once(tmp_path, capsys):
    defaults = {k: v for k, v in DEFAULTS.items() if k != "latitude"}
    text = yaml.safe_dump({"defaults": {**defaults, "place": "Lyonn, FR"},
                           "kits": [{"owner": "Ada"}, {"owner": "Bo"}]}, allow_unicode=True, sort_keys=False)
    (tmp_path / "s.yaml").write_text(text, encoding="utf-8")
    line_no = 1 + text.splitlines().index("  place: Lyonn, FR")
    assert main(["batch", str(tmp_path / "s.yaml"), "-o", str(tmp_path / "out"), "--jobs", "1"]) == 2
    (line,) = capsys.readouterr().err.strip().splitlines()
    assert line.startswith(f"kitgen: error: {tmp_path / 's.yaml'}, line {line_no}: 'place': ")
    assert "Lyon, FR" in line   # the gazetteer's suggestion
    assert not (tmp_path / "out").exists()
