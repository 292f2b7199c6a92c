"""``kitgen check`` (#10) against the independent simulation of
tests/reading.py and against Skyfield with DE421 (the skyfield-data copy,
nothing downloaded).

* kitgen.check.reading reads the same times from the parts as
  tests/reading.py reads from the exported JSON.
* The check's astronomical computation (the local apparent solar time at
  which the Sun, or a star, stands at an altitude) agrees with DE421.
* The command prints the check's figures, in the template's words, and a
  bad recipe is one line with exit status 2.
"""

from __future__ import annotations

import datetime as dt
import math

import pytest

from kitgen.check.accuracy import check_kit, star_truth_hours, sun_truth_hours
from kitgen.check.reading import KitReader
from kitgen.cli import main
from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text
from kitgen.render.json_export import geometry_dict

from .reading import read_time
from .skyfield_reference import ephemeris

RECIPE = "latitude: 40.42\nlongitude: -3.70\ntimezone: Europe/Madrid\nepoch: 2027\n"


@pytest.fixture(scope="module")
def kit():
    return build_kit(parse_recipe_text(RECIPE))


@pytest.mark.parametrize("month,day,alt,morning", [(1, 20, 15.0, True), (3, 21, 30.0, False), (6, 21, 60.0, True),
                                                   (9, 5, 45.0, False), (11, 30, 10.0, True)])
def test_check_reads_as_tests_reading_does(kit, month, day, alt, morning):
    """The check's own reader and tests/reading.py (from the JSON) agree."""
    geom = geometry_dict(kit)
    assert KitReader(kit).time_by_sun(month, day, alt, morning) == pytest.approx(
        read_time(geom, month, day, alt, morning), abs=1e-9)


def _de421_solar_hours(lat, lon, day: dt.date, body, altitude_deg, rising, evening=False):
    """Local apparent solar time (12 h + the Sun's hour angle, DE421) when
    ``body`` stands at ``altitude_deg`` (unrefracted), rising or setting."""
    from skyfield.api import wgs84

    ts, eph = ephemeris()
    site = eph["earth"] + wgs84.latlon(lat, lon)
    base = dt.datetime(day.year, day.month, day.day, tzinfo=dt.timezone.utc)
    noon_h = 12.0 - lon / 15.0

    def alt(hours):
        return site.at(ts.from_datetime(base + dt.timedelta(hours=hours))).observe(body).apparent().altaz()[0].degrees

    # Scan the half day (or the evening) for the crossing, then bisect.
    start = noon_h + (0.0 if evening else (-12.0 if rising else 0.0))
    grid = [start + k * 0.25 for k in range(49 if evening else 49)]
    for lo, hi in zip(grid, grid[1:]):
        f_lo, f_hi = alt(lo) - altitude_deg, alt(hi) - altitude_deg
        if f_lo * f_hi < 0 and (f_hi > f_lo) == rising:
            break
    else:
        return None
    for _ in range(40):
        mid = (lo + hi) / 2
        f_mid = alt(mid) - altitude_deg
        if f_mid * f_lo <= 0:
            hi = mid
        else:
            lo, f_lo = mid, f_mid
    t = ts.from_datetime(base + dt.timedelta(hours=(lo + hi) / 2))
    return (site.at(t).observe(eph["sun"]).apparent().hadec()[0].hours + 12.0) % 24.0


@pytest.mark.parametrize("month,day,alt,morning", [(1, 20, 15.0, True), (6, 21, 60.0, False), (10, 10, 30.0, True)])
def test_sun_truth_against_de421(month, day, alt, morning):
    """Meeus's Sun at the instant against DE421: within 0.1 minute."""
    lat, lon = 40.42, -3.70
    ours = sun_truth_hours(2027, month, day, math.radians(lat), lon, alt, morning)
    _, eph = ephemeris()
    theirs = _de421_solar_hours(lat, lon, dt.date(2027, month, day), eph["sun"], alt, morning)
    assert abs(ours - theirs) * 60 < 0.1


def test_star_truth_against_de421(kit):
    """A star of the rete at an altitude on an evening: the check's solar
    time against Skyfield's star (catalogue place, proper motion) and DE421's
    Sun, within 0.5 minute (the rete carries the mean place at the epoch)."""
    from skyfield.api import Star

    lat, lon = 40.42, -3.70
    checked = 0
    for placed in kit.sky.stars[:6]:
        st = placed.star
        star = Star(ra_hours=st.ra_deg / 15.0, dec_degrees=st.dec_deg, ra_mas_per_year=st.pm_ra_cosdec_mas_yr,
                    dec_mas_per_year=st.pm_dec_mas_yr)
        for month in (1, 4, 10, 12):
            for east in (True, False):
                ours = star_truth_hours(2027, month, 15, math.radians(lat), lon, placed.ra_deg, placed.dec_deg,
                                        40.0, east)
                if ours is None:
                    continue
                theirs = _de421_solar_hours(lat, lon, dt.date(2027, month, 15), star, 40.0, east, evening=True)
                if theirs is None:
                    continue
                assert abs((ours - theirs + 12) % 24 - 12) * 60 < 0.5, (st.name, month, east)
                checked += 1
    assert checked >= 4


def test_figures_and_the_command(kit, tmp_path, capsys):
    accuracy = check_kit(kit)
    # Read by the Sun with exact interpolation, the kit agrees with the
    # astronomy within a minute (#2's aim); rounding to the ticks costs more.
    assert accuracy.sun_exact.worst_min < 1.0
    assert accuracy.sun_graduated.worst_min >= accuracy.sun_exact.worst_min
    assert accuracy.star_exact is not None and accuracy.star_exact.count > 100
    assert accuracy.limiting_scale in ("calendar", "ecliptic", "hours")
    recipe = tmp_path / "r.yaml"
    recipe.write_text(RECIPE)
    code = main(["check", str(recipe)])
    out, err = capsys.readouterr()
    assert code == 0 and err == ""
    w = kit.words
    assert out.splitlines()[2] == w("check.exact", worst=w.number(accuracy.sun_exact.worst_min, 1),
                                    median=w.number(accuracy.sun_exact.median_min, 1))
    limit = dict(accuracy.by_scale)[accuracy.limiting_scale]
    assert out.splitlines()[-1] == w("check.limit", part=w("check.scale_" + accuracy.limiting_scale),
                                     worst=w.number(limit, 1))


def test_bad_recipe_is_one_line(tmp_path, capsys):
    code = main(["check", str(tmp_path / "missing.yaml")])
    out, err = capsys.readouterr()
    assert code == 2 and out == "" and len(err.strip().splitlines()) == 1 and "missing.yaml" in err


def test_size_for_a_target(kit):
    """The size found for a target reaches it, the size tried before it
    does not; and a target below half the hour ring's finest step (5 min,
    kitgen.parts.legibility) is out of reach at any size."""
    from dataclasses import replace

    from kitgen.check.accuracy import TRIED_DIAMETERS_MM, diameter_for_target
    from kitgen.kit import build_from_plan

    accuracy = check_kit(kit, stars=False)
    target = 5.0
    diameter = diameter_for_target(kit, accuracy, target, build_from_plan)
    assert diameter is not None
    bigger = check_kit(build_from_plan(replace(kit.plan, diameter_mm=diameter)), stars=False)
    assert bigger.sun_graduated.worst_min <= target
    before = [d for d in TRIED_DIAMETERS_MM if kit.plan.diameter_mm < d < diameter]
    if before:
        smaller = check_kit(build_from_plan(replace(kit.plan, diameter_mm=before[-1])), stars=False)
        assert smaller.sun_graduated.worst_min > target
    elif diameter != kit.plan.diameter_mm:
        assert accuracy.sun_graduated.worst_min > target
    assert diameter_for_target(kit, accuracy, 2.0, build_from_plan) is None


def test_bad_target_is_one_line(tmp_path, capsys):
    recipe = tmp_path / "r.yaml"
    recipe.write_text(RECIPE)
    code = main(["check", str(recipe), "--target", "soon"])
    out, err = capsys.readouterr()
    assert code == 2 and out == "" and len(err.strip().splitlines()) == 1 and "'soon'" in err


def test_accuracy_as_a_page_of_the_kit(tmp_path):
    """accuracy_page: true puts the report on a page of its own in the PDF
    (read back with pypdf), with the figures of kitgen check."""
    import io

    import pypdf

    from kitgen.render.pdf import build_pdf

    kit = build_kit(parse_recipe_text(RECIPE + "accuracy_page: true\n"))
    assert kit.accuracy == check_kit(kit)
    w = kit.words
    _, data = build_pdf(kit)
    pages = [" ".join(p.extract_text().split()) for p in pypdf.PdfReader(io.BytesIO(data)).pages]
    title = w("check.title", title=w("kit.default_title"), latitude="", year="").split(":")[0]
    found = [t for t in pages if title in t]
    assert len(found) == 1
    exact = w("check.exact", worst=w.number(kit.accuracy.sun_exact.worst_min, 1),
              median=w.number(kit.accuracy.sun_exact.median_min, 1)).strip()
    assert exact in found[0]
    assert build_kit(parse_recipe_text(RECIPE)).accuracy is None


def test_parts_the_reading_needs(tmp_path, capsys):
    """kitgen check reads the whole instrument whatever the recipe prints;
    an accuracy page in a kit without the parts a reading uses is refused
    in one line naming the key's line (the template's words)."""
    from kitgen.words.templates import load_words

    recipe = tmp_path / "r.yaml"
    recipe.write_text(RECIPE + "parts: [plate, rete]\n")
    assert main(["check", str(recipe)]) == 0
    capsys.readouterr()
    recipe.write_text(RECIPE + "parts: [plate, rete]\naccuracy_page: true\n")
    code = main(["build", str(recipe), "-o", str(tmp_path / "k.pdf")])
    out, err = capsys.readouterr()
    w = load_words("en")
    wanted = w("errors.accuracy_page_parts", parts="plate, rete, mater_front, mater_back",
               missing="mater_front, mater_back")
    assert code == 2 and len(err.strip().splitlines()) == 1 and wanted in err and "line 6" in err
    assert not (tmp_path / "k.pdf").exists()
