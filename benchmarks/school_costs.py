"""Measure what a school's first kit costs, by latitude, sheet and language:
the tables a class set's workers are dealt by (kitgen.batch.shares,
FIRST_KIT_MS, PLATE_MS, SMALL_FIRST_KIT_MS, SMALL_PLATE_MS and
LANGUAGE_FACTOR).  Only their ratios matter there; measure again when the
parts' drawing changes much, and paste what this prints.

Each kit is built in this warm process, its language read before (the
shares add what reading it costs apart), with no part kept from an
earlier kit (kitgen.parts.reuse let go), the least of three builds a
point (a later latitude a hair away): the whole kit (parts, pages, PDF)
and its plate alone, in milliseconds.  Then two kits a hair away again,
the parts of their family kept from the third (the rete, the maters,
the rule and the alidade): FAMILY_MS is what the lesser saves.

    python3 benchmarks/school_costs.py            # the tables, about 8 minutes
    python3 benchmarks/school_costs.py --quick    # every 15 degrees, for a look
"""

from __future__ import annotations

import argparse
import time

from kitgen import kit as kit_module
from kitgen import parts
from kitgen.batch.work import warm
from kitgen.errors import speaking
from kitgen.layout.pages import layout_kit
from kitgen.parts import reuse
from kitgen.recipe.load import validate_recipe
from kitgen.render.pdf import render_layers

LANGUAGES = ("en", "fr", "de", "es", "pt", "it", "el", "ru", "ar", "hi")
#: The latitudes the language factors are the mean over.
FACTOR_LATITUDES = (-33.1, -20.2, 5.3, 24.6, 38.2, 45.9, 51.4, 59.8)


def _timed_plate():
    """Wrap the plate's builder so that each kit's plate time is kept."""
    spent = {"plate": 0.0}
    draw = parts.PART_BUILDERS["plate"]

    def plate(*args, **kwargs):
        start = time.perf_counter()
        try:
            return draw(*args, **kwargs)
        finally:
            spent["plate"] += time.perf_counter() - start

    parts.PART_BUILDERS["plate"] = plate
    return spent


def _kit_ms(spent, latitude: float, language: str, sheet: str) -> tuple[float, float]:
    """One kit, whole and its plate, in ms."""
    recipe = validate_recipe({"latitude": latitude, "language": language, "owner": "Ann Example", "sheet": sheet})
    spent["plate"] = 0.0
    start = time.perf_counter()
    with speaking(recipe.language, None):
        kit = kit_module.build_kit(recipe)
        render_layers(kit, layout_kit(kit))
    return (time.perf_counter() - start) * 1000.0, spent["plate"] * 1000.0


def _cold_ms(spent, latitude: float, language: str, sheet: str) -> tuple[float, float]:
    """:func:`_kit_ms` with nothing kept from an earlier kit."""
    reuse.let_go()
    kit_module._NAMELESS.clear()
    return _kit_ms(spent, latitude, language, sheet)


def _least(spent, latitude: float, language: str, sheet: str) -> tuple[float, float, float]:
    """The least of three cold builds, whole and its plate, and what the
    lesser of two builds with its family's parts kept saves (ms)."""
    runs = [_cold_ms(spent, latitude + 0.17 * r, language, sheet) for r in (1, 2, 3)]
    # its family's parts kept from the third
    kept = min(_kit_ms(spent, latitude + 0.17 * r, language, sheet)[0] for r in (4, 5))
    kit_ms, plate_ms = min(runs)
    return kit_ms, plate_ms, kit_ms - kept


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="every 15 degrees, not 5")
    args = parser.parse_args()
    step = 15 if args.quick else 5
    warm()
    spent = _timed_plate()
    for language in LANGUAGES:   # each language read before it is timed
        _kit_ms(spent, 12.3, language, "a4")
    latitudes = range(-75, 76, step)
    for name, sheets in (("", ("a4", "letter")), ("SMALL_", ("a5",))):
        rows = [[_least(spent, lat, language, sheet) for language in ("en", "fr") for sheet in sheets]
                for lat in latitudes]
        print(f"{name}FIRST_KIT_MS = {tuple(round(sum(k for k, _, _ in row) / len(row)) for row in rows)}")
        print(f"{name}PLATE_MS = {tuple(round(sum(p for _, p, _ in row) / len(row)) for row in rows)}")
        print(f"{name}FAMILY_MS = {tuple(max(0, round(sum(f for _, _, f in row) / len(row))) for row in rows)}")
    means = {language: sum(_least(spent, lat, language, "a4")[0] for lat in FACTOR_LATITUDES)
             for language in LANGUAGES}
    print("LANGUAGE_FACTOR = {" + ", ".join(f'"{k}": {v / means["en"]:.3g}' for k, v in means.items()) + "}")
    print(f"(latitudes {latitudes.start} to {latitudes.stop - 1} every {step} degrees; "
          f"a later pupil's kit is PUPIL_MS)")


if __name__ == "__main__":
    main()
