"""A pupil who reads Russian, Greek, Hindi or Arabic reads the rete's star
names in that script (#9).

Every star name the rete draws in a ru, el, hi or ar kit, read from the
exported geometry (the JSON contract), is written wholly in the
language's script: each character a letter or mark of that script, or a
space or hyphen between words.  The reference for a character's script is
the Unicode Character Database as Python's ``unicodedata`` carries it:
the character's name (``CYRILLIC SMALL LETTER A``, ``DEVANAGARI VOWEL
SIGN I``, ...) and its general category (a letter, L*, or a mark, M*).
Each label names its own star: its text is the template's local name of
each star the label stands for, and that name, written in a recipe's
``stars`` list, selects the same star (a pupil may write the name the kit
prints).
"""

from __future__ import annotations

import json
import unicodedata
from importlib import resources

import pytest
import yaml

from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text
from kitgen.render.json_export import render_json
from kitgen.sky.stars import named_stars

SCRIPTS = {"ru": "CYRILLIC", "el": "GREEK", "hi": "DEVANAGARI", "ar": "ARABIC"}
#: Between the words of a name (Unicode: SPACE, HYPHEN-MINUS).
JOINERS = {" ", "-"}

#: North, the equator and south, on A4 and A5; and, north
#: and south on 250 mm retes, all the named stars that fit.
KITS = ["latitude: 55\n", "latitude: 30\n", "latitude: 0\n", "latitude: -35\n", "latitude: -50\nsheet: a5\n",
        "latitude: 40\nstars: {brightest: 200}\ndiameter_mm: 250\n",
        "latitude: -30\nstars: {brightest: 200}\ndiameter_mm: 250\n"]


def template(language: str) -> dict:
    text = resources.files("kitgen.templates").joinpath(f"{language}.yaml").read_text(encoding="utf-8")
    return yaml.safe_load(text)


def in_script(name: str, script: str) -> bool:
    """Whether every character of ``name`` is a letter or mark of
    ``script`` (by its Unicode name and general category) or a joiner,
    with a letter at each end."""
    def ours(ch):
        return unicodedata.category(ch)[0] in "LM" and unicodedata.name(ch, "").startswith(script + " ")

    return bool(name) and ours(name[0]) and ours(name[-1]) and all(ours(c) or c in JOINERS for c in name)


def star_labels(language: str, head: str) -> list[dict]:
    kit = build_kit(parse_recipe_text(f"epoch: 2027\nlanguage: {language}\nparts: [rete]\n{head}"))
    geometry = json.loads(render_json(kit))
    rete, = [p for p in geometry["parts"] if p["id"] == "rete"]
    return [e for e in rete["elements"] if e["role"] == "star_label"]


def test_the_script_check_tells_scripts_apart():
    """The check itself, on names whose characters the UCD places in
    another script: Latin A beside Cyrillic A, Greek omicron beside Latin
    o, a Latin name, an Arabic comma."""
    assert in_script("Сириус", "CYRILLIC") and in_script("Рас Альхаге", "CYRILLIC")
    assert not in_script("Сириус", "GREEK") and not in_script("Sirius", "CYRILLIC")
    assert not in_script("Cириус", "CYRILLIC")        # a Latin C first
    assert not in_script("Πολικός Αστέρaς", "GREEK")   # a Latin a
    assert in_script("अभिजित्", "DEVANAGARI") and in_script("फ़ोमलहॉट", "DEVANAGARI")
    assert in_script("الشعرى اليمانية", "ARABIC") and not in_script("الشعرى، اليمانية", "ARABIC")
    assert not in_script(" Вега", "CYRILLIC") and not in_script("", "ARABIC")


@pytest.mark.parametrize("language", sorted(SCRIPTS))
def test_every_star_name_on_the_rete_is_in_the_languages_script(language):
    tree = template(language)
    local = tree["star_names"]
    separator = tree["page"]["list_separator"]
    drawn = set()
    for head in KITS:
        labels = star_labels(language, head)
        assert len(labels) >= 20, (head, len(labels))
        for label in labels:
            stars = label.get("names", [label["name"]])
            text = label.get("full_text", label["text"])   # a long name set on two lines: the whole of it
            assert text == separator.join(local[s] for s in stars), (head, text, stars)
            for name in text.split(separator):
                assert in_script(name, SCRIPTS[language]), (head, name)
            drawn |= set(stars)
    assert len(drawn) >= 80, len(drawn)


@pytest.mark.parametrize("language", sorted(SCRIPTS))
def test_each_local_name_selects_its_star(language):
    """Every named star of the catalogue has a local name in the script,
    drawn or not; as a recipe's star, each is read as its own star's IAU
    name, so no two stars share a local name."""
    local = template(language)["star_names"]
    assert sorted(local) == sorted(s.name for s in named_stars())
    assert [n for n in local.values() if not in_script(n, SCRIPTS[language])] == []
    names = "".join(f"\n  - {json.dumps(v, ensure_ascii=False)}" for v in local.values())
    recipe = parse_recipe_text(f"epoch: 2027\nlatitude: 20\nlanguage: {language}\nrete_limit_deg: 80\nstars:{names}\n")
    assert list(recipe.stars.names) == list(local)
