"""Fuzzing: thousands of generated recipes, well-formed, malformed and
hostile, thrown at the loader, and a few hundred at the builder and the
command.  Each gives either a valid result or a clean one-line
:class:`UserError` (exit status 2 from the command) with nothing left
behind; never any other exception.

The strategies are built from the recipe's own key table (``KEYS``), so a
new key is fuzzed as soon as it is added.
"""

from __future__ import annotations

import math
import string

import pytest
import yaml
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from kitgen.errors import UserError
from kitgen.kit import build_kit
from kitgen.layout.pages import layout_kit
from kitgen.recipe.load import load_recipe, parse_recipe_text
from kitgen.recipe.schema import KEYS, KEYS_BY_NAME, Recipe
from kitgen.sky.stars import named_stars
from kitgen.words.templates import available_languages, load_words
from tests.ci import examples

from .test_every_latitude import check_all_finite_and_inside

#: The error line's opening in every language (the templates' errors.report):
#: a recipe's error is told in its own language once the recipe names one.
ERROR_PREFIXES = tuple(load_words(code).template("errors.report").split("{message}")[0]
                       for code in available_languages())

SOURCE = "fuzz.yaml"


def cases(local: int, ci: int):
    """Hypothesis settings for ``local`` examples (``ci`` in CI, tests/ci.py),
    with no per-example deadline (a build takes tens of milliseconds)."""
    return settings(max_examples=examples(local, ci), deadline=None,
                    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large,
                                           HealthCheck.function_scoped_fixture])

# -- well-formed values, from the key table ----------------------------------------------------



def _drawable() -> str:
    """Characters every style of the always-present fallback font draws:
    text made of them is well-formed for any language."""
    import unicodedata

    from kitgen.words import fonts

    return "".join(chr(c) for c in range(0x20, 0x2200)
                   if unicodedata.category(chr(c)) not in ("Cc", "Cs", "Cf")
                   and all(fonts.has_char(fonts.DEJAVU[style], chr(c)) for style in fonts.STYLES))


PRINTABLE = st.text(st.sampled_from(_drawable()), max_size=120)
STAR_NAMES = [s.name for s in named_stars()]


def _latitudes():
    def dms(d, m, s, hemi, form):
        return form.format(d=d, m=m, s=s, h=hemi)

    forms = ["{d}°{m}′{s}″{h}", "{d} {m} {s} {h}", "{d}d{m}m{s}s{h}", "{d}°{m}'{s}\"{h}", "{h} {d} {m} {s}"]
    written = st.builds(dms, st.integers(0, 89), st.integers(0, 59), st.integers(0, 59), st.sampled_from("NS"),
                        st.sampled_from(forms))
    return st.one_of(st.floats(-90, 90, allow_nan=False), st.integers(-90, 90), written)


def _value(key):
    """A strategy of valid values for one key of the table."""
    if key.kind == "latitude":
        return _latitudes()
    if key.kind == "integer":
        return st.integers(int(key.low), int(key.high))
    if key.kind == "number":
        return st.floats(key.low, key.high, allow_nan=False)
    if key.kind == "bool":
        return st.booleans()
    if key.kind == "choice":
        return st.sampled_from(key.choices)
    if key.kind == "parts":
        return st.lists(st.sampled_from(key.choices), min_size=1, max_size=len(key.choices), unique=True)
    if key.kind == "stars":
        return st.one_of(st.lists(st.sampled_from(STAR_NAMES), min_size=1, max_size=25),
                         st.builds(lambda n: {"brightest": n}, st.integers(1, 200)),
                         st.builds(lambda m: {"magnitude_limit": m}, st.floats(-2.0, 3.5)))
    if key.name == "language":
        return st.sampled_from(available_languages())
    if key.name == "language_file":
        return None  # needs a file of its own; see test_bad_input_hostile
    if key.kind == "plates":
        return None  # stands instead of 'latitude'; see test_plates.py
    if key.kind == "string":
        return PRINTABLE
    if key.name == "sheet":
        return st.sampled_from(key.choices)
    if key.kind == "parsed":
        return st.just(key.example)
    raise AssertionError(f"no strategy for key kind {key.kind!r}")


VALUES = {k.name: v for k in KEYS if (v := _value(k)) is not None}


@st.composite
def well_formed(draw) -> dict:
    names = draw(st.lists(st.sampled_from(sorted(set(VALUES) - {"latitude"})), unique=True, max_size=8))
    tree = {"latitude": draw(VALUES["latitude"])}
    for name in names:
        tree[name] = draw(VALUES[name])
    # A longitude and a time zone go together (#10): one alone is refused.
    for name, partner in (("longitude", "timezone"), ("timezone", "longitude")):
        if name in tree and partner not in tree:
            tree[partner] = draw(VALUES[partner])
    return tree


def dump(tree) -> str:
    return yaml.safe_dump(tree, allow_unicode=True, sort_keys=False)


# -- malformed and hostile ------------------------------------------------------------------

def _near_miss(name: str):
    return st.builds(lambda i, c: name[:i] + c + name[i + 1:], st.integers(0, len(name) - 1),
                     st.sampled_from(string.ascii_lowercase + "_"))


ANY_SCALAR = st.one_of(st.none(), st.booleans(), st.integers(), st.integers(min_value=10 ** 30),
                       st.floats(), st.text(max_size=30), st.sampled_from(["40,5", ".nan", "1e400", "-0", ""]))
ANY_VALUE = st.recursive(ANY_SCALAR, lambda ch: st.lists(ch, max_size=6) | st.dictionaries(
    st.text(max_size=10), ch, max_size=3), max_leaves=8)
ANY_KEY = st.one_of(st.sampled_from(list(KEYS_BY_NAME)), st.sampled_from(list(KEYS_BY_NAME)).flatmap(_near_miss),
                    st.text(max_size=20))


@st.composite
def malformed(draw) -> dict:
    tree = draw(well_formed()) if draw(st.booleans()) else {}
    for key, value in draw(st.dictionaries(ANY_KEY, ANY_VALUE, min_size=1, max_size=4)).items():
        tree[key] = value
    return tree


SNIPPETS = ["&a ", "*a", "!!python/object/apply:os.system ['true'] ", "!!binary ", "[", "]", "{", "}", ":", ": ",
            "\t", "\x00", "\ufeff", "<<: ", "---\n", "...\n", "'", '"', "\n  ", "\n- ", "# ", "%YAML 1.1\n",
            "%TAG ! tag:x,2000:\n", "? ", "|\n", ">-\n", ",", "\\", "\u202e", "\r", "0x", "1" * 50, "\udc80"]


@st.composite
def mutated_text(draw) -> str:
    text = dump(draw(well_formed()))
    for _ in range(draw(st.integers(1, 4))):
        i = draw(st.integers(0, len(text)))
        j = min(len(text), i + draw(st.integers(0, 5)))
        piece = draw(st.one_of(st.sampled_from(SNIPPETS), st.text(max_size=8)))
        text = text[:i] + piece + text[j:]
    return text


@st.composite
def hostile_text(draw) -> str:
    kind = draw(st.sampled_from(["laughs", "nest_list", "nest_map", "long_list", "long_text", "many_keys",
                                 "tags", "huge_number"]))
    base = "latitude: 40\n"
    # Sizes past every limit (8 levels, 200 stars, 120 characters ...).
    n = draw(st.integers(70, 1000))
    if kind == "laughs":
        width = draw(st.integers(2, 12))
        rows = [f"a0: &a0 [{', '.join(['lol'] * width)}]"]
        rows += [f"a{k}: &a{k} [{', '.join([f'*a{k - 1}'] * width)}]" for k in range(1, draw(st.integers(2, 12)))]
        return base + "\n".join(rows) + "\n"
    if kind == "nest_list":
        return base + "title: " + "[" * n + "]" * n + "\n"
    if kind == "nest_map":
        return base + "title: " + "{a: " * n + "1" + "}" * n + "\n"
    if kind == "long_list":
        return base + "stars: [" + ", ".join(["Vega"] * n * 3) + "]\n"
    if kind == "long_text":
        return base + "title: '" + "W" * (n * 100) + "'\n"
    if kind == "many_keys":
        return base + "".join(f"k{k}: {k}\n" for k in range(n))
    if kind == "tags":
        tag = draw(st.sampled_from(["!!python/object/apply:os.system", "!!python/name:os.system",
                                    "!!python/object/new:list", "!!set", "!!omap", "!!timestamp", "!!binary",
                                    "!local", "!<tag:x.org,2000:y>"]))
        return base + f"title: {tag} [1]\n"
    return base + "epoch: 9" + "9" * (n * 3) + "\n"


# -- the checks ------------------------------------------------------------------------------

def clean(exc: UserError) -> None:
    msg = str(exc)
    assert "\n" not in msg and "\r" not in msg, msg[:200]
    assert msg.startswith(SOURCE), msg[:200]
    assert 0 < len(msg) < 1000, msg[:200]
    assert "Traceback" not in msg


def load_text(text: str):
    """A Recipe, or ``None`` after a clean UserError; any other exception fails."""
    try:
        return parse_recipe_text(text, SOURCE)
    except UserError as exc:
        clean(exc)
        return None


# -- the loader: thousands -------------------------------------------------------------------

@cases(800, 300)
@given(tree=well_formed())
def test_loader_accepts_every_well_formed_recipe(tree):
    try:
        recipe = parse_recipe_text(dump(tree), SOURCE)
    except UserError as exc:
        # Named stars that a rete of the latitude's hemisphere cannot carry,
        # a magnitude limit brighter than every star on the rete, and a
        # margin that leaves too little of a small sheet for the check bar
        # are the refusals a well-formed recipe may meet.
        if exc.message.key == "errors.stars_none_selected":
            return
        problem = exc.message.values.get("problem")
        assert problem is not None and problem.key in ("errors.star_outside", "errors.stars_outside",
                                                       "errors.sheet_margin"), exc
        return
    assert isinstance(recipe, Recipe)
    if isinstance(tree["latitude"], (int, float)):
        assert recipe.latitude_deg == pytest.approx(tree["latitude"], abs=1e-12)
    assert -90.0 <= recipe.latitude_deg <= 90.0 and math.isfinite(recipe.latitude_deg)
    for name, value in tree.items():
        key = KEYS_BY_NAME[name]
        got = getattr(recipe, key.attr)
        if key.kind in ("number", "integer", "bool", "choice") or key.name == "language":
            assert got == value
        elif key.kind == "parts":
            assert list(got) == value


@cases(700, 250)
@given(tree=malformed())
def test_loader_malformed_recipes(tree):
    try:
        text = dump(tree)
    except yaml.YAMLError:
        assume(False)
    load_text(text)


@cases(1000, 400)
@given(text=st.one_of(mutated_text(), st.text(max_size=200)))
def test_loader_mutated_and_random_text(text):
    load_text(text)


@cases(150, 80)
@given(text=hostile_text())
def test_loader_hostile_recipes_are_refused(text):
    """Hostile recipes never load: each is refused, the well-formed head
    ``latitude: 40`` notwithstanding."""
    assert load_text(text) is None


@cases(150, 80)
@given(data=st.one_of(st.binary(max_size=300), mutated_text().map(lambda t: t.encode("utf-8", "surrogatepass"))))
def test_loader_bytes_from_a_file(tmp_path_factory, data):
    p = tmp_path_factory.mktemp("fuzz") / SOURCE
    p.write_bytes(data)
    try:
        load_recipe(p)
    except UserError as exc:
        assert "\n" not in str(exc) and str(exc).startswith(str(p))


# -- the builder: a few hundred --------------------------------------------------------------

@cases(200, 30)
@given(tree=well_formed())
def test_builder_gives_a_valid_kit_or_a_clean_error(tree):
    try:
        recipe = parse_recipe_text(dump(tree), SOURCE)
        kit = build_kit(recipe)
        pages = layout_kit(kit)
    except UserError as exc:
        assert "\n" not in str(exc)
        return
    assert {p.kind for p in kit.parts} == set(recipe.parts)
    check_all_finite_and_inside(kit)
    assert pages and all(math.isfinite(v) for page in pages for pl in page.placements for v in pl.box_mm)


# -- the command: nothing left behind --------------------------------------------------------

@cases(12, 12)
@given(text=st.one_of(well_formed().map(dump), mutated_text(), hostile_text()))
def test_command_writes_a_pdf_or_nothing(tmp_path_factory, capsys, text):
    from kitgen.cli import main

    folder = tmp_path_factory.mktemp("cmd")
    recipe = folder / "r.yaml"
    recipe.write_text(text, encoding="utf-8", errors="surrogatepass")
    code = main(["build", str(recipe), "-o", str(folder / "kit.pdf")])
    err = capsys.readouterr().err
    assert "Traceback" not in err
    if code == 0:
        assert (folder / "kit.pdf").read_bytes().startswith(b"%PDF-")
        assert sorted(p.name for p in folder.iterdir()) == ["kit.pdf", "r.yaml"]
    else:
        assert code == 2, err
        assert err.count("\n") == 1 and err.startswith(ERROR_PREFIXES), err
        assert sorted(p.name for p in folder.iterdir()) == ["r.yaml"]
