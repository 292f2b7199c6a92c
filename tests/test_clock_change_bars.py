"""The bars across the back's clock ring where the clocks change, against
the IANA time zone database (Python's zoneinfo with tzdata).

Where a zone's clocks change in the epoch year (summer time begins or
ends), the correction jumps by half an hour or an hour from one day to
the next; a heavier bar crosses the whole ring there, at the first day of
the new offset, so that the jump reads as the change it is
(kitgen.parts.clock_scale).  Checked here:

* a bar stands at exactly the dates on which the zone's UTC offset at
  noon differs from the day before's (zoneinfo), north and south, for an
  hour and for Lord Howe Island's half hour, and at none for zones that
  keep one offset all year;
* the bar's date and the minutes either side of it are those of the
  ring's runs that meet there;
* no number of the ring comes within 0.45 mm of a bar's ink (Shapely: the
  number's ink box against the bar's line at its printed width), and the
  bar is drawn heavier than the calendar's month lines beside it;
* each side of a bar has a number for a run within a week of the change,
  so that both sides of the jump are read;
* the instructions' clock step says what the bars mark exactly when the
  ring has one;
* the correction each worked example quotes stands on the ring, as the
  number of the run of the example's date (Chicago's on A5: its 15 March
  run lies between the 14 March bar and the equinox, where the
  horizontal, before it stopped at the ring's inner edge, left no room);
* the horizontal through the centre does not cross the ring (it stops at
  the ring's inner circle), so the numbers at the equinoxes are clear.
"""

from __future__ import annotations

import datetime as dt
import zoneinfo

import pytest
from shapely.geometry import LineString

from kitgen.geometry.style import stroke_width_mm
from kitgen.kit import build_kit
from kitgen.layout.instructions import story
from kitgen.layout.pages import layout_kit
from kitgen.recipe.load import validate_recipe
from tests.geos_lines import text_polygon

EPOCH = 2027

#: (latitude, longitude, IANA zone) of sites on each side of the equator;
#: the coordinates are the towns' as commonly given (from memory): only
#: the zone's rules are checked against the reference.
SITES = {
    "London": (51.5, -0.13, "Europe/London"),
    "Sydney": (-33.87, 151.21, "Australia/Sydney"),
    "Lord Howe Island": (-31.55, 159.08, "Australia/Lord_Howe"),
    "Chicago": (41.88, -87.63, "America/Chicago"),
    "Kolkata": (22.57, 88.36, "Asia/Kolkata"),
    "Johannesburg": (-26.2, 28.05, "Africa/Johannesburg"),
    "Beirut": (33.89, 35.5, "Asia/Beirut"),
}
#: (sheet, language) of the kits: the ring's sizes from A4 to A5, in a
#: left-to-right and a right-to-left script.
KITS = (("a4", "en"), ("a5", "es"), ("letter", "ar"))


def _changes(zone: str, year: int) -> list[tuple[int, int]]:
    """The reference: (month, day) of each day whose UTC offset at noon
    differs from the day before's (zoneinfo, the IANA database)."""
    tz = zoneinfo.ZoneInfo(zone)
    out, day = [], dt.date(year, 1, 1)
    before = dt.datetime(year - 1, 12, 31, 12, tzinfo=tz).utcoffset()
    while day.year == year:
        offset = dt.datetime(day.year, day.month, day.day, 12, tzinfo=tz).utcoffset()
        if offset != before:
            out.append((day.month, day.day))
        before, day = offset, day + dt.timedelta(days=1)
    return out


@pytest.fixture(scope="module", params=[(site, sheet, language) for site in sorted(SITES)
                                        for sheet, language in KITS], ids=lambda p: "-".join(p))
def back(request):
    site, sheet, language = request.param
    latitude, longitude, zone = SITES[site]
    kit = build_kit(validate_recipe({"latitude": latitude, "longitude": longitude, "timezone": zone,
                                     "epoch": EPOCH, "sheet": sheet, "language": language}))
    return zone, kit, kit.part("mater_back")


def test_a_bar_stands_where_the_clocks_change_and_nowhere_else(back):
    zone, _, part = back
    bars = [e for e in part.elements if e.role == "clock_change"]
    assert sorted((e.values["month"], e.values["day"]) for e in bars) == _changes(zone, EPOCH)


def test_the_bar_parts_the_runs_whose_minutes_jump(back):
    """The bar's date is the first day of a run; the run before it ends
    the day before; their minutes are the bar's, and differ by the change
    of offset (30 or 60 minutes, less a minute of the equation of time)."""
    zone, _, part = back
    runs = [e.values for e in part.elements if e.role == "clock_run"]
    for bar in (e.values for e in part.elements if e.role == "clock_change"):
        after = next(r for r in runs if (r["from_month"], r["from_day"]) == (bar["month"], bar["day"]))
        first = dt.date(EPOCH, bar["month"], bar["day"])
        last = first - dt.timedelta(days=1)
        before = next(r for r in runs if (r["to_month"], r["to_day"]) == (last.month, last.day))
        assert (before["minutes"], after["minutes"]) == (bar["minutes_before"], bar["minutes"])
        tz = zoneinfo.ZoneInfo(zone)
        shift_min = (dt.datetime(first.year, first.month, first.day, 12, tzinfo=tz).utcoffset()
                     - dt.datetime(last.year, last.month, last.day, 12, tzinfo=tz).utcoffset()).total_seconds() / 60
        assert abs(after["minutes"] - before["minutes"] - shift_min) <= 1


def test_no_number_of_the_ring_touches_a_bar(back):
    _, kit, part = back
    bars = [e for e in part.elements if e.role == "clock_change"]
    numbers = [e for e in part.elements if e.role == "clock_number"]
    assert numbers
    words = kit.words
    months = {e.stroke for e in part.elements if e.role == "calendar_tick" and e.values["day"] == 1}   # month lines
    assert months
    for bar in bars:
        assert all(stroke_width_mm(bar.stroke, kit.dims) > stroke_width_mm(m, kit.dims) for m in months)
        ink = LineString([bar.geom["from"], bar.geom["to"]]).buffer(stroke_width_mm(bar.stroke, kit.dims) / 2)
        for number in numbers:
            assert text_polygon(number.geom, words).distance(ink) >= 0.45, number.geom["text"]


def test_both_sides_of_a_change_are_numbered(back):
    zone, _, part = back
    numbered = {(e.values["month"], e.values["day"]) for e in part.elements if e.role == "clock_number"}
    runs = [(dt.date(EPOCH, r["from_month"], r["from_day"]), dt.date(EPOCH, r["to_month"], r["to_day"]))
            for r in (e.values for e in part.elements if e.role == "clock_run")
            if (r["from_month"], r["from_day"]) in numbered]   # the numbered runs: their first and last days
    for bar in (e.values for e in part.elements if e.role == "clock_change"):
        change = dt.date(EPOCH, bar["month"], bar["day"])
        after = [first for first, _ in runs if 0 <= (first - change).days <= 7]
        before = [last for _, last in runs if 1 <= (change - last).days <= 7]
        assert after and before, (zone, change)


def test_the_instructions_say_what_the_bars_mark(back):
    _, kit, part = back
    text = "\n".join(b.text for b in story(kit, layout_kit(kit)))
    bars = any(e.role == "clock_change" for e in part.elements)
    assert (kit.words("almanac.clock_bars") in text) == bars


def test_the_worked_examples_corrections_are_on_the_ring(back):
    _, kit, part = back

    numbered = {(e.values["month"], e.values["day"]) for e in part.elements if e.role == "clock_number"}
    runs = [e.values for e in part.elements if e.role == "clock_run"]
    examples = [ex for ex in (kit.plan.examples.sun, kit.plan.examples.star) if ex is not None]
    assert examples
    for ex in examples:
        day = dt.date(EPOCH, ex.month, ex.day)
        run = next(r for r in runs if dt.date(EPOCH, r["from_month"], r["from_day"]) <= day
                   <= dt.date(EPOCH, r["to_month"], r["to_day"]))
        assert run["minutes"] == round(ex.correction_min)
        assert (run["from_month"], run["from_day"]) in numbered


def test_the_horizontal_stops_at_the_ring(back):
    """The horizontal's pieces (the back's level segments through the
    centre's height) reach the ring's inner circle and none runs across
    the ring."""
    _, kit, part = back
    radii = [e.geom["radius"] for e in part.elements if e.role == "clock_edge"]
    inner, outer = min(radii), max(radii)
    level = [sorted((e.geom["from"][0], e.geom["to"][0])) for e in part.elements
             if e.role == "scale_edge" and e.shape == "segment" and e.geom["from"][1] == e.geom["to"][1] == 0.0]
    assert [-inner, inner] in level
    for lo, hi in level:
        assert hi <= -outer or lo >= -inner - 1e-9, (lo, hi)   # clear of the ring's left side
        assert lo >= outer or hi <= inner + 1e-9, (lo, hi)     # and of its right side


def test_the_rings_numbers_stand_apart(back):
    """No two numbers of the ring nearer than a millimetre, ink to ink
    (Shapely: the numbers' ink boxes as printed): with a plain space
    between them, signed numbers of a fast-changing season ran together
    and read as one sum ("+9+10"; common practice, no source: the plate's
    labels keep a millimetre from one another too)."""
    _, kit, part = back
    boxes = [(e.geom["text"], text_polygon(e.geom, kit.words)) for e in part.elements if e.role == "clock_number"]
    for k, (text, box) in enumerate(boxes):
        for other, other_box in boxes[k + 1:]:
            assert box.distance(other_box) >= 0.95, (text, other)


def test_no_more_than_three_runs_in_a_row_go_unnumbered(back):
    """Where the correction changes fast (near the turn of the year), the
    runs are narrower than their numbers and only some can be numbered;
    packed from one to the next in date order, no more than three runs
    in a row are left without one, so that a pupil reads a date's
    correction from a number at most two runs away (common practice, no
    source).  The longest-first order had left four in a row on A5 and
    Letter kits, at 1 mm between numbers as at 0.6 mm."""
    _, _, part = back
    runs = sorted((e.values for e in part.elements if e.role == "clock_run"),
                  key=lambda v: (v["from_month"], v["from_day"]))
    numbered = {(e.values["month"], e.values["day"]) for e in part.elements if e.role == "clock_number"}
    longest = bare = 0
    for run in runs + runs:   # round the turn of the year
        bare = 0 if (run["from_month"], run["from_day"]) in numbered else bare + 1
        longest = max(longest, bare)
    assert longest <= 3
