"""A recipe's own language file (recipe key ``language_file``): checked
like the recipe before anything is built, with every missing key listed;
read with YAML's safe loader only (no code runs), nothing fetched."""

from __future__ import annotations

from importlib import resources

import pytest
import yaml

from kitgen.errors import UserError
from kitgen.kit import build_kit
from kitgen.recipe.load import load_recipe

SPANISH = yaml.safe_load(resources.files("kitgen.templates").joinpath("es.yaml").read_text(encoding="utf-8"))


def _write(tmp_path, tree, name="mine.yaml"):
    (tmp_path / name).write_text(yaml.safe_dump(tree, allow_unicode=True), encoding="utf-8")
    recipe = tmp_path / "recipe.yaml"
    recipe.write_text(f"latitude: 41.4\nepoch: 2027\nlanguage_file: {name}\n", encoding="utf-8")
    return recipe


def test_own_language_file_builds_a_kit(tmp_path):
    """A Catalan file (code ca, which CLDR knows): its words are printed,
    and month names come from CLDR's Catalan (Babel as the reference)."""
    from babel import Locale

    tree = dict(SPANISH, language="ca")
    tree["alidade"] = dict(SPANISH["alidade"], title="Alidada catalana")
    kit = build_kit(load_recipe(_write(tmp_path, tree)))
    assert kit.words.language == "ca"
    assert kit.part("alidade").title == "Alidada catalana"
    months = [e.geom["text"] for e in kit.part("mater_back").elements if e.role == "month_label"]
    cldr = Locale.parse("ca").months["stand-alone"]
    assert all(m in cldr["wide"].values() or m in cldr["abbreviated"].values() for m in months)


def test_missing_keys_are_all_listed(tmp_path):
    tree = dict(SPANISH)
    del tree["rule"]
    tree["page"] = {k: v for k, v in SPANISH["page"].items() if k != "on_card"}
    with pytest.raises(UserError) as err:
        load_recipe(_write(tmp_path, tree))
    assert "missing keys: page.on_card, rule.reading_edge, rule.title" in str(err.value)
    assert "\n" not in str(err.value)


def test_placeholders_must_match(tmp_path):
    tree = dict(SPANISH)
    tree["page"] = dict(SPANISH["page"], number="{k} de {total}")
    with pytest.raises(UserError, match=r"'page.number' must use the placeholders \{k\}, \{n\}"):
        load_recipe(_write(tmp_path, tree))


def test_no_code_runs_from_a_language_file(tmp_path):
    (tmp_path / "evil.yaml").write_text("language: !!python/object/apply:os.system ['touch pwned']\n")
    recipe = tmp_path / "recipe.yaml"
    recipe.write_text("latitude: 41.4\nlanguage_file: evil.yaml\n")
    with pytest.raises(UserError):
        load_recipe(recipe)
    assert not (tmp_path / "pwned").exists()


def test_unknown_language_code_and_missing_file(tmp_path):
    with pytest.raises(UserError, match="no language code the Unicode CLDR knows"):
        load_recipe(_write(tmp_path, dict(SPANISH, language="zz-not-a-language")))
    recipe = tmp_path / "r.yaml"
    recipe.write_text("latitude: 41.4\nlanguage_file: nowhere.yaml\n")
    with pytest.raises(UserError, match="no such file"):
        load_recipe(recipe)


def test_characters_no_font_draws_are_refused(tmp_path):
    """U+89C4 (a CJK ideograph) is in none of the shipped fonts' character maps."""
    tree = dict(SPANISH)
    tree["rule"] = dict(SPANISH["rule"], title="规")
    with pytest.raises(UserError, match="U\\+89C4"):
        load_recipe(_write(tmp_path, tree))
