"""The worksheet (#10, ``worksheet: true``): its answers against what
tests/reading.py reads from the exported geometry, against Skyfield with
DE421 (the skyfield-data copy, nothing downloaded) and the IANA zone rules
(zoneinfo), and the answer key on a page of its own (read back with pypdf).
"""

from __future__ import annotations

import datetime as dt
import io
import zoneinfo

import pypdf
import pytest

from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text
from kitgen.render.json_export import geometry_dict
from kitgen.render.pdf import build_pdf

from .reading import read_time
from .skyfield_reference import ephemeris
from .test_clock_on_kit import ring_correction_min

LAT, LON, TZ, EPOCH = 45.76, 4.84, "Europe/Paris", 2027
RECIPE = f"latitude: {LAT}\nlongitude: {LON}\ntimezone: {TZ}\nepoch: {EPOCH}\nworksheet: true\n"


@pytest.fixture(scope="module")
def kit():
    return build_kit(parse_recipe_text(RECIPE))


def _answers(kit) -> dict:
    return {q.kind: dict(q.values) for q in kit.plan.worksheet}


def _site():
    from skyfield.api import wgs84

    ts, eph = ephemeris()
    return ts, eph, eph["earth"] + wgs84.latlon(LAT, LON)


def _crossing_zone_hours(body, day: dt.date, altitude_deg: float, rising: bool, start_h: float, end_h: float):
    """Zone clock time (hours) on ``day`` at which ``body`` (unrefracted)
    crosses ``altitude_deg`` between ``start_h`` and ``end_h`` of UT."""
    ts, eph, site = _site()
    base = dt.datetime(day.year, day.month, day.day, tzinfo=dt.timezone.utc)

    def f(h):
        t = ts.from_datetime(base + dt.timedelta(hours=h))
        return site.at(t).observe(body).apparent().altaz()[0].degrees - altitude_deg

    grid = [start_h + k * 0.25 for k in range(int((end_h - start_h) / 0.25) + 1)]
    lo, hi = next((a, b) for a, b in zip(grid, grid[1:]) if f(a) * f(b) < 0 and (f(b) > f(a)) == rising)
    for _ in range(40):
        mid = (lo + hi) / 2
        if f(mid) * f(lo) <= 0:
            hi = mid
        else:
            lo = mid
    local = (base + dt.timedelta(hours=(lo + hi) / 2)).astimezone(zoneinfo.ZoneInfo(TZ))
    return local.hour + local.minute / 60 + local.second / 3600


def _apart_min(a_h, b_h):
    return abs((a_h - b_h + 12) % 24 - 12) * 60


def test_six_to_ten_questions(kit):
    assert 6 <= len(kit.plan.worksheet) <= 10
    assert {"noon_altitude", "sunrise", "afternoon", "height", "star_rise"} <= set(_answers(kit))


def test_afternoon_time_as_the_kit_reads_it_and_de421(kit):
    a = _answers(kit)["afternoon"]
    geom = geometry_dict(kit)
    solar = read_time(geom, a["month"], a["day"], a["altitude_deg"], False)
    assert _apart_min(solar, a["solar_hours"]) < 1.0
    assert ring_correction_min(geom, a["month"], a["day"]) == a["correction_min"]
    _, eph, _ = _site()
    truth = _crossing_zone_hours(eph["sun"], dt.date(EPOCH, a["month"], a["day"]), a["altitude_deg"], False,
                                 12.0, 21.0)
    assert _apart_min(a["solar_hours"] + a["correction_min"] / 60, truth) < 2.0


def test_noon_altitude_against_de421(kit):
    """The Sun's greatest altitude that day (DE421, unrefracted) within 0.05 deg."""
    a = _answers(kit)["noon_altitude"]
    ts, eph, site = _site()
    base = dt.datetime(EPOCH, a["month"], a["day"], tzinfo=dt.timezone.utc)
    noon_ut = 12.0 - LON / 15.0
    best = max(site.at(ts.from_datetime(base + dt.timedelta(hours=noon_ut + k / 60))).observe(eph["sun"])
               .apparent().altaz()[0].degrees for k in range(-30, 31))
    assert abs(best - a["altitude_deg"]) < 0.05


def test_sunrise_and_day_length_against_de421(kit):
    """Sunrise on the astrolabe's horizon (the Sun's centre at 0 deg, no
    refraction, as the answer says) in zone time within 2 minutes; the
    day's length within 2 minutes."""
    a = _answers(kit)["sunrise"]
    _, eph, _ = _site()
    day = dt.date(EPOCH, a["month"], a["day"])
    rise = _crossing_zone_hours(eph["sun"], day, 0.0, True, 0.0, 12.0)
    setting = _crossing_zone_hours(eph["sun"], day, 0.0, False, 12.0, 23.5)
    assert _apart_min(a["solar_hours"] + a["correction_min"] / 60, rise) < 2.0
    assert abs(a["day_length_hours"] - (setting - rise)) * 60 < 2.0


def test_star_rise_against_de421(kit):
    """The star's rising (its catalogue place, proper motion applied by
    Skyfield, unrefracted) in zone time within 3 minutes: the kit reads
    the evening with the calendar's Sun of that noon, some hours old, which
    costs up to about 2 minutes (see kitgen check), and the printed
    correction is rounded to the minute."""
    from skyfield.api import Star

    a = _answers(kit)["star_rise"]
    st = kit.sky.stars[a["star_index"]].star
    star = Star(ra_hours=st.ra_deg / 15.0, dec_degrees=st.dec_deg, ra_mas_per_year=st.pm_ra_cosdec_mas_yr,
                dec_mas_per_year=st.pm_dec_mas_yr)
    truth = _crossing_zone_hours(star, dt.date(EPOCH, a["month"], a["day"]), 0.0, True, 14.0, 24.0)
    assert _apart_min(a["solar_hours"] + a["correction_min"] / 60, truth) < 3.0


def test_longest_day_against_de421(kit):
    """The date of the greatest noon altitude by DE421, within a day."""
    a = _answers(kit)["longest_day"]
    ts, eph, site = _site()

    def noon_alt(day):
        t = ts.utc(EPOCH, 6, day, 12.0 - LON / 15.0)
        return site.at(t).observe(eph["sun"]).apparent().altaz()[0].degrees

    best = max(range(15, 28), key=noon_alt)
    assert a["month"] == 6 and abs(a["day"] - best) <= 1


def test_answer_key_on_a_page_of_its_own(kit):
    w = kit.words
    _, data = build_pdf(kit)
    pages = [p.extract_text() for p in pypdf.PdfReader(io.BytesIO(data)).pages]
    key_heading = w("worksheet.key_heading", place="", year=w.number(EPOCH)).split(":")[0]
    sheet_heading = w("worksheet.heading", place="", year=w.number(EPOCH)).split(":")[0]
    key_pages = [k for k, t in enumerate(pages) if key_heading in t]
    sheet_pages = [k for k, t in enumerate(pages) if sheet_heading in t]
    assert len(key_pages) == 1 and sheet_pages and key_pages[0] not in sheet_pages
    height = _answers(kit)["height"]
    # The key's page holds the answers and no question.
    assert w.number(height["height_m"], 1) in pages[key_pages[0]]
    assert "?" not in pages[key_pages[0]]
    # The pupil's sheet has a line for the name; the teacher's key has none.
    name_label = w("worksheet.name_line").split(":")[0]
    assert name_label in pages[sheet_pages[0]] and name_label not in pages[key_pages[0]]


def test_no_worksheet_unless_asked():
    kit = build_kit(parse_recipe_text(f"latitude: {LAT}\nepoch: {EPOCH}\n"))
    assert kit.plan.worksheet == ()


# Sites between the tropics (real latitudes, invented schools), and one
# beyond them in the south.
TROPICAL_SITES = [(12.97, 77.59, "Asia/Kolkata", "en"), (-1.29, 36.82, "Africa/Nairobi", "fr"),
                  (-19.92, -43.94, "America/Sao_Paulo", "pt"), (22.9, 72.6, "Asia/Kolkata", "hi")]


def _site_kit(lat, lon, tz, language):
    return build_kit(parse_recipe_text(f"latitude: {lat}\nlongitude: {lon}\ntimezone: {tz}\nepoch: {EPOCH}\n"
                                       f"language: {language}\nworksheet: true\n"))


def _de421_noon_declination_deg(lon):
    """(dates, the Sun's apparent geocentric declination at local mean
    noon, degrees) for every day of EPOCH, by DE421."""
    import numpy as np

    ts, eph = ephemeris()
    dates = [dt.date(EPOCH, 1, 1) + dt.timedelta(days=k) for k in range((dt.date(EPOCH + 1, 1, 1)
                                                                       - dt.date(EPOCH, 1, 1)).days)]
    t = ts.utc(EPOCH, 1, 1 + np.arange(len(dates)), 12.0 - lon / 15.0)
    return dates, eph["earth"].at(t).observe(eph["sun"]).apparent().radec(epoch="date")[1].degrees


@pytest.mark.parametrize("lat, lon, tz, language", TROPICAL_SITES)
def test_between_the_tropics_the_overhead_sun_dates_against_de421(lat, lon, tz, language):
    """Between the tropics the Sun is highest at noon, in the zenith, on two
    dates, when its declination equals the latitude (Smart 1977, ch. II):
    those of DE421 (the day of each sign change of declination - latitude,
    the nearer noon) within a day.  The key in the kit's words carries
    both dates as CLDR writes them (Babel's format_skeleton)."""
    from babel.dates import format_skeleton

    from kitgen.layout.instructions import worksheet_blocks

    kit = _site_kit(lat, lon, tz, language)
    a = _answers(kit)
    assert "longest_day" not in a
    z = a["zenith_days"]
    dates, dec = _de421_noon_declination_deg(lon)
    gap = dec - lat
    truth = [dates[k] if abs(gap[k]) <= abs(gap[k + 1]) else dates[k + 1]
             for k in range(len(dates) - 1) if (gap[k] < 0) != (gap[k + 1] < 0)]
    assert len(truth) == 2
    got = sorted(dt.date(EPOCH, m, d) for m, d in ((z["month"], z["day"]), (z["month2"], z["day2"])))
    assert all(abs((g - t).days) <= 1 for g, t in zip(got, sorted(truth)))
    text = " ".join(b.text for b in worksheet_blocks(kit))
    for g in got:
        assert format_skeleton("MMMMd", g, locale=kit.words.language.replace("-", "_")) in text


@pytest.mark.parametrize("lat, lon, tz, month", [(-33.93, 18.42, "Africa/Johannesburg", 12),
                                                 (23.9, 90.4, "Asia/Dhaka", 6)])
def test_beyond_the_tropics_the_longest_day_against_de421(lat, lon, tz, month):
    """Beyond the tropics (here just beyond the northern one, and in the
    south) the Sun is highest at noon on the date DE421 gives the greatest
    apparent declination toward the site's pole, within a day."""
    kit = _site_kit(lat, lon, tz, "en")
    a = _answers(kit)
    assert "zenith_days" not in a
    dates, dec = _de421_noon_declination_deg(lon)
    best = dates[int((dec if lat > 0 else -dec).argmax())]
    assert a["longest_day"]["month"] == month == best.month and abs(a["longest_day"]["day"] - best.day) <= 1


@pytest.mark.parametrize("language", ["es", "de", "ru", "fr"])
def test_a_kit_without_a_place_names_its_latitude_as_a_title(language):
    # Common practice: a heading names its subject in the nominative,
    # without the article or preposition a sentence gives it ("Hoja de
    # trabajo: latitud 0,2° S", not "la latitud"; "Breite", not "der
    # Breite"; "широта", not "на широте").
    from kitgen.layout.instructions import worksheet_blocks
    from kitgen.recipe.load import validate_recipe
    from kitgen.words.templates import load_words

    kit = build_kit(validate_recipe({"language": language, "latitude": -0.2, "worksheet": True, "epoch": 2027}))
    w = load_words(language)
    sentence = w.template("almanac.place_latitude").split("{value}")[0].strip()
    title = w.template("almanac.place_latitude_title").split("{value}")[0].strip()
    assert sentence != title
    headings = [b.text for b in worksheet_blocks(kit) if b.kind == "heading"]
    assert len(headings) == 2
    for heading in headings:
        assert f": {title} " in heading.replace("\u00a0", " ") and (sentence == title or sentence not in heading)


@pytest.mark.parametrize("language, sheet", [("en", "a5"), ("ar", "a4"), ("hi", "letter")])
def test_each_question_has_a_line_to_write_on(language, sheet):
    # Common practice for a class worksheet: room to write each answer
    # under its question; the teacher's key has none.  The line runs to
    # the column's end (measured by the words layer's own shaping, within
    # one low line's width) and stays on its question's page.
    from kitgen.layout.pages import instructions_split, layout_kit, page_content_mm
    from kitgen.recipe.load import validate_recipe

    kit = build_kit(validate_recipe({"language": language, "sheet": sheet, "latitude": 40.4, "worksheet": True,
                                     "epoch": 2027}))
    pages = layout_kit(kit)
    label = kit.words("worksheet.answer_label")
    text_pages = [p for p in pages if p.kind == "instructions"]
    x0, _, x1, _ = page_content_mm(text_pages[0])
    answers = [(p, ln) for p in text_pages for ln in p.lines if ln.text.startswith(label) and "_" in ln.text]
    questions = len(kit.plan.worksheet)
    assert len(answers) == questions >= 6
    for _, ln in answers:
        width_mm, low_line_mm = _set_width_mm(kit, ln, ln.text), _set_width_mm(kit, ln, "_")
        indent_mm = abs(ln.x_mm - (x1 if kit.words.rtl else x0))
        assert x1 - x0 - indent_mm - low_line_mm <= width_mm <= x1 - x0 - indent_mm + 1e-6
    size_pt, chunks = instructions_split(kit, pages)
    for chunk in chunks:
        kinds = [b.kind for b in chunk]
        assert kinds[:1] != ["answer"]   # never an answer's line alone at a page's top
    key = [p for p in text_pages if any(ln.text.startswith(kit.words("worksheet.key_heading", place="", year="")
                                                                  .split(":")[0]) for ln in p.lines)]
    assert key and not any(ln.text.startswith(label) for p in key for ln in p.lines)


#: The parts of each answer a pupil writes (common practice: a line to
#: write on for each part): the zenith question asks for two dates, the
#: sunrise question for a time and the day's length, the height question
#: for its working and the height; every other question for one thing.
PARTS = {"zenith_days": 2, "sunrise": 2, "height": 2}


@pytest.mark.parametrize("language, sheet, latitude", [("en", "a5", 10.0), ("ar", "a4", -23.0), ("de", "letter", 48.1)])
def test_a_line_to_write_on_for_each_part_of_an_answer(language, sheet, latitude):
    """Under each question, its labelled line, then a further line for each
    further part it asks for (a blank alone, as wide as the column), all on
    the question's page."""
    from kitgen.layout.pages import layout_kit, page_content_mm
    from kitgen.recipe.load import validate_recipe

    kit = build_kit(validate_recipe({"language": language, "sheet": sheet, "latitude": latitude, "worksheet": True,
                                     "epoch": 2027}))
    label = kit.words("worksheet.answer_label")
    pages = [p for p in layout_kit(kit) if p.kind == "instructions"]
    lines = [(k, ln.text) for k, p in enumerate(pages) for ln in p.lines]
    answer = next(ln for p in pages for ln in p.lines if ln.text.startswith(label))
    x0, _, x1, _ = page_content_mm(pages[0])
    column_mm = x1 - x0 - abs(answer.x_mm - (x1 if kit.words.rtl else x0))
    starts = [i for i, (_, text) in enumerate(lines) if text.startswith(label) and "_" in text]
    questions = kit.plan.worksheet
    assert len(starts) == len(questions) >= 6 and any(q.kind in PARTS for q in questions)
    for i, q in zip(starts, questions):
        blanks = 0
        while i + 1 + blanks < len(lines) and set(lines[i + 1 + blanks][1]) == {"_"}:
            blanks += 1
        assert 1 + blanks == PARTS.get(q.kind, 1), q.kind
        assert len({page for page, _ in lines[i:i + 1 + blanks]}) == 1
        for _, text in lines[i + 1:i + 1 + blanks]:   # the column's width, within one low line
            width_mm = _set_width_mm(kit, answer, text)
            assert width_mm <= column_mm < width_mm + _set_width_mm(kit, answer, "_")


def _set_width_mm(kit, line, text: str) -> float:
    """The width (mm) of ``text`` set in a laid-out line's style and size,
    by the words layer's own shaping (25.4 mm to 72 pt)."""
    from kitgen.words.shaping import set_line

    return set_line(text, kit.words.script, line.style, kit.words.rtl).width_em * line.size_pt * 25.4 / 72
