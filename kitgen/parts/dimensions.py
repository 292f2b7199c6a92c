"""The sizes of every part, derived from the mater's diameter.

One place holds the proportions, so that every part agrees: the plate fits
inside the limb, the rete's rim is the plates' too, the rule reaches the
hour ring, the alidade spans the back.  Lengths in mm, text sizes in pt.

Text sizes and tick lengths follow the instrument (in proportion to a
180 mm mater, the A4 default) but never go below a legible minimum:

* text: :data:`MIN_TEXT_PT` = 5 pt, the smallest sans-serif most readers
  read unaided on a laser print (common practice in print: legal "fine
  print" rules commonly ask 6 pt or more; 5 pt digits in DejaVu Sans are
  1.3 mm high); titles at least :data:`MIN_TITLE_PT` = 8 pt;
* ticks: :data:`MIN_TICK_MM` = 0.8 mm for the shortest tick, some 8 line
  widths, so a tick reads as a tick and not as a dot.

Line weights follow the same rule in :mod:`kitgen.geometry.style` (no line
under 0.10 mm), and scales too fine for the size are thinned by
:mod:`kitgen.parts.legibility`.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..geometry.style import stroke_width_mm
from ..sky.rete_rim import plate_and_rim_radii_mm, rim_radius_factor, tropic_rim_deg

#: Smallest text printed, pt.  Common practice in print: 5 pt sans-serif is
#: the smallest size most readers can read unaided on a laser print.
MIN_TEXT_PT = 5.0
MIN_TITLE_PT = 8.0
MIN_TICK_MM = 0.8
#: Narrowest ring of the mater's back that carries ticks, numbers and
#: names (the ecliptic-longitude and calendar rings): enough, at the
#: 5 pt minimum, for the tallest sign or month name and the digits of
#: every shipped language (kitgen.parts.ring_numbers.ring_needed_mm,
#: 5.63 mm in Arabic, checked by tests/test_back_and_rete.py).
MIN_NAMED_RING_MM = 5.7
#: The hole for the plumb's thread (Dimensions.hang_hole_mm): at least
#: this across (mm), a doubled sewing thread being well under 1 mm; up to
#: this much card (mm) left between it and the mater's cut edge, where a
#: strip of card 0.3 mm wide tears under a hanging plumb (common
#: practice, no source); the labels' margin (mm) of paper below its line.
THREAD_HOLE_MM = 1.4
HANG_WEB_MM = 1.0
HANG_MARGIN_MM = 0.3


@dataclass(frozen=True)
class Dimensions:
    """The kit's proportions in mm and pt for one mater diameter: the radii
    of the limb's rings, the plate and the rim, the text sizes and the
    tick length (:func:`dimensions`)."""

    mater_radius_mm: float
    limb_inner_radius_mm: float    # inner edge of the hour ring
    hour_ring_outer_mm: float      # between the hour ring and the degree ring
    plate_radius_mm: float         # the plate's cut circle, inside the limb
    outer_tropic_radius_mm: float  # the rete's rim (the outer tropic or beyond); the edge of the plate's drawing
    equator_radius_mm: float
    text_pt: float                 # ordinary label size
    small_text_pt: float
    title_pt: float
    tick_mm: float                 # length of a minor tick
    back_altitude_ring_mm: float   # mater back: inner edge of the altitude scale
    back_zodiac_ring_mm: float     # mater back: between the ecliptic and the calendar scales
    back_calendar_ring_mm: float   # mater back: inner edge of the calendar scale

    @property
    def rim_radius_mm(self) -> float:
        """The rim of the rete and of the plates' drawing (the field's
        older name says outer tropic: the rim lies there or beyond)."""
        return self.outer_tropic_radius_mm

    @property
    def hang_hole_mm(self) -> tuple[float, float]:
        """(y_mm, radius_mm) of the hole for the plumb's thread (#9), on the
        meridian at the top of the mater, the same point through both
        faces: in the outer share of the front's degree ring, above the
        tips of its 5-degree ticks (0.28 of the ring) and of the back's
        10-degree altitude ticks (0.45 of the back's outer ring), with the
        labels' margin (0.3 mm) between the ticks' ends and the hole's cut
        line, and between the hole and the mater's cut edge.  What the
        share holds beyond that goes, in this order of need, to: a hole
        :data:`THREAD_HOLE_MM` across, enough for a thread doubled into a
        loop; up to :data:`HANG_WEB_MM` of card between the hole and the
        cut edge (the cut lines' middles, where the blade runs), which a
        thin strip tears at when the plumb pulls; the margin below made
        paper the ticks' square ends (butt caps) keep from the ink of the
        hole's line; the hole up to 3 mm across.  It is centred in the
        share where that leaves the web wider.  The front's degree 0
        carries no number there."""
        r = self.mater_radius_mm
        lo = self.hour_ring_outer_mm + 0.28 * (r - self.hour_ring_outer_mm)
        lo = max(lo, self.back_altitude_ring_mm + 0.45 * (r - self.back_altitude_ring_mm))
        room = r - lo
        spare = room - THREAD_HOLE_MM - 2 * HANG_MARGIN_MM
        if spare < 0.0:   # a small mater: the hole takes what the margins leave
            return (lo + r) / 2, (room - 2 * HANG_MARGIN_MM) / 2
        web = HANG_MARGIN_MM + min(HANG_WEB_MM - HANG_MARGIN_MM, spare)
        below = HANG_MARGIN_MM + min(stroke_width_mm("cut", self) / 2, spare - (web - HANG_MARGIN_MM))
        across = min(3.0, room - web - below)
        return min((lo + r) / 2, r - web - across / 2), across / 2

    @property
    def scale(self) -> float:
        """Size relative to a 180 mm mater (the A4 default)."""
        return self.mater_radius_mm / 90.0


def dimensions(diameter_mm: float, obliquity_rad: float, rim_deg: float | None = None,
               hemisphere_sign: int = 1) -> Dimensions:
    """Proportions of the kit for a mater of ``diameter_mm``, the epoch's
    obliquity and the rim's declination ``rim_deg`` (degrees, signed; the
    outer tropic when None), which together set the projection's scale."""
    r = diameter_mm / 2.0
    s = r / 90.0
    limb_inner = r * 0.84
    # A gap between the plate's edge and the hour ring holds the slot for the
    # plate's key, so that the key covers no hour tick (kitgen.sky.rete_rim).
    plate, rim = plate_and_rim_radii_mm(diameter_mm)
    if rim_deg is None:
        rim_deg = tropic_rim_deg(hemisphere_sign, obliquity_rad)
    # The rim (declination delta) has radius R tan(pi/4 - sign delta/2):
    # Snyder 1987, eq. 21-33.
    equator = rim / rim_radius_factor(rim_deg, hemisphere_sign)
    return Dimensions(
        mater_radius_mm=r,
        limb_inner_radius_mm=limb_inner,
        hour_ring_outer_mm=r * 0.93,
        plate_radius_mm=plate,
        outer_tropic_radius_mm=rim,
        equator_radius_mm=equator,
        text_pt=max(MIN_TEXT_PT, 6.5 * s),
        small_text_pt=max(MIN_TEXT_PT, 5.2 * s),
        title_pt=max(MIN_TITLE_PT, 11.0 * s),
        tick_mm=max(MIN_TICK_MM, 1.2 * s),
        back_altitude_ring_mm=r * 0.90,
        back_zodiac_ring_mm=r * 0.90 - max(0.10 * r, MIN_NAMED_RING_MM),
        back_calendar_ring_mm=r * 0.90 - max(0.10 * r, MIN_NAMED_RING_MM) - max(0.12 * r, MIN_NAMED_RING_MM),
    )
