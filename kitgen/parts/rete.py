"""The rete, printed on film: the ecliptic and the stars, turned over the plate.

The rete's own frame is the plate's frame when local sidereal time is 0 h:
a point of right ascension ra sits at hour angle -ra.  Turning the rete by
the sidereal time (clockwise in the north) sets the sky for that moment.
Graduations of the ecliptic are placed by projecting each longitude, not by
dividing the ecliptic circle evenly about its own centre (the projection
does not keep angles about that centre).
"""

from __future__ import annotations

import math

import numpy as np

from ..geometry import model
from ..projection.circles import project_circle
from ..projection.stereographic import equatorial_vector, hemisphere_sign, project
from ..sky.ecliptic import ecliptic_to_equatorial_rad
from . import curves, labels
from .context import PartContext


def ecliptic_points_mm(longitude_deg, obliquity_rad, sign, equator_radius_mm):
    """Rete coordinates (mm) of ecliptic longitudes (degrees)."""
    ra, dec = ecliptic_to_equatorial_rad(np.radians(longitude_deg), obliquity_rad)
    return project(-ra, dec, sign, equator_radius_mm)


def rete(ctx: PartContext) -> model.Part:
    s = hemisphere_sign(ctx.recipe.latitude_deg)
    d, w = ctx.dims, ctx.words
    R = d.equator_radius_mm
    eps = ctx.sky.obliquity_rad
    # The film is cut at the plate's edge, a little outside the outer tropic
    # that bounds the drawing, so the ecliptic never runs into the cut line.
    els: list[model.Element] = [model.circle("cut", (0.0, 0.0), d.plate_radius_mm, "cut"),
                                model.circle("rim", (0.0, 0.0), d.outer_tropic_radius_mm, "fine")]

    ecl_pole = equatorial_vector(-math.radians(270.0), math.pi / 2 - eps)
    image = project_circle(ecl_pole, math.pi / 2, s, R)
    c = np.asarray(image.center_mm)
    band = max(3.0, 0.09 * image.radius_mm)
    els.append(model.circle("ecliptic", c, image.radius_mm, "heavy"))
    els.append(model.circle("ecliptic_band", c, image.radius_mm - band, "light"))

    lons = np.arange(0.0, 360.0, 1.0)
    pts = ecliptic_points_mm(lons, eps, s, R)
    for lon, p in zip(lons, pts):
        u = (c - p) / np.linalg.norm(c - p)
        if lon % 30 == 0:
            length = band
        elif lon % 10 == 0:
            length = band * 0.55
        elif lon % 5 == 0:
            length = band * 0.4
        else:
            length = band * 0.22
        els.append(model.segment("ecliptic_tick", p, p + u * length, "light" if lon % 5 else "medium",
                                 at=(float(p[0]), float(p[1])), longitude_deg=float(lon)))
    signs = w.items("zodiac.signs")
    mids = ecliptic_points_mm(np.arange(15.0, 360.0, 30.0), eps, s, R)
    for k, p in enumerate(mids):
        ang = math.degrees(math.atan2(p[1] - c[1], p[0] - c[0]))
        els.append(curves.ring_text("zodiac_label", signs[k], ang, image.radius_mm - band * 0.62,
                                    d.small_text_pt, center=tuple(c), longitude_deg=30.0 * k + 15.0))

    stars = sorted(ctx.sky.stars, key=lambda st: st.star.mag)
    pts = [project(-math.radians(st.ra_deg), math.radians(st.dec_deg), s, R) for st in stars]
    pin_box = (-2.5, -2.5, 2.5, 2.5)  # the pin's crosshair
    places = labels.place_labels(pts, [st.star.label for st in stars], d.small_text_pt, d.tick_mm * 1.3,
                                 keep_out=[pin_box], inside_radius_mm=d.plate_radius_mm,
                                 keep_out_rings=[(tuple(c), image.radius_mm - band, image.radius_mm)])
    for placed, p, (at, anchor) in zip(stars, pts, places):
        els.append(model.point("star", p, "heavy", name=placed.star.label, ra_deg=placed.ra_deg,
                               dec_deg=placed.dec_deg, mag=placed.star.mag))
        els.append(model.text("star_label", at, placed.star.label, d.small_text_pt, anchor=anchor,
                              name=placed.star.label))
    els.append(model.point("pin", (0.0, 0.0), hole="centre"))
    r = d.plate_radius_mm
    return model.Part("rete", "film", tuple(els), (-r, -r, r, r), {}, w("rete.title"))
