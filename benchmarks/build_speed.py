"""Benchmark: how long one kit takes, stage by stage, and its peak memory.

Run: python3 benchmarks/build_speed.py [N]
Speed and memory targets are checked here, never in a timed test.  The
target for class sets: a kit's geometry in well under a second and its PDF
in about a second on one core, so that hundreds of kits take minutes.
"""

from __future__ import annotations

import sys
import time
import tracemalloc

from kitgen.kit import build_kit
from kitgen.layout.pages import layout_kit
from kitgen.recipe.load import validate_recipe
from kitgen.render.json_export import render_json
from kitgen.render.pdf import render_pdf

TARGET_BUILD_S = 0.5
TARGET_PDF_S = 2.0
#: The pages of the largest kit a recipe may ask for, tiled small: a 600 mm
#: mater with eight plates on a 132 mm square sheet (about 460 pages; its
#: packings had taken 87 s before the page search's tests were bounded and
#: each material laid out once, kitgen.layout.packing.MAX_SEARCH_TESTS).
TILED_RECIPE = {"plates": [0, 10, 20, 30, 45, 60, 75, 89], "diameter_mm": 600,
                "sheet": {"width_mm": 132, "height_mm": 132}, "margin_mm": 6, "epoch": 2027}
TARGET_TILED_LAYOUT_S = 5.0


def tiled_layout_s() -> tuple[float, int]:
    """Seconds to lay out :data:`TILED_RECIPE`'s pages, and how many."""
    kit = build_kit(validate_recipe(TILED_RECIPE))
    t0 = time.perf_counter()
    pages = layout_kit(kit)
    return time.perf_counter() - t0, len(pages)


def main(n: int = 10) -> int:
    lats = [-80 + 160 * k / max(1, n - 1) for k in range(n)]
    t_build = t_pdf = t_json = 0.0
    tracemalloc.start()
    for lat in lats:
        recipe = validate_recipe({"latitude": lat, "epoch": 2027})
        t0 = time.perf_counter()
        kit = build_kit(recipe)
        t1 = time.perf_counter()
        pdf = render_pdf(kit, layout_kit(kit))
        t2 = time.perf_counter()
        render_json(kit)
        t3 = time.perf_counter()
        t_build, t_pdf, t_json = t_build + t1 - t0, t_pdf + t2 - t1, t_json + t3 - t2
    _, peak = tracemalloc.get_traced_memory()
    print(f"kits: {n}; per kit: geometry {t_build / n:.3f} s, PDF {t_pdf / n:.3f} s "
          f"({len(pdf) / 1024:.0f} KiB), JSON {t_json / n:.3f} s; peak traced memory {peak / 2**20:.1f} MiB")
    tracemalloc.stop()   # (it slows Python's allocations many times over)
    tiled_s, tiled_pages = tiled_layout_s()
    print(f"the largest tiled kit: {tiled_pages} pages laid out in {tiled_s:.1f} s "
          f"(target {TARGET_TILED_LAYOUT_S:.0f} s)")
    ok = t_build / n < TARGET_BUILD_S and t_pdf / n < TARGET_PDF_S and tiled_s < TARGET_TILED_LAYOUT_S
    print("within targets" if ok else "OVER TARGET")
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main(int(sys.argv[1]) if len(sys.argv) > 1 else 10))
