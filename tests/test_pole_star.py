"""Polaris on every northern rete (#12 review).

A rete of the N brightest named stars (the default, 32) carries Polaris
besides them wherever it fits, that is on every northern rete, and names
it: the star a pupil finds north by, at the pin, is on every northern
planisphere (common practice, no source).  Some 47 named stars outshine
it, so a northern rete reaching far south had left it out (none at 40 N,
where 52.2 N had it).  A southern rete, whose pole is the south pole, has
no room for it.

Reference: Polaris's place from PyEphem's star list (``ephem.star``,
Hipparcos), its mean declination at the epoch from ``ephem.FixedBody``
computed for the epoch's middle, against the rete's ``dec_deg``.
"""

from __future__ import annotations

import ephem
import ephem.stars
import pytest

from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text


def _rete(head: str):
    return build_kit(parse_recipe_text("epoch: 2027\nparts: [rete]\n" + head)).part("rete")


def _pyephem_dec_deg(year: int) -> float:
    body = ephem.star("Polaris")
    body.compute(ephem.Date(f"{year}/7/2"), epoch=ephem.Date(f"{year}/7/2"))
    return float(body.a_dec) * 180.0 / 3.141592653589793


@pytest.mark.parametrize("head", ["latitude: 40\nlanguage: de\n", "latitude: 0.5\n", "latitude: 20\nsheet: a5\n",
                                  "latitude: 33.9\nlanguage: ar\n", "latitude: 64\nsheet: a5\nlanguage: ru\n",
                                  "latitude: 52.2\n",
                                  # a name right beside the pin's crosshair, read from the mark's edge (#12:
                                  # unnamed on these retes, 2.8 mm from its dot and so nearer no other)
                                  "latitude: 40\nsheet: a5\nlanguage: ru\n", "latitude: 45\ndiameter_mm: 100\n",
                                  "latitude: 55\ndiameter_mm: 100\nlanguage: el\n",
                                  "latitude: 35\ndiameter_mm: 100\nlanguage: ar\n",
                                  "latitude: 5\ndiameter_mm: 100\nlanguage: pt\n",
                                  # and with the looser reaches of a first-magnitude star where even so
                                  # another dot stood just past its name's end (#12)
                                  "latitude: 45\ndiameter_mm: 85\n", "latitude: 30\nsheet: a5\nlanguage: ru\n",
                                  "latitude: 15\nsheet: a5\nlanguage: el\n", "latitude: 0.3\nsheet: letter\nlanguage: pt\n"])
def test_a_northern_rete_carries_and_names_polaris(head):
    rete = _rete(head)
    stars = [e for e in rete.elements if e.role == "star"]
    (polaris,) = [e for e in stars if e.values["name"] == "Polaris"]
    assert polaris.stroke != "none"
    assert abs(polaris.values["dec_deg"] - _pyephem_dec_deg(2027)) < 0.02
    assert any(e.role == "star_label" and e.values.get("name") == "Polaris" for e in rete.elements)
    # the 32 brightest besides it: never fewer stars than asked for
    assert len(stars) >= 32


@pytest.mark.parametrize("head", ["latitude: -33.9\n", "latitude: -0.5\n"])
def test_a_southern_rete_has_no_room_for_it(head):
    rete = _rete(head)
    assert not [e for e in rete.elements if e.role == "star" and e.values["name"] == "Polaris"]


def test_a_list_of_names_is_kept_as_given():
    """Stars chosen by name are those names alone: Polaris is not added."""
    rete = _rete("latitude: 40\nstars: [Vega, Deneb, Altair]\n")
    assert sorted(e.values["name"] for e in rete.elements if e.role == "star") == ["Altair", "Deneb", "Vega"]
