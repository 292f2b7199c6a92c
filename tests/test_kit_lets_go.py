"""A class set's worker holds the label search's grids and bounds for the
kit in hand only (kitgen.parts.breaks.let_go, #12): a new kit lets the
last one's go, where they had kept about 14 kits' polylines alive (20 MB
of a worker's peak, measured in benchmarks/batch_speed.py (e)).  No
outside source: the property is the package's own; the kits are
invented."""

from __future__ import annotations

from kitgen.kit import build_kit
from kitgen.parts import breaks
from kitgen.recipe.load import validate_recipe


def _points_of(kit) -> list:
    return [el.geom["points"] for part in kit.parts for el in part.elements if "points" in el.geom]


def _kept_points() -> list:
    return ([v[0] for v in breaks._POLY_GRIDS.values()] + [v[0] for v in breaks._BOUNDS.values()]
            + [v[0] for v in breaks._LINE_BOUNDS.values()])


def test_a_new_kit_lets_the_last_kits_points_go():
    first = build_kit(validate_recipe({"latitude": 41.3, "language": "en", "owner": "Ann Example"}))
    mine = {id(p): p for p in _points_of(first)}
    assert any(mine.get(id(p)) is p for p in _kept_points())   # kept while its own kit is in hand
    build_kit(validate_recipe({"latitude": -17.8, "language": "fr", "owner": "Bea Example"}))
    assert not any(mine.get(id(p)) is p for p in _kept_points())


def test_a_schools_next_pupil_keeps_its_schools_points():
    first = build_kit(validate_recipe({"latitude": 12.6, "language": "en", "owner": "Cal Example"}))
    mine = {id(p): p for p in _points_of(first.nameless or first)}
    build_kit(validate_recipe({"latitude": 12.6, "language": "en", "owner": "Dee Example"}))
    assert any(mine.get(id(p)) is p for p in _kept_points())
