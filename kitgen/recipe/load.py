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
import os
import re
import stat
import unicodedata
from pathlib import Path

import yaml

from ..errors import Message, UserError, few, shown, speaking, typed
from ..paper import DEFAULT_MARGIN_MM, SheetError, default_diameter_mm, make_sheet
from ..sky.rete_rim import MAX_RIM_DEG, epoch_obliquity_rad, kit_rim_deg, rete_fits, rim_for_stars_deg
from ..sky.stars import closest_name, find_star, fold_name, outside, places_at_epoch, select_stars
from ..template_files import STAR_NAMES, available_languages, shipped_tree
from ..words import fonts, locale
from ..words.templates import MAX_LANGUAGE_FILE_BYTES, check_language_tree
from .latitude import LatitudeError, parse_latitude
from .site import resolve_site
from .schema import (KEYS_BY_NAME, MAX_PLATES, MAX_STAR_NAMES, MAX_TEXT_CHARS, PlateSpec, Recipe, StarChoice,
                     current_year)

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

#: The kinds of file read here, as messages name them.
RECIPE = Message("errors.kind_recipe")
LANGUAGE_FILE = Message("errors.kind_language_file")


def at_line(source, line: int) -> Message:
    """``source, line N`` for a message."""
    return Message("errors.at_line", source=source, line=line)


#: The command that writes a starter file of each kind (``kitgen new``'s
#: options), by the kind's message key; a kind without one (a language
#: file) gets no such hint.
_STARTERS = {"errors.kind_recipe": "kitgen new -o {name}", "errors.kind_set": "kitgen new --set -o {name}",
             "errors.kind_roster": "kitgen new --roster -o {name}"}


def _no_such_file(path, what: Message) -> UserError:
    """The refusal of a missing file, with the command that writes a
    starter file of its kind there, where there is one."""
    starter = _STARTERS.get(what.key)
    if starter is None:
        return UserError("errors.no_such_file_bare", path=path)
    return UserError("errors.no_such_file", path=path, command=starter.format(name=path), what=what)


def read_text_file(path, max_bytes: int = MAX_RECIPE_BYTES, what: Message = RECIPE) -> str:
    """The text of the file at ``path``, read at most ``max_bytes`` (+1, to
    tell a file that is too large); UTF-8, with or without a byte-order
    mark.  Every failure is a one-line :class:`UserError`; ``what`` names
    the kind of file (:data:`RECIPE`, :data:`LANGUAGE_FILE`)."""
    p = Path(path)
    try:
        # O_NONBLOCK: a FIFO or a device is refused below, never waited on
        with open(p, "rb", opener=lambda name, flags: os.open(name, flags | os.O_NONBLOCK)) as fh:
            if not stat.S_ISREG(os.fstat(fh.fileno()).st_mode):
                if stat.S_ISDIR(os.fstat(fh.fileno()).st_mode):
                    raise IsADirectoryError(p)
                raise UserError("errors.not_regular_file", path=p, what=what)
            data = fh.read(max_bytes + 1)
    except FileNotFoundError:
        raise _no_such_file(p, what) from None
    except IsADirectoryError:
        raise UserError("errors.is_folder_not_file", path=p, what=what) from None
    except PermissionError:
        raise UserError("errors.read_permission", path=p) from None
    except OSError as exc:
        raise UserError("errors.cannot_read", path=p, reason=exc.strerror or exc) from None
    except ValueError:   # a NUL in the name: no file system has such a file
        raise _no_such_file(shown(str(p)), what) from None
    if len(data) > max_bytes:
        raise UserError("errors.file_too_large", path=p, kib=max_bytes // 1024, what=what)
    encoding = _other_encoding(data)
    if encoding:
        raise UserError("errors.other_encoding", path=p, what=what, encoding=encoding)
    if b"\x00" in data:
        raise UserError("errors.not_text_file", path=p, what=what)
    try:
        return data.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        line = data[: exc.start].count(b"\n") + 1
        raise UserError("errors.not_utf8", where=at_line(p, line), byte=f"{data[exc.start]:02x}",
                        what=what) from None


#: Byte-order marks (The Unicode Standard, 16.0, section 23.8, table 23-4),
#: the longer first: UTF-32's little-endian mark begins as UTF-16's does.
_BOMS = ((b"\xff\xfe\x00\x00", "UTF-32"), (b"\x00\x00\xfe\xff", "UTF-32"), (b"\xff\xfe", "UTF-16"),
         (b"\xfe\xff", "UTF-16"))


def _other_encoding(data: bytes) -> str | None:
    """The Unicode encoding other than UTF-8 that ``data`` is written in,
    by its byte-order mark or, without one, by the zero bytes that ASCII
    text has in UTF-16 (every second byte) or UTF-32 (three in four);
    ``None`` for anything else."""
    for bom, name in _BOMS:
        if data.startswith(bom):
            return name
    head = data[:512]
    if len(head) >= 8 and b"\x00" in head:
        zeros = [head[k::4].count(0) / len(head[k::4]) for k in range(4)]
        if sum(z > 0.9 for z in zeros) == 3 and len(head) % 4 == 0:
            return "UTF-32"
        if len(head) % 2 == 0 and (zeros[0] > 0.9 and zeros[2] > 0.9) != (zeros[1] > 0.9 and zeros[3] > 0.9):
            return "UTF-16"
    return None


def _check_structure(text: str, source, what: Message = RECIPE, max_events: int = MAX_EVENTS) -> None:
    """Refuse anchors and aliases, explicit tags other than the core ones,
    merge keys, deep nesting and huge documents before anything is built
    from them; the event stream is read lazily, so nothing large is ever
    held."""
    depth = events = 0
    try:
        for event in yaml.parse(text, Loader=yaml.SafeLoader):
            events += 1
            where = at_line(source, event.start_mark.line + 1)
            if isinstance(event, yaml.AliasEvent) or getattr(event, "anchor", None):
                raise UserError("errors.yaml_alias", where=where, what=what)
            tag = getattr(event, "tag", None)
            if tag is not None and tag != "!" and tag not in _CORE_TAGS:
                raise UserError("errors.yaml_tag", where=where, tag=shown(tag), what=what)
            if isinstance(event, yaml.ScalarEvent) and event.value == "<<" and event.style is None:
                raise UserError("errors.yaml_merge", where=where, what=what)
            if isinstance(event, (yaml.MappingStartEvent, yaml.SequenceStartEvent)):
                depth += 1
                if depth > MAX_DEPTH:
                    raise UserError("errors.nested_deeper", where=where, what=what, levels=MAX_DEPTH)
            elif isinstance(event, (yaml.MappingEndEvent, yaml.SequenceEndEvent)):
                depth -= 1
            if events > max_events:
                raise UserError("errors.too_many_values", source=source, what=what, count=max_events)
    except yaml.YAMLError:
        return  # reported with its line and column by the loader


def _yaml_error(exc: yaml.YAMLError, source) -> UserError:
    """PyYAML's own description of the problem is quoted as it gives it
    (in English): it is the parser's, not kitgen's."""
    mark = getattr(exc, "problem_mark", None)
    at = Message("errors.yaml_at", line=mark.line + 1, column=mark.column + 1) if mark else ""
    problem = getattr(exc, "problem", None) or Message("errors.yaml_not_valid")
    return UserError("errors.invalid_yaml", source=source, at=at, problem=problem)


class _Loader(yaml.SafeLoader):
    """YAML's safe loader, reading a number in exponent form (1e-9, 2e2,
    1.5e1) as a number, as the YAML 1.2 core schema does (YAML 1.2.2,
    section 10.3.2), where YAML 1.1 read it as text unless it had a
    decimal point and a signed exponent."""


_Loader.add_implicit_resolver("tag:yaml.org,2002:float",
                              re.compile(r"^[-+]?(\.[0-9]+|[0-9]+(\.[0-9]*)?)[eE][-+]?[0-9]+$"),
                              list("-+.0123456789"))


def joined_pairs(text: str) -> str:
    """``text`` with each UTF-16 surrogate pair joined into the one
    character it stands for.  A double-quoted YAML scalar escapes a
    character beyond U+FFFF as ``\\U0001F31F``, but many tools write it as
    JSON does, two ``\\u`` escapes of its surrogate pair (RFC 8259,
    section 7), which YAML, a superset of JSON (YAML 1.2.2, section 1.3),
    then reads as two lone surrogates; a lone half stays as it is."""
    if not any("\ud800" <= ch <= "\udfff" for ch in text):
        return text
    return text.encode("utf-16-le", "surrogatepass").decode("utf-16-le", "surrogatepass")


def _construct_text(loader, node) -> str:
    return joined_pairs(loader.construct_scalar(node))


_Loader.add_constructor("tag:yaml.org,2002:str", _construct_text)


def safe_yaml(text: str, source=RECIPE, what: Message = RECIPE, max_events: int = MAX_EVENTS):
    """The value of YAML ``text`` after the structure checks, built by the
    safe loader only; a :class:`UserError` for anything wrong.  ``source``
    names the file in messages (a path or a :class:`Message`), ``what`` the
    kind of file (:data:`RECIPE`, :data:`LANGUAGE_FILE`)."""
    _check_structure(text, source, what, max_events)
    try:
        return yaml.load(text, Loader=_Loader)   # noqa: S506 (a safe loader)
    except yaml.YAMLError as exc:
        raise _yaml_error(exc, source) from None
    except (ValueError, OverflowError):
        # The core schema's constructors (a number of more than 4300 digits).
        raise UserError("errors.unreadable_value", source=source) from None
    except RecursionError:
        raise UserError("errors.nested_too_deeply", source=source, what=what) from None


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


def parse_recipe_text(text: str, source=RECIPE) -> Recipe:
    """Validate recipe text; ``source`` names the file in messages."""
    tree = safe_yaml(text, source)
    if tree is None:
        raise UserError("errors.recipe_empty", source=source)
    if not isinstance(tree, dict):
        raise UserError("errors.recipe_not_mapping", source=source)
    with speaking(lambda: recipe_language(tree, source)):
        try:
            nodes = _key_nodes(text)
        except _DuplicateKey as dup:
            name, first, again = dup.args
            raise UserError("errors.key_twice", where=at_line(source, again), name=shown(name),
                            first=first) from None
        lines = {k: line for k, (line, _) in nodes.items()}
        raw_latitude = nodes.get("latitude", (0, None))[1]
        if raw_latitude is not None and ":" in raw_latitude:
            tree["latitude"] = raw_latitude
        raw_longitude = nodes.get("longitude", (0, None))[1]
        if raw_longitude is not None and ":" in raw_longitude:
            tree["longitude"] = raw_longitude
        for name, (_, raw) in nodes.items():   # a title or a name read as a number keeps its text
            key = KEYS_BY_NAME.get(name)
            if raw is not None and key is not None and key.kind == "string" \
                    and isinstance(tree.get(name), (int, float)) and not isinstance(tree.get(name), bool):
                tree[name] = raw
        return validate_recipe(tree, source, lines)


def recipe_language(tree: dict, source=RECIPE) -> tuple[str | None, str | None]:
    """The language a recipe tree asks to be spoken to in, as far as it
    can tell: ``(language, language_file)``, the first the code of a
    shipped template, the second the path of a language file that passes
    its checks (it wins); ``None`` for what the tree does not tell."""
    code = tree.get("language")
    language = code if isinstance(code, str) and code in available_languages() else None
    value = tree.get("language_file")
    if isinstance(value, str) and value and len(value) <= MAX_TEXT_CHARS and not _text_problem(value):
        base = Path(str(source)).parent if Path(str(source)).is_file() else Path.cwd()
        path = (base / value).resolve()
        try:
            load_language_file(path)
            return language, str(path)
        except UserError:
            pass
    return language, None


def load_language_file(path) -> dict:
    """Read and check a language file; every problem is one
    :class:`UserError` line (the first missing keys, then how many more).  The file is
    read as a recipe is (a bounded read, so /dev/zero cannot fill the
    memory; anchors, tags, merge keys and deep nesting refused before YAML's
    safe loader builds anything), so no code runs and nothing is fetched."""
    p = Path(path)
    text = read_text_file(p, MAX_LANGUAGE_FILE_BYTES, LANGUAGE_FILE)
    source = Message("errors.source_language_file", path=p)
    tree = safe_yaml(text, source, LANGUAGE_FILE, max_events=50_000)
    check_language_tree(tree, source, tree_lines(text))
    return tree


def tree_lines(text: str) -> dict:
    """For each key of a YAML mapping, nested ones as ``a.b``: the line
    (1-based) of its value, for messages.  Empty when the text is no
    mapping; only called on text that :func:`safe_yaml` accepted."""
    try:
        node = yaml.compose(text, Loader=yaml.SafeLoader)
    except (yaml.YAMLError, ValueError, RecursionError):
        return {}
    out: dict = {}

    def walk(node, prefix: str, depth: int) -> None:
        if not isinstance(node, yaml.MappingNode) or depth > MAX_DEPTH:
            return
        for k, v in node.value:
            if isinstance(k, yaml.ScalarNode):
                name = prefix + k.value
                out.setdefault(name, v.start_mark.line + 1)
                walk(v, name + ".", depth + 1)

    walk(node, "", 0)
    return out


def resolve_language_file(value: str, source: str, where) -> str:
    """The recipe key ``language_file``: a path relative to the recipe's
    folder (or to the current folder for a recipe that is no file),
    checked at once so that a bad language file is refused like a bad
    recipe.  Returns the absolute path."""
    base = Path(str(source)).parent if Path(str(source)).is_file() else Path.cwd()
    path = (base / value).resolve()
    try:
        load_language_file(path)
    except UserError as exc:
        raise UserError("errors.language_file_problem", where=where, problem=exc) from None
    return str(path)


def load_recipe(path) -> Recipe:
    """Read and validate the recipe file at ``path``."""
    return parse_recipe_text(read_text_file(path), str(path))


def validate_recipe(tree: dict, source=RECIPE, lines: dict | None = None) -> Recipe:
    """Check every key of ``tree`` and build the :class:`Recipe`.  A
    :class:`UserError` carries the language the tree asks for (see
    :func:`recipe_language`), so that the message can be shown in it."""
    with speaking(lambda: recipe_language(tree, source)):
        return _validate(tree, source, lines or {})


def _validate(tree: dict, source, lines: dict) -> Recipe:
    values = _checked_keys(tree, source, lines)
    if values.get("plates"):
        south = any(p.latitude_deg < 0 for p in values["plates"])
        values["latitude_deg"] = next(p.latitude_deg for p in values["plates"]
                                      if not south or p.latitude_deg < 0)
    resolve_site(values, source, at_line(source, lines["place"]) if "place" in lines else source)
    if "latitude_deg" not in values:
        raise UserError("errors.latitude_required", source=source)
    values.setdefault("epoch", current_year())
    _check_sheet_room(values, source, lines)
    _check_stars_fit(values, source, lines)
    _check_drawable(values, source, lines)
    return Recipe(**values)


def _checked_keys(tree: dict, source, lines: dict, skip: tuple[str, ...] = ()) -> dict:
    """Each key of ``tree`` checked on its own (but for ``skip``), as
    ``{attribute: value}``: a key no recipe has, or a value its key
    refuses, is a :class:`UserError` naming its line; a recipe gives
    either ``latitude`` or ``plates``."""
    values: dict = {}
    local_stars = _local_star_names(tree, source) if "stars" in tree and "stars" not in skip else {}
    for name, value in tree.items():
        where = at_line(source, lines[name]) if isinstance(name, str) and name in lines else source
        if not isinstance(name, str) or name not in KEYS_BY_NAME:
            close = difflib.get_close_matches(str(name)[:MAX_TEXT_CHARS], KEYS_BY_NAME, n=1)
            hint = (Message("errors.hint_did_you_mean", name=close[0]) if close
                    else Message("errors.hint_valid_keys", names=list(KEYS_BY_NAME)))
            raise UserError("errors.unknown_key", where=where, name=shown(name), hint=hint)
        if name in skip:
            continue
        key = KEYS_BY_NAME[name]
        values[key.attr] = _check(key, value, where, local_stars)
        if key.name == "language_file" and values[key.attr]:
            values[key.attr] = resolve_language_file(values[key.attr], source, where)
    if values.get("plates") and "latitude_deg" in values:
        raise UserError("errors.plates_and_latitude", source=at_line(source, lines["plates"]) if "plates" in lines
                        else source)
    return values


def check_defaults(tree: dict, source, lines: dict) -> None:
    """Check a class set's ``defaults`` key by key, as a recipe's keys are
    checked: a mistake there is the set's own, said once with its line,
    where every kit that takes the defaults would have said it as its own
    mistake, on its own line (#12).  What depends on a kit's other keys
    (a place's lookup, stars that must fit its rete, the text its fonts
    must draw) is left to each kit; so are the star names, which are read
    in the kit's language."""
    with speaking(lambda: recipe_language(tree, source)):
        _checked_keys(tree, source, lines, skip=("stars",))


#: Recipe keys whose text is printed on the kit.
_PRINTED_KEYS = ("title", "place", "owner")


def _check_drawable(values: dict, source: str, lines: dict) -> None:
    """Refuse printed text (title, place, owner, the plates' places)
    holding a character that no shipped font draws (the kit's language's,
    or another script's, :func:`kitgen.words.fonts.fallbacks`), in every
    style it is set in: it would print as an empty box, or not at all."""
    texts = {k: values.get(KEYS_BY_NAME[k].attr) for k in _PRINTED_KEYS if k in KEYS_BY_NAME}
    texts["plates"] = "".join(getattr(p, "place", "") for p in values.get("plates", ()))
    if not any(texts.values()):
        return
    code = values.get("language", "en")
    if values.get("language_file"):
        code = load_language_file(values["language_file"])["language"]
    script = locale.script(code)
    stacks = [fonts.stack(script, style) for style in fonts.STYLES]
    for name, text in texts.items():
        if not text:
            continue
        lost = set().union(*(fonts.missing_chars(text, faces + fonts.fallbacks(faces)) for faces in stacks))
        if lost:
            where = at_line(source, lines[name]) if name in lines else source
            chars = [_shown(c) for c in sorted(lost)[:5]]
            raise UserError("errors.not_drawable", where=where, name=name, chars=chars,
                            more=" ..." if len(lost) > 5 else "")


def _shown(char: str) -> str:
    """A character a message names: itself, quoted, where a terminal
    shows it alone (not a combining mark, nor a format character), and
    its code point (U+738B), which says what it is where no font on the
    reader's screen draws it either."""
    code = f"U+{ord(char):04X}"
    plain = char.isprintable() and not unicodedata.combining(char) and unicodedata.category(char) != "Cf"
    return f"'{char}' {code}" if plain else code


def finite_number(value) -> bool:
    """A real number (not a bool) that is finite; safe for integers of any
    size, which ``math.isfinite`` would refuse with an OverflowError."""
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        return False
    if isinstance(value, int):
        return abs(value) < 10 ** 300
    return math.isfinite(value)


#: No number in a recipe is anywhere near this large (the largest bound of
#: any key is a few thousand); larger ones are refused before any
#: conversion, which for an integer of hundreds of digits would overflow.
MAX_MAGNITUDE = 1e12


def _huge_number(value, depth: int = 0):
    """The first number in ``value`` (or in its lists and mappings, keys
    included) whose size is beyond :data:`MAX_MAGNITUDE`; ``None`` if none is."""
    if isinstance(value, bool) or depth > MAX_DEPTH:
        return None
    if isinstance(value, int):
        return value if abs(value) > MAX_MAGNITUDE else None
    if isinstance(value, float):
        return value if math.isfinite(value) and abs(value) > MAX_MAGNITUDE else None
    items = list(value.items()) if isinstance(value, dict) else [(None, v) for v in value] \
        if isinstance(value, (list, tuple)) else []
    for k, v in items:
        for x in (k, v):
            found = _huge_number(x, depth + 1)
            if found is not None:
                return found
    return None


def _text_problem(value: str) -> str | None:
    """The first character of ``value`` that cannot be printed, or
    ``None``: control characters and lone surrogates (which no font can
    show and no PDF can carry)."""
    for ch in value:
        cat = unicodedata.category(ch)
        if cat in ("Cc", "Cs"):
            return ch
    return None


def _refuse_unprintable(value: str, label) -> None:
    """Refuse ``value`` if it holds a character that cannot be printed
    (:func:`_text_problem`), naming it as what it is: a control character,
    or half of a UTF-16 surrogate pair without its other half."""
    bad = _text_problem(value)
    if bad and unicodedata.category(bad) == "Cs":
        raise UserError("errors.lone_surrogate", label=label, code=f"{ord(bad):04X}")
    if bad:
        raise UserError("errors.control_character", label=label, code=f"{ord(bad):04X}")


class KeyHelp(Message):
    """A recipe key's help line (``errors.help.NAME`` in the templates;
    the English is :attr:`schema.Key.help`), with the key's range and
    choices as values."""

    def __init__(self, key):
        super().__init__("errors.help." + key.name,
                         low=f"{key.low:g}" if key.low is not None else "",
                         high=f"{key.high:g}" if key.high is not None else "",
                         choices=list(key.choices))


def _check(key, value, where, local_stars: dict | None = None):
    label = Message("errors.key_label", where=where, name=key.name)
    if key.kind == "plates":
        return _check_plates(value, label, where)
    if key.kind == "latitude":
        try:
            return parse_latitude(value)
        except LatitudeError as exc:
            raise UserError("errors.key_problem", label=label, problem=exc) from None
    if key.kind in ("number", "integer"):
        about = KeyHelp(key)
        low, high = f"{key.low:g}", f"{key.high:g}"
        if isinstance(value, str) and "," in value and key.kind == "number":
            raise UserError("errors.decimal_comma", label=label, value=shown(value))
        if isinstance(value, float) and not math.isfinite(value):
            raise UserError("errors.not_finite", label=label, help=about, value=value)
        if not finite_number(value):
            if isinstance(value, int) and not isinstance(value, bool):
                raise UserError("errors.far_outside", label=label, low=low, high=high, help=about)
            raise UserError("errors.not_number", label=label, help=about, value=shown(value))
        if key.kind == "integer" and not (isinstance(value, int) or float(value).is_integer()):
            raise UserError("errors.not_whole", label=label, help=about, value=shown(value))
        if not key.low <= value <= key.high:
            raise UserError("errors.out_of_range", label=label, value=typed(value), low=low, high=high, help=about)
        return int(value) if key.kind == "integer" else float(value)
    if key.kind == "string":
        if not isinstance(value, (str, int, float)) or isinstance(value, bool):
            raise UserError("errors.not_text", label=label, help=KeyHelp(key), value=shown(value))
        value = str(value)
        if len(value) > MAX_TEXT_CHARS:
            raise UserError("errors.text_too_long", label=label, length=len(value), limit=MAX_TEXT_CHARS)
        _refuse_unprintable(value, label)
        if key.name == "language":
            # Language tags are case-insensitive (BCP 47, RFC 5646 section
            # 2.1.1): "EN" and "Fr", as a spreadsheet's column may hold them,
            # are the shipped "en" and "fr".
            code = shipped_language(value)
            if code is None:
                raise UserError("errors.unknown_language", label=label, value=shown(value),
                                codes=available_languages())
            return code
        return value
    if key.kind == "choice":
        if not isinstance(value, str) or value.lower() not in key.choices:
            raise UserError("errors.not_choice", label=label, choices=list(key.choices), value=shown(value))
        return value.lower()
    if key.kind == "bool":
        if not isinstance(value, bool):
            raise UserError("errors.not_bool", label=label, value=shown(value))
        return value
    if key.kind == "parts":
        parts = list(key.choices)
        if isinstance(value, list) and len(value) > MAX_LIST_ITEMS:
            raise UserError("errors.list_too_long", label=label, count=len(value), limit=MAX_LIST_ITEMS,
                            parts=parts)
        if not isinstance(value, list) or not all(isinstance(v, str) for v in value):
            raise UserError("errors.not_part_list", label=label, parts=parts)
        if not value and key.name == "parts":
            raise UserError("errors.parts_empty", label=label, parts=parts)
        bad = [v for v in value if v not in key.choices]
        if bad:
            raise UserError("errors.unknown_part", label=label, value=shown(bad[0]), parts=parts)
        return tuple(dict.fromkeys(value))
    if key.kind == "stars":
        return _check_stars(value, label, local_stars or {})
    if key.kind == "parsed":
        huge = _huge_number(value)
        if huge is not None:
            raise UserError("errors.number_far", label=label, value=shown(huge), help=KeyHelp(key))
        try:
            return key.parse(value)
        except ValueError as exc:
            raise UserError("errors.key_problem", label=label, problem=exc) from None
    raise AssertionError(key.kind)


def _check_plates(value, label: Message, where) -> tuple[PlateSpec, ...]:
    """``plates:``: a list of 1 to MAX_PLATES latitudes, each in any form
    ``latitude:`` takes, or ``{latitude: L, place: NAME}``."""
    if not isinstance(value, list) or not value:
        raise UserError("errors.plates_not_list", label=label, limit=MAX_PLATES)
    if len(value) > MAX_PLATES:
        raise UserError("errors.plates_too_many", label=label, limit=MAX_PLATES, count=len(value))
    plates = []
    for k, entry in enumerate(value, start=1):
        place = ""
        if isinstance(entry, dict):
            unknown = [str(n) for n in entry if n not in ("latitude", "place")]
            if unknown or "latitude" not in entry:
                raise UserError("errors.plate_entry", label=label, number=k)
            place = entry.get("place", "")
            if not isinstance(place, str):
                raise UserError("errors.plate_entry", label=label, number=k)
            # said as of this plate's place ("'plates': plate 2: 'place'")
            place_label = Message("errors.plate_latitude", label=label, number=k, problem="'place'")
            if len(place) > MAX_TEXT_CHARS:
                raise UserError("errors.text_too_long", label=place_label, length=len(place), limit=MAX_TEXT_CHARS)
            _refuse_unprintable(place, place_label)
            entry = entry["latitude"]
        try:
            latitude = parse_latitude(entry)
        except LatitudeError as exc:
            raise UserError("errors.plate_latitude", label=label, number=k, problem=exc) from None
        plates.append(PlateSpec(latitude, place.strip()))
    north = any(p.latitude_deg > 0 for p in plates)
    south = any(p.latitude_deg < 0 for p in plates)
    if north and south:
        raise UserError("errors.plates_mixed", label=label)
    return tuple(plates)


def shipped_language(value) -> str | None:
    """The shipped language a recipe's ``language`` names, whatever its
    case and the spaces round it (language tags are case-insensitive,
    BCP 47, RFC 5646 section 2.1.1: "EN" and " Fr " are "en" and "fr"), or
    None where it names none."""
    if not isinstance(value, str):
        return None
    return {code.lower(): code for code in available_languages()}.get(value.strip().lower())


def _known_star(name: str, where):
    """The catalogue star called ``name``; an unknown name is refused with
    the closest known name as a suggestion."""
    star = find_star(name)
    if star is not None:
        return star
    close = closest_name(name)
    hint = Message("errors.hint_did_you_mean", name=close) if close else Message("errors.hint_star_list")
    shown_name = " ".join(str(name).split())
    if where:
        raise UserError("errors.unknown_star_at", where=where, name=shown_name, hint=hint)
    raise UserError("errors.unknown_star", name=shown_name, hint=hint)


def _check_stars_fit(values: dict, source, lines: dict) -> None:
    """Named stars must lie on the rete of the recipe's hemisphere, and a
    rule (a magnitude limit, the N brightest) must give the rete at least
    one star: a choice that selects nothing is a mistake, not a kit."""
    choice = values.get("stars", StarChoice())
    plates = values.get("plates") or ()
    south = values["latitude_deg"] < 0 or any(p.latitude_deg < 0 for p in plates)
    sign = -1 if south else 1
    latitudes = [p.latitude_deg for p in plates] or [values["latitude_deg"]]
    rim = kit_rim_deg(values.get("rete_limit_deg"), latitudes, sign, values["epoch"], _kit_diameter_mm(values))
    fits = rete_fits(sign, epoch_obliquity_rad(values["epoch"]), rim)
    label = Message("errors.key_label", where=at_line(source, lines["stars"]) if "stars" in lines else source,
                    name="stars")
    if not choice.names:
        if choice.magnitude_limit is not None and not select_stars(
                (), choice.brightest, choice.magnitude_limit, values["epoch"] + 0.5, fits):
            brightest = min(s.mag for s in select_stars((), None, 9.9, values["epoch"] + 0.5, fits))
            raise UserError("errors.stars_none_selected", label=label, value=typed(choice.magnitude_limit),
                            brightest=typed(brightest))
        return
    off = outside(choice.names, values["epoch"] + 0.5, fits)
    if not off:
        return
    problem = (Message("errors.star_outside", name=off[0]) if len(off) == 1
               else Message("errors.stars_outside", names=few([f"'{n}'" for n in off]), count=len(off)))
    _, dec = places_at_epoch([find_star(n) for n in off], values["epoch"] + 0.5)
    needed = rim_for_stars_deg(dec, sign)
    if abs(needed) <= MAX_RIM_DEG:
        raise UserError("errors.stars_beyond_rim", label=label, problem=problem, value=f"{needed:g}")
    raise UserError("errors.key_problem", label=label, problem=problem)


def _check_sheet_room(values: dict, source, lines: dict) -> None:
    """The sheet and the margin together must leave room for the check
    bar: refused here, with the line of the margin (or the sheet) in the
    recipe, not later by the layout with no line."""
    if "sheet" not in values and "margin_mm" not in values:
        return
    try:
        make_sheet(values.get("sheet", "a4"), values.get("margin_mm", DEFAULT_MARGIN_MM))
    except SheetError as exc:
        name = "margin_mm" if "margin_mm" in lines else "sheet"
        where = at_line(source, lines[name]) if name in lines else source
        raise UserError("errors.key_problem", label=where, problem=exc) from None  # the problem names the key


def _kit_diameter_mm(values: dict) -> float:
    """The mater's diameter the kit will have (as the plan finds it):
    the recipe's, or the largest that its sheet holds."""
    if values.get("diameter_mm"):
        return float(values["diameter_mm"])
    try:
        sheet = make_sheet(values.get("sheet", "a4"), values.get("margin_mm", DEFAULT_MARGIN_MM))
    except SheetError:
        return 180.0  # any size: the plan refuses the sheet in its own words
    return default_diameter_mm(sheet, tuple(values.get("print_scale", (1.0, 1.0))))


def _local_star_names(tree: dict, source) -> dict:
    """The star names the recipe's language prints (its ``star_names``:
    the Arabic traditional names, say), folded as the catalogue folds
    names, each to its IAU name: a pupil may write the name the kit
    prints.  Empty when the language is not yet known to be good."""
    language, language_file = recipe_language(tree, source)
    try:
        if language_file:
            names = load_language_file(language_file).get(STAR_NAMES) or {}
        elif language:
            names = shipped_tree(language).get(STAR_NAMES) or {}
        else:
            names = {}
    except UserError:
        names = {}
    return {fold_name(str(local)): str(iau) for iau, local in names.items()}


def _check_stars(value, label: Message, local_stars: dict) -> StarChoice:

    if isinstance(value, list):
        if not value:
            raise UserError("errors.stars_empty", label=label)
        if len(value) > MAX_STAR_NAMES:
            raise UserError("errors.too_many_stars", label=label, limit=MAX_STAR_NAMES, count=len(value))
        names = []
        for v in value:
            if not isinstance(v, str) or isinstance(v, bool):
                raise UserError("errors.star_name_not_text", label=label, value=shown(v))
            if len(v) > MAX_STAR_NAME_CHARS or _text_problem(v):
                raise UserError("errors.no_star_name", label=label, value=shown(v))
            names.append(_known_star(local_stars.get(fold_name(v), v), label).label)
        return StarChoice(names=tuple(dict.fromkeys(names)))
    if isinstance(value, dict) and len(value) == 1:
        (rule, n), = value.items()
        if rule == "brightest":
            if not finite_number(n) or int(n) != n or not 1 <= n <= MAX_STAR_NAMES:
                raise UserError("errors.brightest_range", label=label, limit=MAX_STAR_NAMES, value=shown(n))
            return StarChoice(brightest=int(n))
        if rule == "magnitude_limit":
            if not finite_number(n) or not -2.0 <= n <= 3.5:
                raise UserError("errors.magnitude_range", label=label, value=shown(n))
            return StarChoice(magnitude_limit=float(n))
    raise UserError("errors.stars_form", label=label)
