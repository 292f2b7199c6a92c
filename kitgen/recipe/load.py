"""Read and validate a recipe file (YAML, safe loader only).

Every problem is a :class:`~kitgen.errors.UserError` whose one-line message
names the key and its line in the file and says how to put it right.

A recipe may come from a stranger, so the file is treated as hostile until
checked: it is read with a size limit (so ``/dev/zero`` cannot fill the
memory), its YAML event stream is checked for anchors and aliases (the
"billion laughs" expansion), explicit tags (``!!python/object`` and the
like), deep nesting and sheer size before any value is built, and only
YAML's safe loader ever builds values, so no code can run from a recipe.
:func:`read_text_file` and :func:`safe_yaml` serve any other YAML input
(a language file, say) the same way.
"""

from __future__ import annotations

import difflib
import math
import unicodedata
from pathlib import Path

import yaml

from ..errors import UserError, shown
from .latitude import LatitudeError, parse_latitude
from .schema import KEYS_BY_NAME, MAX_STAR_NAMES, MAX_TEXT_CHARS, Recipe, StarChoice, current_year

#: A recipe is a few hundred bytes; refuse anything absurdly large unread.
MAX_RECIPE_BYTES = 256 * 1024
#: Deepest nesting of lists and mappings a recipe may have (it needs 2).
MAX_DEPTH = 8
#: Most YAML events (scalars, list and mapping starts) a recipe may have.
MAX_EVENTS = 5000
#: Longest list under any key other than ``stars`` (which has its own limit).
MAX_LIST_ITEMS = 50
#: Longest star name (the longest in the catalogue is far shorter).
MAX_STAR_NAME_CHARS = 40

#: The only explicit YAML tags a recipe may carry: the core schema's
#: (YAML 1.1 tag repository).  Any other tag, ``!!python/object`` above all,
#: is refused by name before the safe loader sees it.
_CORE_TAGS = {f"tag:yaml.org,2002:{t}" for t in ("str", "int", "float", "bool", "null", "seq", "map")}


def read_text_file(path, max_bytes: int = MAX_RECIPE_BYTES, what: str = "recipe") -> str:
    """The text of the file at ``path``, read at most ``max_bytes`` (+1, to
    tell a file that is too large); UTF-8, with or without a byte-order
    mark.  Every failure is a one-line :class:`UserError`."""
    p = Path(path)
    try:
        with open(p, "rb") as fh:
            data = fh.read(max_bytes + 1)
    except FileNotFoundError:
        raise UserError(f"{p}: no such file; check the name (`kitgen new -o {p.name}` writes a starter {what})") \
            from None
    except IsADirectoryError:
        raise UserError(f"{p}: is a folder, not a {what} file; give the file's name") from None
    except PermissionError:
        raise UserError(f"{p}: permission denied; check the file's permissions") from None
    except OSError as exc:
        raise UserError(f"{p}: cannot read: {exc.strerror or exc}") from None
    if len(data) > max_bytes:
        raise UserError(f"{p}: the file is larger than {max_bytes // 1024} KiB; is it a {what}?")
    if data.startswith((b"\xff\xfe", b"\xfe\xff")):
        raise UserError(f"{p}: the file is UTF-16 text; save the {what} as UTF-8")
    if b"\x00" in data:
        raise UserError(f"{p}: not a text file (a {what} is UTF-8 YAML text)")
    try:
        return data.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        line = data[: exc.start].count(b"\n") + 1
        raise UserError(f"{p}, line {line}: not UTF-8 text (byte 0x{data[exc.start]:02x}); "
                        f"save the {what} as UTF-8") from None


def _check_structure(text: str, source: str, what: str = "recipe", max_events: int = MAX_EVENTS) -> None:
    """Refuse anchors and aliases, explicit tags other than the core ones,
    merge keys, deep nesting and huge documents before anything is built
    from them; the event stream is read lazily, so nothing large is ever
    held."""
    depth = events = 0
    try:
        for event in yaml.parse(text, Loader=yaml.SafeLoader):
            events += 1
            line = event.start_mark.line + 1
            if isinstance(event, yaml.AliasEvent) or getattr(event, "anchor", None):
                raise UserError(f"{source}, line {line}: YAML anchors and aliases (& and *) are not allowed "
                                f"in a {what}; write each value out")
            tag = getattr(event, "tag", None)
            if tag is not None and tag != "!" and tag not in _CORE_TAGS:
                raise UserError(f"{source}, line {line}: the YAML tag {shown(tag)} is not allowed in a {what}; "
                                "remove it and write the plain value")
            if isinstance(event, yaml.ScalarEvent) and event.value == "<<" and event.style is None:
                raise UserError(f"{source}, line {line}: the YAML merge key '<<' is not allowed in a {what}; "
                                "write each key out")
            if isinstance(event, (yaml.MappingStartEvent, yaml.SequenceStartEvent)):
                depth += 1
                if depth > MAX_DEPTH:
                    raise UserError(f"{source}, line {line}: the {what} is nested deeper than {MAX_DEPTH} "
                                    "levels")
            elif isinstance(event, (yaml.MappingEndEvent, yaml.SequenceEndEvent)):
                depth -= 1
            if events > max_events:
                raise UserError(f"{source}: the {what} has more than {max_events} values; is it a {what}?")
    except yaml.YAMLError:
        return  # reported with its line and column by the loader


def _yaml_error(exc: yaml.YAMLError, source: str) -> UserError:
    mark = getattr(exc, "problem_mark", None)
    where = f" at line {mark.line + 1}, column {mark.column + 1}" if mark else ""
    problem = getattr(exc, "problem", None) or "not valid YAML"
    return UserError(f"{source}: invalid YAML{where}: {problem}; check the quotes, colons and indentation there")


def safe_yaml(text: str, source: str = "recipe", what: str = "recipe", max_events: int = MAX_EVENTS):
    """The value of YAML ``text`` after the structure checks, built by the
    safe loader only; a :class:`UserError` for anything wrong.  ``what``
    names the kind of file in messages ("recipe", "language file")."""
    _check_structure(text, source, what, max_events)
    try:
        return yaml.safe_load(text)
    except yaml.YAMLError as exc:
        raise _yaml_error(exc, source) from None
    except (ValueError, OverflowError):
        # The core schema's constructors (a number of more than 4300 digits).
        raise UserError(f"{source}: a value cannot be read (a number far too long?); "
                        "write plain numbers such as 48.2") from None
    except RecursionError:
        raise UserError(f"{source}: the {what} is nested too deeply") from None


def _key_nodes(text: str) -> dict:
    """For each top-level key: its line (1-based) and, for a plain scalar
    value, the text as written (YAML 1.1 would read 40:26:46 as a number).
    Refuses a key given twice (YAML's loader would silently keep the last)."""
    try:
        node = yaml.compose(text, Loader=yaml.SafeLoader)
    except (yaml.YAMLError, ValueError, RecursionError):
        return {}
    if not isinstance(node, yaml.MappingNode):
        return {}
    out = {}
    for k, v in node.value:
        if isinstance(k, yaml.ScalarNode):
            line = k.start_mark.line + 1
            if k.value in out:
                raise _DuplicateKey(k.value, out[k.value][0], line)
            raw = v.value if isinstance(v, yaml.ScalarNode) and v.style is None else None
            out[k.value] = (line, raw)
    return out


class _DuplicateKey(Exception):
    pass


def parse_recipe_text(text: str, source: str = "recipe") -> Recipe:
    """Validate recipe text; ``source`` names the file in messages."""
    tree = safe_yaml(text, source)
    if tree is None:
        raise UserError(f"{source}: the recipe is empty; `kitgen new` writes a starter recipe")
    if not isinstance(tree, dict):
        raise UserError(f"{source}: a recipe is a mapping of keys to values, such as 'latitude: 48.2'; "
                        "`kitgen new` writes a starter recipe")
    try:
        nodes = _key_nodes(text)
    except _DuplicateKey as dup:
        name, first, again = dup.args
        raise UserError(f"{source}, line {again}: the key {shown(name)} is given twice (first on line {first}); "
                        "keep one") from None
    lines = {k: line for k, (line, _) in nodes.items()}
    raw_latitude = nodes.get("latitude", (0, None))[1]
    if raw_latitude is not None and ":" in raw_latitude:
        tree["latitude"] = raw_latitude
    return validate_recipe(tree, source, lines)


def load_recipe(path) -> Recipe:
    """Read and validate the recipe file at ``path``."""
    return parse_recipe_text(read_text_file(path), str(path))


def validate_recipe(tree: dict, source: str = "recipe", lines: dict | None = None) -> Recipe:
    """Check every key of ``tree`` and build the :class:`Recipe`."""
    lines = lines or {}
    values: dict = {}
    for name, value in tree.items():
        where = f"{source}, line {lines[name]}" if isinstance(name, str) and name in lines else source
        if not isinstance(name, str) or name not in KEYS_BY_NAME:
            close = difflib.get_close_matches(str(name)[:MAX_TEXT_CHARS], KEYS_BY_NAME, n=1)
            hint = f"; did you mean '{close[0]}'?" if close else f"; valid keys: {', '.join(KEYS_BY_NAME)}"
            raise UserError(f"{where}: unknown key {shown(name)}{hint}")
        key = KEYS_BY_NAME[name]
        values[key.attr] = _check(key, value, where)
        if key.name == "language_file" and values[key.attr]:
            from ..words.templates import resolve_language_file
            values[key.attr] = resolve_language_file(values[key.attr], source, where)
    if "latitude_deg" not in values:
        raise UserError(f"{source}: the key 'latitude' is required (degrees, north positive, -90 to 90); "
                        "add a line such as 'latitude: 48.2'")
    values.setdefault("epoch", current_year())
    _check_drawable(values, source, lines)
    return Recipe(**values)


#: Recipe keys whose text is printed on the kit.
_PRINTED_KEYS = ("title", "place")


def _check_drawable(values: dict, source: str, lines: dict) -> None:
    """Refuse printed text (title, place) holding a character that no
    shipped font of the kit's language draws, in every style it is set in:
    it would print as an empty box, or not at all."""
    texts = {k: values.get(KEYS_BY_NAME[k].attr) for k in _PRINTED_KEYS if k in KEYS_BY_NAME}
    if not any(texts.values()):
        return
    from ..words import fonts, locale

    code = values.get("language", "en")
    if values.get("language_file"):
        from ..words.templates import check_language_file
        code = check_language_file(values["language_file"])["language"]
    script = locale.script(code)
    for name, text in texts.items():
        if not text:
            continue
        lost = set().union(*(fonts.missing_chars(text, fonts.stack(script, style)) for style in fonts.STYLES))
        if lost:
            where = f"{source}, line {lines[name]}" if name in lines else source
            chars = ", ".join(f"U+{ord(c):04X}" for c in sorted(lost)[:5]) + (" ..." if len(lost) > 5 else "")
            raise UserError(f"{where}: '{name}' has characters that no shipped font draws ({chars}); "
                            "remove them or write the text another way")


def finite_number(value) -> bool:
    """A real number (not a bool) that is finite; safe for integers of any
    size, which ``math.isfinite`` would refuse with an OverflowError."""
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        return False
    if isinstance(value, int):
        return abs(value) < 10 ** 300
    return math.isfinite(value)


def _text_problem(value: str) -> str | None:
    """Why ``value`` cannot be printed, or ``None``: control characters
    and lone surrogates (which no font can show and no PDF can carry)."""
    for ch in value:
        cat = unicodedata.category(ch)
        if cat in ("Cc", "Cs"):
            return f"contains the control character U+{ord(ch):04X}; remove it"
    return None


def _check(key, value, where: str):
    label = f"{where}: '{key.name}'"
    if key.kind == "latitude":
        try:
            return parse_latitude(value)
        except LatitudeError as exc:
            raise UserError(f"{label}: {exc}") from None
    if key.kind in ("number", "integer"):
        if isinstance(value, str) and "," in value and key.kind == "number":
            raise UserError(f"{label} must be a number with a decimal point, not a comma (got {shown(value)})")
        if isinstance(value, float) and not math.isfinite(value):
            raise UserError(f"{label} must be a finite number ({key.help}), got {value}")
        if not finite_number(value):
            if isinstance(value, int) and not isinstance(value, bool):
                raise UserError(f"{label} is far outside {key.low:g} to {key.high:g} ({key.help})")
            raise UserError(f"{label} must be a number ({key.help}), got {shown(value)}")
        if key.kind == "integer" and not (isinstance(value, int) or float(value).is_integer()):
            raise UserError(f"{label} must be a whole number ({key.help}), got {shown(value)}")
        if not key.low <= value <= key.high:
            raise UserError(f"{label} is {value:g}, outside {key.low:g} to {key.high:g} ({key.help})")
        return int(value) if key.kind == "integer" else float(value)
    if key.kind == "string":
        if not isinstance(value, (str, int, float)) or isinstance(value, bool):
            raise UserError(f"{label} must be text ({key.help}), got {shown(value)}; put it in quotes")
        value = str(value)
        if len(value) > MAX_TEXT_CHARS:
            raise UserError(f"{label} is {len(value)} characters long; at most {MAX_TEXT_CHARS}, shorten it")
        problem = _text_problem(value)
        if problem:
            raise UserError(f"{label} {problem}")
        if key.name == "language":
            from ..words.templates import available_languages
            if value not in available_languages():
                raise UserError(f"{label}: unknown language {shown(value)}; available: "
                                f"{', '.join(available_languages())}")
        return value
    if key.kind == "choice":
        if not isinstance(value, str) or value.lower() not in key.choices:
            raise UserError(f"{label} must be one of {', '.join(key.choices)}, got {shown(value)}")
        return value.lower()
    if key.kind == "bool":
        if not isinstance(value, bool):
            raise UserError(f"{label} must be true or false, got {shown(value)}")
        return value
    if key.kind == "parts":
        if isinstance(value, list) and len(value) > MAX_LIST_ITEMS:
            raise UserError(f"{label}: the list has {len(value)} items; at most {MAX_LIST_ITEMS} "
                            f"(the parts are {', '.join(key.choices)})")
        if not isinstance(value, list) or not all(isinstance(v, str) for v in value):
            raise UserError(f"{label} must be a list of part names ({', '.join(key.choices)})")
        if not value and key.name == "parts":
            raise UserError(f"{label} is empty; name at least one of {', '.join(key.choices)}")
        bad = [v for v in value if v not in key.choices]
        if bad:
            raise UserError(f"{label}: unknown part {shown(bad[0])}; parts are {', '.join(key.choices)}")
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
            raise UserError(f"{label}: the list of stars is empty; name at least one, or write {{brightest: 32}}")
        if len(value) > MAX_STAR_NAMES:
            raise UserError(f"{label}: at most {MAX_STAR_NAMES} stars, got {len(value)}; "
                            f"shorten the list or write {{brightest: N}}")
        names = []
        for v in value:
            if not isinstance(v, str) or isinstance(v, bool):
                raise UserError(f"{label}: star names are text, got {shown(v)}; `kitgen stars` lists them")
            if len(v) > MAX_STAR_NAME_CHARS or _text_problem(v):
                raise UserError(f"{label}: {shown(v)} is no star name; `kitgen stars` lists them")
            names.append(find_star(v, label).label)
        return StarChoice(names=tuple(dict.fromkeys(names)))
    if isinstance(value, dict) and len(value) == 1:
        (rule, n), = value.items()
        if rule == "brightest":
            if not finite_number(n) or int(n) != n or not 1 <= n <= MAX_STAR_NAMES:
                raise UserError(f"{label}: 'brightest' takes a whole number from 1 to {MAX_STAR_NAMES}, "
                                f"got {shown(n)}")
            return StarChoice(brightest=int(n))
        if rule == "magnitude_limit":
            if not finite_number(n) or not -2.0 <= n <= 3.5:
                raise UserError(f"{label}: 'magnitude_limit' takes a magnitude from -2 to 3.5 "
                                f"(the catalogue holds stars brighter than 3.5), got {shown(n)}")
            return StarChoice(magnitude_limit=float(n))
    raise UserError(f"{label} must be a list of star names, {{brightest: N}} or {{magnitude_limit: M}}")
