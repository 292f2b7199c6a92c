"""The plate's last search for an almucantar's number (all round a small
circle near the zenith, every place on a grid round each point) skips the
points whose every place surely meets a line, found many places at once
(kitgen.parts.plate_labels.PlateLabeller._may_be_free, #12).  Checked
against the one-by-one search it stands in for (first_free, whose tests
test_screen_against_shapely checks against GEOS): wherever a point is
skipped, the one-by-one search finds no place there either.  The kits are
crowded A5 plates, where the search reaches that far (the case it was
made for: the 80 degree circle at 45 N)."""

from __future__ import annotations

import pytest

from kitgen import kit
from kitgen.errors import speaking
from kitgen.parts.plate_labels import PlateLabeller, around
from kitgen.recipe.load import validate_recipe


@pytest.mark.parametrize("latitude, language", [(45.0, "en"), (40.0, "de"), (-60.0, "ru")])
def test_a_point_skipped_has_no_free_place(monkeypatch, latitude, language):
    seen = {"skipped": 0, "kept": 0}
    screened = PlateLabeller._may_be_free

    def checked(self, centres, step_mm, reach_mm, text, size_pt, protected):
        verdicts = list(screened(self, centres, step_mm, reach_mm, text, size_pt, protected))
        assert len(verdicts) == len(centres)
        for c, may in zip(centres, verdicts):
            if not may:
                seen["skipped"] += 1
                places = [(x, y, 0.0) for x, y in around(c, step_mm, reach_mm)]
                assert self.first_free(places, text, size_pt, protected) is None, (text, c)
            else:
                seen["kept"] += 1
        yield from verdicts

    monkeypatch.setattr(PlateLabeller, "_may_be_free", checked)
    monkeypatch.setattr(kit, "_NAMELESS", {})   # drawn afresh, not taken from an earlier test's kits
    recipe = validate_recipe({"latitude": latitude, "language": language, "sheet": "a5", "epoch": 2027})
    with speaking(language, None):
        kit.build_kit(recipe)
    assert seen["skipped"] > 0   # the search reached the small circle, and points were skipped
