"""A rete's names placed again keep what does not change (#12).

The rete places its names up to four times (a merged dot's names alone,
names on two lines, a bright star named loosely); each placing after the
first takes each name's places and their fixed tests from the one before
(``place_labels``' ``kept``).  The reference is the rete placed without
them, every placing from nothing: the same elements, value for value.
"""

from __future__ import annotations

import random

import pytest

import kitgen.kit as kit_module
import kitgen.parts.labels as labels
from kitgen.kit import build_kit
from kitgen.parts import reuse
from kitgen.recipe.load import parse_recipe_text


def _rete(head: str):
    """The rete drawn afresh (the kits kept for a class set's next pupil,
    and the parts kept for the next school, let go first)."""
    kit_module._NAMELESS.clear()
    kit_module._NAMED_BASE.clear()
    kit_module._plan.cache_clear()
    reuse.let_go()
    return build_kit(parse_recipe_text("epoch: 2027\nparts: [rete]\n" + head)).part("rete")


@pytest.mark.parametrize("head", ["latitude: -23.5\nlanguage: pt\n", "latitude: -33.9\nsheet: a5\n",
                                  "latitude: 24.7\nlanguage: ar\n"])
def test_the_same_rete_with_and_without_the_places_kept(head, monkeypatch):
    kept = _rete(head)
    place = labels.place_labels

    placings = []

    def afresh(*args, kept=None, **kwargs):
        placings.append(kept)
        return place(*args, kept=None, **kwargs)

    monkeypatch.setattr(labels, "place_labels", afresh)
    fresh = _rete(head)
    assert placings, "the rete was not placed again"
    assert [(e.role, e.geom, e.values) for e in fresh.elements] == [(e.role, e.geom, e.values) for e in kept.elements]


@pytest.mark.parametrize("head", ["latitude: -12.0\nlanguage: pt\n", "latitude: -23.5\nsheet: a5\n",
                                  "latitude: 51.5\n"])
def test_the_same_rete_with_every_leader_tested_against_every_link(head, monkeypatch):
    # A place's link to its dot is tested only against the leaders whose
    # boxes come near it (labels._crosses_link).  Reference: every leader
    # the grid finds tested against every segment of the link.
    kept = _rete(head)
    tried = {"leaders": 0}

    def every_pair(point, box, segments):
        segments = list(segments)
        tried["leaders"] += len(segments)
        return any(labels._segments_cross(a, b, p, q) for a, b in segments for p, q in labels._link(point, box))

    monkeypatch.setattr(labels, "_crosses_link", every_pair)
    fresh = _rete(head)
    assert tried["leaders"] > 0
    assert [(e.role, e.geom, e.values) for e in fresh.elements] == [(e.role, e.geom, e.values) for e in kept.elements]


def test_a_link_crossed_as_geos_finds_it():
    # labels._crosses_link against Shapely/GEOS, a general-purpose
    # reference library: a segment crosses the link from a point to its
    # label's box where it crosses (interiors meeting in a point) one of
    # the link's segments, to the box's corners and nearest point.
    # Random cases, seeded, many of them near the link's box.
    shapely = pytest.importorskip("shapely")
    from shapely.geometry import LineString

    rng = random.Random(20261205)
    crossed = 0
    for _ in range(1500):
        point = (rng.uniform(-20, 20), rng.uniform(-20, 20))
        x, y = rng.uniform(-20, 20), rng.uniform(-20, 20)
        box = (x, y, x + rng.uniform(0.5, 12), y + rng.uniform(0.5, 4))
        segments = []
        for _ in range(rng.randint(1, 6)):
            a = (rng.uniform(-25, 25), rng.uniform(-25, 25))
            segments.append((a, (a[0] + rng.uniform(-12, 12), a[1] + rng.uniform(-12, 12))))
        links = [LineString([p, q]) for p, q in labels._link(point, box) if p != q]
        expected = any(LineString([a, b]).crosses(link) for a, b in segments for link in links)
        assert labels._crosses_link(point, box, segments) == expected, (point, box, segments)
        crossed += expected
    assert 100 < crossed < 1400   # both answers well represented
