"""The quick tests that spare the rete's band words exact tests (#12)
leave out nothing the exact tests would find.

A sliding word skips a turn only where the quick reckoning finds it
surely on a dot (``band_words._surely_near_dot``), and tests a dot, a
word or a tick exactly only where their bounds come near
(``band_words.near_rows``).  Checked on seeded random boxes, dots and
turns against Shapely/GEOS distances between the turned box (a polygon)
and each dot's centre or each other box: every turn skipped has a dot
within the clearance, every box within reach is among the rows found.
"""

from __future__ import annotations

import math
import random

import numpy as np
from shapely import affinity
from shapely.geometry import Point, Polygon, box as shapely_box

from kitgen.parts import band_words, labels

CLEARANCE_MM = band_words.dot_clearance_mm(5.2)   # a word space at the 5.2 pt of an A4 rete


def _turned_box(rng):
    """Four corners of a word's box, some 3 to 20 mm long and 1 to 3 mm high,
    turned by any angle, somewhere on a ring about the origin."""
    w, h = rng.uniform(3.0, 20.0), rng.uniform(1.0, 3.0)
    a = rng.uniform(0.0, 2 * math.pi)
    r = rng.uniform(20.0, 60.0)
    x, y = r * math.cos(a), r * math.sin(a)
    t = rng.uniform(-180.0, 180.0)
    c, s = math.cos(math.radians(t)), math.sin(math.radians(t))
    return [(x + c * dx - s * dy, y + s * dx + c * dy) for dx, dy in ((0, 0), (w, 0), (w, h), (0, h))]


def test_every_turn_skipped_has_a_dot_within_the_clearance():
    rng = random.Random(12)
    center = (3.0, -7.0)
    flagged = 0
    for _ in range(60):
        corners = _turned_box(rng)
        # dots about the box's ring, some on it
        dots = [((rng.uniform(-70, 70), rng.uniform(-70, 70)), rng.uniform(0.2, 1.5)) for _ in range(30)]
        cx = sum(p[0] for p in corners) / 4
        cy = sum(p[1] for p in corners) / 4
        dots.append(((cx, cy), 0.5))
        deltas = [0.1 * k for k in range(-60, 61)]
        sure = band_words._surely_near_dot([corners], deltas, center, dots, CLEARANCE_MM)
        assert sure[deltas.index(0.0)], "a dot at the box's middle is surely on it"
        polygon = Polygon(corners)
        for delta, near in zip(deltas, sure):
            if not near:
                continue
            flagged += 1
            turned = affinity.rotate(polygon, delta, origin=center)
            gaps = [turned.distance(Point(c)) - r for c, r in dots]   # Shapely/GEOS distance
            assert min(gaps) < CLEARANCE_MM, (delta, min(gaps))
    assert flagged > 60


def test_every_box_within_reach_is_among_the_rows_found():
    rng = random.Random(21)
    rows = []
    for _ in range(300):
        x, y = rng.uniform(-50, 50), rng.uniform(-50, 50)
        rows.append((x, y, x + rng.uniform(0.1, 8), y + rng.uniform(0.1, 3)))
    bounds = np.array(rows)
    for _ in range(100):
        corners = _turned_box(rng)
        reach = rng.choice([0.0, labels.SEARCH_SLACK_MM, CLEARANCE_MM, 1.0, 2.0])
        found = set(band_words.near_rows(bounds, band_words.bounds_of(corners), reach))
        word = Polygon(corners)
        for k, row in enumerate(rows):
            if word.distance(shapely_box(*row)) <= reach:   # Shapely/GEOS distance
                assert k in found, (k, row)
