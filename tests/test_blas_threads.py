"""The ``kitgen`` program asks NumPy's BLAS for one thread (#12).

NumPy's wheels carry OpenBLAS, which starts a thread a core as NumPy is
imported unless ``OPENBLAS_NUM_THREADS`` says otherwise (the OpenBLAS
README, "Setting the number of threads using environment variables").
The threads are counted in ``/proc/self/task``, one entry a thread of
the process (Linux proc(5)), after a command that imports NumPy (``kitgen
places``, which reads the gazetteer's arrays) has run through the
program's own entry point, :func:`kitgen.start.run`.
"""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]

pytestmark = pytest.mark.skipif(not Path("/proc/self/task").is_dir(), reason="threads counted in Linux's /proc")

#: ``kitgen places Lyon`` through the program's entry point (or straight
#: through kitgen.cli, which does not ask for one thread), then the
#: process's threads, on the last line.
_COUNT = """
import os, sys
sys.argv = ["kitgen", "places", "Lyon"]
from kitgen.start import run
from kitgen import cli
status = (run if {entry} else cli.main)()
assert status == 0 and "numpy" in sys.modules
print(len(os.listdir("/proc/self/task")))
"""


def _threads(entry: bool, **env) -> int:
    environ = {k: v for k, v in os.environ.items() if not k.endswith(("_NUM_THREADS", "_MAXIMUM_THREADS"))}
    environ.update(env, PYTHONPATH=str(ROOT))
    done = subprocess.run([sys.executable, "-c", _COUNT.format(entry=entry)], env=environ, capture_output=True,
                          text=True, check=True, cwd=ROOT)
    return int(done.stdout.strip().splitlines()[-1])


def _openblas_starts_threads() -> bool:
    """Whether, on this machine, importing NumPy without being asked
    otherwise starts threads: with one core, or a NumPy without OpenBLAS,
    there is nothing for kitgen to prevent."""
    return _threads(False) > 1


def test_the_program_runs_on_one_thread():
    if not _openblas_starts_threads():
        pytest.skip("NumPy starts no BLAS threads here (one core, or no OpenBLAS)")
    assert _threads(True) == 1


def test_the_users_own_setting_is_kept():
    if not _openblas_starts_threads() or (os.cpu_count() or 1) < 2:
        pytest.skip("NumPy starts no BLAS threads here (one core, or no OpenBLAS)")
    assert _threads(True, OPENBLAS_NUM_THREADS="2") == 2
