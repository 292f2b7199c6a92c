"""Language files and recipe values that the first hardening let through
(#11): refused in one line before anything is built.

References: Python's format string syntax (the ``string`` module's
documentation: a replacement field is ``{field_name!conversion:format_spec}``);
the Unicode CLDR through Babel for the month names a language pulls in;
the shipped fonts' character maps through fontTools; the Unicode Standard
(23.8) for byte-order marks; the star catalogue for magnitudes.
"""

from __future__ import annotations

import time
from importlib import resources

import pytest
import yaml
from babel import Locale

from kitgen.errors import UserError
from kitgen.recipe.load import load_recipe
from kitgen.words import fonts

FRENCH_TEXT = resources.files("kitgen.templates").joinpath("fr.yaml").read_text(encoding="utf-8")
ARABIC = yaml.safe_load(resources.files("kitgen.templates").joinpath("ar.yaml").read_text(encoding="utf-8"))


def _recipe(tmp_path, language_text: str, extra: str = ""):
    (tmp_path / "mine.yaml").write_text(language_text, encoding="utf-8")
    recipe = tmp_path / "r.yaml"
    recipe.write_text(f"latitude: 41.4\nepoch: 2027\nlanguage_file: mine.yaml\n{extra}", encoding="utf-8")
    return recipe


def _refused(path) -> str:
    start = time.monotonic()
    with pytest.raises(UserError) as err:
        load_recipe(path)
    assert time.monotonic() - start < 10
    text = str(err.value)
    assert "\n" not in text
    return text


@pytest.mark.parametrize("field", ["{k:>999999999}", "{k!r}", "{k!z}", "{k.__class__}", "{k[0]}", "{}", "{0}",
                                   "{k:{n}}", "{k:,}"])
def test_only_plain_placeholders(tmp_path, field):
    """Every form but a plain ``{name}`` is refused, naming the field and
    the line of the file where it stands."""
    lines = FRENCH_TEXT.split("\n")
    number = next(i for i, line in enumerate(lines) if line.strip().startswith("number:") and "{k}" in line)
    lines[number] = lines[number].replace("{k}", field, 1)
    text = _refused(_recipe(tmp_path, "\n".join(lines)))
    assert f"line {number + 1}" in text and "plain placeholders" in text and field in text


@pytest.mark.parametrize("code", ["zh", "ja", "ko", "th", "bn", "am"])
def test_a_script_no_shipped_font_draws_is_refused_naming_characters_and_script(tmp_path, code):
    """A language file for a script no shipped font draws: its CLDR month
    names (Babel) hold characters missing from every font's character map
    (fontTools); the message names some of them and the script."""
    months = Locale.parse(code).months["stand-alone"]["wide"].values()
    faces = fonts.all_faces()
    lost = sorted({c for m in months for c in fonts.missing_chars(m, faces)})
    assert lost, f"{code}: the shipped fonts would draw its month names; the test needs another language"
    text = _refused(_recipe(tmp_path, FRENCH_TEXT.replace("language: fr", f"language: {code}", 1)))
    assert "no shipped font draws" in text and "script" in text
    assert f"U+{ord(lost[0]):04X}" in text


def test_a_star_name_no_font_draws_is_refused(tmp_path):
    text = FRENCH_TEXT.replace("star_names: {}", 'star_names: {Sirius: "天狼星"}', 1)
    assert text != FRENCH_TEXT
    assert "U+5929" in _refused(_recipe(tmp_path, text))


def test_the_arabic_names_the_kit_prints_are_accepted_in_arabic_recipes(tmp_path):
    """The names of templates/ar.yaml's star_names, as the Arabic kit
    prints them, select the same stars as their IAU names (#11)."""
    from kitgen.sky.stars import find_star

    # the stars north of the tropic of Capricorn, inside every northern rete
    local = {iau: name for iau, name in ARABIC["star_names"].items() if find_star(iau).dec_deg > -20}
    assert len(local) >= 6
    names = list(local.values())
    recipe = tmp_path / "r.yaml"
    recipe.write_text(yaml.safe_dump({"latitude": 30.0, "epoch": 2027, "language": "ar", "stars": names},
                                     allow_unicode=True), encoding="utf-8")
    got = load_recipe(recipe).stars.names
    fitting = load_recipe_with(tmp_path, {"latitude": 30.0, "epoch": 2027, "language": "ar",
                                          "stars": list(local)}).stars.names
    assert got == fitting
    # not in English: the Arabic names are the Arabic kit's
    recipe.write_text(yaml.safe_dump({"latitude": 30.0, "epoch": 2027, "language": "en", "stars": names[:1]},
                                     allow_unicode=True), encoding="utf-8")
    assert "unknown star" in _refused(recipe)


def load_recipe_with(tmp_path, tree):
    p = tmp_path / "iau.yaml"
    p.write_text(yaml.safe_dump(tree, allow_unicode=True), encoding="utf-8")
    return load_recipe(p)


# -- numbers -------------------------------------------------------------------------------------

@pytest.mark.parametrize("text", [
    "sheet: {width_mm: 1" + "0" * 400 + ", height_mm: 300}",
    "sheet: {width_in: -1" + "0" * 40 + ", height_in: 12}",
    "print_scale: 1" + "0" * 400,
    "print_scale: {x: 0.97, y: 1" + "0" * 30 + "}",
])
def test_huge_integers_in_parsed_keys(tmp_path, text):
    p = tmp_path / "r.yaml"
    p.write_text(f"latitude: 40\n{text}\n", encoding="utf-8")
    msg = _refused(p)
    assert "line 2" in msg and "far too large" in msg and len(msg) < 400


def test_a_magnitude_limit_that_selects_no_star(tmp_path):
    """The catalogue's brightest star (Sirius, Hp -1.09 in the shipped
    Hipparcos list) is fainter than -1.5: a limit of -1.5 selects nothing."""
    from kitgen.sky.stars import catalogue

    brightest = min(s.mag for s in catalogue())
    p = tmp_path / "r.yaml"
    p.write_text(f"latitude: 40\nstars: {{magnitude_limit: {brightest - 0.3:.2f}}}\n", encoding="utf-8")
    msg = _refused(p)
    assert "line 2" in msg and "selects no star" in msg
    p.write_text(f"latitude: 40\nstars: {{magnitude_limit: {brightest + 0.01:.2f}}}\n", encoding="utf-8")
    assert load_recipe(p).stars.magnitude_limit is not None


def test_many_stars_off_the_rete_the_reason_comes_first(tmp_path):
    """A northern rete cannot hold the far southern stars; the message
    says so first and lists a few, then how many more."""
    from kitgen.sky.stars import catalogue

    south = [s.name for s in catalogue() if s.name and s.dec_deg < -50][:15]
    assert len(south) >= 8
    p = tmp_path / "r.yaml"
    p.write_text(yaml.safe_dump({"latitude": 52.0, "epoch": 2027, "stars": south}), encoding="utf-8")
    msg = _refused(p)
    reason = msg.index("outside the rete")
    assert reason < msg.index(south[0]) and "more" in msg[reason:]
    assert south[-1] not in msg


@pytest.mark.parametrize("text, line, needle", [
    ("latitude: 40\nepoch: 2027\nsheet: a5\ndiameter_mm: 300\nduplex: long_edge\n", 5, "'duplex' needs the mater"),
    ("latitude: 40\nepoch: 2027\nduplex: long_edge\nparts: [rete]\n", 3, "'duplex' prints the mater"),
    ("latitude: 40\nsheet: {width_mm: 150, height_mm: 300}\nmargin_mm: 15.1\n", 3, "leaves 119 mm"),
])
def test_mistakes_found_late_still_name_the_recipe_line(tmp_path, capsys, text, line, needle):
    """A value the build (not the loader) finds wrong is told with its line
    in the recipe too (#11); and a shortfall is never rounded up to the
    bound it falls short of ("leaves 120 mm ... at least 120 mm")."""
    from kitgen.cli import main

    (tmp_path / "r.yaml").write_text(text, encoding="utf-8")
    assert main(["build", str(tmp_path / "r.yaml"), "-o", str(tmp_path / "k.pdf")]) == 2
    err = capsys.readouterr().err.strip().splitlines()[-1]
    assert f"r.yaml, line {line}: " in err and needle in err
    assert not (tmp_path / "k.pdf").exists()


def test_a_folder_given_as_the_language_file_says_so_once(tmp_path):
    """``language_file: .`` names a folder: one line saying so, the kind of
    file named once (it read "not a language file file")."""
    (tmp_path / "r.yaml").write_text("latitude: 40\nlanguage_file: .\n", encoding="utf-8")
    text = _refused(tmp_path / "r.yaml")
    assert "is a folder" in text and "language file" in text and "file file" not in text
