"""The twilights that last all night round midsummer (#12 review: at
59.9 N the Sun's point never reaches the plate's -18 deg line from late
April to August, and the instructions said to read its end there).

References:
- Skyfield 1.4x with JPL's DE421 (from the skyfield-data package, no
  download): the Sun's geometric altitude (no refraction, the plate's
  lines being of the true altitude) through each night, at longitude 0,
  sampled every 5 minutes from 20:00 to 04:00 UT; its lowest is the
  night's deepest twilight.
- Astronomical twilight ends where the Sun is 18 deg below the horizon,
  nautical 12 deg, civil 6 deg (common practice, as almanacs define them).
"""

from __future__ import annotations

import datetime as dt

import numpy as np
import pytest
from skyfield.api import wgs84

from kitgen.kit import build_kit
from kitgen.layout.instructions import sunrise_blocks
from kitgen.recipe.load import validate_recipe

from .skyfield_reference import ephemeris

#: (latitude, twilights drawn): north and south, each line reached all year or not.
SITES = ((59.9, ["astronomical"]), (52.0, ["astronomical"]), (55.8, ["civil", "nautical", "astronomical"]),
         (-55.0, ["nautical", "astronomical"]), (63.4, ["civil", "nautical"]))
#: The calendar gives the Sun's place at noon: a date at a run's ends may go either way.
EDGE_DAYS = 1


def _kit(latitude_deg, twilight, language="en"):
    return build_kit(validate_recipe({"latitude": latitude_deg, "epoch": 2027, "twilight": twilight,
                                      "language": language}))


def _lowest_deg(latitude_deg: float, date: dt.date) -> float:
    """The Sun's lowest geometric altitude in the night after ``date``
    (Skyfield, DE421)."""
    ts, eph = ephemeris()
    site = eph["earth"] + wgs84.latlon(latitude_deg, 0.0)
    start = dt.datetime(date.year, date.month, date.day, 20, tzinfo=dt.timezone.utc)
    t = ts.from_datetimes([start + dt.timedelta(minutes=5 * k) for k in range(97)])
    alt, _, _ = site.at(t).observe(eph["sun"]).apparent().altaz()
    return float(np.min(alt.degrees))


def _nights(first, last):
    """The dates from ``first`` to ``last`` ((month, day) in 2027), over
    the turn of the year where ``last`` comes first."""
    a = dt.date(2027, *first)
    b = dt.date(2027 if last >= first else 2028, *last)
    return [a + dt.timedelta(days=k) for k in range((b - a).days + 1)]


@pytest.mark.parametrize("latitude_deg, twilight", SITES)
def test_dates_against_skyfield(latitude_deg, twilight):
    """Every night inside the printed run stays above the line, and the
    nights a few days outside it go below (Skyfield), each to a day."""
    kit = _kit(latitude_deg, twilight)
    assert kit.plan.all_night, "each site has a line some nights never reach"
    for night in kit.plan.all_night:
        inside = _nights(night.first, night.last)
        for date in inside[EDGE_DAYS:len(inside) - EDGE_DAYS:3]:
            assert _lowest_deg(latitude_deg, date) > night.altitude_deg, date
        for date in (inside[0] - dt.timedelta(days=EDGE_DAYS + 2), inside[-1] + dt.timedelta(days=EDGE_DAYS + 2)):
            assert _lowest_deg(latitude_deg, date) < night.altitude_deg, date


def test_lines_reached_every_night_are_not_named():
    """At 45 N every night reaches -18 deg (the Sun's midnight depth at
    midsummer is 90 - 45 - 23.4 = 21.6 deg): nothing is said."""
    kit = _kit(45.0, ["astronomical"])
    assert kit.plan.all_night == ()
    text = " ".join(b.text for b in sunrise_blocks(kit))
    assert "never reaches" not in text


@pytest.mark.parametrize("language", ("en", "ru", "ar", "de"))
def test_the_sunrise_steps_give_the_dates(language):
    """The sunrise steps name each such line and its dates, in the kit's language."""
    kit = _kit(59.9, ["astronomical"], language)
    w = kit.words
    (night,) = kit.plan.all_night
    text = " ".join(b.text for b in sunrise_blocks(kit))
    line = w("plate.line_twilight_short", altitude="\u2212" + w.number(18))
    assert text.count(line) >= 2   # the lines read as the horizon, and the one never reached
    for month, day in (night.first, night.last):
        assert w.number(day) in text and w.items("calendar.months")[month - 1][:3].lower() in text.lower()
