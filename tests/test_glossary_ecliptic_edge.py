"""The glossary says which edge of the rete's zodiac band is the ecliptic
(a teacher's look: a pupil reading the Sun's place on the band's inner
edge errs by the band's width, 5 mm on an A4 rete), and the rete draws it
so: the ecliptic is the band's outer circle, drawn heavier than its
inner one, and every degree tick starts on it and runs inwards.

References: the rete's ecliptic is the circle of the ecliptic's
stereographic image (Snyder, "Map Projections: A Working Manual", USGS
PP 1395, eq. 21-4, the projection kitgen draws); that it is the band's
outer, ticked edge is kitgen's own drawing rule (common practice on
astrolabes, no source).
"""

from __future__ import annotations

import math

import pytest

from kitgen.geometry.style import stroke_width_mm
from kitgen.kit import build_kit
from kitgen.layout.instructions import glossary_blocks
from kitgen.recipe.load import validate_recipe


@pytest.mark.parametrize("recipe", [
    {"latitude": 51.5, "language": "en"},
    {"latitude": -34.6, "language": "es", "sheet": "a5"},
    {"latitude": 24.7, "language": "ar", "sheet": "letter"},
])
def test_the_ecliptic_is_the_bands_outer_ticked_edge(recipe):
    kit = build_kit(validate_recipe(dict(recipe, epoch=2027)))
    rete = next(p for p in kit.parts if p.kind == "rete")
    ecliptic = [e for e in rete.elements if e.role == "ecliptic"]   # a circle, or arcs broken around words
    (band,) = [e for e in rete.elements if e.role == "ecliptic_band"]
    drawn = {(e.geom["center"], e.geom["radius"]) for e in ecliptic}
    assert drawn == {(band.geom["center"], ecliptic[0].geom["radius"])}
    ecliptic = ecliptic[0]
    r_ecl, r_band = ecliptic.geom["radius"], band.geom["radius"]
    # The ecliptic's image: through the points of declination +eps and
    # -eps on opposite sides of the pole, at R tan(45 deg -+ eps/2) from it
    # (Snyder eq. 21-4), so its radius is R / cos(eps) and its centre
    # R tan(eps) from the pole, R the equator's radius.
    eps = kit.sky.obliquity_rad
    big_r = kit.dims.equator_radius_mm
    assert r_ecl == pytest.approx(big_r / math.cos(eps), abs=1e-6)
    assert math.hypot(*ecliptic.geom["center"]) == pytest.approx(big_r * math.tan(eps), abs=1e-6)
    assert r_ecl - r_band > 2.0   # the band's width, inside the ecliptic
    assert stroke_width_mm(ecliptic.stroke, kit.dims) > stroke_width_mm(band.stroke, kit.dims)
    cx, cy = ecliptic.geom["center"]
    ticks = [e for e in rete.elements if e.role == "ecliptic_tick"]
    assert len(ticks) == 360
    on_edge = 0
    for tick in ticks:   # each from its point of the ecliptic inwards (shortened where a star's dot lies on it)
        assert math.dist(tick.values["at"], (cx, cy)) == pytest.approx(r_ecl, abs=1e-6)
        start = math.dist(tick.geom["from"], (cx, cy))
        tip = math.dist(tick.geom["to"], (cx, cy))
        assert r_band - 1e-6 <= tip < start <= r_ecl + 1e-6
        on_edge += start == pytest.approx(r_ecl, abs=1e-6)
    assert on_edge >= 350
    # the glossary's ecliptic item says so, in the kit's own words
    said = kit.words.items("instructions.glossary")[9]
    item = next(b.text for b in glossary_blocks(kit) if b.text.startswith(said[:20]))
    assert item == said
    if recipe["language"] == "en":
        assert "On the rete the ecliptic is the outer, heavier edge of the zodiac band, where the degree ticks start" in item
