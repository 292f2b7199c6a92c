"""Read a class set: one YAML file naming many kits (#12).

A set is a mapping with up to three keys::

    defaults: {latitude: 52.2, language: en}    # any recipe keys
    kits:                                       # recipes that override them
      - {owner: Ada, title: Hilltop Club, copies: 2}
    roster: pupils.csv                          # and/or a table, one row a kit

The roster is UTF-8 CSV with a header whose columns are recipe keys (and
``copies``), separated by commas, or by semicolons or tabs as spreadsheets
write them where the comma is the decimal sign; an empty cell takes the
default.  In a roster separated by semicolons or tabs a number's comma is
its decimal sign (``51,48``), as the spreadsheet wrote it.  A first line
``sep=;`` (which spreadsheets write and read to name the separator) names
the separator and is not a row.  The keys that say where a kit is for (place, latitude,
longitude, time zone, plates) go as one: a kit that gives a place, a
latitude or plates takes none of them from the defaults (:data:`SITE_KEYS`).  Kits are
numbered in the order they come: the ``kits`` list first, then the
roster's rows.

The set file is read as a recipe is (:func:`kitgen.recipe.load.read_text_file`
and :func:`~kitgen.recipe.load.safe_yaml`: bounded, safe loader, no
aliases or tags).  Each kit is then its defaults merged with its own keys
and validated by :func:`kitgen.recipe.load.validate_recipe`, the very
check ``kitgen build`` makes, so a kit builds as the same recipe would on
its own.  A mistake in the set's structure stops the run; a mistake in one
kit is that kit's own one-line reason, naming its list index or row and
the key, and the other kits still build.
"""

from __future__ import annotations

import csv
import difflib
import io
import re
from dataclasses import dataclass
from pathlib import Path

import yaml

from ..errors import Message, UserError, shown
from ..recipe.load import at_line, check_defaults, read_text_file, safe_yaml, validate_recipe
from ..recipe.site import look_up_place
from ..recipe.schema import KEYS_BY_NAME, Recipe

#: The keys of a set file.
SET_KEYS = ("defaults", "kits", "roster")
#: Most kits one set may hold, and most copies of one kit.
MAX_KITS = 2000
MAX_COPIES = 100
#: A roster of MAX_KITS rows of a dozen short columns stays well under this.
MAX_ROSTER_BYTES = 2 * 1024 * 1024
#: The set file's own limits: larger than a recipe's, since it lists kits.
MAX_SET_BYTES = 1024 * 1024
MAX_SET_EVENTS = 100_000

KIND_SET = Message("errors.kind_set")
KIND_ROSTER = Message("errors.kind_roster")

#: Recipe keys whose roster cells are taken as written (text); cells of
#: the other keys are read as YAML values, so that numbers, booleans,
#: lists (``[rule]``) and mappings (``{brightest: 10}``) can be written.
_TEXT_KINDS = ("string", "choice", "latitude")


@dataclass(frozen=True)
class SetKit:
    """One kit of a set: its number (from 1), where it was given (for
    messages), its merged recipe tree, how many copies to print, and
    either the validated recipe or the one-line reason it cannot be built."""

    number: int
    where: Message
    tree: dict
    copies: int
    recipe: Recipe | None = None
    error: UserError | None = None
    #: What the set's merging did that the kit's user may not have meant
    #: (the defaults' clock not taken), for the manifest's notes.
    notes: tuple[Message, ...] = ()


@dataclass(frozen=True)
class KitSet:
    """A class set as read and checked: its kits in order, the language to
    speak to the user in, and the files it reads."""

    path: Path
    kits: tuple[SetKit, ...]
    language: str | None   # the defaults' language, to speak to the user in
    inputs: tuple[Path, ...] = ()   # files the set reads besides itself (the roster)


def load_set(path) -> KitSet:
    """Read and check the set file at ``path`` and every kit it names.
    Raises :class:`UserError` for a fault of the set as a whole."""
    path = Path(path)
    text = read_text_file(path, MAX_SET_BYTES, KIND_SET)
    tree = safe_yaml(text, str(path), KIND_SET, MAX_SET_EVENTS)
    if not isinstance(tree, dict):
        raise UserError("errors.set_not_mapping", source=path)
    node = _compose(text)   # where things are in the file, composed once
    _refuse_duplicates(node, path)
    _keep_sexagesimal_latitudes(node, tree)
    lines = _top_lines(node)
    for name in tree:
        if name not in SET_KEYS:
            where = at_line(path, lines[name]) if name in lines else path
            raise UserError("errors.set_unknown_key", where=where, name=shown(name), keys=list(SET_KEYS))
    defaults = tree.get("defaults") or {}
    if not isinstance(defaults, dict):
        raise UserError("errors.set_defaults_not_mapping", where=at_line(path, lines.get("defaults", 1)))
    if "copies" in defaults:
        raise UserError("errors.set_copies_in_defaults", where=at_line(path, lines.get("defaults", 1)))
    defaults = _absolute_language_file(defaults, path.parent)
    defaults_lines = _defaults_lines(node)
    check_defaults(defaults, path, defaults_lines)
    _check_default_place(defaults, at_line(path, defaults_lines.get("place", lines.get("defaults", 1))))
    raws: list[tuple[Message, dict]] = []
    listed = tree.get("kits") or []
    if not isinstance(listed, list):
        raise UserError("errors.set_kits_not_list", where=at_line(path, lines.get("kits", 1)))
    item_lines = _item_lines(node)
    for index, item in enumerate(listed, start=1):
        line = item_lines[index - 1] if index <= len(item_lines) else lines.get("kits", 1)
        where = Message("errors.set_kit_where", source=path, index=index, line=line)
        raws.append((where, item))
    inputs = ()
    if tree.get("roster") is not None:
        raws += _roster_rows(tree["roster"], path, lines.get("roster", 1))
        inputs = (path.parent / tree["roster"],)
    if not raws:
        raise UserError("errors.set_no_kits", source=path)
    if len(raws) > MAX_KITS:
        raise UserError("errors.set_too_many_kits", source=path, count=len(raws), limit=MAX_KITS)
    kits = tuple(_set_kit(number, where, item, defaults, path.parent)
                 for number, (where, item) in enumerate(raws, start=1))
    language = defaults.get("language").strip().lower() if isinstance(defaults.get("language"), str) else None
    return KitSet(path, kits, language, inputs)


#: The keys that say where a kit is for.  A kit that gives a place, a
#: latitude or plates (:data:`POSITION_KEYS`, not empty) takes none of
#: these from the defaults: a row's own town is looked up, never printed
#: beside the defaults' latitude, and its clock correction never takes
#: another town's longitude or time zone; a kit's ``plates`` replace the
#: defaults' ``latitude``, and its ``latitude`` their ``plates``.  A kit
#: that gives only a longitude or a time zone overrides those alone.
SITE_KEYS = ("place", "latitude", "longitude", "timezone", "plates")
POSITION_KEYS = ("place", "latitude", "plates")


def _set_kit(number: int, where: Message, item, defaults: dict, base: Path) -> SetKit:
    """Merge one kit's keys over the defaults (the :data:`SITE_KEYS` as
    one where the kit gives a position) and validate the recipe; a mistake
    becomes the kit's own error."""
    if isinstance(item, _RowError):
        return SetKit(number, where, dict(item), 1, error=item.error)
    if not isinstance(item, dict):
        return SetKit(number, where, {}, 1, error=UserError("errors.set_kit_not_mapping", where=where))
    item = _absolute_language_file(item, base)
    own = {k: v for k, v in item.items() if k != "copies"}
    # A position of its own without its clock: the kit tells local mean
    # time where the defaults named a clock (a zone, or a town looked up);
    # a place printed but not looked up has its build's own note.
    own_position = any(_given(own, name) for name in POSITION_KEYS)
    leaves_clock = (own_position and not _given(own, "place")
                    and (_given(defaults, "timezone") or (_given(defaults, "place") and not _given(defaults, "latitude")
                                                          and not _given(defaults, "plates"))))
    if own_position:
        defaults = {k: v for k, v in defaults.items() if k not in SITE_KEYS}
    tree = {**defaults, **own}
    try:
        copies = _copies(item.get("copies", 1), where)
    except UserError as exc:
        return SetKit(number, where, tree, 1, error=exc)
    try:
        recipe = validate_recipe(dict(tree), where)
    except UserError as exc:
        return SetKit(number, where, tree, copies, error=exc)
    notes = (Message("notes.set_clock_not_taken"),) if leaves_clock and recipe.timezone is None else ()
    return SetKit(number, where, tree, copies, recipe=recipe, notes=notes)


def _given(tree: dict, name: str) -> bool:
    return tree.get(name) not in (None, "")


def _copies(value, where) -> int:
    if isinstance(value, bool) or not isinstance(value, int) or not 1 <= value <= MAX_COPIES:
        raise UserError("errors.set_copies", where=where, high=MAX_COPIES, value=shown(value))
    return value


def _absolute_language_file(tree: dict, base: Path) -> dict:
    """A ``language_file`` is relative to the file that names it (the set
    file, for the defaults, the kits list and the roster alike)."""
    value = tree.get("language_file")
    if isinstance(value, str) and value and not Path(value).is_absolute():
        return {**tree, "language_file": str((base / value).resolve())}
    return tree


# -- the roster -------------------------------------------------------------------

def _roster_rows(value, set_path: Path, line: int) -> list[tuple[Message, dict]]:
    """``(where, row)`` for every row of the roster CSV named by ``value``
    (relative to the set file)."""
    if not isinstance(value, str) or not value.strip():
        raise UserError("errors.set_roster_not_file", where=at_line(set_path, line), value=shown(value))
    path = set_path.parent / value
    text = read_text_file(path, MAX_ROSTER_BYTES, KIND_ROSTER)
    named = _separator_line(text)
    delimiter = named or _delimiter(text)
    reader = csv.reader(io.StringIO(text, newline=""), delimiter=delimiter, strict=True)
    row = 0   # the records read: a row as a spreadsheet numbers it, whatever lines its cells take
    try:
        if named:
            next(reader)   # the "sep=" line
            row += 1
        header = next(reader, None)
        row += 1
        if header is None:
            raise UserError("errors.roster_empty", path=path)
        columns = [_column_key(c) for c in header]
        _check_columns(columns, path)
        rows = []
        named_columns = max((k + 1 for k, name in enumerate(columns) if name), default=0)
        for cells in reader:
            row += 1
            if not any(c.strip() for c in cells):
                continue   # a blank line
            where = Message("errors.roster_row_where", source=path, row=row)
            if len(cells) < named_columns:   # a separator missing: its values may stand under other keys
                rows.append((where, _RowError(UserError("errors.roster_cells", where=where, count=len(cells),
                                                        columns=named_columns), _as_given(columns, cells))))
                continue
            for k, cell in enumerate(cells):
                if cell.strip() and (k >= len(columns) or not columns[k]):
                    if k < len(columns):   # a column without a name holds a value: the header's mistake
                        raise UserError("errors.roster_empty_column", path=path, column=k + 1)
                    rows.append((where, _RowError(UserError("errors.roster_cells", where=where,
                                                            count=len(cells), columns=len(columns)),
                                                  _as_given(columns, cells))))
                    break
            else:   # cells past the header's named columns are empty
                rows.append((where, _row_tree(columns, cells, decimal_comma=delimiter != ",")))
    except csv.Error as exc:   # named by the record it begins in (a quote left open runs to the file's end)
        where = Message("errors.roster_row_where", source=path, row=row + 1)
        raise UserError("errors.roster_not_csv", where=where, problem=str(exc)) from None
    return rows


#: A spreadsheet's first line naming the roster's separator (``sep=;``,
#: quoted by some programs), for the separators a roster may have.
_SEPARATOR_LINE = re.compile(r'"?sep=([,;\t])"?[ \t]*(?:\r?\n|\Z)', re.IGNORECASE)


def _separator_line(text: str) -> str | None:
    """The separator the roster's first line names (``sep=;``), or None."""
    found = _SEPARATOR_LINE.match(text)
    return found.group(1) if found else None


def _delimiter(text: str) -> str:
    """The roster's separator, told by its header line: a comma, or the
    semicolon or tab that spreadsheets write where the comma is the
    decimal sign (a header holds no decimal number)."""
    header = text.split("\n", 1)[0]
    return next((d for d in (",", ";", "\t") if d in header), ",")


def _column_key(name: str) -> str:
    """A header cell as the recipe key it names: itself, or written as a
    spreadsheet's header often is (``Owner``, ``Print scale``,
    ``Diameter-mm``), the key it is but for case, spaces and hyphens."""
    name = name.strip()
    if name in KEYS_BY_NAME or name == "copies":
        return name
    key = re.sub(r"[\s-]+", "_", name.lower())
    return key if key in KEYS_BY_NAME or key == "copies" else name


def _check_columns(columns: list[str], path: Path) -> None:
    """Refuse a column named twice or naming no recipe key; a column
    without a name may stand (a spreadsheet's empty trailing columns) as
    long as no row has a value in it."""
    seen = set()
    for k, name in enumerate(columns, start=1):
        if not name:
            continue
        if name in seen:
            raise UserError("errors.roster_column_twice", path=path, name=shown(name))
        seen.add(name)
        if name != "copies" and name not in KEYS_BY_NAME:
            close = difflib.get_close_matches(name, [*KEYS_BY_NAME, "copies"], n=1)
            hint = (Message("errors.hint_did_you_mean", name=close[0]) if close
                    else Message("errors.hint_valid_keys", names=[*KEYS_BY_NAME, "copies"]))
            raise UserError("errors.roster_unknown_column", path=path, name=shown(name), hint=hint)


class _RowError(dict):
    """A roster row that could not be read: it carries its error, and
    holds what its cells say under the named columns they stand in (its
    owner, for the manifest's row)."""

    def __init__(self, error: UserError, tree: dict | None = None):
        super().__init__(tree or {})
        self.error = error


#: The keys whose value is a number (or a latitude or longitude written
#: with one), whose decimal comma a semicolon or tab roster may hold.
_NUMBER_KINDS = ("number", "latitude")
_NUMBER_KEYS = ("longitude", "rete_limit_deg", "print_scale")

#: Line breaks within a cell, with the spaces around them.
_LINE_BREAKS = re.compile(r"\s*[\r\n]\s*")

#: A comma between two digits: a decimal comma, where it is the only comma.
_DECIMAL_COMMA = re.compile(r"(?<=\d),(?=\d)")


def _as_given(columns: list[str], cells: list[str]) -> dict:
    """A refused row's text cells under their named columns, as written:
    the manifest's owner, title and place of a row that was not built."""
    return {name: _LINE_BREAKS.sub(" ", cell).strip() for name, cell in zip(columns, cells)
            if name in ("owner", "title", "place") and cell.strip()}


def _row_tree(columns: list[str], cells: list[str], decimal_comma: bool = False) -> dict:
    """The row's recipe keys: non-empty cells only, each read as its key
    reads a value (see :data:`_TEXT_KINDS`); with ``decimal_comma`` (a
    roster separated by semicolons or tabs), a number's one comma between
    digits read as its decimal point.  A recipe refuses a decimal comma,
    which YAML cannot tell from a list; a cell of such a roster is one
    value, and its spreadsheet wrote the comma as the decimal sign."""
    tree = {}
    for name, cell in zip(columns, cells):
        # A line break a spreadsheet's cell holds (Alt+Enter) is a space here.
        cell = _LINE_BREAKS.sub(" ", cell).strip()
        if not cell or not name:
            continue
        key = KEYS_BY_NAME.get(name)
        if decimal_comma and key is not None and (key.kind in _NUMBER_KINDS or name in _NUMBER_KEYS) \
                and cell.count(",") == 1:
            cell = _DECIMAL_COMMA.sub(".", cell)
        if key is not None and key.kind in _TEXT_KINDS:
            tree[name] = cell
        else:
            tree[name] = _cell_value(cell)
    return tree


def _cell_value(cell: str):
    """A cell read as a YAML value with the recipe's safeguards; a cell
    that is not valid YAML is kept as text (the key's check then says what
    it wants)."""
    try:
        return safe_yaml(cell, KIND_ROSTER, KIND_ROSTER, 200)
    except UserError:
        return cell


# -- where things are in the set file ----------------------------------------------

def _compose(text: str):
    try:
        return yaml.compose(text, Loader=yaml.SafeLoader)
    except (yaml.YAMLError, ValueError, RecursionError):
        return None


def _top_lines(node) -> dict:
    """The line of each key of the composed mapping ``node``."""
    if not isinstance(node, yaml.MappingNode):
        return {}
    return {k.value: k.start_mark.line + 1 for k, _ in node.value if isinstance(k, yaml.ScalarNode)}


def _value_of(node, key: str, kind):
    """The composed value of ``key`` in the set's mapping ``node``, if it is
    a node of ``kind``; else None."""
    if not isinstance(node, yaml.MappingNode):
        return None
    return next((v for k, v in node.value if isinstance(k, yaml.ScalarNode) and k.value == key
                 and isinstance(v, kind)), None)


def _check_default_place(defaults: dict, where: Message) -> None:
    """A ``place`` of the defaults that the gazetteer does not know (or
    cannot tell apart) is the set's own mistake, said once with its line
    as a recipe's is (kitgen.recipe.site.look_up_place), where every kit
    taking it had said it as its own."""
    place = defaults.get("place")
    if isinstance(place, str) and place and "latitude" not in defaults and "plates" not in defaults:
        look_up_place(place, where)


def _defaults_lines(node) -> dict:
    """The line of each key of ``defaults``."""
    return _top_lines(_value_of(node, "defaults", yaml.MappingNode))


def _item_lines(node) -> list[int]:
    """The line of each item of the ``kits`` list."""
    listed = _value_of(node, "kits", yaml.SequenceNode)
    return [item.start_mark.line + 1 for item in listed.value] if listed is not None else []


def _refuse_duplicates(node, path: Path) -> None:
    """A key given twice in any mapping of the set (YAML's loader would
    silently keep the last)."""
    def walk(node):
        if isinstance(node, yaml.MappingNode):
            first = {}
            for k, v in node.value:
                if isinstance(k, yaml.ScalarNode):
                    line = k.start_mark.line + 1
                    if k.value in first:
                        raise UserError("errors.key_twice", where=at_line(path, line), name=shown(k.value),
                                        first=first[k.value])
                    first[k.value] = line
                walk(v)
        elif isinstance(node, yaml.SequenceNode):
            for item in node.value:
                walk(item)
    walk(node)


def _keep_sexagesimal_latitudes(node, tree: dict) -> None:
    """A plain ``latitude: 40:26:46`` is a base-60 number to YAML 1.1; keep
    it as written, as the recipe loader does, for the defaults and every
    kit of the list."""
    if not isinstance(node, yaml.MappingNode):
        return
    for k, v in node.value:
        if not isinstance(k, yaml.ScalarNode):
            continue
        if k.value == "defaults" and isinstance(tree.get("defaults"), dict):
            _raw_latitude(v, tree["defaults"])
        elif k.value == "kits" and isinstance(v, yaml.SequenceNode) and isinstance(tree.get("kits"), list):
            for item_node, item in zip(v.value, tree["kits"]):
                if isinstance(item, dict):
                    _raw_latitude(item_node, item)


def _raw_latitude(node, mapping: dict) -> None:
    if not isinstance(node, yaml.MappingNode):
        return
    for k, v in node.value:
        if (isinstance(k, yaml.ScalarNode) and k.value == "latitude" and isinstance(v, yaml.ScalarNode)
                and v.style is None and ":" in v.value):
            mapping["latitude"] = v.value
