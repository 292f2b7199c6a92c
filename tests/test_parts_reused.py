"""A part kept from one school's kit and given to another's
(kitgen.parts.reuse, #12) is the part its builder draws for that kit
afresh, element for element; the parts a class set's schools share are
shared.  No outside source: the property is the package's own (the
builders run again with nothing kept are the reference); the kits are
invented."""

from __future__ import annotations

import pickle

import pytest

from kitgen import kit as kit_module
from kitgen.errors import speaking
from kitgen.parts import reuse
from kitgen.recipe.load import validate_recipe


def _nameless(recipe: dict):
    r = validate_recipe(recipe)
    with speaking(r.language, None):
        return kit_module.build_kit(r)


def _fresh(recipe: dict):
    reuse.let_go()
    kit_module._NAMELESS.clear()
    return _nameless(recipe)


#: Pairs of schools (the first built, then the second with what the first
#: left kept), and the parts the second must take from the first.
PAIRS = [
    ({"latitude": 52.2, "language": "en"}, {"latitude": 57.7, "language": "en"},
     {"mater_front", "mater_back", "rete", "rule", "alidade"}),
    ({"latitude": 40.4, "language": "es"}, {"latitude": 44.9, "language": "es"},
     {"mater_front", "mater_back", "rule", "alidade"}),          # two rims: two retes
    ({"latitude": 35.2, "language": "fr"}, {"latitude": -35.2, "language": "fr"},
     {"mater_back", "rule", "alidade"}),                         # the other hemisphere: its own front
    ({"latitude": 48.1, "language": "de"}, {"latitude": 48.1, "language": "en"}, set()),
    ({"latitude": 24.7, "language": "ar", "sheet": "a5"}, {"latitude": 24.7, "language": "ar", "sheet": "a4"},
     set()),
    ({"latitude": 51.5, "language": "en"}, {"latitude": 51.5, "language": "en", "place": "Reykjavik"},
     {"mater_front", "rete", "rule", "alidade"}),                # a town: its own clock correction
    ({"latitude": -23.5, "language": "pt"}, {"latitude": -23.5, "language": "pt", "epoch": 2031},
     {"mater_front", "rule", "alidade"}),                        # another year: another sky and calendar
    ({"latitude": 53.0, "language": "en"}, {"latitude": 53.0, "language": "en", "title": "Moorside Astronomers"},
     {"mater_front", "plate", "rete", "rule", "alidade"}),       # the title is on the back
    ({"latitude": 52.0, "language": "en"}, {"latitude": 90.0, "language": "en"},
     {"mater_front", "rete", "rule", "alidade"}),                # at the pole: no worked example by the Sun
]


@pytest.mark.parametrize("first, second, shared", PAIRS)
def test_a_kept_part_is_the_part_drawn_afresh(first, second, shared):
    reuse.let_go()
    kit_module._NAMELESS.clear()
    a = _nameless(first)
    b = _nameless(second)
    taken = {p.kind for p, q in zip(b.parts, a.parts) if p.elements is q.elements}
    fresh = _fresh(second)
    for kept, drawn in zip(b.parts, fresh.parts):
        assert kept.id == drawn.id
        assert kept.elements == drawn.elements, f"{kept.id} kept differs from the one drawn afresh"
    assert taken == shared


def test_no_reading_context_is_left_in_a_part():
    reuse.let_go()
    kit = _nameless({"latitude": -33.9, "language": "en", "place": "Cape Town"})
    seen = []

    def walk(value):
        if isinstance(value, reuse._Reading):
            seen.append(value)
        elif isinstance(value, dict):
            for v in value.values():
                walk(v)
        elif isinstance(value, (tuple, list)):
            for v in value:
                walk(v)

    for part in kit.parts:
        for el in part.elements:
            walk(el.geom)
            walk(el.values)
    assert not seen
    assert pickle.loads(pickle.dumps(kit.parts)) == kit.parts   # a worker sends parts whole
