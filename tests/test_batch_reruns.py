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
import os

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
    # a row refused for another key writes its language as the kits built do (it wrote " FR")
    assert _batch(tmp_path, {"defaults": DEFAULTS, "kits": [{"owner": "Bo", "language": " FR", "latitude": 95}]},
                  "refused") == 2
    assert _manifest(tmp_path / "refused")[0]["language"] == "fr"


def test_a_roster_as_a_spreadsheet_saves_it(tmp_path, capsys):
    roster = ('Owner,Latitude,Language,Print Scale,,\r\n'
              'Ada,40,EN,,,\r\n'
              '"Bo\nBrennan",41,,\r\n'        # a line break in a cell; the empty columns' cells left out
              'Cy,95,,,,\r\n'                 # record 4 of the file, on its fifth line
              'Di,40\r\n')                     # a named column's cell left out: refused, its owner kept
    (tmp_path / "pupils.csv").write_text(roster, encoding="utf-8")
    assert _batch(tmp_path, {"defaults": DEFAULTS, "roster": "pupils.csv"}) == 2
    rows = _manifest(tmp_path / "out")
    assert [(r["owner"], r["latitude"], r["language"], r["status"] == "ok") for r in rows] == [
        ("Ada", "40", "en", True), ("Bo Brennan", "41", "en", True), ("Cy", "95", "en", False),
        ("Di", "", "en", False)]
    assert "pupils.csv, row 4:" in rows[2]["status"]
    assert "pupils.csv, row 5: the row has 2 cells but the header has 4" in rows[3]["status"]
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


def test_the_starter_set_and_roster_build_as_written(tmp_path, capsys):
    """``kitgen new --set`` and ``--roster`` write what ``kitgen batch``
    builds, the set naming the roster once its comment is taken off; a
    missing set or roster names the command that writes one, where the
    hint had named ``kitgen new``, which writes a recipe a set refuses."""
    set_path, roster = tmp_path / "set.yaml", tmp_path / "pupils.csv"
    assert main(["batch", str(set_path), "-o", str(tmp_path / "out")]) == 2
    assert f"`kitgen new --set -o {set_path}`" in capsys.readouterr().err   # the path as given, its folder kept
    assert main(["new", "--set", "-o", str(set_path)]) == 0
    text = set_path.read_text(encoding="utf-8")
    set_path.write_text(text.replace("# roster: pupils.csv", "roster: pupils.csv"), encoding="utf-8")
    capsys.readouterr()
    assert main(["batch", str(set_path), "-o", str(tmp_path / "out")]) == 2
    assert f"`kitgen new --roster -o {roster}`" in capsys.readouterr().err   # beside the set, where it reads it
    assert main(["new", "--roster", "-o", str(roster)]) == 0
    assert roster.read_bytes().startswith(b"\xef\xbb\xbfowner,")   # UTF-8 with its mark, as a spreadsheet reads it
    assert main(["batch", str(set_path), "-o", str(tmp_path / "out"), "--jobs", "1", "--quiet"]) == 0
    rows = _manifest(tmp_path / "out")
    assert [r["owner"] for r in rows] == ["Class teacher", "Ada Brightwater", "Bruno Castellane", "Chidi Okoro-Lane"]
    assert [r["language"] for r in rows] == ["en", "en", "fr", "en"] and {r["status"] for r in rows} == {"ok"}
    capsys.readouterr()
    assert main(["batch", str(set_path), "-o", ""]) == 2
    (line,) = capsys.readouterr().err.strip().splitlines()
    assert "folder" in line and "leave -o out" not in line


def test_a_disks_root_is_refused_before_any_work(tmp_path, capsys):
    """A mount point (a memory stick's root) cannot be renamed over
    (POSIX rename(2): EBUSY), so a set or preview folder cannot be
    swapped into its place: said at once, where a set had failed only
    once every kit was built.  /proc is a mount point on every Linux."""
    mount = next(p for p in ("/proc", "/sys", "/dev/shm") if os.path.ismount(p))
    (tmp_path / "s.yaml").write_text(yaml.safe_dump({"defaults": DEFAULTS, "kits": [{"owner": "Ada"}]}))
    (tmp_path / "r.yaml").write_text(yaml.safe_dump(DEFAULTS))
    for command in (["batch", str(tmp_path / "s.yaml")], ["preview", str(tmp_path / "r.yaml")]):
        assert main([*command, "-o", mount]) == 2
        (line,) = capsys.readouterr().err.strip().splitlines()
        assert line.startswith(f"kitgen: error: {mount}: is a disk's own root") and f"{mount}/kits" in line


def test_a_kit_that_leaves_the_defaults_clock_says_so(tmp_path):
    """A kit that gives its own latitude takes none of the defaults' site
    (README), their longitude and time zone neither: it tells local mean
    time, which its manifest row now says in its language, where it had
    said nothing (a coordinator's roster row with a latitude alone).  A
    kit that names its place (looked up in GeoNames, with its own zone),
    or that takes the defaults' site, has no such note."""
    defaults = {**DEFAULTS, "longitude": "0.1W", "timezone": "Europe/London"}
    kits = [{"owner": "Ada"}, {"owner": "Bo", "latitude": 45.7}, {"owner": "Cy", "latitude": 45.7, "language": "fr"},
            {"owner": "Di", "place": "Lyon, FR"}, {"owner": "Ed", "latitude": 45.7, "longitude": "4.8E",
                                                    "timezone": "Europe/Paris"}]
    assert _batch(tmp_path, {"defaults": defaults, "kits": kits}) == 0
    notes = [row["notes"] for row in _manifest(tmp_path / "out")]
    assert "does not take the defaults' clock" in notes[1] and "local mean time" in notes[1]
    assert "il ne prend donc pas l’horloge des valeurs par défaut" in notes[2]
    assert not any("clock" in n or "horloge" in n for n in (notes[0], notes[3], notes[4]))


def test_the_clock_note_follows_what_the_kit_tells(tmp_path):
    """The note goes by the time the kit tells: a kit with plates of its
    own and no clock, or a latitude of its own where the defaults' town
    (looked up in GeoNames) gave the clock, tells local mean time and says
    so; a kit that names a place beside its latitude has the build's own
    note for that instead."""
    defaults = {k: v for k, v in DEFAULTS.items() if k != "latitude"}
    kits = [{"owner": "Ada"}, {"owner": "Bo", "latitude": 43.3}, {"owner": "Cy", "plates": [50, 55]},
            {"owner": "Di", "latitude": 59.9, "place": "Nordvik"}]
    assert _batch(tmp_path, {"defaults": {**defaults, "place": "Lyon, FR"}, "kits": kits}) == 0
    notes = [row["notes"] for row in _manifest(tmp_path / "out")]
    said = "does not take the defaults' clock"
    assert said not in notes[0] and said in notes[1] and said in notes[2] and said not in notes[3]
    assert "'Nordvik' is printed on the kit but not looked up" in notes[3]


def test_an_earlier_empty_folder_gets_the_manifest(tmp_path, capsys):
    """An empty folder made beforehand is no earlier set: a run whose
    every kit fails writes its manifest there, saying why."""
    (tmp_path / "out").mkdir()
    (tmp_path / "out" / ".DS_Store").write_bytes(b"\0")
    assert _batch(tmp_path, {"defaults": DEFAULTS, "kits": [{"owner": "Ada", "latitude": 95}]}) == 2
    (row,) = _manifest(tmp_path / "out")
    assert row["status"] != "ok" and "95" in row["status"]
