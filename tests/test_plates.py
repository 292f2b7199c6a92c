"""Several plates in one kit (#8): each plate against first principles and
against the sky, and the recipe's rules for ``plates:``.

References:
- Snyder, *Map Projections - A Working Manual*, USGS Professional Paper
  1395 (1987), ch. 21, polar stereographic: a point of declination delta
  lies rho = R tan((90 deg - delta) / 2) from the pole, R being the
  equator's radius on the part (Snyder's 2 R k0).  The almucantar of
  altitude a at latitude phi crosses the meridian at declinations
  phi - (90 - a) (upper meridian) and 180 - (phi + 90 - a) (lower
  meridian); its image is the circle through the two images (Snyder 1987,
  ch. 21: circles map to circles), so its centre and radius follow from
  rho alone.
- Skyfield with JPL's DE421 (tests/skyfield_reference.py) for the time a
  user reads with each plate (tests/reading.py).
"""

from __future__ import annotations

import datetime as dt
import json
import math

import pytest

from kitgen.cli import main
from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text
from kitgen.render.json_export import geometry_dict, render_json

from .reading import read_time
from .test_reading_against_de421 import _reference

TOL_MM = 0.01  # circles within 0.01 mm (issue #8)


def _rho(dec_deg: float, equator_mm: float) -> float:
    """Snyder 1987, eq. 21-33 with k0 = 1: distance from the pole."""
    return equator_mm * math.tan(math.radians(90.0 - dec_deg) / 2.0)


def _almucantar_circle(lat_deg: float, alt_deg: float, equator_mm: float) -> tuple[float, float]:
    """(centre y, radius) of the almucantar's image on the plate of a
    northern instrument (+y towards the upper meridian); a southern plate
    is its mirror image, with |latitude|."""
    phi = abs(lat_deg)
    y_upper = _rho(phi - (90.0 - alt_deg), equator_mm)
    y_lower = -_rho(180.0 - (phi + 90.0 - alt_deg), equator_mm)
    return (y_upper + y_lower) / 2.0, (y_upper - y_lower) / 2.0


def _equator_radius(geom, plate) -> float:
    return next(e["radius"] for e in plate["elements"] if e["role"] == "equator")


def _check_plate(geom, plate, lat_deg):
    R = _equator_radius(geom, plate)
    seen = 0
    for e in plate["elements"]:
        if e["role"] not in ("almucantar", "horizon") or e["shape"] not in ("circle", "arc"):
            continue
        cy, r = _almucantar_circle(lat_deg, e["altitude_deg"], R)
        assert abs(e["center"][0]) < TOL_MM, (lat_deg, e["altitude_deg"])
        assert abs(e["center"][1] - cy) < TOL_MM and abs(e["radius"] - r) < TOL_MM, (lat_deg, e["altitude_deg"])
        seen += 1
    assert seen >= 5, lat_deg  # the check ran on real circles
    # The tropics do not depend on the latitude: rho(+-eps) on every plate.
    tropics = sorted(e["radius"] for e in plate["elements"] if e["role"] == "tropic")
    decs = sorted(e["declination_deg"] for e in plate["elements"] if e["role"] == "tropic")
    sign = 1 if geom["plates"][0]["latitude_deg"] >= 0 and all(p["latitude_deg"] >= 0 for p in geom["plates"]) else -1
    want = sorted(_rho(sign * d, R) for d in decs)
    assert tropics and max(abs(a - b) for a, b in zip(tropics, want)) < TOL_MM, lat_deg


KITS = {
    "north": ("plates: [{latitude: 57.1, place: Northfield}, 45.8, {latitude: 36.4, place: Southbay}, 23.9]\n",
              [57.1, 45.8, 36.4, 23.9]),
    "south": ("plates: [-12.5, {latitude: -27.3, place: Lowmeadow}, -41.2]\n", [-12.5, -27.3, -41.2]),
    "equator": ("plates: [{latitude: 0, place: Midline}, 8.6]\n", [0.0, 8.6]),
    "equator-south": ("plates: [0, -8.6]\n", [0.0, -8.6]),
}


@pytest.fixture(scope="module")
def geometries():
    return {name: json.loads(render_json(build_kit(parse_recipe_text(text + "epoch: 2027\n"))))
            for name, (text, _) in KITS.items()}


@pytest.mark.parametrize("name", sorted(KITS))
def test_every_plate_matches_first_principles(geometries, name):
    geom = geometries[name]
    lats = KITS[name][1]
    assert geom["version"] == 3   # the contract documented in DEVELOPERS.md (#9)
    assert [p["latitude_deg"] for p in geom["plates"]] == pytest.approx(lats)
    plates = [p for p in geom["parts"] if p["kind"] == "plate"]
    assert [p["id"] for p in plates] == [f"plate-{k}" for k in range(1, len(lats) + 1)]
    assert [p["id"] for p in geom["plates"]] == [p["id"] for p in plates]
    for plate, lat in zip(plates, lats):
        assert plate["latitude_deg"] == pytest.approx(lat)
        _check_plate(geom, plate, lat)
    # One mater, one rete, one rule, one alidade for all the plates.
    kinds = [p["kind"] for p in geom["parts"]]
    assert all(kinds.count(k) == 1 for k in ("mater_front", "mater_back", "rete", "rule", "alidade"))
    assert len({p["id"] for p in geom["parts"]}) == len(geom["parts"])


# (kit, plate number, east longitude, local date, altitude, morning)
READINGS = [
    ("north", 1, -2.1, dt.date(2027, 6, 21), 35.0, True),
    ("north", 2, 6.2, dt.date(2027, 3, 3), 20.0, False),
    ("north", 3, -4.0, dt.date(2027, 9, 30), 30.0, True),
    ("north", 4, 12.5, dt.date(2027, 12, 15), 25.0, False),
    ("south", 1, 30.0, dt.date(2027, 2, 14), 40.0, True),
    ("south", 2, 150.0, dt.date(2027, 8, 1), 20.0, False),
    ("south", 3, -70.0, dt.date(2027, 11, 11), 35.0, True),
    ("equator", 1, 35.0, dt.date(2027, 4, 20), 45.0, False),
    ("equator", 2, -75.0, dt.date(2027, 10, 5), 30.0, True),
    ("equator-south", 1, 100.0, dt.date(2027, 1, 25), 50.0, True),
    ("equator-south", 2, 20.0, dt.date(2027, 7, 7), 25.0, False),
]


@pytest.mark.parametrize("name,number,lon,day,alt,morning", READINGS)
def test_time_read_with_each_plate_matches_de421(geometries, name, number, lon, day, alt, morning):
    geom = geometries[name]
    lat = KITS[name][1][number - 1]
    read_h = read_time(geom, day.month, day.day, alt, morning, plate_id=f"plate-{number}")
    true_h = _reference(lat, lon, day, alt, morning)
    error_min = abs((read_h - true_h + 12) % 24 - 12) * 60
    assert error_min < 1.0, f"read {read_h:.4f} h, truth {true_h:.4f} h: {error_min:.2f} min off"


def test_a_kit_of_plates_names_each_plate_apart():
    kit = build_kit(parse_recipe_text("plates: [{latitude: 50, place: Upton}, 40, 30]\nlanguage: de\n"))
    plates = kit.parts_of("plate")
    assert len({p.title for p in plates}) == 3
    labels = [[e.geom["text"] for e in p.elements if e.role == "plate_label"] for p in plates]
    assert any("Upton" in t for t in labels[0])
    assert geometry_dict(kit)["plates"][0] == {"id": "plate-1", "latitude_deg": 50.0, "place": "Upton"}


@pytest.mark.parametrize("text,key", [
    ("plates: [40, -30]\n", "plates_mixed"),
    ("plates: [40]\nlatitude: 40\n", "plates_and_latitude"),
    ("plates: [1, 2, 3, 4, 5, 6, 7, 8, 9]\n", "plates_too_many"),
    ("plates: []\n", "plates_not_list"),
    # a plate's place said as of the one-plate form's (the entry itself is right)
    ("plates: [{latitude: 45, place: \"A\\tB\"}, 50]\n", "control_character"),
    ("plates: [{latitude: 45, place: " + "x" * 130 + "}, 50]\n", "text_too_long"),
])
def test_bad_plates_are_refused_in_one_line_and_nothing_is_written(tmp_path, capsys, text, key):
    from kitgen.template_files import shipped_table

    recipe = tmp_path / "r.yaml"
    recipe.write_text(text, encoding="utf-8")
    code = main(["build", str(recipe), "-o", str(tmp_path / "kit.pdf")])
    err = capsys.readouterr().err
    assert code == 2 and err.count("\n") == 1 and "Traceback" not in err
    # The English template's fixed words of that message are in the line.
    fixed = [w for w in shipped_table("en")[f"errors.{key}"].replace("{{", "").replace("}}", "").split("{")
             if w][0].split("}")[-1].strip()
    assert fixed.split()[0] in err
    assert sorted(p.name for p in tmp_path.iterdir()) == ["r.yaml"]


def test_the_svg_set_has_one_file_per_part_id(tmp_path, capsys):
    recipe = tmp_path / "r.yaml"
    recipe.write_text("plates: [52, 44, 38]\n", encoding="utf-8")
    assert main(["geometry", str(recipe), "--format", "svg", "-o", str(tmp_path / "svg")]) == 0
    names = sorted(p.name for p in (tmp_path / "svg").iterdir())
    assert names == sorted(f"{i}.svg" for i in ("alidade", "mater-back", "mater-front", "plate-1", "plate-2",
                                                  "plate-3", "rete", "rule"))


def test_the_pdf_of_a_kit_of_plates_is_whole():
    """Every page the sheet's size (ISO 216: A4 is 210 x 297 mm; PDF
    32000-1:2008, 8.3.2.3: 72 points an inch), every font embedded (9.9:
    a FontFile2 stream), every page numbered "k of n" (the template's
    words), and the first page listing the plates."""
    import io

    import pypdf

    from kitgen.render.pdf import build_pdf
    from kitgen.template_files import shipped_table

    from .printed import page_text

    kit = build_kit(parse_recipe_text("plates: [{latitude: 55.9, place: Greyhaven}, 47.3, 41.0, 34.6]\n"))
    pages, pdf = build_pdf(kit)
    reader = pypdf.PdfReader(io.BytesIO(pdf))
    n = len(reader.pages)
    assert n == len(pages) and n >= 6
    pt = 72.0 / 25.4
    for k, page in enumerate(reader.pages):
        w, h = sorted((float(page.mediabox.width), float(page.mediabox.height)))
        assert (w, h) == pytest.approx((210 * pt, 297 * pt), abs=0.01)
        assert shipped_table("en")["page.number"].format(k=k + 1, n=n) in page_text(reader, k)
        for font in (page.get("/Resources") or {}).get("/Font", {}).values():
            descriptor = font.get_object().get("/FontDescriptor") or \
                font.get_object()["/DescendantFonts"][0].get_object()["/FontDescriptor"]
            assert "/FontFile2" in descriptor.get_object()
    first = page_text(reader, 0)
    assert "Greyhaven" in first and first.count("plate ") >= 4
