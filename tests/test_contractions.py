"""A preposition joins the article a place's name begins with (#12: a
class set names many towns, and nobody reads each kit): French "au
Havre", "du Caire", Italian "al Cairo", "dell’Avana", never "à Le Havre"
or "di Il Cairo".

References: the contractions of French (à + le = au, à + les = aux,
de + le = du, de + les = des) and Italian (a + il = al, di + il = del,
a + l’ = all’ ...) are common grammar, written here from memory; the
names come from the Unicode CLDR's exemplar cities through Babel, or are
a user's own place name.  The article "La" joins nothing in French, and
a foreign name's article ("La Paz") stays in Italian: common practice.
"""

from __future__ import annotations

import pytest
from babel import Locale

from kitgen.kit import build_kit
from kitgen.layout.pages import layout_kit
from kitgen.recipe.load import validate_recipe
from kitgen.words.templates import Words, load_words

CAIRO = {"latitude": 30.04, "longitude": 31.24, "timezone": "Africa/Cairo", "epoch": 2027}
HAVANA = {"latitude": 23.13, "longitude": -82.38, "timezone": "America/Havana", "epoch": 2027}


def _kit_text(recipe) -> str:
    kit = build_kit(validate_recipe(recipe))
    lines = [ln.text for page in layout_kit(kit) for ln in (page.lines or ())]
    labels = [el.text for part in kit.parts for el in part.elements if getattr(el, "text", None)]
    return "\n".join(lines + labels)


def test_french_a_place_of_le_and_les():
    text = _kit_text({**CAIRO, "language": "fr", "place": "Le Havre", "latitude": 49.49, "longitude": 0.11,
                      "timezone": "Europe/Paris", "worksheet": True})
    assert "Au Havre, le " in text and " au Havre en " in text
    assert "À Le Havre" not in text and "à Le Havre" not in text
    assert "Fiche d’exercices\u00a0: Le Havre" in text   # no preposition, the name as written
    fr = load_words("fr")
    assert fr("almanac.sun_table_intro", place="Les Cayes", year="2027", clock_name="x").startswith(
        "Lever et coucher du Soleil aux Cayes en ")
    assert fr("almanac.sun_table_intro", place="La Rochelle", year="2027", clock_name="x").startswith(
        "Lever et coucher du Soleil à La Rochelle en ")


def test_italian_clock_of_cairo_and_havana():
    for site, city, joined in ((CAIRO, "Africa/Cairo", "del Cairo"), (HAVANA, "America/Havana", "dell’Avana")):
        name = Locale.parse("it").time_zones[city]["city"]   # CLDR: "Il Cairo", "L’Avana"
        assert name.split(" ")[0] in ("Il", "L’Avana")
        text = _kit_text({**site, "language": "it"})
        assert f"orologio {joined}" in text
        assert f"di {name}" not in text and f"a {name}" not in text and f"A {name}" not in text


def test_a_foreign_article_stays_in_italian():
    it = load_words("it")
    assert it("clock_scale.caption_zone", zone="La Paz").endswith("orologio di La Paz")
    assert it("almanac.sun_table_intro", place="L'Aquila", year="2027", clock_name="x").startswith(
        "Alba e tramonto all’Aquila nel ")


@pytest.mark.parametrize("template, want", [("voilà {place}", "voilà Le Havre"), ("à {place}", "au Havre"),
                                            ("à {place} et à {other}", "au Havre et aux Cayes"),
                                            ("à Le {place}", "à Le Le Havre")])
def test_a_contraction_only_where_a_value_begins(template, want):
    # the preposition is a word of its own, and the article the value's first word
    words = Words("fr", {"k": template}, contractions={"à Le ": "au ", "à Les ": "aux "})
    assert words("k", place="Le Havre", other="Les Cayes") == want
