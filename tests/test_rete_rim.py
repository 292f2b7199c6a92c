"""The rim of the rete and the plates (#9): ``rete_limit_deg`` and its
default, against outside references.

References:
- Snyder, *Map Projections: A Working Manual*, USGS Professional Paper 1395
  (1987), eq. 21-33 (polar stereographic, k0 = 1/2 at the pole): a circle
  of declination delta lies at R tan(pi/4 - sign delta / 2), R the
  equator's radius; the equator's radius is read from the plate's own
  equator element.
- PyEphem's star list (``ephem.stars``, Hipparcos places), computed for
  the epoch's equinox (``a_dec``): the declinations of Canopus, Achernar
  and Acrux, independent of kitgen's catalogue and precession.
- The altitude of a star at upper culmination, 90 - |phi - delta| (any
  spherical astronomy text, e.g. Smart, *Textbook on Spherical Astronomy*,
  6th ed. 1977, ch. II), for which stars rise well above the horizon.
"""

from __future__ import annotations

import math
import re

import ephem
import ephem.stars
import numpy as np
import pytest

from kitgen.errors import UserError
from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text
from kitgen.sky.rete_rim import MIN_EQUATOR_RADIUS_MM, RIM_MARGIN_DEG, VISIBLE_ALTITUDE_DEG

EPOCH = 2027


def kit_of(text: str):
    return build_kit(parse_recipe_text(f"epoch: {EPOCH}\n" + text))


def ephem_dec_deg(name: str) -> float:
    """The star's declination (deg) for the equinox and epoch of mid-EPOCH, by PyEphem."""
    body = ephem.stars.star(name)
    date = f"{EPOCH}/7/2"
    body.compute(date, epoch=date)
    return math.degrees(body.a_dec)


def rim_circle_mm(part) -> float:
    (rim,) = [e for e in part.elements if e.role == "rim"]
    return rim.geom["radius"]


def equator_mm(plate) -> float:
    radii = {round(e.geom["radius"], 9) for e in plate.elements if e.role == "equator"}
    assert len(radii) == 1
    return radii.pop()


def plate_reach_mm(plate) -> float:
    """How far from the pin the plate's lines go: the farthest end of its
    arcs and segments (the drawing is clipped at the rim)."""
    far = 0.0
    for e in plate.elements:
        if e.role in ("cut", "key", "pin") or e.stroke == "none":
            continue
        if e.shape == "arc":
            c, r = np.asarray(e.geom["center"]), e.geom["radius"]
            for a in (e.geom["start_deg"], e.geom["end_deg"]):
                p = c + r * np.array([math.cos(math.radians(a)), math.sin(math.radians(a))])
                far = max(far, float(np.hypot(*p)))
        elif e.shape == "segment":
            far = max(far, float(np.hypot(*e.geom["from"])), float(np.hypot(*e.geom["to"])))
    return far


def test_default_near_the_equator_takes_the_southern_sky_when_the_size_allows():
    kit = kit_of("latitude: 0.5\ndiameter_mm: 300\n")
    names = {e.values["name"]: e for e in kit.part("rete").elements if e.role == "star"}
    for name in ("Canopus", "Achernar", "Acrux"):
        dec = ephem_dec_deg(name)
        # each culminates well above the horizon at 0.5 N ...
        assert 90.0 - abs(0.5 - dec) >= VISIBLE_ALTITUDE_DEG
        # ... lies inside the rim with the margin kept for its name ...
        assert dec > kit.sky.rim_deg + RIM_MARGIN_DEG, name
        # ... and is on the rete, at the catalogue's place for the epoch
        assert name in names
        assert names[name].values["dec_deg"] == pytest.approx(dec, abs=0.01)


def test_default_on_a4_near_the_equator_keeps_the_equator_readable():
    kit = kit_of("latitude: 0.5\nlanguage: en\n")  # A4: a 180 mm mater
    plate, rete = kit.part("plate-1"), kit.part("rete")
    # the equator keeps its chosen least radius (a choice of kitgen's, #9) ...
    assert equator_mm(plate) >= MIN_EQUATOR_RADIUS_MM - 1e-9
    # ... and the rim is as far as that allows, to the whole degree (Snyder eq. 21-33)
    rim_mm = rim_circle_mm(rete)
    farther = MIN_EQUATOR_RADIUS_MM * math.tan(math.pi / 4 + math.radians(abs(kit.sky.rim_deg) + 1) / 2)
    assert farther > rim_mm
    # the bright southern stars left off are named in the notes, with the value that brings them in
    (note,) = [n for n in kit.notes if n.key == "notes.stars_beyond_rim"]
    value = float(note.values["value"])
    for name in ("Canopus", "Achernar", "Acrux"):
        dec = ephem_dec_deg(name)  # PyEphem's place
        assert dec <= kit.sky.rim_deg + RIM_MARGIN_DEG  # off this rete ...
        assert name in note.values["stars"]
        assert dec > value + RIM_MARGIN_DEG  # ... and on the one the note offers
    assert f"rete_limit_deg: {value:g}" in note.text(kit.words)


@pytest.mark.parametrize("text,limit", [("latitude: 30\nrete_limit_deg: -50\n", -50.0),
                                        ("latitude: -20\nrete_limit_deg: 45\n", 45.0),
                                        ("latitude: -20\nrete_limit_deg: -45\n", 45.0),  # the sign may be left out
                                        ("latitude: 52.2\n", None),
                                        # a pole's plate, the farthest rim, a small duplex kit: its
                                        # labels had met a line width never looked up (#12)
                                        ("latitude: 90\nrete_limit_deg: -80\ndiameter_mm: 120\n"
                                         "duplex: long_edge\n", -80.0)])
def test_rim_of_rete_and_plate_follow_snyder(text, limit):
    kit = kit_of(text)
    sign = kit.plan.hemisphere_sign
    rim_deg = kit.sky.rim_deg
    if limit is not None:
        assert rim_deg == limit
    else:  # at 52.2 N the default is the classical rim: the outer tropic
        eps = math.degrees(kit.sky.obliquity_rad)
        assert rim_deg == pytest.approx(-eps, abs=1e-9)
    plate, rete = kit.part("plate-1"), kit.part("rete")
    R = equator_mm(plate)
    # Snyder 1987, eq. 21-33: rho = R tan(pi/4 - sign delta / 2)
    expected = R * math.tan(math.pi / 4 - sign * math.radians(rim_deg) / 2)
    assert rim_circle_mm(rete) == pytest.approx(expected, abs=1e-6)
    (rim,) = [e for e in rete.elements if e.role == "rim"]
    assert rim.values["declination_deg"] == rim_deg
    # the plate is drawn out to the same rim, and no farther
    assert plate_reach_mm(plate) == pytest.approx(expected, abs=1e-6)


def test_rete_limit_extends_plate_and_rete_together():
    near, far = kit_of("latitude: 30\nrete_limit_deg: -30\n"), kit_of("latitude: 30\nrete_limit_deg: -55\n")
    # the same rim on the paper, a smaller projection inside it
    assert rim_circle_mm(near.part("rete")) == pytest.approx(rim_circle_mm(far.part("rete")))
    assert equator_mm(far.part("plate-1")) < equator_mm(near.part("plate-1"))
    # the stars between the two rims (PyEphem's declinations) come onto the rete with the farther one
    fomalhaut = ephem_dec_deg("Fomalhaut")
    assert -55.0 + RIM_MARGIN_DEG < fomalhaut < -30.0 + RIM_MARGIN_DEG
    stars = lambda kit: {e.values["name"] for e in kit.part("rete").elements if e.role == "star"}  # noqa: E731
    assert "Fomalhaut" in stars(far) and "Fomalhaut" not in stars(near)


def test_notes_name_the_bright_stars_beyond_the_rim_and_the_key():
    kit = kit_of("latitude: 30\nrete_limit_deg: -30\nlanguage: en\n")
    (note,) = [n for n in kit.notes if n.key == "notes.stars_beyond_rim"]
    named = set(note.values["stars"])
    # every named star culminates well above the horizon at 30 N, and lies beyond the rim
    for name in named:
        dec = ephem_dec_deg(name) if name in ephem.stars.stars else None
        if dec is not None:
            assert 90.0 - abs(30.0 - dec) >= VISIBLE_ALTITUDE_DEG
            assert dec <= -30.0 + RIM_MARGIN_DEG
    assert "Fomalhaut" in named
    # the value offered brings them all in
    value = float(note.values["value"])
    kit2 = kit_of(f"latitude: 30\nrete_limit_deg: {value:g}\n")
    stars = {e.values["name"] for e in kit2.part("rete").elements if e.role == "star"}
    assert not [n for n in kit2.notes if n.key == "notes.stars_beyond_rim"]
    assert named <= stars or len(stars) == 32  # the 32 brightest that fit
    assert "rete_limit_deg" in note.text(kit.words)


@pytest.mark.parametrize("language", ["hi", "ar", "fr"])
def test_the_notes_line_is_one_to_copy_into_the_recipe(language):
    """The note quotes the recipe line that brings the stars in; in a
    kit of the locale's own digits (Devanagari, Arabic-Indic) or a decimal
    comma, the line is still as a recipe writes it, so that, copied into
    the recipe, it is read (YAML, a number) and the note goes."""
    text = f"latitude: 0\nlanguage: {language}\nnative_digits: true\n"
    kit = kit_of(text)
    (note,) = [n for n in kit.notes if n.key == "notes.stars_beyond_rim"]
    line = re.search(r"rete_limit_deg: [^\s'\u2019\u201d\u00bb]+", note.text(kit.words)).group(0)
    assert re.fullmatch(r"rete_limit_deg: -?[0-9]+(\.[0-9]+)?", line), line
    again = kit_of(text + line + "\n")
    assert again.sky.rim_deg == float(line.split(": ")[1])
    assert not [n for n in again.notes if n.key == "notes.stars_beyond_rim"]


def test_a_refused_star_names_the_key_that_lets_it_in():
    with pytest.raises(UserError) as info:
        parse_recipe_text(f"epoch: {EPOCH}\nlatitude: 24.5\nrete_limit_deg: -30\nstars: [Sirius, Canopus]\n")
    text = str(info.value)
    assert "Canopus" in text and "rete_limit_deg" in text
    value = float(text.split("rete_limit_deg: ")[1].split("'")[0])
    # the value offered does let it in (PyEphem's declination, with the rim's margin)
    assert ephem_dec_deg("Canopus") > value + RIM_MARGIN_DEG
    recipe = parse_recipe_text(f"epoch: {EPOCH}\nlatitude: 24.5\nrete_limit_deg: {value:g}\nstars: [Sirius, Canopus]\n")
    assert recipe.rete_limit_deg == value


@pytest.mark.parametrize("value", ["10", "85", "-90", "true", "'far'"])
def test_a_rim_out_of_range_is_one_clear_line(value):
    with pytest.raises(UserError) as info:
        parse_recipe_text(f"epoch: {EPOCH}\nlatitude: 24.5\nrete_limit_deg: {value}\n")
    assert "rete_limit_deg" in str(info.value) and "23.5" in str(info.value)
