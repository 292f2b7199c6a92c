"""How often a kitgen process runs Python's cyclic garbage collector (#12).

A kit's own garbage is freed by reference counting as it goes; the cyclic
collector's passes mostly walk what is loaded for good (modules, fonts,
templates, the catalogue), and their full passes over that heap took 4 to
6 per cent of a class set's time and about 0.08 s of a single
``kitgen build`` (two full passes).  So while a kit or a set is built,
what is loaded is left out of the passes (``gc.freeze``) and the passes
are made rarer (:data:`GC_THRESHOLDS`).
"""

from __future__ import annotations

import gc
from contextlib import contextmanager

#: The collector's thresholds while kits are built (Python's own: 700, 10,
#: 10): a 40-kit set of five schools made 5 full passes and 629 in all,
#: 0.35 s; with these, 1 and 133, 0.08 s, and the same peak memory.
GC_THRESHOLDS = (50_000, 50, 100)


def collect_rarely() -> tuple[int, ...]:
    """Leave what is loaded so far out of the collector's passes
    (``gc.freeze``) and make the passes rarer (:data:`GC_THRESHOLDS`);
    returns the thresholds before."""
    thresholds = gc.get_threshold()
    gc.freeze()
    gc.set_threshold(*GC_THRESHOLDS)
    return thresholds


@contextmanager
def rare_collections():
    """:func:`collect_rarely` within the block, as it was after."""
    thresholds = collect_rarely()
    try:
        yield
    finally:
        gc.set_threshold(*thresholds)
        gc.unfreeze()
