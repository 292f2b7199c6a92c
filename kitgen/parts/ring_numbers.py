"""Numbered ring scales: where the ticks end and the numbers stand.

The mater's back (ecliptic longitude, calendar) and the rete's ecliptic
are laid out alike, from the edge the ticks stand on: the ticks, then a
row of numbers at the tips of the numbered ticks (10 and 20 within each
sign; the days of the month), then the names (signs, months).  No tick
crosses a number or a name except a sign's or a month's first, which
bounds them.  Lengths in mm.
"""

from __future__ import annotations

from .labels import MARGIN_MM

#: Shares of a ring taken by its ticks, from the edge they stand on: a
#: one-degree (one-day) tick, and a 5- or 10-degree (5- or 10-day) tick,
#: at whose tip the number stands.  A sign's or a month's first tick
#: crosses the whole ring.
SHORT_TICK, NUMBERED_TICK = 0.12, 0.18

#: The numbers printed within each zodiac sign (degrees from its start).
SIGN_NUMBERS_DEG = (10, 20)


def digits_height_mm(words, size_pt: float) -> float:
    """Height (mm) of the language's digits at ``size_pt``, measured with
    the real font."""
    return words.measure("".join(words.number(k) for k in range(10)), size_pt).height_mm


def numbers_gap_mm(words, size_pt: float) -> float:
    """The least clear paper (mm) between two numbers of one row: a digit's
    width, so that two neighbours never read as one number (10 and 20 as
    "1020"; common practice on printed scales)."""
    return words.measure(words.number(0), size_pt).width_mm


def number_row(words, size_pt: float, ring_mm: float) -> tuple[float, float]:
    """(from_edge_mm, height_mm): how far from the ticks' edge a ring's row
    of numbers begins (the numbered ticks' tips and the labels' margin),
    and how high its digits are."""
    return NUMBERED_TICK * ring_mm + MARGIN_MM, digits_height_mm(words, size_pt)


def names_from_edge_mm(words, size_pt: float, ring_mm: float) -> float:
    """How far from the ticks' edge the names' room begins: past the row
    of numbers and a margin."""
    lift, h = number_row(words, size_pt, ring_mm)
    return lift + h + MARGIN_MM


def ring_needed_mm(words, size_pt: float, name_height_mm: float) -> float:
    """The least ring width (mm) that holds the ticks, the numbers and a
    name ``name_height_mm`` high with the margin on both sides of it."""
    h = digits_height_mm(words, size_pt)
    return (4 * MARGIN_MM + h + name_height_mm + 0.05) / (1.0 - NUMBERED_TICK)
