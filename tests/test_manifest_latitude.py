"""A class set's manifest writes each kit's latitude to six decimals
(kitgen.batch.manifest.LATITUDE_DECIMALS, #12): as typed where it was
typed so, and not to sixteen figures where it was worked out from
degrees and minutes.  Reference: the sexagesimal arithmetic of ISO 6709
(a degree is sixty minutes, a minute sixty seconds), worked by hand in
the comments; the pupils and the club are invented."""

from __future__ import annotations

from types import SimpleNamespace

import pytest

from kitgen.batch.manifest import manifest_row
from kitgen.batch.setfile import load_set

ROWS = (
    ("Ada Frost", "64 08 N", "64.133333"),     # 64 + 8/60 = 64.1333...
    ("Ben Marsh", "33 52 30 S", "-33.875"),    # -(33 + 52/60 + 30/3600) = -33.875
    ("Cai Dune", "-33.9", "-33.9"),
    ("Dot Reed", "51.4769", "51.4769"),
    ("Eli Moss", "0", "0"),
    ("Fay Holt", "0.0000001", "0"),            # under half a millionth: 0, never -0
    ("Gil Park", "-0.0000001", "0"),
)


@pytest.fixture()
def kits(tmp_path):
    (tmp_path / "pupils.csv").write_text("owner,latitude\n" + "".join(f"{o},{lat}\n" for o, lat, _ in ROWS),
                                         encoding="utf-8")
    (tmp_path / "set.yaml").write_text("defaults:\n  title: Saltmarsh Astronomy Club\n  epoch: 2027\n"
                                       "roster: pupils.csv\n", encoding="utf-8")
    return load_set(tmp_path / "set.yaml").kits


def test_the_manifest_writes_a_latitude_to_six_decimals(kits):
    built = SimpleNamespace(materials=("card",), notes=())
    rows = [manifest_row(k, f"{k.number:03d}.pdf", built, {}, "") for k in kits]
    assert [r["latitude"] for r in rows] == [want for _, _, want in ROWS]
    for kit, row in zip(kits, rows):
        assert float(row["latitude"]) == pytest.approx(kit.recipe.latitude_deg, abs=5e-7)
