"""The JSON renderer: the geometry model as the documented contract.

``{"format": "kitgen-geometry", "version": 1, "units": "mm", "epoch": Y,
"parts": [...]}``; each part ``{"kind", "material", "bounds_mm",
"elements": [...]}`` (the plate also ``latitude_deg``), each element its
``shape``, ``role``, shape fields and role values.  Schema: DEVELOPERS.md.
"""

from __future__ import annotations

import json

FORMAT_NAME = "kitgen-geometry"
FORMAT_VERSION = 1


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
    out = {"kind": part.kind, "material": part.material, "bounds_mm": list(part.bounds_mm)}
    out.update({k: _plain(v) for k, v in part.values.items()})
    out["elements"] = [element_dict(e) for e in part.elements]
    return out


def geometry_dict(kit) -> dict:
    return {"format": FORMAT_NAME, "version": FORMAT_VERSION, "units": "mm", "epoch": kit.recipe.epoch,
            "latitude_deg": kit.recipe.latitude_deg, "parts": [part_dict(p) for p in kit.parts]}


def render_json(kit) -> bytes:
    """The kit's geometry as UTF-8 JSON bytes (keys in a fixed order)."""
    return (json.dumps(geometry_dict(kit), ensure_ascii=False, separators=(",", ":")) + "\n").encode("utf-8")
