"""The commented starter recipe that ``kitgen new`` writes, made from the
key table so that it always lists exactly the keys the loader accepts."""

from __future__ import annotations

import yaml

from .schema import KEYS, current_year

_HEADER = """\
# A kitgen recipe: one astrolabe kit.  Change what you need, then run
#   kitgen build THIS-FILE.yaml
# Only 'latitude' is required; the other values below are examples.
"""


def starter_recipe() -> str:
    lines = [_HEADER]
    for key in KEYS:
        example = current_year() if key.name == "epoch" else key.example
        value = yaml.safe_dump({key.name: example}, default_flow_style=True, sort_keys=False,
                               allow_unicode=True).strip()[1:-1]
        if key.name in ("diameter_mm", "language_file", "plates", "rete_limit_deg"):  # defaults worth keeping
            value = "# " + value
        lines.append(f"# {key.help}\n{value}\n")
    return "\n".join(lines)
