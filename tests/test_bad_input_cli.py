"""Every wrong input gives one line that names the problem and how to fix
it, exit status 2 for a mistake in the input and 1 for an internal fault,
and no traceback unless ``--debug`` asks for one.

Most cases run ``kitgen.cli.main`` in this process and read its stderr; a
few run the real command in a child process to check what a shell sees.
The expected wording is the project's own (these are its messages); the
positions of YAML errors are checked against the text of the recipe.
"""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest

from kitgen.cli import main
from kitgen.errors import EXIT_INTERNAL, EXIT_INTERRUPTED, EXIT_USER


def run(argv, capsys) -> tuple[int, str]:
    """Exit status and stderr of ``kitgen ARGV`` run in this process."""
    try:
        code = main([str(a) for a in argv])
    except SystemExit as exc:  # argparse's own exits
        code = exc.code
    _, err = capsys.readouterr()
    return code, err


def one_line(err: str) -> str:
    """The single line of a failure, with the checks every failure passes."""
    assert "Traceback" not in err
    lines = err.rstrip("\n").split("\n")
    assert len(lines) == 1, err
    return lines[0]


def recipe(tmp_path: Path, text, name: str = "r.yaml") -> Path:
    p = tmp_path / name
    if isinstance(text, bytes):
        p.write_bytes(text)
    else:
        p.write_text(text, encoding="utf-8")
    return p


def build_fails(tmp_path, capsys, text, *needles, code=EXIT_USER, name="r.yaml"):
    """Build the recipe ``text``; assert it fails with ``code``, one line
    holding every needle, and writes nothing."""
    r = recipe(tmp_path, text, name)
    out = tmp_path / "kit.pdf"
    got, err = run(["build", r, "-o", out], capsys)
    line = one_line(err)
    assert got == code, line
    assert line.startswith("kitgen: error: "), line
    for needle in needles:
        assert needle in line, (needle, line)
    assert not out.exists()
    assert sorted(p.name for p in tmp_path.iterdir()) == [r.name]
    return line


# -- wrong type ------------------------------------------------------------------------------------

@pytest.mark.parametrize("text, needles", [
    ("latitude: [40, 5]\n", ["line 1", "'latitude'", "a latitude is a number or text such as", "40 26 46 N"]),
    ("latitude: 40\nepoch: soon\n", ["line 2", "'epoch' must be a number", "1900 to 2100"]),
    ("latitude: 40\nepoch: 2027.5\n", ["'epoch' must be a whole number"]),
    ("latitude: 40\ntwilight: maybe\n", ["'twilight': must be true or false, or civil", "'maybe'"]),
    ("latitude: 40\ntitle: [a, b]\n", ["'title' must be text", "put it in quotes"]),
    ("latitude: 40\nsheet: 4\n", ["'sheet'", "a4"]),
    ("latitude: 40\nstars: Sirius\n", ["'stars' must be a list of star names", "{brightest: N}"]),
    ("latitude: 40\nparts: plate\n", ["'parts' must be a list of part names", "rete"]),
    ("- latitude: 40\n", ["a recipe is a mapping of keys to values", "kitgen new"]),
])
def test_wrong_type(tmp_path, capsys, text, needles):
    build_fails(tmp_path, capsys, text, *needles)


# -- out of range, NaN and infinity -------------------------------------------------------------

@pytest.mark.parametrize("text, needles", [
    ("latitude: 91\n", ["the latitude is 91, outside -90 to 90 degrees"]),
    ("latitude: -90.5\n", ["outside -90 to 90"]),
    ("latitude: 40\nepoch: 1800\n", ["'epoch' is 1800, outside 1900 to 2100"]),
    ("latitude: 40\naltitude_step_deg: 0.01\n", ["'altitude_step_deg' is 0.01, outside 1 to 30"]),
    ("latitude: 40\nazimuth_step_deg: 1000\n", ["'azimuth_step_deg' is 1000, outside 5 to 90"]),
    ("latitude: 40\ndiameter_mm: -5\n", ["'diameter_mm' is -5, outside 80 to 600"]),
    ("latitude: 40\nstars: {brightest: 0}\n", ["'brightest' takes a whole number from 1 to 200"]),
    ("latitude: 40\nstars: {magnitude_limit: 9}\n", ["'magnitude_limit' takes a magnitude from -2 to 3.5"]),
])
def test_out_of_range(tmp_path, capsys, text, needles):
    build_fails(tmp_path, capsys, text, *needles)


@pytest.mark.parametrize("text, needles", [
    ("latitude: .nan\n", ["'latitude'", "finite number", "nan"]),
    ("latitude: .inf\n", ["'latitude'", "finite number", "inf"]),
    ("latitude: -.inf\n", ["'latitude'", "finite number"]),
    ("latitude: 40\naltitude_step_deg: .nan\n", ["'altitude_step_deg' must be a finite number"]),
    ("latitude: 40\ndiameter_mm: .inf\n", ["'diameter_mm' must be a finite number"]),
    ("latitude: 40\nstars: {magnitude_limit: .nan}\n", ["'magnitude_limit' takes a magnitude"]),
    ("latitude: 40\nepoch: .inf\n", ["'epoch' must be a finite number"]),
])
def test_nan_and_infinity(tmp_path, capsys, text, needles):
    build_fails(tmp_path, capsys, text, *needles)


# -- unknown key, star, language ------------------------------------------------------------------

def test_unknown_key_with_suggestion(tmp_path, capsys):
    build_fails(tmp_path, capsys, "latitude: 40\nlattitude: 41\n", "line 2", "unknown key 'lattitude'",
                "did you mean 'latitude'?")


def test_unknown_key_without_a_close_match_lists_the_keys(tmp_path, capsys):
    build_fails(tmp_path, capsys, "latitude: 40\nwallpaper: red\n", "unknown key 'wallpaper'", "valid keys:",
                "altitude_step_deg")


def test_unknown_star_with_suggestion(tmp_path, capsys):
    build_fails(tmp_path, capsys, "latitude: 40\nstars: [Sirius, Betelguese]\n", "line 2",
                "unknown star 'Betelguese'", "did you mean 'Betelgeuse'?")


def test_unknown_star_without_a_close_match(tmp_path, capsys):
    build_fails(tmp_path, capsys, "latitude: 40\nstars: [Qwxyzzy]\n", "unknown star 'Qwxyzzy'",
                "`kitgen stars` lists the known names")


def test_unknown_language(tmp_path, capsys):
    build_fails(tmp_path, capsys, "latitude: 40\nlanguage: tlh\n", "line 2", "unknown language 'tlh'",
                "available:", "en")


def test_unknown_language_that_looks_like_a_path(tmp_path, capsys):
    build_fails(tmp_path, capsys, "latitude: 40\nlanguage: ../../etc/passwd\n", "unknown language")


def test_missing_latitude(tmp_path, capsys):
    build_fails(tmp_path, capsys, "title: Hilltop Science Club\n", "the key 'latitude' is required",
                "latitude: 48.2")


def test_key_given_twice(tmp_path, capsys):
    build_fails(tmp_path, capsys, "latitude: 40\nsheet: a4\nlatitude: 50\n", "line 3",
                "the key 'latitude' is given twice (first on line 1); keep one")


# -- a sheet too small for the instrument -------------------------------------------------------

def test_sheet_too_small(tmp_path, capsys):
    """A custom sheet below the smallest that holds the check bar and the
    page furniture is refused with the limits (a named sheet, however
    large the instrument, is tiled instead)."""
    build_fails(tmp_path, capsys, "latitude: 40\nsheet: {width_mm: 100, height_mm: 100}\n", "line 2",
                "'sheet'", "100", "132")


def test_unknown_sheet(tmp_path, capsys):
    build_fails(tmp_path, capsys, "latitude: 40\nsheet: a9\n", "unknown sheet 'a9'", "a4", "width_mm")


# -- unreadable, empty, a folder, not text ------------------------------------------------------

def _build_path_fails(tmp_path, capsys, path, *needles):
    out = tmp_path / "kit.pdf"
    got, err = run(["build", path, "-o", out], capsys)
    line = one_line(err)
    assert got == EXIT_USER, line
    for needle in needles:
        assert needle in line, (needle, line)
    assert not out.exists()
    return line


def test_no_such_file(tmp_path, capsys):
    _build_path_fails(tmp_path, capsys, tmp_path / "nothing.yaml", "nothing.yaml: no such file",
                      "kitgen new")


def test_a_folder(tmp_path, capsys):
    (tmp_path / "school").mkdir()
    _build_path_fails(tmp_path, capsys, tmp_path / "school", "is a folder, not a file (recipe)",
                      "give the file's name")


def test_unreadable_file_input_output_error(tmp_path, capsys):
    """A real read error, root or not: reading /proc/self/mem from its start
    fails with EIO, as the first page of a process is never mapped (Linux
    proc(5))."""
    if not Path("/proc/self/mem").exists():
        pytest.skip("no /proc/self/mem on this system")
    _build_path_fails(tmp_path, capsys, "/proc/self/mem", "cannot read", "Input/output error")


@pytest.mark.skipif(os.geteuid() == 0, reason="root reads a file whatever its mode; "
                    "see test_unreadable_file_permission_denied_simulated")
def test_unreadable_file_permission_denied(tmp_path, capsys):
    r = recipe(tmp_path, "latitude: 40\n")
    r.chmod(0)
    _build_path_fails(tmp_path, capsys, r, "permission denied", "permissions")


def test_unreadable_file_permission_denied_simulated(tmp_path, capsys, monkeypatch):
    """As root (CI) a mode of 000 does not stop a read, so the refusal is
    simulated: ``open`` raises the PermissionError a user would meet."""
    r = recipe(tmp_path, "latitude: 40\n")
    import builtins
    real_open = builtins.open

    def deny(path, *a, **k):
        if Path(path) == r:
            raise PermissionError(13, "Permission denied", str(path))
        return real_open(path, *a, **k)

    monkeypatch.setattr(builtins, "open", deny)
    _build_path_fails(tmp_path, capsys, r, "permission denied", "check the file's permissions")


@pytest.mark.parametrize("text", [b"", b"\n\n", b"   \n", b"# only a comment\n", b"---\n", b"~\n"])
def test_empty_file(tmp_path, capsys, text):
    build_fails(tmp_path, capsys, text, "the recipe is empty", "`kitgen new` writes a starter recipe")


def test_binary_file(tmp_path, capsys):
    build_fails(tmp_path, capsys, b"\x89PNG\r\n\x1a\n\x00\x00\x00\rIHDR", "not a text file", "UTF-8 text")


def test_not_utf8(tmp_path, capsys):
    build_fails(tmp_path, capsys, "latitude: 40\ntitle: Caf\xe9\n".encode("latin-1"), "line 2",
                "not UTF-8 text (byte 0xe9)", "save the recipe as UTF-8")


def test_utf16(tmp_path, capsys):
    build_fails(tmp_path, capsys, "latitude: 40\n".encode("utf-16"), "UTF-16", "save the recipe as UTF-8")


def test_utf8_with_byte_order_mark_is_accepted(tmp_path, capsys):
    r = recipe(tmp_path, "\ufefflatitude: 40\nepoch: 2027\n".encode("utf-8"))
    got, err = run(["geometry", r, "-o", tmp_path / "g.json"], capsys)
    assert got == 0, err


# -- invalid YAML, with its line and column ------------------------------------------------------

@pytest.mark.parametrize("text, line, column, problem", [
    # The second colon of line 2, "sheet: a4: b", is its 10th character.
    ("latitude: 40\nsheet: a4: b\n", 2, 10, "mapping values are not allowed here"),
    # A flow list never closed: the loader meets the end of the text on line 3.
    ("latitude: 40\nstars: [Sirius, Vega\n", 3, 1, "expected ',' or ']'"),
    # A tab used for indentation, at the start of line 2.
    ("latitude: 40\n\tsheet: a4\n", 2, 1, "found character '\\t' that cannot start any token"),
    # An unclosed double quote, running to the end.
    ('latitude: 40\ntitle: "Hilltop\n', 3, 1, "found unexpected end of stream"),
])
def test_invalid_yaml_names_line_and_column(tmp_path, capsys, text, line, column, problem):
    build_fails(tmp_path, capsys, text, f"invalid YAML at line {line}, column {column}", problem,
                "check the quotes, colons and indentation")


# -- latitude as written ---------------------------------------------------------------------

def test_decimal_comma_latitude(tmp_path, capsys):
    build_fails(tmp_path, capsys, "latitude: 40,5\n", "'40,5' has a decimal comma", "write a decimal point",
                "Accepted forms:", "40 26 46 N")


# -- the command line itself --------------------------------------------------------------------

@pytest.mark.parametrize("argv, needle", [
    (["build"], "the following arguments are required: recipe"),
    (["build", "a.yaml", "b.yaml"], "unrecognized arguments: b.yaml"),
    (["stars", "--max-mag", "bright"], "argument --max-mag: invalid float value: 'bright'"),
    (["paint"], "invalid choice: 'paint'"),
])
def test_command_line_mistakes_are_one_line(capsys, argv, needle):
    got, err = run(argv, capsys)
    line = one_line(err)
    assert got == EXIT_USER
    assert needle in line and "--help" in line


def test_no_command_shows_help_and_exits_2(capsys):
    got, err = run([], capsys)
    assert got == EXIT_USER and "usage:" in err and "Traceback" not in err


def test_stars_epoch_out_of_range(capsys):
    got, err = run(["stars", "--epoch", "1500"], capsys)
    assert got == EXIT_USER and "--epoch must be from 1900 to 2100, got 1500" in one_line(err)


# -- user error (2) versus internal fault (1), --debug, interrupt ----------------------------

def test_internal_fault_is_one_line_with_exit_1(tmp_path, capsys, monkeypatch):
    import kitgen.kit

    def broken(recipe):
        raise RuntimeError("the plate\nfell over")

    monkeypatch.setattr(kitgen.kit, "build_kit", broken)
    r = recipe(tmp_path, "latitude: 40\n")
    got, err = run(["build", r, "-o", tmp_path / "kit.pdf"], capsys)
    line = one_line(err)
    assert got == EXIT_INTERNAL
    assert line == "kitgen: internal error: RuntimeError: the plate fell over (run with --debug for details)"


def test_debug_lets_the_fault_raise(tmp_path, capsys, monkeypatch):
    import kitgen.kit

    monkeypatch.setattr(kitgen.kit, "build_kit", lambda recipe: 1 / 0)
    r = recipe(tmp_path, "latitude: 40\n")
    with pytest.raises(ZeroDivisionError):
        main(["build", str(r), "-o", str(tmp_path / "kit.pdf"), "--debug"])
    with pytest.raises(ZeroDivisionError):
        main(["--debug", "build", str(r), "-o", str(tmp_path / "kit.pdf")])


def test_interrupt_exits_130(tmp_path, capsys, monkeypatch):
    import kitgen.kit

    def interrupted(recipe):
        raise KeyboardInterrupt

    monkeypatch.setattr(kitgen.kit, "build_kit", interrupted)
    r = recipe(tmp_path, "latitude: 40\n")
    got, err = run(["build", r, "-o", tmp_path / "kit.pdf"], capsys)
    assert got == EXIT_INTERRUPTED
    assert one_line(err) == "kitgen: interrupted; no file was left half-written"


def test_control_characters_from_a_recipe_are_not_printed_raw(tmp_path, capsys):
    """A hostile key cannot send terminal escapes or extra lines to the
    user's terminal through an error message."""
    line = build_fails(tmp_path, capsys, 'latitude: 40\n"evil\\e[2J\\nkey\\u202e": 1\n', "unknown key")
    assert "\x1b" not in line and "\u202e" not in line and "\\x1b" in line and "\\u202e" in line


# -- in a real process ---------------------------------------------------------------------

def _kitgen(*args, cwd):
    return subprocess.run([sys.executable, "-m", "kitgen", *map(str, args)], cwd=cwd, capture_output=True,
                          text=True, timeout=120)


def test_real_process_user_error(tmp_path):
    recipe(tmp_path, "latitude: 40,5\n")
    p = _kitgen("build", "r.yaml", cwd=tmp_path)
    assert p.returncode == 2
    assert p.stdout == ""
    assert p.stderr.count("\n") == 1 and "decimal comma" in p.stderr and "Traceback" not in p.stderr
    assert sorted(x.name for x in tmp_path.iterdir()) == ["r.yaml"]


def test_real_process_internal_fault_and_debug(tmp_path):
    recipe(tmp_path, "latitude: 40\n")
    code = ("import sys, kitgen.kit as k\n"
            "def boom(r): raise MemoryError('out of memory')\n"
            "k.build_kit = boom\n"
            "from kitgen.cli import main\n"
            "sys.exit(main(sys.argv[1:]))\n")
    p = subprocess.run([sys.executable, "-c", code, "build", "r.yaml"], cwd=tmp_path, capture_output=True,
                       text=True, timeout=120)
    assert p.returncode == 1
    assert p.stderr == "kitgen: internal error: MemoryError: out of memory (run with --debug for details)\n"
    p = subprocess.run([sys.executable, "-c", code, "build", "r.yaml", "--debug"], cwd=tmp_path,
                       capture_output=True, text=True, timeout=120)
    assert p.returncode == 1 and "Traceback" in p.stderr and "MemoryError" in p.stderr
    assert sorted(x.name for x in tmp_path.iterdir()) == ["r.yaml"]


# -- text that cannot be printed; the starter recipe ------------------------------------------

# each character shown beside its code point; an unassigned one (U+038B) by its code alone
@pytest.mark.parametrize("title, codes", [("東京", "'京' U+4EAC, '東' U+6771"), ("Club \U0001f52d", "'\U0001f52d' U+1F52D"),
                                          ("\u038b", "U+038B")])
def test_title_no_shipped_font_draws(tmp_path, capsys, title, codes):
    build_fails(tmp_path, capsys, f"latitude: 40\ntitle: '{title}'\n", "line 2",
                f"'title' has characters that no shipped font draws ({codes})", "remove them")


def test_the_starter_recipe_builds(tmp_path, capsys):
    """`kitgen new` writes every key with its example value; that recipe,
    as written, must build (an empty list example once made it fail)."""
    starter = tmp_path / "school.yaml"
    assert run(["new", "-o", starter], capsys)[0] == 0
    assert run(["build", starter, "-o", tmp_path / "school.pdf"], capsys)[0] == 0
