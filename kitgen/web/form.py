"""The kit form: fields named as the recipe keys, read into a recipe tree.

A form and a recipe file speak the same words: each field's ``name`` is a
recipe key (``latitude``, ``sheet``, ``diameter_mm``...), its values are
read into the tree a YAML file would give, and the tree goes through the
one validation every recipe goes through
(:func:`kitgen.recipe.load.validate_recipe`), so a mistake gets the same
message as on the command line.  The fields come from the recipe schema
(:data:`kitgen.recipe.schema.KEYS`): a key added there appears in the
form's "more" section by itself, labelled by its help line.

Keys whose value is a path on the server (``language_file`` and any other
``*_file`` key) are never taken from the web: a page must not make the
server read its files.
"""

from __future__ import annotations

from dataclasses import dataclass

import yaml

from ..errors import UserError
from ..recipe.load import KeyHelp, safe_yaml, validate_recipe
from ..recipe.schema import KEYS, KEYS_BY_NAME, MAX_TEXT_CHARS, PARTS, Recipe

#: Keys whose value names a file on the machine that reads the recipe.
PATH_KEYS = frozenset({"language_file"} | {k.name for k in KEYS if k.name.endswith("_file")})

#: The fields a teacher decides, in this order, shown first; every other
#: key of the schema goes under "more".
MAIN_FIELDS = ("place", "latitude", "longitude", "timezone", "language", "sheet", "diameter_mm", "stars",
               "owner", "title")
#: Keys the page leaves to a recipe file (whole-kit structure rather than a
#: teacher's choice), besides the path-valued ones.
NOT_ON_PAGE = frozenset({"parts", "plates", "cutter_colours", "pin_hole_mm", "sight_hole_mm"})

#: Form fields that are not recipe keys.
CSRF_FIELD = "csrf_token"
CONTROL_FIELDS = frozenset({CSRF_FIELD, "format", "roster"})

#: Most values one field may carry (a list of parts, say).
MAX_VALUES_PER_FIELD = len(PARTS) + 2
#: Most values a page's address may carry to fill the form (each at most
#: a recipe's longest text, MAX_TEXT_CHARS).
MAX_QUERY_VALUES = 100


@dataclass(frozen=True)
class Field:
    """One form field: the recipe key, the widget and where it goes."""

    key: object          # the schema's Key
    widget: str          # "text", "number", "select", "checkbox", "checkboxes", "pair"
    main: bool
    choices: tuple = ()

    @property
    def name(self) -> str:
        return self.key.name


def _widget(key) -> tuple[str, tuple]:
    if key.name == "sheet":
        return "select", tuple(key.choices)
    if key.name == "print_scale":
        return "pair", ()
    if key.kind == "bool":
        return "checkbox", ()
    if key.kind == "choice":
        return "select", tuple(key.choices)
    if key.kind == "parts":
        return "checkboxes", tuple(key.choices)
    if key.kind in ("number", "integer"):
        return "number", ()
    return "text", ()


def fields(languages: list[str]) -> list[Field]:
    """Every field of the page, main ones first, in the schema's order
    otherwise; ``language`` offers ``languages``."""
    out = []
    order = [n for n in MAIN_FIELDS if n in KEYS_BY_NAME] + [
        k.name for k in KEYS if k.name not in MAIN_FIELDS]
    for name in order:
        if name in PATH_KEYS or name in NOT_ON_PAGE:
            continue
        key = KEYS_BY_NAME[name]
        widget, choices = _widget(key)
        if name == "language":
            widget, choices = "select", tuple(languages)
        out.append(Field(key, widget, name in MAIN_FIELDS, choices))
    return out


class FormError(Exception):
    """The form cannot be read at all (a path-valued or unknown key, too
    many values): ``key`` of the templates' ``web`` section (without the
    ``web.``) and the field."""

    def __init__(self, key: str, field: str):
        super().__init__(key)
        self.key, self.field = key, field


def _number(text: str):
    """A form's number as YAML would read it; text that is no number is
    passed on as text, for the validation to say what is wrong."""
    t = text.strip()
    try:
        return int(t)
    except ValueError:
        pass
    try:
        value = float(t)
    except ValueError:
        return t
    return value


def _stars(text: str):
    """``32`` -> ``{brightest: 32}``; ``Vega, Deneb`` -> a list of names."""
    t = text.strip()
    number = _number(t)
    if not isinstance(number, str):
        return {"brightest": number}
    return [n.strip() for n in t.split(",") if n.strip()]


def _yaml_value(text: str):
    """A field whose key takes more than one form (``twilight: civil`` or
    ``[civil, nautical]``, ``rete_limit_deg: -40``) read as the same text
    in a recipe would be, through the recipe's own bounded, safe YAML
    reader; text it cannot read is passed on as text, for the validation
    to say what is wrong."""
    t = text.strip()
    if len(t) > MAX_TEXT_CHARS:
        return t
    try:
        return safe_yaml(t)
    except UserError:
        return t


def form_tree(items: list[tuple[str, str]]) -> dict:
    """The recipe tree of a submitted form (``(name, value)`` pairs in the
    order sent): empty fields left out (the recipe's default then holds),
    numbers read as YAML would read them, checkboxes as booleans (a hidden
    ``false`` before the box, so an unticked box says no).  Raises
    :class:`FormError` for a path-valued key or a name that is no key."""
    grouped: dict[str, list[str]] = {}
    for name, value in items:
        if name in CONTROL_FIELDS:
            continue
        base = name.split(".", 1)[0]
        if base in PATH_KEYS:
            raise FormError("error.path_key", base)
        if base not in KEYS_BY_NAME:
            raise FormError("error.unknown_field", base)
        grouped.setdefault(name, []).append(value)
        if len(grouped[name]) > MAX_VALUES_PER_FIELD:
            raise FormError("error.too_many_values", base)
    tree: dict = {}
    for name, values in grouped.items():
        base, _, sub = name.partition(".")
        key = KEYS_BY_NAME[base]
        if base == "print_scale":
            if sub in ("x", "y") and values[-1].strip():
                tree.setdefault("print_scale", {})[sub] = _number(values[-1])
            continue
        if key.kind == "bool":
            tree[base] = "true" in values or "on" in values
            continue
        if key.kind == "parts":
            tree[base] = [v for v in values if v != ""]
            continue
        value = values[-1]
        if not value.strip():
            continue
        if key.kind in ("number", "integer"):
            tree[base] = _number(value)
        elif key.kind == "stars":
            tree[base] = _stars(value)
        elif key.kind == "latitude":
            tree[base] = value.strip()
        elif key.kind == "parsed":
            tree[base] = _yaml_value(value)
        else:
            tree[base] = value
    scale = tree.get("print_scale")
    if isinstance(scale, dict) and len(scale) == 1:  # one side given: the other prints true
        scale.setdefault("x", 1.0)
        scale.setdefault("y", 1.0)
    return tree


def field_of(exc: UserError) -> str | None:
    """The recipe key a validation error is about, when it names one."""
    label = exc.values.get("label")
    name = getattr(label, "values", {}).get("name") if label is not None else None
    if name is None:
        name = exc.values.get("name")
    if isinstance(name, str):
        name = name.strip("'\"")
        if name in KEYS_BY_NAME:
            return name
    if exc.key == "errors.latitude_required":
        return "latitude"
    if exc.key == "errors.clock_needs_both":  # told beside the box left empty
        return exc.values["missing"]
    return None


#: A longitude and a time zone go together (kitgen.recipe.site, #10): each
#: checked alone with a stand-in for the other, the pair then as a whole.
CLOCK_PARTNERS = {"longitude": {"timezone": "UTC"}, "timezone": {"longitude": 0}}


def check_form(tree: dict, words) -> tuple[Recipe | None, dict[str, str]]:
    """``(recipe, {})`` when the tree is a good recipe, else ``(None,
    {field: message})``: each field checked on its own first, so that every
    wrong field is told at once, then the whole (for what depends on
    several keys).  Messages are the recipe validation's own, in the
    language of ``words`` (``""`` for a message about the form as a whole)."""
    errors: dict[str, str] = {}
    for name, value in tree.items():
        alone = {name: value} if name == "latitude" else {"latitude": 0, name: value}
        alone.update({k: v for k, v in CLOCK_PARTNERS.get(name, {}).items() if k not in alone})
        try:
            validate_recipe(alone)
        except UserError as exc:
            errors[field_of(exc) or name] = exc.text(words)
    if errors:
        return None, errors
    try:
        return validate_recipe(dict(tree)), {}
    except UserError as exc:
        return None, {field_of(exc) or "": exc.text(words)}


def hint(field: Field, words) -> str:
    """The field's hint: its key's help line in the page's language."""
    return KeyHelp(field.key).text(words)


def recipe_yaml(tree: dict, heading: str) -> bytes:
    """The submitted tree as a recipe file that ``kitgen build`` reads back
    to the same kit; ``heading`` becomes a comment line at the top."""
    lines = "".join(f"# {line}\n" for line in heading.splitlines())
    tree = dict(tree)
    if isinstance(tree.get("latitude"), str) and not isinstance(_number(tree["latitude"]), str):
        tree["latitude"] = _number(tree["latitude"])  # 52.2 rather than '52.2'
    body = yaml.safe_dump(tree, allow_unicode=True, sort_keys=False, default_flow_style=False)
    return (lines + body).encode("utf-8")
