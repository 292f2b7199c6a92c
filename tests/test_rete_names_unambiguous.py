"""No star's name on the rete reads as another dot's (#12 review).

A name is unambiguous when its own point is clearly what it stands
beside: from the places a reader looks from a name for its point (the
middles of its two ends and its middle; common practice in map
labelling: a name is set beside its point, or over or under it), no
other drawn dot within AMBIGUOUS_WITHIN_MM is nearer than
CLEARLY_OWN_RATIO times the name's own dot, unless that dot is claimed
by a name of its own (its leader, or its name beside it nearer than this
one), and then it is no nearer than this name's own mark (its dot, or its
leader's end; for a dot under the pin's crosshair, Polaris's, whose
dot the pin hole punches out, the crosshair's edge where the name stands
right beside it).  Millimetres, not label offsets: the names stay 5 pt on
every kit (#12 review: on an 85 mm rete "Capella", at the end of a 10 mm
leader, stood level with Alhena's unnamed dot 2.4 mm past its end).  A
first-magnitude star (1.5 and brighter, as the term is commonly used)
named loosely keeps unclaimed dots LOOSE_WITHIN_MM away.  The distances
are the project's own rule (kitgen.parts.labels.AMBIGUOUS_WITHIN_MM),
measured here from the JSON contract's elements and the shipped fonts'
metrics (``Words.measure``).
"""

from __future__ import annotations

import math

import pytest

from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text

AMBIGUOUS_WITHIN_MM = 3.0
CLEARLY_OWN_RATIO = 1.5
LOOSE_WITHIN_MM = 2.0
FIRST_MAGNITUDE = 1.5


def _box(e, words):
    ext = words.measure(e.geom["text"], e.geom["size_pt"])
    (x, y), share = e.geom["at"], {"start": 0.0, "middle": 0.5, "end": 1.0}[e.geom["anchor"]]
    return (x - share * ext.width_mm, y - ext.height_mm / 2, x + (1 - share) * ext.width_mm, y + ext.height_mm / 2)


def _reading_mm(point, radius_mm, box):
    x0, y0, x1, y1 = box
    return min(math.dist(point, (x, (y0 + y1) / 2)) for x in (x0, (x0 + x1) / 2, x1)) - radius_mm


#: Half the side of the square the pin's crosshair is kept in (mm), the
#: rete's own mark (kitgen.parts.rete's pin box).
PIN_HALF_MM = 2.5


def _under_pin(dot) -> bool:
    return all(abs(v) < PIN_HALF_MM for v in dot.geom["at"])


def _beside_pin(box) -> bool:
    """Over or under the crosshair's middle, or level with it."""
    return box[0] <= 0.0 <= box[2] or box[1] <= 0.0 <= box[3]


def _gap_to_pin(point) -> float:
    return math.hypot(max(abs(point[0]) - PIN_HALF_MM, 0.0), max(abs(point[1]) - PIN_HALF_MM, 0.0))


def ambiguous_names(rete, words):
    dots = {e.values["name"]: e for e in rete.elements if e.role == "star" and e.stroke != "none"}
    leaders = {e.values["name"]: e for e in rete.elements if e.role == "star_leader"}
    boxes = {}
    for e in rete.elements:
        if e.role == "star_label":   # a name on two lines: the box round both
            b, o = _box(e, words), boxes.get(e.values["name"])
            boxes[e.values["name"]] = b if o is None else (min(o[0], b[0]), min(o[1], b[1]),
                                                            max(o[2], b[2]), max(o[3], b[3]))
    bad = []
    for name, box in boxes.items():
        own = dots[name]
        own_mm = _reading_mm(own.geom["at"], own.values["radius_mm"], box)
        if _under_pin(own) and _beside_pin(box):
            # the dot under the pin's crosshair is punched out with the pin
            # hole: a name right beside the crosshair reads from its edge
            own_mm = min(own_mm, min(_gap_to_pin((x, (box[1] + box[3]) / 2)) for x in (box[0], box[2],
                                                                                       (box[0] + box[2]) / 2)))
        mark_mm = _reading_mm(leaders[name].geom["to"], 0.0, box) if name in leaders else own_mm
        within = LOOSE_WITHIN_MM if own.values["mag"] <= FIRST_MAGNITUDE else AMBIGUOUS_WITHIN_MM
        for other, dot in dots.items():
            if other == name:
                continue
            d_mm = _reading_mm(dot.geom["at"], dot.values["radius_mm"], box)
            if d_mm >= min(within, CLEARLY_OWN_RATIO * own_mm):
                continue
            claimed = other in leaders or other in boxes \
                and _reading_mm(dot.geom["at"], dot.values["radius_mm"], boxes[other]) < d_mm
            if not claimed or d_mm < mark_mm:
                bad.append((name, other, round(d_mm, 2), round(own_mm, 2)))
    return bad, len(boxes)


@pytest.mark.parametrize("head", [
    "title: Harbour View School\nlatitude: 45\nlanguage: en\ndiameter_mm: 85\n",   # the review's kit
    "latitude: 52.2\nlanguage: en\ndiameter_mm: 90\n",
    "latitude: 40\nlanguage: de\ndiameter_mm: 100\n",
    "latitude: -23.5\nlanguage: pt\ndiameter_mm: 110\n",
    "latitude: -45\nlanguage: es\ndiameter_mm: 95\n",
    "latitude: 12\nlanguage: hi\ndiameter_mm: 120\n",
    "latitude: 30\nlanguage: fr\nsheet: letter\n",
    "latitude: 35\nlanguage: ar\nsheet: a5\n",
])
def test_no_name_reads_as_another_dots(head):
    kit = build_kit(parse_recipe_text("epoch: 2027\n" + head + "parts: [rete]\n"))
    bad, named = ambiguous_names(kit.part("rete"), kit.words)
    assert named >= 18
    assert not bad


#: Common practice in map labelling: a leader crosses lines steeply, never
#: along them; within 30 degrees of a line's direction and nearer than its
#: half width and the labels' margin (0.3 mm) the two print as one line
#: (#12 review: Regulus's leader 0.1 mm beside the bound of Leo and Virgo).
ALONG_DEG, GAP_MM = 30.0, 0.3


@pytest.mark.parametrize("head", [
    "latitude: 45\nlanguage: en\ndiameter_mm: 85\n",     # Regulus, Capella
    "latitude: 38\nlanguage: en\ndiameter_mm: 88\n",
    "latitude: 0.5\nlanguage: de\nsheet: a4\n",         # Pollux
    "latitude: -60\nlanguage: fr\ndiameter_mm: 100\n",  # Shaula
    "latitude: -55\nlanguage: es\nsheet: a5\n",
    "latitude: 28\nlanguage: it\ndiameter_mm: 95\n",
])
def test_no_leader_runs_along_a_signs_bound(head):
    from shapely.geometry import LineString

    from kitgen.geometry.style import stroke_width_mm
    kit = build_kit(parse_recipe_text("epoch: 2027\n" + head + "parts: [rete]\n"))
    rete = kit.part("rete")
    bounds = [e for e in rete.elements if e.role == "ecliptic_tick" and e.stroke != "none"
              and e.values["longitude_deg"] % 30 == 0]
    assert len(bounds) >= 12
    along = []
    for leader in rete.with_role("star_leader"):
        (ax, ay), (bx, by) = leader.geom["from"], leader.geom["to"]
        for b in bounds:
            (cx, cy), (dx, dy) = b.geom["from"], b.geom["to"]
            cos = abs((bx - ax) * (dx - cx) + (by - ay) * (dy - cy)) / math.hypot(bx - ax, by - ay) \
                / math.hypot(dx - cx, dy - cy)
            gap = LineString([(ax, ay), (bx, by)]).distance(LineString([(cx, cy), (dx, dy)]))
            if cos > math.cos(math.radians(ALONG_DEG)) and gap < stroke_width_mm(b.stroke, kit.dims) / 2 + GAP_MM:
                along.append((leader.values["name"], b.values["longitude_deg"], round(gap, 2)))
    assert not along
