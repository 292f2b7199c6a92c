"""A leader against the rete's band: whether a segment meets an annulus
(kitgen.parts.labels._segment_meets_ring), worked exactly.

Reference: plane geometry, common practice (no source): a point's
distance from the centre varies continuously along a segment, least at
the foot of the perpendicular from the centre (or at an end) and greatest
at an end, so the segment meets the annulus r0 <= d <= r1 exactly where
its least distance is at most r1 and its greatest at least r0.  The
property test checks that against the segment sampled every micrometre,
away from grazing cases that a sample cannot decide.
"""

import math

from hypothesis import assume, given, strategies as st

from kitgen.parts.labels import _segment_meets_ring

RING = ((0.0, 0.0), 40.0, 45.0)


def test_a_segment_across_the_band_meets_it():
    assert _segment_meets_ring((30.0, 0.0), (50.0, 0.0), RING)


def test_a_segment_wholly_inside_the_inner_circle_does_not():
    assert not _segment_meets_ring((-30.0, 5.0), (30.0, 5.0), RING)


def test_a_segment_wholly_beyond_the_outer_circle_does_not():
    assert not _segment_meets_ring((46.0, -10.0), (46.0, 10.0), RING)


def test_a_chord_of_the_outer_circle_that_stays_outside_the_inner_one_meets_it():
    # both ends beyond the band, its middle 42 mm from the centre: inside the band
    assert _segment_meets_ring((42.0, -30.0), (42.0, 30.0), RING)


def test_a_chord_that_passes_through_the_hole_still_meets_the_band_at_its_ends():
    # from 44 mm out on one side to 44 mm out on the other, through the centre
    assert _segment_meets_ring((-44.0, 0.0), (44.0, 0.0), RING)


def test_a_point_is_a_segment_of_no_length():
    assert _segment_meets_ring((0.0, 42.0), (0.0, 42.0), RING)
    assert not _segment_meets_ring((0.0, 39.0), (0.0, 39.0), RING)


coord = st.floats(-60.0, 60.0, allow_nan=False)


@given(coord, coord, coord, coord, st.floats(5.0, 50.0), st.floats(0.05, 8.0))
def test_agrees_with_the_segment_sampled_every_micrometre(x0, y0, x1, y1, r0, width):
    r1 = r0 + width
    length = math.hypot(x1 - x0, y1 - y0)
    assume(length < 30.0)
    n = max(1, int(length / 0.001))
    dists = [math.hypot(x0 + (x1 - x0) * k / n, y0 + (y1 - y0) * k / n) for k in range(n + 1)]
    # away from grazing (within a micrometre of either circle), where the samples decide
    assume(all(abs(d - r0) > 0.002 and abs(d - r1) > 0.002 for d in (min(dists), max(dists))))
    sampled = any(r0 <= d <= r1 for d in dists)
    assert _segment_meets_ring((x0, y0), (x1, y1), ((0.0, 0.0), r0, r1)) == sampled
