"""A pupil's name with glyphs that no character maps to (Devanagari
conjuncts and their half forms) gives the same bytes in a class set as alone
(#12: each kit equals a single ``kitgen build`` of its merged recipe, and
``--jobs`` never changes a byte).

A school's pupils share the school's pages, and each name is drawn after
the names before it in the same process; a glyph without a character of
its own is embedded under a private-use character, which must be the
glyph's whatever was drawn before.  The names are chosen so that a later
pupil's name holds conjuncts that no name before it holds (checked below
with HarfBuzz, through uharfbuzz, the shaping engine's own bindings).
(Arabic needs no such test with the shipped font: Noto Sans Arabic maps
each of its contextual forms to a presentation-form character.)

References: ``kitgen build`` of each merged recipe in a process of its
own (the issue's reproducibility), and HarfBuzz for the glyphs of each
name.
"""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest
import uharfbuzz as hb
import yaml

from kitgen.words import fonts

#: Rosters of an invented Hindi-speaking school (latitude 26.9° N), names
#: invented: conjuncts in the later names only, and in the first name
#: and a later one but not in the one between.
ROSTERS = {
    "later": ["सीता राम", "आरव नक्षत्री", "ऋद्धि क्षत्रिय"],
    "first": ["अनन्या तारकर", "सीता", "श्रेया त्र्यंबक"],
}


def _kitgen(*args):
    env = dict(os.environ, PYTHONPATH=str(Path(__file__).resolve().parents[1]))
    return subprocess.run([sys.executable, "-m", "kitgen", *map(str, args)], capture_output=True, text=True,
                          env=env, timeout=600)


def _glyphs(text: str, face) -> set[int]:
    """The glyph ids HarfBuzz shapes ``text`` into with ``face``'s font."""
    blob = hb.Blob(fonts.font_bytes(face))
    font = hb.Font(hb.Face(blob))
    buf = hb.Buffer()
    buf.add_str(text)
    buf.guess_segment_properties()
    hb.shape(font, buf)
    return {info.codepoint for info in buf.glyph_infos}


def _unmapped(text: str, face) -> set[int]:
    """Of the glyphs of ``text``, those no character maps to."""
    mapped = {fonts._gid_of(face, name) for name in fonts.cmap(face).values()}
    return _glyphs(text, face) - mapped


@pytest.mark.parametrize("roster", sorted(ROSTERS))
def test_each_pupils_kit_is_its_lone_build_and_the_same_with_two_workers(roster, tmp_path):
    pupils = ROSTERS[roster]
    face = fonts.SCRIPT_FACES["Deva"]["label"]
    # the last name brings glyphs without a character that no name before it has
    assert _unmapped(pupils[-1], face) - set().union(*(_unmapped(name, face) for name in pupils[:-1]))
    defaults = {"latitude": 26.9, "epoch": 2027, "language": "hi", "title": "तारामंडल विद्यालय", "diameter_mm": 80,
                "stars": {"brightest": 6}}
    (tmp_path / "set.yaml").write_text(yaml.safe_dump({"defaults": defaults, "roster": "pupils.csv"},
                                                      allow_unicode=True), encoding="utf-8")
    (tmp_path / "pupils.csv").write_text("owner\n" + "\n".join(pupils) + "\n", encoding="utf-8")
    for jobs in (1, 2):
        done = _kitgen("batch", tmp_path / "set.yaml", "-o", tmp_path / f"out-{jobs}", "--jobs", jobs, "--quiet")
        assert done.returncode == 0, done.stderr
    one, two = tmp_path / "out-1", tmp_path / "out-2"
    files = sorted(p.relative_to(one) for p in one.rglob("*") if p.is_file())
    assert files == sorted(p.relative_to(two) for p in two.rglob("*") if p.is_file())
    for name in files:
        assert (one / name).read_bytes() == (two / name).read_bytes(), name
    kits = sorted((one / "kits").iterdir())
    assert len(kits) == len(pupils)
    for k, (pupil, kit) in enumerate(zip(pupils, kits)):
        recipe = tmp_path / f"alone-{k}.yaml"
        recipe.write_text(yaml.safe_dump({**defaults, "owner": pupil}, allow_unicode=True), encoding="utf-8")
        done = _kitgen("build", recipe, "-o", tmp_path / f"alone-{k}.pdf")
        assert done.returncode == 0, done.stderr
        # Reference: `kitgen build` of the same merged recipe, a process of its own.
        assert kit.read_bytes() == (tmp_path / f"alone-{k}.pdf").read_bytes(), pupil
