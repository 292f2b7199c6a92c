"""Near the equator the glossary does not say that a summer hour is
longer than a winter one (#12 review: a Spanish kit at 0.2 S said so,
where its own unequal hours' example gave an hour of 60 minutes).

Reference: Skyfield 1.4x with JPL's DE421 (from the skyfield-data
package, no download): ``almanac.find_risings`` / ``find_settings`` with
``horizon_degrees=-0.8333`` give each day's length; the unequal hour is
a twelfth of it (common practice), so the hours of the longest and the
shortest day differ by a twelfth of their days' difference.
"""

from __future__ import annotations

import numpy as np
import pytest
from skyfield import almanac as sf_almanac
from skyfield.api import wgs84

from kitgen.kit import build_kit
from kitgen.layout.instructions import DAYS_ALIKE_MIN, glossary_blocks
from kitgen.recipe.load import validate_recipe

from .skyfield_reference import ephemeris


def _day_lengths_min(latitude_deg: float) -> np.ndarray:
    """The day's length (minutes) on each day of 2027 at longitude 0
    (Skyfield, DE421)."""
    ts, eph = ephemeris()
    observer = eph["earth"] + wgs84.latlon(latitude_deg, 0.0)
    t0, t1 = ts.utc(2027, 1, 1), ts.utc(2028, 1, 1)
    rises, r_ok = sf_almanac.find_risings(observer, eph["sun"], t0, t1, horizon_degrees=-0.8333)
    sets, s_ok = sf_almanac.find_settings(observer, eph["sun"], t0, t1, horizon_degrees=-0.8333)
    rises, sets = np.asarray(rises.tt)[r_ok], np.asarray(sets.tt)[s_ok]
    return np.asarray([(sets[sets > r][0] - r) * 1440.0 for r in rises if (sets > r).any()])


@pytest.mark.parametrize("latitude_deg, language", [(0.2, "es"), (-2.0, "en"), (6.0, "pt"), (-8.0, "fr"),
                                                    (40.4, "es")])
def test_the_glossary_says_how_the_hours_change_here(latitude_deg, language):
    lengths = _day_lengths_min(latitude_deg)
    alike = lengths.max() - lengths.min() < DAYS_ALIKE_MIN
    kit = build_kit(validate_recipe({"latitude": latitude_deg, "epoch": 2027, "language": language}))
    glossary = [b.text for b in glossary_blocks(kit)]
    equator = kit.words("instructions.glossary_unequal_equator")
    term = equator.split(":")[0]
    (item,) = [t for t in glossary if t.split(":")[0] == term]
    assert (item == equator) == alike, (latitude_deg, lengths.max() - lengths.min())
    assert alike == (abs(latitude_deg) < 3.0)   # the sites chosen well inside or outside the band
