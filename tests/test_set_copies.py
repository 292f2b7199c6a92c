"""A set kit that cannot be built keeps the copies its row asked for
(#12): the manifest tells the coordinator how many to print once the row
is mended.  The row's error is its recipe's (a latitude beyond 90 deg:
no such place on Earth, by the definition of geodetic latitude); a row
whose copies are themselves wrong falls back to one.  Pupils invented."""

from __future__ import annotations

from kitgen.batch.manifest import manifest_row
from kitgen.batch.setfile import load_set


def test_a_failed_row_keeps_its_copies(tmp_path):
    (tmp_path / "pupils.csv").write_text(
        "owner,latitude,copies\n"
        "Nadia Brook,95,3\n"       # a recipe fault: copies still 3
        "Owen Hale,51.5,2\n"       # built
        "Pia Lund,51.5,zero\n",    # a copies fault
        encoding="utf-8")
    (tmp_path / "set.yaml").write_text("defaults:\n  title: Brookside Science Club\nroster: pupils.csv\n",
                                       encoding="utf-8")
    kits = load_set(tmp_path / "set.yaml").kits
    assert [(k.copies, k.error is None) for k in kits] == [(3, False), (2, True), (1, False)]
    row = manifest_row(kits[0], "", None, {}, "latitude out of range")
    assert row["copies"] == 3 and row["file"] == "" and row["status"] == "latitude out of range"


def test_a_failed_rows_sheet_and_language_are_those_it_would_be_built_on(tmp_path):
    # A row that leaves the sheet and language to the defaults shows the
    # ones it would be built on once mended: the set's, else the recipe's
    # own (A4 and English, kitgen's documented defaults).
    (tmp_path / "pupils.csv").write_text("owner,latitude,sheet\nNadia Brook,95,\nOwen Hale,95,letter\n",
                                         encoding="utf-8")
    (tmp_path / "set.yaml").write_text("defaults:\n  title: Brookside Science Club\nroster: pupils.csv\n",
                                       encoding="utf-8")
    kits = load_set(tmp_path / "set.yaml").kits
    rows = [manifest_row(k, "", None, {}, "latitude out of range") for k in kits]
    assert [(r["sheet"], r["language"], r["latitude"]) for r in rows] == [("a4", "en", "95"), ("letter", "en", "95")]
    (tmp_path / "set.yaml").write_text("defaults:\n  language: fr\n  sheet: a5\nroster: pupils.csv\n",
                                       encoding="utf-8")
    kits = load_set(tmp_path / "set.yaml").kits
    rows = [manifest_row(k, "", None, {}, "latitude out of range") for k in kits]
    assert [(r["sheet"], r["language"]) for r in rows] == [("a5", "fr"), ("letter", "fr")]
