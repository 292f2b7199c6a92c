"""The shipped bright-star catalogue against outside references.

References:
- PyEphem's star list ``ephem.stars.db`` (115 entries, 2 of them names
  for one star several times): J2000 places at epoch J2000.0 computed by
  its author from the original Hipparcos catalogue (ESA 1997, VizieR
  I/239) with Skyfield, and the V magnitudes of that catalogue.
- ERFA (pyerfa): ``erfa.pmsafe`` (space motion) and ``erfa.pmat06``
  (IAU 2006 bias-precession matrix), for places at other epochs.
"""

from __future__ import annotations

import math

import ephem
import ephem.stars
import erfa
import numpy as np
import pytest

from kitgen.errors import UserError
from kitgen.recipe.load import parse_recipe_text
from kitgen.sky.stars import catalogue, closest_name, find_star, named_stars, outside, places_at_epoch, select_stars

ARCSEC_PER_RAD = 180.0 / math.pi * 3600.0
MATCH_RADIUS_ARCSEC = 60.0


def _unit(ra_deg, dec_deg):
    ra, dec = np.radians(ra_deg), np.radians(dec_deg)
    return np.stack([np.cos(dec) * np.cos(ra), np.cos(dec) * np.sin(ra), np.sin(dec)], axis=-1)


def _ephem_entries():
    """(name, ra_deg, dec_deg, V mag) of every PyEphem star, J2000."""
    out = []
    for name in ephem.stars.stars:
        body = ephem.stars.star(name)
        body.compute("2000/1/1 12:00", epoch="2000/1/1 12:00")
        out.append((name, math.degrees(body._ra), math.degrees(body._dec), float(body.mag)))
    return out


@pytest.fixture(scope="module")
def matches():
    """For each PyEphem star: the catalogue star nearest to it (or None if
    none within 1 arcmin), and the separation in arcsec.  A PyEphem name
    that is also one of ours must name the star at that position."""
    cat = catalogue()
    vectors = _unit([s.ra_deg for s in cat], [s.dec_deg for s in cat])
    found = []
    for name, ra, dec, vmag in _ephem_entries():
        cosines = vectors @ _unit(ra, dec)
        i = int(np.argmax(cosines))
        sep = math.acos(min(1.0, float(cosines[i]))) * ARCSEC_PER_RAD
        star = cat[i] if sep <= MATCH_RADIUS_ARCSEC else None
        try:
            by_name = find_star(name)
        except UserError:
            by_name = None
        if by_name is not None:
            assert by_name == star, f"our {name!r} is HIP {by_name.hip}, PyEphem's {name!r} is elsewhere"
        found.append((name, ra, dec, vmag, star, sep))
    return found


def test_j2000_places_agree_with_pyephem(matches):
    # PyEphem's places come from the 1997 Hipparcos reduction, ours from
    # the 2007 one; both carried from J1991.25 to J2000.0.  The two
    # reductions differ by ~1 mas in place and ~1-3 mas/yr in proper
    # motion for most stars, hence ~0.03" at J2000; for binaries whose
    # orbital solution changed (Castor, Alhena) by up to ~16 mas/yr, hence
    # 0.17" measured.  PyEphem stores RA to 1e-8 h and Dec to 1e-8 deg, far
    # below that.  Tolerance 0.25" (measured maximum 0.17", Alhena).
    seps = [sep for *_, star, sep in matches if star is not None]
    assert len(seps) >= 95
    assert max(seps) < 0.25, max(seps)
    assert float(np.median(seps)) < 0.03


def test_magnitudes_agree_with_pyephem_v(matches):
    # Ours is the Hipparcos broad-band Hp, PyEphem's the Johnson V of the
    # Hipparcos main catalogue.  Hp - V runs from about -0.1 (hot blue
    # stars) to about +0.2 (K giants) for these stars, +0.35 for Sirius;
    # red variables can differ further.  Tolerance 0.5 mag (measured
    # maximum 0.35, Sirius), as a check that no star is misidentified.
    diffs = [(abs(star.mag - vmag), name) for name, _, _, vmag, star, _ in matches if star is not None]
    worst = max(diffs)
    assert worst[0] <= 0.5, worst


def test_catalogue_is_complete_against_pyephem(matches):
    # Hp < 3.5 over the whole sky: about 270 stars (the catalogue is all-sky,
    # so every declination is in range).
    assert 250 <= len(catalogue()) <= 350
    missing = [name for name, _, _, vmag, star, _ in matches if vmag < 3.0 and star is None]
    assert missing == []
    # Each catalogue name is used once.
    names = [s.name.casefold() for s in named_stars()]
    assert len(names) == len(set(names))


#: 20 stars spread over the sky, with the largest proper motions (Rigil
#: Kentaurus, Toliman, Arcturus, Sirius, Procyon) and the one nearest a pole
#: (Polaris).
ERFA_STARS = (
    "Sirius", "Canopus", "Rigil Kentaurus", "Toliman", "Arcturus", "Vega", "Capella", "Rigel", "Procyon",
    "Achernar", "Betelgeuse", "Altair", "Acrux", "Aldebaran", "Spica", "Antares", "Fomalhaut", "Deneb",
    "Polaris", "Miaplacidus",
)


@pytest.mark.parametrize("epoch_year", [1950.0, 2026.0, 2075.0])
def test_places_at_epoch_agree_with_erfa(epoch_year):
    # ERFA: pmsafe carries the J2000.0 place to the epoch (parallax and
    # radial velocity zero, as the catalogue's proper motion alone is what
    # kitgen applies); pmat06 is the IAU 2006 bias-precession matrix at the
    # epoch's TT.  kitgen neglects the 23 mas ICRS-to-J2000 frame bias, so
    # about 0.023" of difference is expected; tolerance 0.05".
    stars = [find_star(n) for n in ERFA_STARS]
    ra_deg, dec_deg = places_at_epoch(stars, epoch_year)

    ra0 = np.radians([s.ra_deg for s in stars])
    dec0 = np.radians([s.dec_deg for s in stars])
    mas = math.radians(1.0 / 3.6e6)
    pmr = np.array([s.pm_ra_cosdec_mas_yr for s in stars]) * mas / np.cos(dec0)
    pmd = np.array([s.pm_dec_mas_yr for s in stars]) * mas
    j2000a, j2000b = erfa.epj2jd(2000.0)
    epa, epb = erfa.epj2jd(epoch_year)
    with np.errstate(all="ignore"), pytest.warns(erfa.ErfaWarning):
        # zero parallax: pmsafe warns and uses its minimum parallax
        ra1, dec1, *_ = erfa.pmsafe(ra0, dec0, pmr, pmd, 0.0, 0.0, j2000a, j2000b, epa, epb)
    p = erfa.s2c(ra1, dec1) @ erfa.pmat06(epa, epb).T
    ra_ref, dec_ref = erfa.c2s(p)
    ra_ref = erfa.anp(ra_ref)

    dra_arcsec = ((np.radians(ra_deg) - ra_ref + math.pi) % (2 * math.pi) - math.pi) * np.cos(dec_ref)
    dra_arcsec *= ARCSEC_PER_RAD
    ddec_arcsec = (np.radians(dec_deg) - dec_ref) * ARCSEC_PER_RAD
    assert np.max(np.abs(dra_arcsec)) < 0.05, np.max(np.abs(dra_arcsec))
    assert np.max(np.abs(ddec_arcsec)) < 0.05, np.max(np.abs(ddec_arcsec))
    # The precession over the interval itself is far larger (50"/yr), so a
    # missing precession or proper motion step could not pass.
    moved = np.max(np.abs(np.radians(dec_deg) - dec0)) * ARCSEC_PER_RAD
    assert moved > 20.0 * abs(epoch_year - 2000.0) / 26.0


def test_find_star_suggests_a_close_name():
    assert find_star("Betelguese") is None and closest_name("Betelguese") == "Betelgeuse"
    assert closest_name("Rigel Kent") == "Rigil Kentaurus"
    with pytest.raises(UserError) as err:
        parse_recipe_text("latitude: 48\nstars: [Vega, Betelguese]\n")
    message = str(err.value)
    assert message == "recipe, line 2: 'stars': unknown star 'Betelguese'; did you mean 'Betelgeuse'?"
    assert "\n" not in message
    # Case, accents and spacing do not matter; HIP numbers work.
    assert find_star("  fómalhaut ").name == "Fomalhaut"
    assert find_star("hip 32349").name == "Sirius"
    assert find_star("HIP 71681").name == "Toliman"


def test_named_star_outside_the_rete_is_refused():
    # PyEphem: Acrux's declination at 2026 is about -63 deg, Sirius's about
    # -16.7 deg; a rete reaching down to -40 deg holds Sirius, not Acrux.
    acrux = ephem.star("Acrux")
    acrux.compute("2026/1/1", epoch="2026/1/1")
    assert math.degrees(acrux.a_dec) < -40.0

    def fits(ra_deg, dec_deg):
        return np.asarray(dec_deg) > -40.0

    assert [s.name for s in select_stars(("sirius", "Sirius"), None, None, 2026, fits)] == ["Sirius"]
    assert outside(("Sirius", "Acrux"), 2026, fits) == ["Acrux"]
    # A northern rete reaches down to about -21.4 deg (the Tropic of
    # Capricorn less the rim's margin), so the recipe refuses Acrux there.
    with pytest.raises(UserError, match=r"^recipe, line 2: 'stars': star 'Acrux' is outside the rete for this "
                                        r"latitude; 'rete_limit_deg: -\d+' takes the rete's rim far enough"):
        parse_recipe_text("latitude: 48\nstars: [Sirius, Acrux]\n")
    # The five brightest named stars that fit are PyEphem's five brightest
    # in V north of -40 deg (Hp orders them slightly differently).
    ephem_bright = sorted((v, n) for n, _, dec, v in _ephem_entries() if dec > -40.0)
    ephem_five = {find_star(n).name for _, n in ephem_bright[:5]}
    brightest = select_stars((), 5, None, 2026, fits)
    assert {s.name for s in brightest} == ephem_five
    assert [s.mag for s in brightest] == sorted(s.mag for s in brightest)
    faint = select_stars((), None, 3.0, 2026, fits)
    assert any(not s.name for s in faint) and all(s.mag <= 3.0 for s in faint)
