"""A rete's names placed again keep what does not change (#12).

The rete places its names up to four times (a merged dot's names alone,
names on two lines, a bright star named loosely); each placing after the
first takes each name's places and their fixed tests from the one before
(``place_labels``' ``kept``).  The reference is the rete placed without
them, every placing from nothing: the same elements, value for value.
"""

from __future__ import annotations

import pytest

import kitgen.kit as kit_module
import kitgen.parts.labels as labels
from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text


def _rete(head: str):
    """The rete drawn afresh (the kits kept for a class set's next pupil
    let go first)."""
    kit_module._NAMELESS.clear()
    kit_module._NAMED_BASE.clear()
    kit_module._plan.cache_clear()
    return build_kit(parse_recipe_text("epoch: 2027\nparts: [rete]\n" + head)).part("rete")


@pytest.mark.parametrize("head", ["latitude: -23.5\nlanguage: pt\n", "latitude: -33.9\nsheet: a5\n",
                                  "latitude: 24.7\nlanguage: ar\n"])
def test_the_same_rete_with_and_without_the_places_kept(head, monkeypatch):
    kept = _rete(head)
    place = labels.place_labels

    def afresh(*args, kept=None, **kwargs):
        return place(*args, kept=None, **kwargs)

    monkeypatch.setattr(labels, "place_labels", afresh)
    fresh = _rete(head)
    assert fresh is not kept
    assert [(e.role, e.geom, e.values) for e in fresh.elements] == [(e.role, e.geom, e.values) for e in kept.elements]
