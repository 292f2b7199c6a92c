"""The sunrise table's day lengths as a reader checks them: sunset's
printed minute less sunrise's gives the printed length (each time is
rounded on its own; common practice in almanacs), and that length stays
within a minute of the computed one, which test_clock_against_skyfield
checks against DE421.  Sites: real latitudes and zones, both hemispheres,
a zone far from its meridian, local mean time, and near the polar circle.
"""

from __future__ import annotations

import pytest

from kitgen.sky.site_almanac import almanac_for_site

SITES = [(51.5, -0.1, "Europe/London"), (-33.9, 18.4, "Africa/Johannesburg"), (43.3, -8.4, "Europe/Madrid"),
         (0.5, 32.6, "Africa/Kampala"), (65.8, 24.1, "Europe/Helsinki"), (-45.9, 170.5, "Pacific/Auckland"),
         (48.2, None, None)]


def _minutes(hh_mm: str) -> int:
    h, m = hh_mm.split(":")
    return int(h) * 60 + int(m)


@pytest.mark.parametrize("lat, lon, tz", SITES)
def test_printed_length_is_printed_sunset_less_sunrise(lat, lon, tz):
    rows = [r for r in almanac_for_site(2027, lat, lon, tz).sun_rise_set if r.reason is None]
    assert rows
    for r in rows:
        assert (_minutes(r.set) - _minutes(r.rise)) % 1440 == r.day_length_whole_min
        assert abs(r.day_length_whole_min - r.day_length_min) <= 1.0 + 1e-9
