"""One word for one thing (#9): in every language the instructions call the
almucantar, the alidade, the rule, the rete, the plate, the mater and the
shadow square by the words printed on the parts and in the plate's picture, and by no other.

The printed words are read from a built kit (the parts' text and titles,
the instructions' picture of the plate); the instructions' words from the
template files themselves, read with PyYAML, so that each step is compared
with the same step in English. No standard covers this: keeping one term
per thing and checking a translation against the terms printed on the
object is common practice of technical translation (a terminology list
checked before release); no text is copied into the test.
"""

from __future__ import annotations

import re
import unicodedata
from pathlib import Path

import pytest
import yaml

from kitgen.kit import build_kit
from kitgen.layout.figures import kit_figures
from kitgen.layout.instructions import column_mm
from kitgen.layout.pages import layout_kit
from kitgen.recipe.load import parse_recipe_text

LANGUAGES = ["en", "es", "fr", "de", "pt", "it", "el", "ru", "ar", "hi"]
TEMPLATES = Path(__file__).resolve().parent.parent / "templates"
RECIPE = "latitude: 52.2\nepoch: 2027\nworksheet: true\n"

#: The sections a pupil reads in the instructions, and the keys left out:
#: the cautions speak of a school's rules, not the part.
SECTIONS = ("instructions", "almanac", "worksheet")
SKIPPED = {"instructions.cautions"}

#: Final letters a declined noun may change (Russian линейка, линейки):
#: vowels, and the Greek sigma, which may also go (Κανόνας, κανόνα).
#: Common practice of matching inflected terms; no standard.
VOWELS = set("aeiouаеиоуыэюяйьαεηιουω")
SIGMA = "σ"   # casefold writes the final ς as σ


def _fold(text: str) -> str:
    """Case folded, without the accents of Latin, Greek and Cyrillic
    letters (U+0300-U+036F; Devanagari's vowel signs are kept) and without
    the invisible marks that isolate a number in right-to-left text."""
    decomposed = unicodedata.normalize("NFD", text.casefold())
    return "".join(c for c in decomposed if not 0x300 <= ord(c) <= 0x36F and unicodedata.category(c) != "Cf")


def _cased(word: str) -> bool:
    """Whether a word is written in a script that declines by endings we
    can match (Latin, Greek, Cyrillic), not Arabic or Devanagari."""
    return any(c.upper() != c.lower() for c in word)


def _strip_article(word: str) -> str:
    """Arabic writes the article into the word (العنكبوت): match the noun."""
    return word[2:] if word.startswith("ال") and len(word) > 4 else word


def _term_re(term: str) -> re.Pattern:
    """A printed name as a sentence may use it: its words in order; in a
    cased script each word as printed (case and accents aside) with up to
    three letters of ending, or, for a word of five letters or more, its
    last vowel changed or its Greek final sigma gone; in Arabic and Devanagari the words as
    printed (their endings are separate words), Arabic's article and
    ta marbuta aside."""
    parts = []
    for word in term.split():
        f = _fold(word)
        if _cased(word):
            forms = [re.escape(f) + r"\w{0,3}"]
            if len(f) >= 5 and f[-1] in VOWELS:
                forms.append(re.escape(f[:-1]) + r"\w{1,3}")
            elif len(f) >= 5 and f[-1] == SIGMA:
                forms.append(re.escape(f[:-1]) + r"\w{0,3}")
            parts.append(r"(?<!\w)(?:" + "|".join(forms) + r")(?!\w)")
        else:
            noun = _fold(_strip_article(word))
            # Arabic's ta marbuta: ta before a suffix (مقنطرته), -at in the plural.
            noun = re.escape(noun[:-1]) + "(?:ة|ت|ات)" if noun.endswith("ة") else re.escape(noun)
            parts.append(r"\S*" + noun)   # the article and the prepositions written into the word
    return re.compile(r"\s+".join(parts))


def _texts(language: str) -> dict[str, str]:
    """Every sentence of the instructions' sections of a template file, by
    key (a list's items as key[i])."""
    tree = yaml.safe_load((TEMPLATES / f"{language}.yaml").read_text(encoding="utf-8"))
    out = {}
    for section in SECTIONS:
        for key, value in tree[section].items():
            full = f"{section}.{key}"
            if full in SKIPPED:
                continue
            if isinstance(value, list):
                out.update({f"{full}[{i}]": v for i, v in enumerate(value)})
            elif isinstance(value, str):
                out[full] = value
    return out


def _printed_terms(kit) -> dict[str, str]:
    """The names printed on the kit: the rule's and the alidade's on the
    parts, the rete's, the plate's and the mater's in the titles printed
    beside them (the rete's before the bracket saying it goes on film, the
    mater's before the comma naming its face), the shadow square's caption
    on the back, and the almucantar's in the instructions' picture of the
    plate (its number taken away)."""
    def label(kind, role):
        (e,) = kit.part(kind).with_role(role)
        return e.geom["text"]

    plate_fig, _ = kit_figures(kit, column_mm(layout_kit(kit)))
    (alm,) = [e.geom["text"] for e in plate_fig.elements
              if e.shape == "text" and e.values.get("curve") == "almucantar"]
    return {"rule": label("rule", "part_label"), "alidade": label("alidade", "part_label"),
            "rete": re.split(r"\s*\(", kit.part("rete").title)[0],
            "plate": kit.part("plate-1").title, "mater": re.split(r"\s*[,،]", kit.part("mater_front").title)[0],
            "shadow_square": label("mater_back", "shadow_caption"),
            "almucantar": _fold("".join(c for c in alm if not c.isdigit() and c != "°")).strip()}


_KITS: dict[str, object] = {}


def _kit(language: str):
    if language not in _KITS:
        _KITS[language] = build_kit(parse_recipe_text(RECIPE + f"language: {language}\n"))
    return _KITS[language]


@pytest.mark.parametrize("language", LANGUAGES)
def test_steps_name_each_part_as_it_is_printed(language):
    """Every sentence that in English names the almucantar, the alidade,
    the rule, the rete, the plate, the mater or the shadow square by its
    printed name names it,
    in this language, by this language's printed name."""
    en_terms = {k: _term_re(v) for k, v in _printed_terms(_kit("en")).items()}
    terms = _printed_terms(_kit(language))
    patterns = {k: _term_re(v) for k, v in terms.items()}
    en_texts, texts = _texts("en"), _texts(language)
    assert en_texts.keys() == texts.keys()
    missing, checked = [], 0
    for key, en_text in en_texts.items():
        for thing, en_re in en_terms.items():
            if en_re.search(_fold(en_text)):
                checked += 1
                if not patterns[thing].search(_fold(texts[key])):
                    missing.append((key, thing, terms[thing], texts[key]))
    assert not missing, missing
    assert checked >= 30


@pytest.mark.parametrize("language", LANGUAGES)
def test_the_shadow_square_is_named_by_its_caption(language):
    """The step that reads the shadow square, and the worksheet's question
    on it, quote the caption printed beside the square."""
    caption = _printed_terms(_kit(language))["shadow_square"]
    texts = _texts(language)
    for key in ("instructions.height_steps[2]", "worksheet.q_height"):
        assert caption in texts[key], (key, texts[key])


@pytest.mark.parametrize("language", [lang for lang in LANGUAGES if lang != "ar"])
def test_no_second_word_for_a_part(language):
    """No word of the instructions is a near-miss of a printed name (the
    same first letters, another word): such a word is a second term for
    the same thing (almicantarada beside Almicantarat). Arabic's plurals
    change the word's end (مقنطرات), so Arabic relies on the test above."""
    terms = _printed_terms(_kit(language))
    found = []
    for thing in ("almucantar", "alidade", "rule", "rete", "plate", "mater"):
        word = max(terms[thing].split(), key=len)
        f = _fold(word)
        if len(f) < 6:
            continue
        head = f[:max(5, len(f) - 3)]
        term = _term_re(word)
        for text in _texts(language).values():
            for token in re.findall(r"[^\s.,;:!?()«»“”\"'’‘·—–\-/=×÷+°%{}\[\]।]+", _fold(text)):
                if token.startswith(head) and not term.fullmatch(token):
                    found.append((thing, word, token))
    assert not found, sorted(set(found))


@pytest.mark.parametrize("language", LANGUAGES)
def test_the_pictures_almucantar_is_numbered_as_on_the_plate(language):
    """The plate's almucantars carry their number without a degree sign
    (the glossary says so); the picture's name for one writes it the same
    way, so that the two never disagree (#9)."""
    kit = _kit(language)
    plate_fig, _ = kit_figures(kit, column_mm(layout_kit(kit)))
    (name,) = [e for e in plate_fig.elements if e.shape == "text" and e.values.get("curve") == "almucantar"]
    number = kit.words.number(name.values["altitude_deg"])
    on_plate = {e.geom["text"] for e in kit.part("plate-1").with_role("almucantar_label")}
    assert number in on_plate and "°" not in "".join(on_plate)
    assert number in name.geom["text"] and "°" not in name.geom["text"]
