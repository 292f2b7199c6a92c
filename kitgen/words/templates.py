"""Every printed word comes from a language template (templates/LANG.yaml).

Parts, layout and renderers ask a :class:`Words` for text by key; none of
them holds a literal word.  Templates are plain YAML mappings of keys to
strings with ``{name}`` placeholders, loaded with the safe loader; no code
runs from a template.  Month names, the decimal sign and the digits are
not in the templates: they come from the Unicode CLDR through Babel
(:mod:`kitgen.words.locale`).  A recipe may bring its own language file
(``language_file``), checked by :func:`check_language_tree` against the
English template before anything is built.
"""

from __future__ import annotations

import re
import string
import unicodedata

from ..errors import Message, UserError, few
from ..template_files import (STAR_NAMES, STAR_SHORT_NAMES, available_languages, shipped_contractions,
                              shipped_short_star_names, shipped_tree)
from ..template_files import split_tree as _split
from . import fonts, locale
from .fit import Fitted, fit_label
from .measure import MM_PER_PT, Extent, extent, ink_span_em
from .shaping import isolate_numbers, set_line

#: Keys that describe a template rather than print words.
META_KEYS = ("language", "reviewed_by_native_speaker")
#: A language file is a few kilobytes; refuse anything absurdly large unread.
MAX_LANGUAGE_FILE_BYTES = 256 * 1024
MAX_STRING_CHARS = 600


#: Where a value begins in a composed text, while contractions are made: a
#: private-use character, which no template or name holds.
_START = "\ue000"


def _joins(contractions: dict):
    """The pattern that finds a contraction's preposition (after no
    letter) and article (a value's first word) on either side of
    :data:`_START`, with what each pair becomes; None without any."""
    if not contractions:
        return None
    split = [written.partition(" ") for written in contractions]   # "à Le ": ("à", " ", "Le ")
    heads = "|".join(sorted({re.escape(h + " ") for h, _, _ in split}, key=len, reverse=True))
    tails = "|".join(sorted({re.escape(t) for _, _, t in split}, key=len, reverse=True))
    return re.compile(rf"(?<!\w)({heads}){_START}({tails})"), dict(contractions)


def word_keys(table: dict) -> set[str]:
    """The keys that print words (every key but the template's own facts)."""
    return {k for k in table if k not in META_KEYS}


def placeholders(value) -> set[str]:
    texts = value if isinstance(value, list) else [value]
    return {f for t in texts for _, f, _, _ in string.Formatter().parse(t) if f is not None}


class Words:
    """The words of one language.  ``words("plate.horizon")`` or
    ``words("page.number", k=1, n=6)``; lists (the twelve 30-degree
    divisions of the ecliptic, the month names from CLDR) by :meth:`items`;
    numbers by :meth:`number`; text sizes by :meth:`measure`."""

    def __init__(self, language: str, table: dict, star_names: dict | None = None, native_digits: bool = False,
                 contractions: dict | None = None, short_star_names: dict | None = None):
        self.language = language
        self.native_digits = bool(native_digits)
        self.script = locale.script(language)
        self.rtl = locale.is_right_to_left(language)
        self._table = dict(table)
        self._table["calendar.months"] = locale.month_names(language)
        self._table["calendar.months_short"] = locale.month_names(language, "abbreviated")
        self._stars = dict(star_names or {})
        self._short_stars = dict(short_star_names or {})
        self._numbers: dict[tuple, str] = {}
        self._joins = _joins(contractions or {})

    def same_as(self, other: "Words") -> bool:
        """Whether ``other`` writes every word as these do: the same
        language, digits, templates, star names and contractions (a part
        drawn with one is the same drawn with the other, kitgen.parts.reuse)."""
        return (self is other or (self.language == other.language and self.native_digits == other.native_digits
                                  and self._table == other._table and self._stars == other._stars
                                  and self._short_stars == other._short_stars and self._joins == other._joins))

    def __call__(self, key: str, **values) -> str:
        try:
            template = self._table[key]
        except KeyError:
            raise KeyError(f"template {self.language!r} has no key {key!r}") from None
        if isinstance(template, list):
            raise KeyError(f"template key {key!r} is a list; use items()")
        if not values:
            text = template
        elif self._joins is None:
            text = template.format(**{name: self.isolated(v) for name, v in values.items()})
        else:
            text = self._joined(template.format(**{name: _START + self.isolated(v) if isinstance(v, str) else v
                                                   for name, v in values.items()}))
        # In a right-to-left language each number reads left to right,
        # its sign and degree sign with it (#9).
        return isolate_numbers(text) if self.rtl else text

    def _joined(self, text: str) -> str:
        """``text`` with each contraction made where a value (marked by
        :data:`_START`) begins with the article its preposition joins,
        and the marks taken out."""
        pattern, joined = self._joins

        def join(m) -> str:
            both = joined.get(m.group(1) + m.group(2))
            return m.group(0) if both is None else both + _START

        return pattern.sub(join, text).replace(_START, "")

    def isolated(self, value):
        """``value`` as it goes into a template: text holding a letter
        written in the other direction than this language (an Arabic title
        in an English kit, a Latin one in an Arabic kit) is wrapped in FIRST
        STRONG ISOLATE ... POP DIRECTIONAL ISOLATE (UAX #9, 2.4), so that it
        never reorders the words around it (:mod:`kitgen.words.shaping`
        lays isolates out separately); anything else is left as it is."""
        if not isinstance(value, str):
            return value
        other = ("L",) if self.rtl else ("R", "AL")
        if any(unicodedata.bidirectional(ch) in other for ch in value):
            return "\u2068" + value + "\u2069"
        return value

    def template(self, key: str) -> str | None:
        """The template text of ``key`` as written, ``{placeholders}`` and
        all (``None`` when there is none); used for the error messages of
        :mod:`kitgen.errors`."""
        value = self._table.get(key)
        return value if isinstance(value, str) else None

    def items(self, key: str) -> list[str]:
        value = self._table[key]
        if not isinstance(value, list):
            raise KeyError(f"template key {key!r} is not a list")
        return [isolate_numbers(v) for v in value] if self.rtl else list(value)

    def keys(self) -> set[str]:
        return set(self._table)

    def strings(self):
        """Every printed string of the template with its key (lists item by item)."""
        for key, value in self._table.items():
            if key in META_KEYS:
                continue
            for v in value if isinstance(value, list) else [value]:
                yield key, v
        for name, local in self._stars.items():
            yield f"{STAR_NAMES}.{name}", local
        for name, short in self._short_stars.items():
            yield f"{STAR_SHORT_NAMES}.{name}", short

    def number(self, value: float, decimals: int = 0) -> str:
        """A number as this language writes it: the CLDR decimal sign and,
        when the recipe asks for them, the locale's own digits.  Each is
        formatted once (a kit writes its scales' numbers thousands of
        times while its labels are placed, #12); the key holds the value's
        type and exact ``repr``, so that 0.0 and -0.0, or 5 and 5.0, are
        never taken for one another."""
        key = (value.__class__, repr(value), decimals)
        text = self._numbers.get(key)
        if text is None:
            text = self._numbers[key] = locale.format_number(value, decimals, self.language, self.native_digits)
        return text

    def star_name(self, iau_name: str) -> str:
        """A star's name: the template's local name, else the IAU name."""
        return self._stars.get(iau_name, iau_name)

    def star_short_name(self, iau_name: str) -> str | None:
        """The customary short form of a star's name ("Rigil Kent"), where
        the template gives one; else None."""
        return self._short_stars.get(iau_name)

    def faces(self, style: str = "label"):
        return fonts.stack(self.script, style)

    def measure(self, text: str, size_pt: float, style: str = "label") -> Extent:
        """Width and height (mm) of one line of ``text`` in the real font."""
        return extent(text, size_pt, self.script, style, self.rtl)

    def ink_span_mm(self, text: str, size_pt: float, style: str = "label") -> tuple[float, float]:
        """Leftmost and rightmost ink of one line of ``text`` (mm from the
        line's left end), its advance width included
        (:func:`kitgen.words.measure.ink_span_em`)."""
        left, right = ink_span_em(set_line(text, self.script, style, self.rtl))
        em = size_pt * MM_PER_PT
        return left * em, right * em

    def fit(self, text: str, size_pt: float, max_width_mm: float, max_height_mm: float | None = None,
            short: str | None = None, style: str = "label", min_pt: float = 5.0) -> Fitted:
        """``text`` fitted to its room by the rule of :mod:`kitgen.words.fit`."""
        return fit_label(text, size_pt, max_width_mm, lambda s, pt: self.measure(s, pt, style), min_pt,
                         max_height_mm, short)


def load_words(language: str, native_digits: bool = False) -> Words:
    """The shipped template for ``language`` (a BCP 47 code such as ``en``)."""
    if language not in available_languages():
        raise UserError("errors.unknown_language_code", value=repr(language), codes=available_languages())
    table, stars = _split(shipped_tree(language))
    return Words(language, table, stars, native_digits, shipped_contractions(language),
                 shipped_short_star_names(language))


def words_from_tree(tree: dict, native_digits: bool = False) -> Words:
    """The words of a language tree already checked by
    :func:`check_language_tree` (a recipe's own language file, read by
    :func:`kitgen.recipe.load.load_language_file`)."""
    table, stars = _split(tree)
    return Words(str(tree["language"]), table, stars, native_digits)


def plain_field_problem(text: str) -> str | None:
    """The first replacement field of ``text`` that is not a plain
    ``{name}`` (a format spec such as ``{x:>999999}``, a conversion such as
    ``{x!r}``, an attribute or index such as ``{x.y}`` or ``{x[0]}``, or an
    empty ``{}``), as written; ``None`` when all are plain.  Only plain
    fields are allowed: the others could make ``str.format`` build huge
    strings or reach into the values.  Raises ``ValueError`` for an
    unmatched brace (Python's format string syntax)."""
    for _, field, spec, conversion in string.Formatter().parse(text):
        if field is None:
            continue
        if not field.isidentifier() or spec or conversion is not None:
            return "{" + field + ("!" + conversion if conversion is not None else "") + (":" + spec if spec else "") + "}"
    return None


def _script_name(code: str) -> str:
    """An ISO 15924 script code with its English name from CLDR, for a
    message: ``Hans (Simplified Han)``."""
    name = locale.cldr_locale("en").scripts.get(code)
    return f"{code} ({name})" if name else code


def _char_names(chars) -> list:
    return few([f"U+{ord(c):04X} {unicodedata.name(c, '?')}" for c in sorted(chars)], 4)


def check_cldr_drawable(code: str, source) -> None:
    """Refuse a language whose CLDR data (the month names, wide and short,
    the decimal sign and the locale's own digits) holds a character no
    shipped font of its script draws: the kit could not print its calendar
    (the Unicode CLDR through Babel, as :mod:`kitgen.words.locale` reads it)."""
    script = locale.script(code)
    faces = tuple(fonts.stack(script, "label")) + tuple(fonts.stack(script, "bold"))
    data = {"calendar.months (CLDR)": locale.month_names(code),
            "calendar.months_short (CLDR)": locale.month_names(code, "abbreviated"),
            "numbers (CLDR)": [locale.format_number(1.5, 1, code),
                               locale.format_number(1234567890, 0, code, native_digits=True)]}
    for key, texts in data.items():
        lost = set().union(*(fonts.missing_chars(t, faces) for t in texts))
        if lost:
            raise UserError("errors.language_script", where=source, key=key, script=_script_name(script),
                            chars=_char_names(lost))


def check_language_tree(tree, source, lines: dict | None = None) -> None:
    """Check a language tree against the English template: the same keys,
    the same plain ``{name}`` placeholders, lists of the same length, plain
    text only, a language code that CLDR knows, and every character, the
    CLDR month names and digits it brings in too, in the shipped fonts.
    ``lines`` (dotted key -> line in the file) lets a message name the line."""
    lines = lines or {}

    def where(key: str):
        return Message("errors.at_line", source=source, line=lines[key]) if key in lines else source

    if not isinstance(tree, dict):
        raise UserError("errors.language_not_mapping", source=source)
    code = tree.get("language")
    if not isinstance(code, str):
        raise UserError("errors.language_code_missing", source=source)
    try:
        locale.cldr_locale(code)
    except locale.LocaleError:
        raise UserError("errors.language_code_unknown", source=source, code=code) from None
    if not isinstance(tree.get("reviewed_by_native_speaker"), bool):
        raise UserError("errors.language_reviewed", source=source)
    stars = tree.get(STAR_NAMES) or {}
    if not isinstance(stars, dict) or not all(isinstance(v, str) for v in stars.values()):
        raise UserError("errors.language_star_names", source=source, section=STAR_NAMES)
    check_cldr_drawable(code, source)
    english, _ = _split(shipped_tree("en"))
    try:
        table, _ = _split(tree)
    except AttributeError:
        raise UserError("errors.language_values", source=source) from None
    missing = sorted(word_keys(english) - word_keys(table))
    if missing:
        raise UserError("errors.language_missing_keys", source=source, keys=few(missing, 8))
    unknown = sorted(word_keys(table) - word_keys(english))
    if unknown:
        raise UserError("errors.language_unknown_keys", source=source, keys=few(unknown, 8))
    faces = set(fonts.stack(locale.script(code), "label")) | set(fonts.stack(locale.script(code), "bold"))
    for key in sorted(word_keys(english)):
        want, got = english[key], table[key]
        if isinstance(want, list) != isinstance(got, list) or (isinstance(want, list) and len(want) != len(got)):
            n = len(want) if isinstance(want, list) else 1
            raise UserError("errors.language_list_length", source=source, key=key, count=n)
        for text in got if isinstance(got, list) else [got]:
            if len(text) > MAX_STRING_CHARS:
                raise UserError("errors.language_string_long", source=where(key), key=key, limit=MAX_STRING_CHARS)
            try:
                odd = plain_field_problem(text)
            except ValueError:
                raise UserError("errors.language_unmatched_brace", source=where(key), key=key) from None
            if odd:
                raise UserError("errors.language_format_field", where=where(key), key=key, field=odd)
        if placeholders(want) != placeholders(got):
            fields = ["{" + f + "}" for f in sorted(placeholders(want))] or Message("errors.none")
            raise UserError("errors.language_placeholders", source=where(key), key=key, fields=fields)
        for text in got if isinstance(got, list) else [got]:
            lost = fonts.missing_chars(text, faces)
            if lost:
                raise UserError("errors.language_script", where=where(key), key=key,
                                script=_script_name(locale.script(code)), chars=_char_names(lost))
    for name, local in stars.items():
        lost = fonts.missing_chars(local, faces)
        if lost:
            key = f"{STAR_NAMES}.{name}"
            raise UserError("errors.language_script", where=where(key), key=key,
                            script=_script_name(locale.script(code)), chars=_char_names(lost))
