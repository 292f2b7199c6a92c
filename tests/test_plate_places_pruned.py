"""The plate's last search for an almucantar's number (all round a small
circle near the zenith, every place on a grid round each point) skips the
points whose every place surely meets a line, found many places at once
(kitgen.parts.plate_labels.PlateLabeller._may_be_free, #12).  Checked
against the one-by-one search it stands in for (first_free, whose tests
test_screen_against_shapely checks against GEOS): wherever a point is
skipped, the one-by-one search finds no place there either; and where
the search with the named lines alone is found to find nothing
(``_may_find``), the one-by-one search with them finds nothing, so that
the searches with more lines, which it stands in for, find nothing too.
The kits are crowded A5 plates, where the search reaches that far (the
case it was made for: the 80 degree circle at 45 N)."""

from __future__ import annotations

import pytest

from kitgen import kit
from kitgen.errors import speaking
from kitgen.parts import reuse
from kitgen.parts.plate_labels import (CLEAR_MM, MARGIN_MM, ROUND_REACH_MM, ROUND_STEP_MM, STEP_MM, PlateLabeller,
                                      around, midpoint, points_along)
from kitgen.recipe.load import validate_recipe


@pytest.mark.parametrize("latitude, language", [(45.0, "en"), (40.0, "de"), (-60.0, "ru")])
def test_a_point_skipped_has_no_free_place(monkeypatch, latitude, language):
    seen = {"skipped": 0, "kept": 0}
    screened = PlateLabeller._may_be_free

    def checked(self, centres, text, size_pt, protected):
        verdicts = list(screened(self, centres, text, size_pt, protected))
        assert len(verdicts) == len(centres)
        for c, may in zip(centres, verdicts):
            if not may:
                seen["skipped"] += 1
                places = [(x, y, 0.0) for x, y in around(c, STEP_MM, ROUND_REACH_MM)]
                assert self.first_free(places, text, size_pt, protected) is None, (text, c)
            else:
                seen["kept"] += 1
        yield from verdicts

    may_find = PlateLabeller._may_find

    def checked_find(self, els, small, text, size_pt, lines):
        found = may_find(self, els, small, text, size_pt, lines)
        if not found:   # then the one-by-one search finds no place with these lines, nor with more
            seen["levels skipped"] = seen.get("levels skipped", 0) + 1
            for el in els:
                assert self.first_free(points_along(el, midpoint(el), reach_mm=1e4), text, size_pt, lines) is None
            for el in small:
                for c in points_along(el, midpoint(el), step_mm=ROUND_STEP_MM, reach_mm=1e4):
                    places = [(x, y, 0.0) for x, y in around(c, STEP_MM, ROUND_REACH_MM)]
                    assert self.first_free(places, text, size_pt, lines) is None, (text, c)
        return found

    monkeypatch.setattr(PlateLabeller, "_may_be_free", checked)
    monkeypatch.setattr(PlateLabeller, "_may_find", checked_find)
    monkeypatch.setattr(kit, "_NAMELESS", {})   # drawn afresh, not taken from an earlier test's kits
    recipe = validate_recipe({"latitude": latitude, "language": language, "sheet": "a5", "epoch": 2027})
    with speaking(language, None):
        kit.build_kit(recipe)
    assert seen["skipped"] > 0   # the search reached the small circle, and points were skipped
    assert seen.get("levels skipped", 0) > 0   # and searches were left out as finding nothing


@pytest.mark.parametrize("latitude, language, sheet", [(45.0, "en", "a5"), (-33.9, "es", "a4"), (0.4, "fr", "letter"),
                                                       (66.0, "ru", "a4")])
def test_the_farther_search_skips_only_places_found_not_free(monkeypatch, latitude, language, sheet):
    # An almucantar's number sought farther along its circle skips the
    # places its nearer search found not free with the same lines
    # (first_free's ``unfree``).  Reference: the plate drawn with every
    # place tested again, as before: the same elements, value for value.
    recipe = validate_recipe({"epoch": 2027, "latitude": latitude, "language": language, "sheet": sheet})
    with speaking(recipe.language, None):
        reuse.let_go()
        kept = kit.draw_plates(recipe)
        reuse.let_go()   # drawn again, not taken from the kept parts
        first_free = PlateLabeller.first_free
        asked = {"with a set": 0}

        def every_place(self, candidates, text, size_pt, protected, near=None, unfree=None):
            asked["with a set"] += unfree is not None
            return first_free(self, candidates, text, size_pt, protected, near)

        monkeypatch.setattr(PlateLabeller, "first_free", every_place)
        fresh = kit.draw_plates(recipe)
        reuse.let_go()
    assert asked["with a set"] > 0
    for key, part in kept.items():
        assert [(e.role, e.geom, e.values) for e in fresh[key].elements] == \
            [(e.role, e.geom, e.values) for e in part.elements]


@pytest.mark.parametrize("latitude, language, sheet", [(23.0, "el", "a4"), (0.5, "fr", "a4"), (-33.9, "en", "a5")])
def test_a_place_clear_of_every_line_has_no_thin_line_through_it(monkeypatch, latitude, language, sheet):
    # A curve's name is screened for a place clear of every line only
    # where no thin line (almucantar, azimuth, unequal hour) crosses the
    # place grown by MARGIN_MM + 0.3 (PlateLabeller._name_place).  Its
    # premise, checked with the exact tests (Room.clear_of, Room.meets)
    # on every place the search looks at: a place CLEAR_MM from every
    # line has no thin line within MARGIN_MM + 0.3.
    seen = {"clear": 0}
    name_place = PlateLabeller._name_place

    def checked(self, places, idx, lines, best, named_clear=CLEAR_MM):
        _, protected, _, thin = lines
        for k in idx.tolist():
            box = places.box(k)
            if self.room.clear_of(box, protected, CLEAR_MM):
                seen["clear"] += 1
                assert not any(self.room.meets(el, box, MARGIN_MM + 0.3) for el in thin)
        return name_place(self, places, idx, lines, best, named_clear)

    monkeypatch.setattr(PlateLabeller, "_name_place", checked)
    recipe = validate_recipe({"epoch": 2027, "latitude": latitude, "language": language, "sheet": sheet})
    with speaking(recipe.language, None):
        reuse.let_go()
        kit.draw_plates(recipe)
        reuse.let_go()
    assert seen["clear"] > 0
