"""The README's promises on generated language files and command lines
(#11), not only generated recipes (tests/test_fuzz_recipes.py): whatever
comes in, a run ends with exit status 0, or 2 and one line on stderr (1
would be kitgen's own fault, and fails here), never a traceback, leaves no
partial or temporary file, and takes seconds, not minutes.

Hypothesis draws the inputs; under CI (CI=true, tests/conftest.py) it is
derandomized and draws few examples, so the suite stays quick.
"""

from __future__ import annotations

import contextlib
import io
import json
import os
import string
import tempfile
import time
from importlib import resources
from pathlib import Path

import yaml
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from kitgen.cli import main
from kitgen.errors import EXIT_OK, EXIT_USER
from tests.ci import examples

FEW = settings(max_examples=examples(25, 12), deadline=None,
               suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])
ENGLISH = yaml.safe_load(resources.files("kitgen.templates").joinpath("en.yaml").read_text(encoding="utf-8"))
#: A small kit, quick to build: two parts.
RECIPE = "latitude: 41.4\nepoch: 2027\nparts: [rule, alidade]\n"
SECONDS = 60  # far above any honest run here; a padding spec or a hang would pass it


def _leaves(tree, prefix=""):
    for key, value in tree.items():
        if isinstance(value, dict):
            yield from _leaves(value, f"{prefix}{key}.")
        else:
            yield f"{prefix}{key}"


LEAVES = sorted(k for k in _leaves(ENGLISH) if k not in ("language", "reviewed_by_native_speaker"))

#: Text a translator (or an attacker) may put in a value: placeholders,
#: format specs, conversions, braces, scripts no font draws, controls,
#: bidirectional marks, long runs.
NASTY = st.one_of(
    st.sampled_from(["{k:>999999999}", "{k!r}", "{k.__class__}", "{k[0]}", "{}", "{0}", "{", "}", "{{", "}}",
                     "{k}", "{n}", "天文", "ดาว", "ኮከብ", "\u202e", "\u2068", "\x00", "\x1b[2J", "…", "é" * 700]),
    st.text(alphabet=string.printable + "éß€ΩЖمदअ{}", max_size=40))


def _set(tree: dict, dotted: str, value) -> None:
    *path, last = dotted.split(".")
    for p in path:
        tree = tree.setdefault(p, {}) if isinstance(tree.get(p), dict) else tree.setdefault(p, {})
    tree[last] = value


@st.composite
def language_files(draw):
    """A language file: the English template with a few values replaced,
    keys dropped or added, and maybe another language code."""
    tree = yaml.safe_load(yaml.safe_dump(ENGLISH))
    tree["language"] = draw(st.sampled_from(["en", "ca", "fr", "zh", "th", "am", "he", "xx", "", "en-GB"]))
    for _ in range(draw(st.integers(0, 4))):
        key = draw(st.sampled_from(LEAVES))
        choice = draw(st.integers(0, 4))
        if choice == 0:
            _set(tree, key, draw(NASTY))
        elif choice == 1:
            _set(tree, key, draw(st.lists(NASTY, max_size=3)))
        elif choice == 2:
            _set(tree, key, draw(st.sampled_from([None, 7, True, {"a": "b"}])))
        elif choice == 3:
            _set(tree, key + "_extra", "x")
        else:
            parent = tree
            *path, last = key.split(".")
            for p in path:
                parent = parent.get(p, {}) if isinstance(parent, dict) else {}
            if isinstance(parent, dict):
                parent.pop(last, None)
    if draw(st.booleans()):
        tree["star_names"] = {draw(st.sampled_from(["Sirius", "Vega", "Nope"])): draw(NASTY)}
    return yaml.safe_dump(tree, allow_unicode=True)


def _run(argv, cwd: Path) -> tuple[int, str, float]:
    err, out = io.StringIO(), io.StringIO()
    here = os.getcwd()
    os.chdir(cwd)
    start = time.monotonic()
    try:
        with contextlib.redirect_stderr(err), contextlib.redirect_stdout(out):
            try:
                code = main([str(a) for a in argv])
            except SystemExit as exc:  # argparse's own exits are promises too
                code = exc.code
    finally:
        os.chdir(here)
    return code, err.getvalue(), time.monotonic() - start


def _promises_kept(code, err: str, seconds: float, folder: Path, before: set) -> None:
    lines = [line for line in err.splitlines() if not line.startswith("kitgen: note:")]
    assert code in (EXIT_OK, EXIT_USER), err
    assert "Traceback" not in err
    assert len(lines) == (0 if code == EXIT_OK else 1), err
    assert seconds < SECONDS
    left = {p.name for p in folder.rglob("*")} - before
    assert not [n for n in left if ".kitgen." in n or n.endswith(".part")], left
    if code != EXIT_OK:
        assert not left, left


@FEW
@given(language=language_files())
def test_generated_language_files(language):
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        (folder / "mine.yaml").write_text(language, encoding="utf-8")
        (folder / "r.yaml").write_text(RECIPE + "language_file: mine.yaml\n", encoding="utf-8")
        before = {p.name for p in folder.rglob("*")}
        code, err, seconds = _run(["geometry", "r.yaml", "-o", "out.json"], folder)
        _promises_kept(code, err, seconds, folder, before)
        if code == EXIT_OK:
            assert json.loads((folder / "out.json").read_text(encoding="utf-8"))["format"] == "kitgen-geometry"


TOKENS = st.one_of(st.sampled_from(["r.yaml", ".", "/", "..", "-o", "--force", "--format", "svg",
                                    "json", "a4", "0", "-1", "nan", "inf", "1e400", "9" * 400, "out", "out/x.pdf",
                                    "x" * 300, "é" * 200, "--dpi", "30", "--sheet", "--margin", "--max-mag",
                                    "--epoch", "--name", "--language", "ar", "zz", "r.yaml/", "\u202e", ""]),
                   st.text(alphabet=string.ascii_letters + string.digits + "-./é", max_size=12))


@FEW
@given(command=st.sampled_from(["build", "geometry", "new", "stars", "calibrate", "preview"]),
       rest=st.lists(TOKENS, max_size=5))
def test_generated_command_lines(command, rest):
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        (folder / "r.yaml").write_text(RECIPE, encoding="utf-8")
        before = {p.name for p in folder.rglob("*")}
        code, err, seconds = _run([command, *rest], folder)
        _promises_kept(code, err, seconds, folder, before)
        assert (folder / "r.yaml").read_text(encoding="utf-8") == RECIPE  # never written over
