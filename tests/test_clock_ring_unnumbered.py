"""The back's clock ring where a run has no room for its number (#12 review).

In a fast season the correction changes by a minute every two or three
days, its runs are narrower than their numbers, and only every second or
third run is numbered (kitgen.parts.clock_scale).  A pupil who lays the
alidade on such a run reads no number there; the clock step of the
instructions then says that the runs step one minute at a time, with a
run of the kit's own ring as the example.  Checked here, on kits north
and south, with and without a site, on four sheets and in five
languages:

* between the clock changes, each run of the ring is one minute from the
  runs either side of it: each run is the days whose correction rounds
  to one whole minute, and the correction changes by less than a minute a
  day, the equation of time by about half a minute a day at most
  (J. Meeus, Astronomical Algorithms, 2nd ed., 1998, ch. 28; checked
  here on the kit's own day-by-day correction, the clock changes apart);
* the instructions carry the sentence exactly when the ring has a run
  without a number (with "except across a heavy bar" where the ring has
  a clock change's bar), and the three numbers it quotes are such a run
  and its neighbours, in date order, on this kit's ring.
"""

from __future__ import annotations

import pytest

from kitgen.kit import build_kit
from kitgen.layout.instructions import story, unnumbered_run
from kitgen.layout.pages import layout_kit
from kitgen.parts.clock_scale import signed
from kitgen.recipe.load import validate_recipe

#: Kits not in the other clock tests: sites' coordinates as commonly given
#: (from memory); only the ring's own arithmetic is checked.
RECIPES = [
    {"latitude": 43.3, "language": "es", "sheet": "A5", "longitude": -8.4, "timezone": "Europe/Madrid"},
    {"latitude": -37.8, "language": "en", "sheet": "Letter", "longitude": 144.96, "timezone": "Australia/Melbourne"},
    {"latitude": 55.75, "language": "ru", "sheet": "A4", "longitude": 37.62, "timezone": "Europe/Moscow"},
    {"latitude": 9.0, "language": "fr", "sheet": "A4"},
    {"latitude": 30.0, "language": "ar", "sheet": "A3", "longitude": 31.2, "timezone": "Africa/Cairo"},
    {"latitude": 47.4, "language": "de", "diameter_mm": 100},
]


@pytest.fixture(scope="module", params=RECIPES, ids=lambda r: f"{r['language']}-{r['latitude']}")
def ring(request):
    kit = build_kit(validate_recipe(dict(request.param, epoch=2027)))
    back = kit.parts_of("mater_back")[0]
    runs = [e.values for e in back.elements if e.role == "clock_run"]
    numbered = {(e.values["month"], e.values["day"]) for e in back.elements if e.role == "clock_number"}
    assert runs, "the ring is drawn on these kits"
    return kit, runs, numbered


def test_the_ring_steps_one_minute_between_clock_changes(ring):
    kit, runs, _ = ring
    daily = [x for _, _, x in kit.plan.almanac.clock_correction]
    steps = [abs(b - a) for a, b in zip(daily, daily[1:] + daily[:1])]
    changes = [s for s in steps if s >= 20.0]   # summer time begins or ends
    # Meeus ch. 28: the equation of time changes by at most about 30 s a day
    assert max(s for s in steps if s < 20.0) < 0.6
    jumps = [abs(r["minutes"] - runs[k - 1]["minutes"]) for k, r in enumerate(runs)]
    other = sorted(j for j in jumps if j != 1)
    # (a change's hour, between two days' corrections each rounded: 59 to 61)
    assert len(other) == len(changes)
    assert all(abs(j - c) <= 1.0 for j, c in zip(other, sorted(changes)))


def test_the_instructions_explain_an_unnumbered_run(ring):
    kit, runs, numbered = ring
    text = "\n".join(b.text for b in story(kit, layout_kit(kit)))
    bare = [k for k, r in enumerate(runs) if (r["from_month"], r["from_day"]) not in numbered]
    got = unnumbered_run(kit)
    assert (got is not None) == bool(bare)
    if got is None:
        return
    w = kit.words
    # across a clock change's bar the step is the change (test_clock_change_bars): said where there is one
    bars = any(e.role == "clock_change" for e in kit.parts_of("mater_back")[0].elements)
    key = "almanac.clock_unnumbered_bars" if bars else "almanac.clock_unnumbered"
    assert w(key, before=signed(w, got[0]), between=signed(w, got[1]), after=signed(w, got[2])) in text
    triples = [(runs[k - 1]["minutes"], runs[k]["minutes"], runs[(k + 1) % len(runs)]["minutes"]) for k in bare]
    assert got in triples
    assert abs(got[1] - got[0]) == 1 and abs(got[2] - got[1]) == 1
