"""The JSON renderer: the geometry model as the documented contract.

``{"format": "kitgen-geometry", "version": 3, "units": "mm", "epoch": Y,
"latitude_deg": L, "plates": [...], "parts": [...]}``; each plate ``{"id",
"latitude_deg", "place"}``; each part ``{"id", "kind", "material",
"bounds_mm", "elements": [...]}`` (a plate also ``latitude_deg``, ``place``
and ``number``), each element its ``shape``, ``role``, shape fields and
role values.  Schema and changes from versions 1 and 2: DEVELOPERS.md.
"""

from __future__ import annotations

import json

from ..sky.site_almanac import hh_mm

FORMAT_NAME = "kitgen-geometry"
FORMAT_VERSION = 3


def _plain(value):
    if isinstance(value, tuple):
        return [_plain(v) for v in value]
    if isinstance(value, float):
        return float(value)
    return value


def element_dict(el) -> dict:
    out = {"shape": el.shape, "role": el.role}
    out.update({k: _plain(v) for k, v in el.geom.items()})
    out.update({k: _plain(v) for k, v in el.values.items()})
    if el.shape != "text":
        out["stroke"] = el.stroke
    return out


def part_dict(part) -> dict:
    out = {"id": part.id, "kind": part.kind, "material": part.material, "bounds_mm": list(part.bounds_mm)}
    out.update({k: _plain(v) for k, v in part.values.items()})
    out["elements"] = [element_dict(e) for e in part.elements]
    return out


def geometry_dict(kit) -> dict:
    plan = kit.plan
    plates = [{"id": p.id, "latitude_deg": p.latitude_deg, "place": p.place} for p in plan.plates]
    return {"format": FORMAT_NAME, "version": FORMAT_VERSION, "units": "mm", "epoch": plan.epoch,
            "latitude_deg": plan.latitude_deg, "plates": plates, "parts": [part_dict(p) for p in kit.parts],
            **site_and_almanac(kit)}


def site_and_almanac(kit) -> dict:
    """The ``site`` and ``almanac`` keys (#10): where the kit is for, and
    its clock correction and sunrise and sunset table for the epoch year,
    as the plan resolved them (kitgen.plan.resolve)."""
    s, almanac = kit.plan.site, kit.plan.almanac
    return {
        "site": {"latitude_deg": s.latitude_deg, "longitude_deg": s.longitude_deg, "timezone": s.timezone,
                 "place": s.place},
        "almanac": {
            "time": almanac.time,
            "clock_correction": [{"month": m, "day": d, "minutes": round(x, 3)}
                                 for m, d, x in almanac.clock_correction],
            "sun_rise_set": [{"month": r.month, "day": r.day, "rise": r.rise, "set": r.set,
                              "day_length": hh_mm(r.day_length_whole_min) if r.day_length_min < 1440 else "24:00",
                              "reason": r.reason} for r in almanac.sun_rise_set],
        },
    }


def render_json(kit) -> bytes:
    """The kit's geometry as UTF-8 JSON bytes (keys in a fixed order)."""
    return (json.dumps(geometry_dict(kit), ensure_ascii=False, separators=(",", ":")) + "\n").encode("utf-8")
