"""Read and validate a recipe file (YAML, safe loader only).

Every problem is a :class:`~kitgen.errors.UserError` whose one-line message
names the key and its line in the file.
"""

from __future__ import annotations

import difflib
from pathlib import Path

import yaml

from ..errors import UserError
from .latitude import LatitudeError, parse_latitude
from .schema import (KEYS_BY_NAME, MAX_STAR_NAMES, MAX_TEXT_CHARS, Recipe, StarChoice, current_year,
                     is_finite_number)

#: A recipe is a few hundred bytes; refuse anything absurdly large unread.
MAX_RECIPE_BYTES = 256 * 1024


#: Deepest nesting of lists and mappings a recipe may have (it needs 2).
MAX_DEPTH = 8
#: Most YAML events (scalars, list and mapping starts) a recipe may have.
MAX_EVENTS = 5000


def _check_structure(text: str, source: str) -> None:
    """Refuse anchors and aliases (the "billion laughs" expansion), deep
    nesting and huge documents before anything is built from them; the
    event stream is read lazily, so nothing large is ever held."""
    depth = events = 0
    try:
        for event in yaml.parse(text, Loader=yaml.SafeLoader):
            events += 1
            if isinstance(event, yaml.AliasEvent) or getattr(event, "anchor", None):
                line = event.start_mark.line + 1
                raise UserError(f"{source}, line {line}: YAML anchors and aliases (& and *) are not allowed in a recipe")
            if isinstance(event, (yaml.MappingStartEvent, yaml.SequenceStartEvent)):
                depth += 1
                if depth > MAX_DEPTH:
                    line = event.start_mark.line + 1
                    raise UserError(f"{source}, line {line}: the recipe is nested deeper than {MAX_DEPTH} levels")
            elif isinstance(event, (yaml.MappingEndEvent, yaml.SequenceEndEvent)):
                depth -= 1
            if events > MAX_EVENTS:
                raise UserError(f"{source}: the recipe has more than {MAX_EVENTS} values; is it a recipe?")
    except yaml.YAMLError:
        return  # reported with its line and column by the loader


def _key_nodes(text: str) -> dict[str, tuple[int, str | None]]:
    """For each top-level key: its line (1-based) and, for a plain scalar
    value, the text as written (YAML 1.1 would read 40:26:46 as a number)."""
    try:
        node = yaml.compose(text, Loader=yaml.SafeLoader)
    except yaml.YAMLError:
        return {}
    if not isinstance(node, yaml.MappingNode):
        return {}
    out = {}
    for k, v in node.value:
        if isinstance(k, yaml.ScalarNode):
            raw = v.value if isinstance(v, yaml.ScalarNode) and v.style is None else None
            out[k.value] = (k.start_mark.line + 1, raw)
    return out


def parse_recipe_text(text: str, source: str = "recipe") -> Recipe:
    """Validate recipe text; ``source`` names the file in messages."""
    _check_structure(text, source)
    try:
        tree = yaml.safe_load(text)
    except yaml.YAMLError as exc:
        mark = getattr(exc, "problem_mark", None)
        where = f" at line {mark.line + 1}, column {mark.column + 1}" if mark else ""
        problem = getattr(exc, "problem", None) or "not valid YAML"
        raise UserError(f"{source}: invalid YAML{where}: {problem}") from None
    if tree is None:
        raise UserError(f"{source}: the recipe is empty; `kitgen new` writes a starter recipe")
    if not isinstance(tree, dict):
        raise UserError(f"{source}: a recipe is a mapping of keys to values, such as 'latitude: 48.2'")
    nodes = _key_nodes(text)
    lines = {k: line for k, (line, _) in nodes.items()}
    raw_latitude = nodes.get("latitude", (0, None))[1]
    if raw_latitude is not None and ":" in raw_latitude:
        tree["latitude"] = raw_latitude
    return validate_recipe(tree, source, lines)


def load_recipe(path) -> Recipe:
    """Read and validate the recipe file at ``path``."""
    p = Path(path)
    try:
        if p.stat().st_size > MAX_RECIPE_BYTES:
            raise UserError(f"{p}: the file is larger than {MAX_RECIPE_BYTES // 1024} KiB; is it a recipe?")
        text = p.read_text(encoding="utf-8")
    except UserError:
        raise
    except FileNotFoundError:
        raise UserError(f"{p}: no such file") from None
    except IsADirectoryError:
        raise UserError(f"{p}: is a folder, not a recipe file") from None
    except UnicodeDecodeError:
        raise UserError(f"{p}: not a text file (a recipe is UTF-8 YAML)") from None
    except OSError as exc:
        raise UserError(f"{p}: cannot read: {exc.strerror}") from None
    return parse_recipe_text(text, str(p))


def validate_recipe(tree: dict, source: str = "recipe", lines: dict[str, int] | None = None) -> Recipe:
    """Check every key of ``tree`` and build the :class:`Recipe`."""
    lines = lines or {}
    values: dict = {}
    for name, value in tree.items():
        where = f"{source}, line {lines[name]}" if name in lines else source
        if not isinstance(name, str) or name not in KEYS_BY_NAME:
            close = difflib.get_close_matches(str(name), KEYS_BY_NAME, n=1)
            hint = f"; did you mean '{close[0]}'?" if close else f"; valid keys: {', '.join(KEYS_BY_NAME)}"
            raise UserError(f"{where}: unknown key '{name}'{hint}")
        key = KEYS_BY_NAME[name]
        values[key.attr] = _check(key, value, where)
        if key.name == "language_file" and values[key.attr]:
            from ..words.templates import resolve_language_file
            values[key.attr] = resolve_language_file(values[key.attr], source, where)
    if "latitude_deg" not in values:
        raise UserError(f"{source}: the key 'latitude' is required (degrees, north positive, -90 to 90)")
    values.setdefault("epoch", current_year())
    return Recipe(**values)


def _check(key, value, where: str):
    label = f"{where}: '{key.name}'"
    if key.kind == "latitude":
        try:
            return parse_latitude(value)
        except LatitudeError as exc:
            raise UserError(f"{label}: {exc}") from None
    if key.kind in ("number", "integer"):
        if isinstance(value, str) and "," in value and key.kind == "number":
            raise UserError(f"{label} must be a number with a decimal point, not a comma (got '{value}')")
        if not is_finite_number(value):
            raise UserError(f"{label} must be a number ({key.help}), got {value!r}")
        if key.kind == "integer" and float(value) != int(value):
            raise UserError(f"{label} must be a whole number ({key.help}), got {value!r}")
        if not key.low <= value <= key.high:
            raise UserError(f"{label} is {value}, outside {key.low:g} to {key.high:g} ({key.help})")
        return int(value) if key.kind == "integer" else float(value)
    if key.kind == "string":
        if not isinstance(value, (str, int, float)) or isinstance(value, bool):
            raise UserError(f"{label} must be text ({key.help}), got {value!r}")
        value = str(value)
        if len(value) > MAX_TEXT_CHARS:
            raise UserError(f"{label} is longer than {MAX_TEXT_CHARS} characters")
        if key.name == "language":
            from ..words.templates import available_languages
            if value not in available_languages():
                raise UserError(f"{label}: unknown language '{value}'; available: "
                                f"{', '.join(available_languages())}")
        return value
    if key.kind == "choice":
        if not isinstance(value, str) or value.lower() not in key.choices:
            raise UserError(f"{label} must be one of {', '.join(key.choices)}, got {value!r}")
        return value.lower()
    if key.kind == "bool":
        if not isinstance(value, bool):
            raise UserError(f"{label} must be true or false, got {value!r}")
        return value
    if key.kind == "parts":
        if not isinstance(value, list) or not value or not all(isinstance(v, str) for v in value):
            raise UserError(f"{label} must be a list of part names ({', '.join(key.choices)})")
        bad = [v for v in value if v not in key.choices]
        if bad:
            raise UserError(f"{label}: unknown part '{bad[0]}'; parts are {', '.join(key.choices)}")
        return tuple(dict.fromkeys(value))
    if key.kind == "stars":
        return _check_stars(value, label)
    if key.kind == "parsed":
        try:
            return key.parse(value)
        except ValueError as exc:
            raise UserError(f"{label}: {exc}") from None
    raise AssertionError(key.kind)


def _check_stars(value, label: str) -> StarChoice:
    from ..sky.stars import find_star

    if isinstance(value, list):
        if not value:
            raise UserError(f"{label}: the list of stars is empty")
        if len(value) > MAX_STAR_NAMES:
            raise UserError(f"{label}: at most {MAX_STAR_NAMES} stars, got {len(value)}")
        names = []
        for v in value:
            if not isinstance(v, str):
                raise UserError(f"{label}: star names are text, got {v!r}")
            names.append(find_star(v, label).label)
        return StarChoice(names=tuple(dict.fromkeys(names)))
    if isinstance(value, dict) and len(value) == 1:
        (rule, n), = value.items()
        if rule == "brightest":
            if not is_finite_number(n) or int(n) != n or not 1 <= n <= MAX_STAR_NAMES:
                raise UserError(f"{label}: 'brightest' takes a whole number from 1 to {MAX_STAR_NAMES}")
            return StarChoice(brightest=int(n))
        if rule == "magnitude_limit":
            if not is_finite_number(n) or not -2.0 <= n <= 3.5:
                raise UserError(f"{label}: 'magnitude_limit' takes a magnitude from -2 to 3.5 "
                                "(the catalogue holds stars brighter than 3.5)")
            return StarChoice(magnitude_limit=float(n))
    raise UserError(f"{label} must be a list of star names, {{brightest: N}} or {{magnitude_limit: M}}")
