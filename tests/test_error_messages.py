"""Every message a user reads comes from the language templates.

- A static check (Python's own ``ast`` parser over kitgen/, parts
  included): every call of :class:`kitgen.errors.UserError`, of
  :class:`~kitgen.errors.Message` and of every other keyed error class
  names a key of the templates' ``errors`` or ``notes`` section as a string
  literal, gives exactly that entry's placeholders, and the key is in every
  shipped language with the same placeholders as English.  A raw English
  message fails it.
- The completeness checks of tests/test_languages.py see the ``errors``
  and ``notes`` entries (keys, placeholders, glyph coverage).
- Through the command line, a recipe's ``language`` (or ``language_file``)
  chooses the language of its error: the expected line is built here from
  the template files themselves (read with PyYAML), with the values filled
  in, and the exit status is 2 (a mistake in the input).
"""

from __future__ import annotations

import ast
import importlib
import pkgutil
import string
from importlib import resources
from pathlib import Path

import pytest
import yaml

import kitgen
from kitgen.cli import main
from kitgen.errors import EXIT_USER, KeyedError, Message, UserError

LANGUAGES = ("en", "es", "fr", "de", "pt", "it", "el", "ru", "ar", "hi")
PACKAGE = Path(kitgen.__file__).parent
TEMPLATES = resources.files("kitgen.templates")

#: Calls that pass a key on rather than name one: the machinery of
#: kitgen/errors.py itself (a KeyedError keeps its Message).
PLUMBING = {("errors.py", "__init__")}
#: The help line of a recipe key, whose key is built from the key's name;
#: test_every_recipe_key_has_its_help_in_every_language checks those.
BUILT_KEYS = {"KeyHelp"}


def _tree(code: str) -> dict:
    return yaml.safe_load(TEMPLATES.joinpath(f"{code}.yaml").read_text(encoding="utf-8"))


def _flat(tree, prefix=""):
    out = {}
    for k, v in tree.items():
        if isinstance(v, dict):
            out.update(_flat(v, f"{prefix}{k}."))
        else:
            out[f"{prefix}{k}"] = v
    return out


def _errors(code: str) -> dict:
    return _flat(_tree(code)["errors"], "errors.")


#: The sections whose entries are messages: the command line's errors and
#: the build's notes (what it thinned or shortened to stay legible).
MESSAGE_SECTIONS = ("errors", "notes")


def _messages(code: str) -> dict:
    out = {}
    for section in MESSAGE_SECTIONS:
        out.update(_flat(_tree(code)[section], f"{section}."))
    return out


def _fields(text: str) -> set[str]:
    return {f for _, f, _, _ in string.Formatter().parse(text) if f is not None}


def _keyed_class_names() -> set[str]:
    """Names of every class whose first argument is a message key: the
    subclasses of KeyedError and Message, found after importing every
    kitgen module."""
    for info in pkgutil.walk_packages([str(PACKAGE)], "kitgen."):
        if info.name != "kitgen.__main__":
            importlib.import_module(info.name)
    names, todo = set(), [KeyedError, Message]
    while todo:
        cls = todo.pop()
        names.add(cls.__name__)
        todo.extend(cls.__subclasses__())
    return names


def _calls():
    """(file, line, function, call) for every call of a keyed class in kitgen/."""
    names = _keyed_class_names() - BUILT_KEYS
    for path in sorted(PACKAGE.rglob("*.py")):
        rel = path.relative_to(PACKAGE).as_posix()
        tree = ast.parse(path.read_text(encoding="utf-8"), rel)
        # The module first, then functions outer before inner (ast.walk is
        # breadth first), so that the last attribution is the innermost.
        for func in [tree] + [n for n in ast.walk(tree) if isinstance(n, (ast.FunctionDef, ast.AsyncFunctionDef))]:
            body = func.body
            for node in ast.walk(ast.Module(body=body, type_ignores=[])):
                if not isinstance(node, ast.Call):
                    continue
                f = node.func
                name = f.id if isinstance(f, ast.Name) else f.attr if isinstance(f, ast.Attribute) else None
                if name in names:
                    yield rel, node.lineno, getattr(func, "name", "<module>"), node


def _direct_calls():
    """Each call once, attributed to its innermost function."""
    seen = {}
    for rel, line, fn, node in _calls():
        seen[(rel, line, node.col_offset)] = (rel, line, fn, node)
    return list(seen.values())


def test_every_message_is_a_template_key_with_its_placeholders():
    english = _messages("en")
    others = {code: _messages(code) for code in LANGUAGES}
    problems, used = [], set()
    calls = _direct_calls()
    assert len(calls) > 100  # the walk finds the calls (there are about 150)
    # ... the notes of kitgen/parts/legibility.py among them
    assert any(rel == "parts/legibility.py" for rel, *_ in calls)
    for rel, line, fn, node in calls:
        if (rel, fn) in PLUMBING:
            continue
        where = f"kitgen/{rel}:{line}"
        first = node.args[0] if node.args else None
        if not (isinstance(first, ast.Constant) and isinstance(first.value, str)):
            problems.append(f"{where}: the message is not a key given as a string literal")
            continue
        key = first.value
        used.add(key)
        if key not in english:
            problems.append(f"{where}: {key!r} is not in the errors or notes of templates/en.yaml")
            continue
        if any(k.arg is None for k in node.keywords) or len(node.args) > 1:
            problems.append(f"{where}: {key!r} takes its values as keyword arguments only")
            continue
        given = {k.arg for k in node.keywords}
        if given != _fields(english[key]):
            problems.append(f"{where}: {key!r} is given {sorted(given)}, the template has "
                            f"{sorted(_fields(english[key]))}")
        for code, table in others.items():
            if key not in table or _fields(table[key]) != _fields(english[key]):
                problems.append(f"{where}: {key!r} is missing or differs in templates/{code}.yaml")
    assert not problems, "\n".join(problems)
    # Every entry is used, so that the templates hold no message kitgen never says.
    unused = {k for k in english if not k.startswith("errors.help.")} - used
    assert not unused, sorted(unused)


def test_the_static_check_catches_a_raw_message(tmp_path):
    """The check above sees a raw English message and a key with the
    wrong placeholders (run on a small source text of its own)."""
    source = ('raise UserError(f"{p}: no such file")\n'
              'raise UserError("errors.no_such_file", path=p)\n'
              'raise UserError("errors.no_such_file", path=p, command=c, what=w)\n')
    english = _errors("en")
    verdicts = []
    for node in [n for n in ast.walk(ast.parse(source)) if isinstance(n, ast.Call)]:
        first = node.args[0]
        literal = isinstance(first, ast.Constant) and first.value in english
        verdicts.append(literal and {k.arg for k in node.keywords} == _fields(english[first.value]))
    assert verdicts == [False, False, True]


@pytest.mark.parametrize("code", LANGUAGES)
def test_the_completeness_checks_see_the_error_messages(code):
    """tests/test_languages.py compares every flattened key (and its
    placeholders) with English and checks the glyphs of every string that
    ``Words.strings()`` yields: both include the errors and notes sections."""
    from kitgen.words.templates import load_words

    from tests.test_languages import _flat as languages_flat

    english = _messages("en")
    assert any(k.startswith("notes.part.") for k in english)
    assert set(english) <= set(languages_flat(_tree(code)))
    strings = {k for k, _ in load_words(code).strings()}
    assert set(english) <= strings
    assert any(k.startswith("errors.help.") for k in strings)


@pytest.mark.parametrize("code", LANGUAGES)
def test_every_recipe_key_has_its_help_in_every_language(code):
    """Messages quote a recipe key's help line; each key of the schema has
    one in every language, and the English one says what schema.py says."""
    from kitgen.recipe.load import KeyHelp
    from kitgen.recipe.schema import KEYS

    table = _errors(code)
    english = _errors("en")
    for key in KEYS:
        name = f"errors.help.{key.name}"
        assert name in table, (code, name)
        assert _fields(table[name]) == _fields(english[name]) <= {"low", "high", "choices"}, (code, name)
        if code == "en":
            assert str(KeyHelp(key)) == key.help


def test_str_of_an_error_is_the_english_template_filled_in():
    english = _errors("en")
    exc = UserError("errors.unknown_key", where="r.yaml, line 2", name="'colur'",
                    hint=Message("errors.hint_did_you_mean", name="colour"))
    assert str(exc) == english["errors.unknown_key"].format(
        where="r.yaml, line 2", name="'colur'", hint=english["errors.hint_did_you_mean"].format(name="colour"))
    # A list is joined with the language's list separator (from the template).
    from kitgen.words.templates import load_words

    arabic = _tree("ar")["page"]["list_separator"]
    listed = Message("errors.stars_outside", names=["'Vega'", "'Deneb'"], count=2).text(load_words("ar"))
    assert listed == _errors("ar")["errors.stars_outside"].format(names=arabic.join(["'Vega'", "'Deneb'"]), count=2)


# -- through the command line ------------------------------------------------------------

def _run(argv, capsys) -> tuple[int, str]:
    code = main([str(a) for a in argv])
    _, err = capsys.readouterr()
    lines = err.rstrip("\n").split("\n")
    assert len(lines) == 1 and "Traceback" not in err, err
    return code, lines[0]


def _build(tmp_path, capsys, text: str) -> tuple[int, str, Path]:
    recipe = tmp_path / "r.yaml"
    recipe.write_text(text, encoding="utf-8")
    out = tmp_path / "kit.pdf"
    code, line = _run(["build", recipe, "-o", out], capsys)
    assert not out.exists()
    return code, line, recipe


def test_spanish_recipe_with_an_unknown_key_is_told_in_spanish(tmp_path, capsys):
    code, line, recipe = _build(tmp_path, capsys, "language: es\nlatitude: 40\naltitud_step_deg: 5\n")
    es = _errors("es")
    where = es["errors.at_line"].format(source=recipe, line=3)
    hint = es["errors.hint_did_you_mean"].format(name="altitude_step_deg")
    message = es["errors.unknown_key"].format(where=where, name="'altitud_step_deg'", hint=hint)
    assert code == EXIT_USER
    assert line == es["errors.report"].format(message=message)
    assert "clave desconocida" in line  # the Spanish words themselves, not English


def test_arabic_recipe_with_a_latitude_out_of_range_is_told_in_arabic(tmp_path, capsys):
    code, line, recipe = _build(tmp_path, capsys, "language: ar\nlatitude: 95\n")
    ar = _errors("ar")
    label = ar["errors.key_label"].format(where=ar["errors.at_line"].format(source=recipe, line=2),
                                          name="latitude")
    problem = ar["errors.latitude_range"].format(value="95")
    message = ar["errors.key_problem"].format(label=label, problem=problem)
    assert code == EXIT_USER
    assert line == ar["errors.report"].format(message=message)
    assert "خط العرض" in line


@pytest.mark.parametrize("text", ["latitude: 95\n", "language: tlh\nlatitude: 95\n", "language: [es]\nlatitude: 95\n"])
def test_recipe_with_no_valid_language_is_told_in_english(tmp_path, capsys, text):
    """No language, an unknown code, or a language that is no text: English
    (the first error found is the one reported)."""
    code, line, recipe = _build(tmp_path, capsys, text)
    en = _errors("en")
    assert code == EXIT_USER
    assert line.startswith("kitgen: error: ")
    if text.startswith("latitude"):
        assert line == f"kitgen: error: {recipe}, line 1: 'latitude': the latitude is 95, outside -90 to 90 degrees"
    else:
        assert "'language'" in line and (" unknown language " in line or " must be text " in line), line
    assert en["errors.report"].format(message="") == "kitgen: error: "


def test_a_star_off_the_rete_is_told_in_the_recipes_language(tmp_path, capsys):
    """Polaris (Dec about +89 degrees, any star catalogue) never rises at
    latitude 40 S, so it is off a southern rete: refused with the line of
    its key, in the recipe's language."""
    code, line, recipe = _build(tmp_path, capsys, "language: fr\nlatitude: -40\nstars: [Polaris]\n")
    fr = _errors("fr")
    assert code == EXIT_USER
    where = fr["errors.at_line"].format(source=recipe, line=3)
    label = fr["errors.key_label"].format(where=where, name="stars")
    problem = fr["errors.star_outside"].format(name="Polaris")
    assert line == fr["errors.report"].format(message=fr["errors.key_problem"].format(label=label, problem=problem))


def test_a_recipes_own_language_file_tells_the_errors(tmp_path, capsys):
    """A Catalan language file (its errors section taken from es.yaml, one
    entry reworded) tells the recipe's unknown key in its own words."""
    tree = _tree("es")
    tree["language"] = "ca"
    tree["errors"]["unknown_key"] = "{where}: clau desconeguda {name}{hint}"
    (tmp_path / "ca.yaml").write_text(yaml.safe_dump(tree, allow_unicode=True), encoding="utf-8")
    code, line, recipe = _build(tmp_path, capsys, "language_file: ca.yaml\nlatitude: 40\nplaca: x\n")
    es = _errors("es")
    where = es["errors.at_line"].format(source=recipe, line=3)
    assert code == EXIT_USER
    assert line == es["errors.report"].format(message=f"{where}: clau desconeguda 'placa'" + es[
        "errors.hint_did_you_mean"].format(name="place"))


def test_a_bad_language_file_is_told_in_the_recipes_language(tmp_path, capsys):
    """The language file itself is wrong (no 'language' code): the recipe's
    'language' still tells the message's language."""
    (tmp_path / "mine.yaml").write_text("reviewed_by_native_speaker: false\n", encoding="utf-8")
    code, line, recipe = _build(tmp_path, capsys, "language: de\nlanguage_file: mine.yaml\nlatitude: 40\n")
    de = _errors("de")
    source = de["errors.source_language_file"].format(path=(tmp_path / "mine.yaml").resolve())
    problem = de["errors.language_code_missing"].format(source=source)
    where = de["errors.at_line"].format(source=recipe, line=2)
    assert code == EXIT_USER
    assert line == de["errors.report"].format(
        message=de["errors.language_file_problem"].format(where=where, problem=problem))


def test_calibrate_tells_its_errors_in_its_language(tmp_path, capsys):
    out = tmp_path / "cal.pdf"
    code, line = _run(["calibrate", "--language", "ru", "--margin", "99", "-o", out], capsys)
    ru = _errors("ru")
    assert code == EXIT_USER
    assert line == ru["errors.report"].format(
        message=ru["errors.margin_option"].format(value="99", low="6", high="30"))
    assert not out.exists()


# -- the build's notes, and messages about sheets and folders ---------------------------------

def _filled(value, code: str) -> str:
    """A message's text as the templates of ``code`` say it, filled in here
    from the template files (PyYAML) and the Unicode CLDR (Babel's
    format_decimal, for the numbers), not by kitgen's own code."""
    from babel.numbers import format_decimal

    from kitgen.errors import Number

    if isinstance(value, Message):
        table = _messages(code)
        return table[value.key].format(**{k: _filled(v, code) for k, v in value.values.items()})
    if isinstance(value, Number):
        pattern = "0" + ("." + "0" * value.decimals if value.decimals else "")
        return format_decimal(round(value.value, value.decimals), format=pattern, locale=code)
    if isinstance(value, (list, tuple)):
        return _tree(code)["page"]["list_separator"].join(_filled(v, code) for v in value)
    return str(value)


@pytest.mark.parametrize("code", ["de", "en"])
def test_the_notes_of_a_small_kit_are_told_in_the_recipes_language(tmp_path, capsys, code):
    """An 80 mm kit thins scales and shortens labels (see
    tests/test_legibility.py); the command line tells every note on its own
    line, in the recipe's language, exactly as its template words it (the
    template text filled in here), numbers with the language's CLDR decimal
    sign."""
    from kitgen.kit import build_kit
    from kitgen.recipe.load import load_recipe

    recipe = tmp_path / "small.yaml"
    recipe.write_text(f"latitude: 52.2\nepoch: 2027\nlanguage: {code}\ndiameter_mm: 80\n", encoding="utf-8")
    out = tmp_path / "small.pdf"
    assert main(["build", str(recipe), "-o", str(out)]) == 0
    stdout, err = capsys.readouterr()
    assert stdout.strip() == str(out) and out.exists() and "Traceback" not in err
    notes = build_kit(load_recipe(recipe)).notes
    keys = {n.key for n in notes}
    # No label of a shipped language is cut short, even at 80 mm (#11).
    assert len(notes) >= 4 and keys & {"notes.unnamed_stars", "notes.unnamed_stars_many"}
    assert "notes.shortened" not in keys
    # One star or several: the note agrees with the count (the templates' own
    # two forms, as the printing steps' _one and _many).
    assert all(n.key.endswith("_many") == (len(n.values["stars"]) > 1)
               for n in notes if n.key.startswith("notes.unnamed_stars"))
    report = _messages(code)["notes.report"]
    assert err.splitlines() == [report.format(message=_filled(n, code)) for n in notes]
    if code == "de":
        # German words and the German decimal comma (CLDR de: decimal sign ","), no English.
        assert all(line.startswith("kitgen: Hinweis: ") for line in err.splitlines())
        assert "Durchmesser" in err and " would " not in err and " ticks " not in err
        assert any("0," in line for line in err.splitlines())
    else:
        assert all(line.startswith("kitgen: note: ") for line in err.splitlines())
        assert "0." in err


def test_a_note_holds_no_word_of_its_own():
    """Every note is a notes.* message whose part names are notes.part.*
    messages and whose numbers are Number values: nothing English is put
    together in the code."""
    from kitgen.errors import Number
    from kitgen.kit import build_kit
    from kitgen.recipe.load import parse_recipe_text

    kit = build_kit(parse_recipe_text("latitude: 52.2\nepoch: 2027\ndiameter_mm: 80\n"))
    assert kit.notes
    for note in kit.notes:
        assert isinstance(note, Message) and note.key.startswith("notes.")
        assert isinstance(note.values["part"], Message) and note.values["part"].key.startswith("notes.part.")
        assert isinstance(note.values["diameter"], Number)
        for name, value in note.values.items():
            items = value if isinstance(value, list) else [value]
            # star names (IAU, or the template's local names) are the only plain text
            assert all(isinstance(v, (Message, Number)) for v in items) or name == "stars", (note.key, name)


def _cli_line(argv, capsys) -> tuple[int, str]:
    code = main([str(a) for a in argv])
    _, err = capsys.readouterr()
    note = _messages("en")["notes.report"].format(message="")
    lines = [line for line in err.splitlines() if not line.startswith(note)]
    assert len(lines) == 1 and "Traceback" not in err, err
    return code, lines[0]


def test_a_custom_sheet_is_named_once_in_english(tmp_path, capsys):
    """'the 250 x 350 mm sheet', never 'sheet sheet' nor 'sheet page': the
    duplex message for a custom sheet, and the margin message for a named
    one, in English; German takes the same placeholders."""
    en, de = _errors("en"), _errors("de")
    custom = en["errors.sheet_custom"].format(width="250", height="350")
    assert custom == "250 x 350 mm"
    recipe = tmp_path / "r.yaml"
    recipe.write_text("latitude: 40\nsheet: {width_mm: 250, height_mm: 350}\nduplex: long_edge\n"
                      "diameter_mm: 300\n", encoding="utf-8")
    code, line = _cli_line(["build", recipe, "-o", tmp_path / "k.pdf"], capsys)
    assert code == EXIT_USER
    # the recipe's line of 'duplex' leads (#11)
    assert line == en["errors.report"].format(message=en["errors.key_problem"].format(
        label=en["errors.at_line"].format(source=recipe, line=3), problem=en["errors.duplex_mater"].format(sheet=custom)))
    assert "one 250 x 350 mm page" in line and "sheet sheet" not in line and "sheet page" not in line
    # ISO 216: A5 is 148 mm across, so margins of 30 mm leave 88 mm.
    from kitgen.paper import MIN_USABLE_MM

    recipe.write_text("latitude: 40\nsheet: a5\nmargin_mm: 30\n", encoding="utf-8")
    code, line = _cli_line(["build", recipe, "-o", tmp_path / "k.pdf"], capsys)
    assert code == EXIT_USER
    assert line.endswith(en["errors.sheet_margin"].format(key="'margin_mm'", margin="30", usable="88", sheet="a5",
                                                          needed=f"{MIN_USABLE_MM:g}"))
    assert "across the a5 sheet;" in line
    assert not (tmp_path / "k.pdf").exists()
    for key in ("sheet_custom", "sheet_margin", "duplex_mater", "tile_sheet_too_small"):
        assert _fields(de[f"errors.{key}"]) == _fields(en[f"errors.{key}"]), key


def test_a_preview_folder_that_cannot_be_made_is_a_clean_error(tmp_path, capsys):
    """The folder for the pictures would have to be made inside a plain
    file: a mistake in the input (exit 2), told on one line in the recipe's
    language (German here) as its templates word it, nothing written and
    the file left as it was."""
    recipe = tmp_path / "r.yaml"
    recipe.write_text("latitude: 52.2\nepoch: 2027\nlanguage: de\n", encoding="utf-8")
    blocker = tmp_path / "blocker"
    blocker.write_bytes(b"mine")
    folder = blocker / "look"
    code, line = _cli_line(["preview", recipe, "-o", folder, "--dpi", "30"], capsys)
    de = _errors("de")
    assert code == EXIT_USER
    assert line == de["errors.report"].format(message=de["errors.write_failed"].format(
        path=folder, doing=de["errors.doing_make_folder"], advice=de["errors.write_not_folder"]))
    assert blocker.read_bytes() == b"mine" and sorted(p.name for p in tmp_path.iterdir()) == ["blocker", "r.yaml"]


def test_a_number_in_a_message_is_written_as_its_language_writes_numbers():
    """Number values take the decimal sign (and, when asked, the digits) of
    the Unicode CLDR as Babel gives them; without a language, a decimal
    point.  ``None`` decimals: as few as show the number whole."""
    from babel.numbers import format_decimal

    from kitgen.errors import Number
    from kitgen.words.templates import load_words

    assert (Number(80.0).decimals, Number(1.5).decimals, Number(0.25).decimals, Number(179.9999999).decimals) == \
        (0, 1, 2, 0)
    assert Number(0.4495, 2).text() == "0.45" and Number(80.0).text() == "80"
    assert Number(0.45, 2).text(load_words("de")) == format_decimal(0.45, format="0.00", locale="de")
    # Babel gives the arab system's decimal sign; the digits are Unicode's
    # ARABIC-INDIC DIGIT ZERO to NINE, U+0660 to U+0669.
    arab = str.maketrans("0123456789", "".join(chr(0x660 + k) for k in range(10)))
    assert Number(1.5).text(load_words("ar", native_digits=True)) == format_decimal(
        1.5, format="0.0", locale="ar", numbering_system="arab").translate(arab)


def test_a_notes_isolates_are_dropped_and_overrides_still_shown_escaped():
    """An Arabic note quotes a twilight line's name, whose number the
    template isolates (LRI ... PDI, Unicode Standard Annex #9, 2.4): the
    terminal line shows the number, not the isolates as codes; a
    right-to-left override (U+202E, which could reorder what follows) is
    still shown escaped."""
    from kitgen.errors import one_line
    from kitgen.words.locale import true_minus
    from kitgen.words.templates import load_words

    w = load_words("ar")
    name = w("plate.line_twilight", altitude=true_minus(w.number(-18)))
    assert "\u2066" in name and "\u2069" in name
    line = one_line(f"«{name}» \u202e")
    assert "\\u2066" not in line and "\\u2069" not in line and "\u2066" not in line
    assert "\u221218°" in line and line.endswith("\\u202e")
