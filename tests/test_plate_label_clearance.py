"""A label on the plate breaks only its own line and stands clear of the
others; cardinal letters beside their horizon points; the zenith an open
mark unlike the pin's (#9).

References:

* Snyder, *Map Projections: A Working Manual*, USGS PP 1395 (1987), ch. 21:
  a direction v of the sky (unit vector, z to the visible pole) is drawn
  at R (v_x, v_y) / (1 + v_z) from the pin (the polar stereographic
  projection, eq. 21-33 in vector form); the zenith at polar angle
  90 deg - |phi| lies R tan((90 deg - |phi|) / 2) up the meridian.
* Meeus, *Astronomical Algorithms* (2nd ed. 1998), eq. 13.5, in vector
  form: the horizon's point of azimuth A (from north through east) is
  cos A N + sin A E, with the north point N = (0, -sin phi, cos phi) and
  the east point E = (-1, 0, 0) in the place's equatorial frame (x to
  hour angle +90 deg, y to the upper meridian, z to the north pole).
* Clearance: about a millimetre of white round lettering, and never a
  line broken round a word that is not its own (common practice of map
  and scale lettering); the least distance accepted beside a line is the
  0.3 mm the kit's labels keep from the lines they are set along
  (kitgen.parts.labels.MARGIN_MM, common practice).  The ink boxes are
  measured with the shipped fonts by the kit's own ``Words``, the lines
  sampled every 0.05 mm (tests/test_plate_readings.py).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from kitgen.geometry.style import stroke_width_mm
from kitgen.render.ink import inks
from tests.test_plate_readings import (STROKES, check_tens_numbered, distance_to_box, kit_of, plates, samples,
                                       stroke_ends, text_box)

#: Clear paper (mm) every label keeps from the lines not its own where
#: there is room (common practice, see above) and the least it may keep.
CLEAR_MM, LEAST_MM = 1.0, 0.3
#: A cardinal letter farther than this (mm) from its horizon point has a
#: leader to it (our value, #9).
NEAR_MM = 2.5
#: Half the pin's crosshair (4 mm across, kitgen.geometry.style) and the
#: clearance kept round it.
PIN_MM = 2.0 + 0.3

#: Latitudes north, south, on and near the equator and at 64 deg; sizes
#: 80, 185 (the A4 default) and 300 mm; languages with Latin, Arabic and
#: Devanagari script; paired so that each value meets several others.
CASES = [(47.3, None, "en"), (-37.8, 300, "ar"), (0.0, 80, "hi"), (64.0, None, "hi"), (3.1, 300, "en"),
         (-64.0, 80, "ar"), (26.9, 80, "en"), (0.5, None, "ar"), (-33.9, 185, "hi"), (64.0, 80, "en"),
         (-90.0, None, "en")]

TOLERANCE_MM = 0.02   # sampling of the lines and rounding of the arcs' ends


def own_lines(label, line) -> bool:
    """The lines a label may break: its own circle or curve."""
    v = label.values
    if label.role == "almucantar_label":
        return line.role in ("almucantar", "horizon") and abs(line.values.get("altitude_deg", 1e9) - v["altitude_deg"]) < 1e-9
    if label.role == "azimuth_label":
        # (and its leader, where it stands beside its horizon point)
        return line.role in ("azimuth", "azimuth_leader") \
            and abs(line.values.get("azimuth_deg", 1e9) - v["azimuth_deg"]) < 1e-9
    if label.role == "curve_label":
        return line.role == v["curve"] and all(abs(line.values.get(k, 1e9) - x) < 1e-6
                                               for k, x in v.items() if k != "curve")
    if label.role == "cardinal":
        # A cardinal letter names a point of the horizon; the equator meets
        # the horizon at the east and west points (a fact of the sphere:
        # Meeus, Astronomical Algorithms, ch. 13), so on a crowded plate the
        # letter may stand over both (#9: never a point left unnamed).
        return line.role in ("horizon", "equator")
    return False


def along_meridian(line) -> bool:
    """The meridian and the east-west line (and the azimuths drawn on
    them): numbers are set beside them."""
    if line.role in ("meridian", "east_west"):
        return True
    if line.role != "azimuth" or line.shape != "segment":
        return False
    (x0, y0), (x1, y1) = line.geom["from"], line.geom["to"]
    return max(abs(x0), abs(x1)) < 1e-6 or max(abs(y0), abs(y1)) < 1e-6


def may_cross(label, line, numbered=()) -> bool:
    """Lines a label must cross where no place clears them: the azimuths
    closing in on the meridian near the zenith and, where the circles
    crowd, the unnumbered almucantars beside it, for an almucantar's
    number; the thin lines running across a named curve, for its name."""
    if label.role == "almucantar_label":
        return line.role == "azimuth" or (line.role == "almucantar" and line.values["altitude_deg"] not in numbered)
    if label.role in ("curve_label", "plate_label"):
        # and the plate's latitude, never left out, on a small plate
        return line.role in ("almucantar", "azimuth", "unequal_hour")
    return False


def line_key(line):
    return (line.role, tuple(sorted((k, round(v, 6)) for k, v in line.values.items() if isinstance(v, float))))


def check_plate(kit, part):
    w, dims = kit.words, kit.dims
    lines = [(e, samples(e)) for e in part.elements
             if e.shape in STROKES and e.stroke not in ("none", "cut", "fold") and e.role != "cardinal_leader"]
    labels = [e for e in part.elements if e.shape == "text" and e.geom["text"].strip()
              and e.role not in ("title", "owner")]
    assert labels
    too_near, broken, clear = [], [], 0
    numbered = {e.values["altitude_deg"] for e in part.with_role("almucantar_label")}
    for lab in labels:
        box = text_box(lab, w)
        reach = math.hypot(box[2], box[3]) + 2.0
        least = math.inf
        ends: dict = {}
        for e, pts in lines:
            if own_lines(lab, e):
                continue
            near = pts[np.hypot(*(pts - box[0]).T) < reach]
            if not len(near):
                continue
            d = float(distance_to_box(near, box).min()) - stroke_width_mm(e.stroke, dims) / 2
            if along_meridian(e):
                assert d >= LEAST_MM - TOLERANCE_MM, (lab.geom["text"], e.role, d)
                continue
            # A line broken round this label: two of its pieces end at the box.
            # (a break cuts MARGIN_MM and half the line's width off the box,
            # a polyline at its points, a fraction of a millimetre apart)
            slack = 0.25 if e.shape == "polyline" else 0.1
            for p in stroke_ends(e):
                if distance_to_box([p], box)[0] < LEAST_MM + stroke_width_mm(e.stroke, dims) / 2 + slack:
                    ends.setdefault(line_key(e), []).append(e)
            if may_cross(lab, e, numbered):
                continue
            least = min(least, d)
        for key, pieces in ends.items():
            if len(pieces) >= 2 and not may_cross(lab, pieces[0], numbered):
                broken.append((lab.role, lab.geom["text"], key[0]))
        if least < LEAST_MM - TOLERANCE_MM:
            too_near.append((lab.role, lab.geom["text"], round(least, 2)))
        clear += least >= CLEAR_MM - TOLERANCE_MM
    return too_near, broken, clear / len(labels)


@pytest.mark.parametrize("lat, diameter, language", CASES)
def test_a_label_breaks_no_line_but_its_own_and_stands_clear_of_the_others(lat, diameter, language):
    kit = kit_of(latitude=lat, language=language, **({"diameter_mm": diameter} if diameter else {}))
    for part in plates(kit):
        too_near, broken, share = check_plate(kit, part)
        assert not broken, (lat, diameter, language, broken[:5])
        assert not too_near, (lat, diameter, language, too_near[:5])
        # most labels keep the full clearance (measured: 0.3 to 0.8 of them
        # at these cases; the rest stand beside a line, never in its gap)
        assert share >= 0.25, (lat, diameter, language, share)
    # every almucantar multiple of 10 drawn is numbered (Snyder: within 3 mm of its circle)
    check_tens_numbered(kit)


@pytest.mark.parametrize("lat, diameter, language", [(64.0, 80, "en"), (0.5, 80, "ar"), (47.3, None, "en")])
def test_a_label_left_out_is_named_in_the_notes(lat, diameter, language):
    kit = kit_of(latitude=lat, language=language, **({"diameter_mm": diameter} if diameter else {}))
    part = plates(kit)[0]
    said = [n for n in kit.notes if n.key == "notes.plate_labels_left_out"]
    missing = part.values["labels_left_out"]
    assert bool(said) == bool(missing)
    if missing:
        assert [m.values["text"] for m in said[0].values["labels"]] == list(missing)
    dropped = part.values["almucantars_left_out_deg"]
    gone = [n for n in kit.notes if n.key == "notes.almucantars_left_out"]
    assert bool(gone) == bool(dropped)
    drawn = {e.values["altitude_deg"] for e in part.with_role("almucantar")}
    assert not set(dropped) & drawn
    if lat == 64.0 and diameter == 80:
        # a plate this small is thinned, and says so
        assert any(n.key in ("notes.almucantar_numbers_coarse", "notes.azimuths_thinned") for n in kit.notes)
        assert missing


def horizon_point(az_deg: float, lat_deg: float, R: float):
    """Meeus eq. 13.5 and Snyder eq. 21-33 (see the module's docstring);
    a southern plate is seen from the south pole (x and z mirrored)."""
    phi, A = math.radians(abs(lat_deg)), math.radians(az_deg)
    if lat_deg < 0:   # the south point plays the north's part
        A = math.pi - A
    v = math.cos(A) * np.array([0.0, -math.sin(phi), math.cos(phi)]) + math.sin(A) * np.array([-1.0, 0.0, 0.0])
    if lat_deg < 0:
        v = v * np.array([-1.0, 1.0, 1.0])
    return R * v[0] / (1 + v[2]), R * v[1] / (1 + v[2])


@pytest.mark.parametrize("lat", [0.5, 3.1, -3.0, 30.0, 60.0])
def test_each_cardinal_letter_stands_by_its_horizon_point(lat):
    kit = kit_of(latitude=lat, language="fr" if lat == 3.1 else "en")
    part = plates(kit)[0]
    R = kit.dims.equator_radius_mm
    letters = part.with_role("cardinal")
    assert {e.values["azimuth_deg"] for e in letters} == {0.0, 90.0, 180.0, 270.0} - {
        a for a in (0.0, 180.0) if math.hypot(*horizon_point(a, lat, R)) > kit.dims.outer_tropic_radius_mm - 4}
    leaders = part.with_role("cardinal_leader")
    for e in letters:
        word = kit.words({0.0: "cardinal.north", 90.0: "cardinal.east", 180.0: "cardinal.south",
                          270.0: "cardinal.west"}[e.values["azimuth_deg"]])
        assert e.geom["text"] == word
        p = horizon_point(e.values["azimuth_deg"], lat, R)
        box = text_box(e, kit.words)
        gap = float(distance_to_box([p], box)[0])
        if max(abs(p[0]), abs(p[1])) <= PIN_MM:
            # the point is under the pin's mark: the letter beside the mark
            mark = [(x, y) for x in np.linspace(-PIN_MM, PIN_MM, 41) for y in np.linspace(-PIN_MM, PIN_MM, 41)]
            assert distance_to_box(mark, box).min() <= NEAR_MM, (lat, word, gap)
            continue
        if gap <= NEAR_MM:
            continue
        mine = [ld for ld in leaders if ld.values["azimuth_deg"] == e.values["azimuth_deg"]]
        assert mine, (lat, word, gap, "no leader")
        a, z = mine[0].geom["from"], mine[0].geom["to"]
        assert math.dist(z, p) < 0.5 and distance_to_box([a], box)[0] < 0.5, (lat, word)


@pytest.mark.parametrize("lat", [47.3, 24.5, -25.0, 0.5])
def test_the_zenith_is_an_open_cross_unlike_the_pin(lat):
    kit = kit_of(latitude=lat)
    part = plates(kit)[0]
    R = kit.dims.equator_radius_mm
    (z,) = part.with_role("zenith")
    y = R * math.tan(math.radians(90.0 - abs(lat)) / 2)   # Snyder eq. 21-33
    assert math.dist(z.geom["at"], (0.0, y)) < 1e-6
    drawn = inks(z, kit.dims)
    assert all(i.shape == "segment" for i in drawn) and len(drawn) == 2   # no dot, no hole
    for i in drawn:
        (x0, y0), (x1, y1) = i.geom["from"], i.geom["to"]
        # crossing at the zenith, slanted: never along the pin's upright arms
        assert math.dist(((x0 + x1) / 2, (y0 + y1) / 2), z.geom["at"]) < 1e-9
        angle = math.degrees(math.atan2(y1 - y0, x1 - x0)) % 180.0
        assert 30.0 < angle < 60.0 or 120.0 < angle < 150.0
    (pin,) = part.with_role("pin")
    assert any(i.shape == "circle" and i.stroke == "cut" for i in inks(pin, kit.dims))
