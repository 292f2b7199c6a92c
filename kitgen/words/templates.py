"""Every printed word comes from a language template (templates/LANG.yaml).

Parts, layout and renderers ask a :class:`Words` for text by key; none of
them holds a literal word.  Templates are plain YAML mappings of keys to
strings with ``{name}`` placeholders, loaded with the safe loader; no code
runs from a template.
"""

from __future__ import annotations

import string
from functools import lru_cache
from importlib import resources
from pathlib import Path

import yaml

from ..errors import UserError


def available_languages() -> list[str]:
    """Language codes that have a shipped template."""
    folder = resources.files("kitgen.templates")
    return sorted(p.name[:-5] for p in folder.iterdir() if p.name.endswith(".yaml"))


def _flatten(tree, prefix=""):
    out = {}
    for key, value in tree.items():
        name = f"{prefix}{key}"
        if isinstance(value, dict):
            out.update(_flatten(value, name + "."))
        elif isinstance(value, list):
            out[name] = [str(v) for v in value]
        else:
            out[name] = str(value)
    return out


@lru_cache(maxsize=None)
def _shipped(language: str) -> dict:
    text = resources.files("kitgen.templates").joinpath(f"{language}.yaml").read_text(encoding="utf-8")
    return _flatten(yaml.safe_load(text))


class Words:
    """The words of one language.  ``words("plate.horizon")`` or
    ``words("page.number", k=1, n=6)``; lists (month names, the twelve
    30-degree divisions of the ecliptic) by :meth:`items`."""

    def __init__(self, language: str, table: dict):
        self.language = language
        self._table = table

    def __call__(self, key: str, **values) -> str:
        try:
            template = self._table[key]
        except KeyError:
            raise KeyError(f"template {self.language!r} has no key {key!r}") from None
        if isinstance(template, list):
            raise KeyError(f"template key {key!r} is a list; use items()")
        return template.format(**values) if values else template

    def items(self, key: str) -> list[str]:
        value = self._table[key]
        if not isinstance(value, list):
            raise KeyError(f"template key {key!r} is not a list")
        return list(value)

    def keys(self) -> set[str]:
        return set(self._table)

    def number(self, value: float, decimals: int = 0) -> str:
        """A number as this language writes it (decimal separator from the
        template's ``format.decimal``)."""
        s = f"{value:.{decimals}f}"
        return s.replace(".", self._table.get("format.decimal", "."))

    def placeholders(self, key: str) -> set[str]:
        value = self._table[key]
        texts = value if isinstance(value, list) else [value]
        return {f for t in texts for _, f, _, _ in string.Formatter().parse(t) if f}


def load_words(language: str) -> Words:
    """The shipped template for ``language`` (a BCP 47 code such as ``en``)."""
    if language not in available_languages():
        raise UserError(f"unknown language {language!r}; available: {', '.join(available_languages())}")
    return Words(language, _shipped(language))


def load_words_file(path: Path) -> Words:
    """A user's own language file, in the same format as the templates."""
    try:
        tree = yaml.safe_load(Path(path).read_text(encoding="utf-8"))
    except (OSError, yaml.YAMLError) as exc:
        raise UserError(f"cannot read language file {path}: {exc}") from None
    if not isinstance(tree, dict):
        raise UserError(f"language file {path} is not a mapping of keys to words")
    return Words(str(tree.get("language", Path(path).stem)), _flatten(tree))
