"""Skyfield with the DE421 ephemeris carried by the skyfield-data package,
loaded from that package's folder so that no test downloads anything."""

from __future__ import annotations

from functools import lru_cache


@lru_cache(maxsize=1)
def ephemeris():
    """(timescale, DE421 ephemeris); fails loudly rather than download."""
    from skyfield.api import Loader
    from skyfield_data import get_skyfield_data_path

    load = Loader(get_skyfield_data_path(), expire=False)
    return load.timescale(builtin=True), load("de421.bsp")
