"""reportlab's C accelerator (rl-accel, #12) changes the speed, never the
bytes: a kit drawn with reportlab's pure-Python functions is the same PDF.

Reference: reportlab's ``reportlab/lib/rl_accel.py``, the interface module
that takes each function (``fp_str``, ``asciiBase85Encode``, the TTF
checksums...) from the C extension ``_rl_accel`` where it imports and
else from its own Python version of the same function; a build in a child
process where that import fails (an entry of ``None`` in ``sys.modules``
makes Python's import raise ImportError, as the language reference's
import system chapter says) takes the Python path.
"""

from __future__ import annotations

import subprocess
import sys

import pytest

RECIPE = {"latitude": -33.9, "language": "es", "epoch": 2027, "sheet": "a5", "owner": "Grupo Astronomía Cerro Azul"}

_BUILD = """
import hashlib, sys
if sys.argv[1] == "python":
    sys.modules["_rl_accel"] = None
from reportlab.lib import rl_accel
print(sorted(rl_accel._c_funcs) and "c" or "python")
from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe
from kitgen.render.pdf import build_pdf
recipe = validate_recipe(%r)
print(hashlib.sha256(build_pdf(build_kit(recipe))[1]).hexdigest())
""" % (RECIPE,)


def _build(path: str) -> tuple[str, str]:
    done = subprocess.run([sys.executable, "-c", _BUILD, path], capture_output=True, text=True, check=True)
    used, digest = done.stdout.split()
    return used, digest


def test_pure_python_path_gives_the_same_pdf():
    # rl-accel is a dependency of kitgen (pyproject.toml): where its wheel
    # installs, reportlab takes its functions from C, and from Python
    # where the C module is hidden; the kit's bytes are the same.
    pytest.importorskip("_rl_accel")
    used_c, with_c = _build("c")
    used_py, with_python = _build("python")
    assert (used_c, used_py) == ("c", "python")
    assert with_c == with_python
