"""The shipped language templates as files: which there are, and their trees.

The lowest layer of the words: it reads ``templates/LANG.yaml`` from the
package with YAML's safe loader and knows nothing else of kitgen, so that
:mod:`kitgen.errors` can say a message in English and
:mod:`kitgen.words.templates` can build a language's words from the same
files, without either importing the other.
"""

from __future__ import annotations

from functools import lru_cache
from importlib import resources

import yaml

#: A section of optional local star names (IAU name -> local name).
STAR_NAMES = "star_names"
#: A section of a shipped template's optional short star names (IAU name
#: -> the local name's customary short form, "Rigil Kent"), set where the
#: whole name finds no room on the rete (kitgen.parts.rete).
STAR_SHORT_NAMES = "star_short_names"
#: A section of a shipped template's optional contractions: a preposition
#: of its text and the article a name put after it begins with, as they
#: join (French "à" and "Le Havre": "au Havre"), kitgen.words.templates.
CONTRACTIONS = "contractions"


def available_languages() -> list[str]:
    """Language codes that have a shipped template."""
    return list(_shipped_codes())


@lru_cache(maxsize=1)
def _shipped_codes() -> tuple[str, ...]:
    """The shipped templates' codes, the package's folder listed once a
    process (a class set checks every row's language against them)."""
    folder = resources.files("kitgen.templates")
    return tuple(sorted(p.name[:-5] for p in folder.iterdir() if p.name.endswith(".yaml")))


#: YAML's safe loader in C (libyaml) where PyYAML was built with it, ten
#: times faster than the pure-Python one on a template (#12); the same
#: safe constructors, so the same tree.
_SAFE_LOADER = getattr(yaml, "CSafeLoader", yaml.SafeLoader)


@lru_cache(maxsize=None)
def shipped_tree(language: str) -> dict:
    """The shipped template of ``language`` as YAML gives it (trusted data)."""
    text = resources.files("kitgen.templates").joinpath(f"{language}.yaml").read_text(encoding="utf-8")
    return yaml.load(text, Loader=_SAFE_LOADER)


def shipped_contractions(language: str) -> dict[str, str]:
    """The shipped template's :data:`CONTRACTIONS`: ``{"à Le ": "au "}``,
    the preposition and the name's first word as written, and what they
    become; none for most languages."""
    return {str(k): str(v) for k, v in (shipped_tree(language).get(CONTRACTIONS) or {}).items()}


def shipped_short_star_names(language: str) -> dict[str, str]:
    """The shipped template's :data:`STAR_SHORT_NAMES`: ``{"Rigil
    Kentaurus": "Rigil Kent"}``; a recipe's own language file has none."""
    return {str(k): str(v) for k, v in (shipped_tree(language).get(STAR_SHORT_NAMES) or {}).items()}


def flatten(tree, prefix: str = "") -> dict:
    """``{"a": {"b": "x"}}`` as ``{"a.b": "x"}``; lists kept as lists of text."""
    out = {}
    for key, value in tree.items():
        name = f"{prefix}{key}"
        if isinstance(value, dict):
            out.update(flatten(value, name + "."))
        elif isinstance(value, list):
            out[name] = [str(v) for v in value]
        else:
            out[name] = str(value)
    return out


def split_tree(tree: dict) -> tuple[dict, dict]:
    """(flattened words, star names) of a template tree."""
    tree = dict(tree)
    stars = tree.pop(STAR_NAMES, None) or {}
    tree.pop(CONTRACTIONS, None)   # not words of their own (shipped_contractions)
    tree.pop(STAR_SHORT_NAMES, None)   # nor these (shipped_short_star_names)
    return flatten(tree), {str(k): str(v) for k, v in stars.items()}


@lru_cache(maxsize=None)
def shipped_table(language: str) -> dict:
    """The flattened words of a shipped template (star names aside)."""
    return split_tree(shipped_tree(language))[0]
