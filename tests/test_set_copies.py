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
