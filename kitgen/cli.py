"""The ``kitgen`` command line.

Results on stdout, messages on stderr; exit 0 on success, 2 for a mistake
in the input, 1 for an internal fault, 130 when interrupted.  A failure is
one line, never a traceback, unless ``--debug`` asks for one.
"""

from __future__ import annotations

import argparse
import contextlib
import errno
import os
import sys
from pathlib import Path

from . import __version__, interrupt
from .collect import rare_collections
from .errors import (EXIT_INTERNAL, EXIT_INTERRUPTED, EXIT_OK, EXIT_USER, Message, UserError, one_line, speaking,
                     typed)


class _Parser(argparse.ArgumentParser):
    """argparse, but a mistake on the command line is one line too."""

    def error(self, message):
        self.exit(EXIT_USER, f"kitgen: error: {one_line(message)} (see {self.prog} --help)\n")

    def _print_message(self, message, file=None):
        """Help and version go to stdout through :func:`_emit`, so that a
        failed write is said in one line (argparse would keep quiet)."""
        if message:
            if file is sys.stdout:  # None too, when stdout is closed: argparse passes sys.stdout
                _emit(message)
            else:
                _tell(message.rstrip("\n"))


def _parser() -> argparse.ArgumentParser:
    p = _Parser(prog="kitgen", description="Printable paper astrolabe kits for any latitude.")
    p.add_argument("--version", action="version", version=f"kitgen {__version__}")
    p.add_argument("--debug", action="store_true", help="show a traceback when something fails")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")

    b = sub.add_parser("build", help="build the printable PDF kit from a recipe")
    b.add_argument("recipe", help="the recipe file (YAML)")
    b.add_argument("-o", "--output", help="the PDF to write (default: the recipe's name with .pdf)")
    b.add_argument("--force", action="store_true", help="write over an existing file kitgen did not make")

    g = sub.add_parser("geometry", help="export the kit's geometry as JSON or SVG")
    g.add_argument("recipe", help="the recipe file (YAML)")
    g.add_argument("--format", choices=("json", "svg"), default="json", help="json (one file) or svg (a file per part)")
    g.add_argument("-o", "--output", help="JSON: the file to write (default: stdout); SVG: the folder to write into")
    g.add_argument("--force", action="store_true", help="write over existing files kitgen did not make")

    n = sub.add_parser("new", help="write a commented starter recipe (or class set, or roster)")
    n.add_argument("-o", "--output", help="the file to write (default: stdout)")
    kind = n.add_mutually_exclusive_group()
    kind.add_argument("--set", action="store_true", help="a starter class set for kitgen batch, not a recipe")
    kind.add_argument("--roster", action="store_true", help="a starter roster (CSV) for a class set")

    s = sub.add_parser("stars", help="list the built-in star catalogue")
    s.add_argument("--name", help="only stars whose name contains this text")
    s.add_argument("--max-mag", type=float, help="only stars at least this bright (magnitude)")
    s.add_argument("--epoch", type=int, help="year of the listed places (default: this year)")

    w = sub.add_parser("places", help="list the places of the gazetteer (GeoNames) that match a name",
                       epilog="Place data: GeoNames (geonames.org), CC BY 4.0.")
    w.add_argument("query", help="a town's name, optionally with region and country: Lisbon, 'Lisbon, PT'")
    w.add_argument("--limit", type=_place_limit, default=10, help="most places listed, 1 to 100 (default: 10)")

    k = sub.add_parser("check", help="report how well the kit tells the time, read from its own geometry (#10)")
    k.add_argument("recipe", help="the recipe (YAML)")
    k.add_argument("--target", help="minutes: also find the size at which every reading by the Sun at the printed "
                                    "graduations is within this (0.5 to 60)")

    c = sub.add_parser("calibrate", help="write a page of check bars to measure the printer's scale")
    c.add_argument("--sheet", default="a4",
                   help="a5, a4, a3, letter, legal, tabloid, or the sides and unit such as 250x350mm or 9x12in "
                        "(default: a4)")
    c.add_argument("--margin", type=float, default=10.0, help="margin kept clear on every side, mm (default: 10)")
    c.add_argument("--language", default="en", help="language of the words on the page (default: en)")
    c.add_argument("-o", "--output", help="the PDF to write (default: calibration-SHEET.pdf)")
    c.add_argument("--force", action="store_true", help="write over an existing file kitgen did not make")

    v = sub.add_parser("preview", help="write a PNG picture of every page of the kit, to look at before printing")
    v.add_argument("recipe", help="the recipe file (YAML)")
    v.add_argument("-o", "--output", required=True, help="the folder to write the pictures into")
    v.add_argument("--dpi", type=float, default=100.0, help="resolution, dots per inch, 30 to 300 (default: 100)")
    v.add_argument("--force", action="store_true", help="write over existing files kitgen did not make")

    a = sub.add_parser("batch", help="build a class set: many kits from one set recipe, into one folder")
    a.add_argument("set", help="the set recipe (YAML): defaults, kits and/or a roster CSV")
    a.add_argument("-o", "--output", required=True,
                   help="the folder to write: kits/, print-paper.pdf, print-card.pdf, print-film.pdf "
                        "(a file a sheet size where the kits' sheets differ), manifest.csv "
                        "(made fresh; an earlier set's folder is replaced whole)")
    a.add_argument("-j", "--jobs", type=int, help="worker processes (default: the machine's cores)")
    a.add_argument("--quiet", action="store_true", help="no progress bar or progress lines")

    w = sub.add_parser("serve", help="a web page on this machine for making kits without a terminal")
    w.add_argument("--host", help="address to listen on (default: 127.0.0.1, this machine only); "
                                  "any other address is served with a warning")
    w.add_argument("--port", type=int, default=0, help="port to listen on (default: a free one)")
    w.add_argument("--open", action="store_true", help="open the page in the web browser")
    w.add_argument("--workers", type=int, default=2, help="kits built at once (default: 2)")
    w.add_argument("--queue", type=int, default=8, help="kits waiting beyond those, before 'busy' (default: 8)")
    return p


def _recipe_path(text: str) -> Path:
    """The recipe's path, checked before any work: not a folder (``.``,
    ``/``), no name longer than the file system takes."""
    from .outfile import check_name_length
    from .recipe.load import RECIPE

    path = Path(text)
    check_name_length(path)
    if path.is_dir():
        raise UserError("errors.is_folder_not_file", path=path, what=RECIPE)
    return path


def _default_output(recipe: Path, suffix: str) -> Path:
    return recipe.with_suffix(suffix)


def _inputs(args, recipe=None) -> tuple:
    """The files the build reads, never to be written over: the recipe and
    the language file it names."""
    found = [Path(args.recipe)]
    if recipe is not None and recipe.language_file:
        found.append(Path(recipe.language_file))
    return tuple(found)


def _output_path(text: str) -> Path:
    from .outfile import check_name_length

    check_name_length(text)
    return Path(text)


def _cmd_build(args) -> int:
    from .kit import build_kit
    from .outfile import check_target, write_atomic
    from .recipe.load import load_recipe
    from .render.pdf import build_pdf

    path = _recipe_path(args.recipe)
    _check_stdout_not_input(path)
    out = _output_path(args.output) if args.output else _default_output(path, ".pdf")
    check_target(out, args.force, _inputs(args))
    recipe = load_recipe(path)
    with speaking(recipe.language, recipe.language_file or None), _at_recipe_line(path):
        _check_stdout_not_input(*_inputs(args, recipe))
        check_target(out, args.force, _inputs(args, recipe))
        kit = build_kit(recipe)
        write_atomic(out, build_pdf(kit)[1], args.force, _inputs(args, recipe))
    _print_notes(kit)
    _emit(f"{out}\n")
    return EXIT_OK


#: Mistakes found only while the kit is laid out, and the recipe key whose
#: value they are about: the message gets that key's line in the recipe.
_BUILD_ERROR_KEYS = {"errors.tile_sheet_too_small": "sheet", "errors.duplex_mater": "duplex",
                     "errors.duplex_parts": "duplex", "errors.accuracy_page_parts": "accuracy_page"}


@contextlib.contextmanager
def _at_recipe_line(path: Path):
    """Within the block, a mistake that the build finds in a recipe value
    (:data:`_BUILD_ERROR_KEYS`) is told with that value's line in the
    recipe, as the loader tells its own."""
    try:
        yield
    except UserError as exc:
        name = _BUILD_ERROR_KEYS.get(exc.key)
        if name is None:
            raise
        from .recipe.load import at_line, read_text_file, tree_lines

        try:
            line = tree_lines(read_text_file(path)).get(name)
        except UserError:
            line = None
        if line is None:
            raise
        raise UserError("errors.key_problem", label=at_line(path, line), problem=exc) from None


def _print_notes(kit) -> None:
    """Say on stderr what the build thinned or shortened to keep every
    scale legible, one line a note, in the kit's language (the ``notes``
    section of its template, prefix and all, as errors use ``errors.report``)."""
    for note in kit.notes:
        _tell(one_line(Message("notes.report", message=note).text(kit.words)))


def _write_folder(folder: Path, files: dict, args, recipe, own) -> None:
    """Write ``{file name: bytes}`` as the folder ``folder``, whole
    (:func:`kitgen.outfile.write_folder_atomic`), then list the files."""
    from .outfile import write_folder_atomic

    written = write_folder_atomic(folder, files, args.force, _inputs(args, recipe), own)
    _emit("".join(f"{p}\n" for p in written))


def _cmd_geometry(args) -> int:
    from .recipe.load import load_recipe

    path = _recipe_path(args.recipe)
    if args.output:
        _output_path(args.output)
    _check_stdout_not_input(path)
    kit_recipe = load_recipe(path)
    with speaking(kit_recipe.language, kit_recipe.language_file or None), _at_recipe_line(path):
        _check_stdout_not_input(*_inputs(args, kit_recipe))
        return _write_geometry(args, kit_recipe)


def _write_geometry(args, kit_recipe) -> int:
    from .kit import build_kit
    from .outfile import check_target, write_atomic

    if args.format == "json":
        from .render.json_export import render_json

        if args.output:
            check_target(Path(args.output), args.force, _inputs(args, kit_recipe))
        data = render_json(build_kit(kit_recipe))
        if args.output:
            write_atomic(Path(args.output), data, args.force, _inputs(args, kit_recipe))
            _emit(f"{args.output}\n")
        else:
            _emit(data)
        return EXIT_OK
    from .render.svg import render_svg_files

    if not args.output:
        raise UserError("errors.svg_needs_folder")
    folder = Path(args.output)
    if folder.exists() and not folder.is_dir():
        raise UserError("errors.svg_folder_is_file", path=folder)
    _write_folder(folder, render_svg_files(build_kit(kit_recipe)), args, kit_recipe,
                  lambda name: name.endswith(".svg"))
    return EXIT_OK


def _cmd_new(args) -> int:
    from .batch.starter import starter_roster, starter_set
    from .outfile import write_atomic
    from .recipe.starter import starter_recipe

    if args.set:
        text = starter_set().encode("utf-8")
    elif args.roster:
        text = ("\ufeff" + starter_roster()).encode("utf-8")   # a spreadsheet then reads it as UTF-8
    else:
        text = starter_recipe().encode("utf-8")
    if args.output:
        out = _output_path(args.output)
        if out.exists():
            raise UserError("errors.new_exists", path=out)
        write_atomic(out, text)
        _emit(f"{out}\n")
    else:
        _emit(text)
    return EXIT_OK


def _cmd_stars(args) -> int:
    from .recipe.schema import EPOCH_MAX, EPOCH_MIN, current_year
    from .sky.stars import filter_stars, format_star_table
    from .words.templates import load_words

    epoch = args.epoch if args.epoch is not None else current_year()
    if not EPOCH_MIN <= epoch <= EPOCH_MAX:
        raise UserError("errors.epoch_option", low=EPOCH_MIN, high=EPOCH_MAX, value=epoch)
    stars = filter_stars(args.name, args.max_mag)
    if not stars:
        raise UserError("errors.no_star_matches")
    _emit(format_star_table(stars, epoch + 0.5, load_words("en")))
    return EXIT_OK


def _cmd_calibrate(args) -> int:
    from .layout.calibration import calibration_page
    from .paper import MAX_MARGIN_MM, MIN_MARGIN_MM, SheetError, make_sheet, parse_sheet_option
    from .outfile import check_target, write_atomic
    from .render.calibration_pdf import render_calibration_pdf
    from .words.templates import load_words

    try:
        value = parse_sheet_option(args.sheet)
    except SheetError as exc:
        raise UserError("errors.sheet_option", problem=exc) from None
    if not MIN_MARGIN_MM <= args.margin <= MAX_MARGIN_MM:
        raise UserError("errors.margin_option", value=typed(args.margin), low=f"{MIN_MARGIN_MM:g}",
                        high=f"{MAX_MARGIN_MM:g}")
    try:
        sheet = make_sheet(value, args.margin)
    except SheetError as exc:
        raise UserError.of(exc, key="--margin") from None
    words = load_words(args.language)
    name = value if isinstance(value, str) else f"{value[0]:g}x{value[1]:g}mm"
    out = _output_path(args.output) if args.output else Path(f"calibration-{name}.pdf")
    check_target(out, args.force)
    write_atomic(out, render_calibration_pdf(calibration_page(sheet), words), args.force)
    _emit(f"{out}\n")
    return EXIT_OK


def _cmd_preview(args) -> int:
    import re

    from .kit import build_kit
    from .outfile import safe_file_name
    from .recipe.load import load_recipe
    from .render.pdf import build_pdf
    from .render.preview import MAX_DPI, MIN_DPI, render_previews

    if not MIN_DPI <= args.dpi <= MAX_DPI:
        raise UserError("errors.dpi_option", value=typed(args.dpi), low=f"{MIN_DPI:g}", high=f"{MAX_DPI:g}")
    path = _recipe_path(args.recipe)
    folder = _output_path(args.output)
    if folder.exists() and not folder.is_dir():
        raise UserError("errors.preview_folder_is_file", path=folder)
    _check_stdout_not_input(path)
    recipe = load_recipe(path)
    with speaking(recipe.language, recipe.language_file or None), _at_recipe_line(path):
        _check_stdout_not_input(*_inputs(args, recipe))
        kit = build_kit(recipe)
        pictures = render_previews(build_pdf(kit)[1], args.dpi)
        digits = max(2, len(str(len(pictures))))
        stem = safe_file_name(path.stem)
        names = [f"{stem}-page-{k:0{digits}d}.png" for k in range(1, len(pictures) + 1)]
        series = re.compile(re.escape(stem) + r"-page-[0-9]+\.png")
        _write_folder(folder, dict(zip(names, pictures)), args, recipe, series.fullmatch)
        _print_notes(kit)
    return EXIT_OK


def _cmd_batch(args) -> int:
    """A class set (#12): every kit into one fresh folder, in parallel; a
    failed kit is said on stderr and in the manifest, the others are
    built, and the exit status is then 2 (1 for a fault of kitgen's)."""
    from .batch import run_set, summary_lines
    from .batch.run import MAX_JOBS
    from .words.templates import available_languages, load_words

    if args.jobs is not None and not 1 <= args.jobs <= MAX_JOBS:
        raise UserError("errors.jobs_option", high=MAX_JOBS, value=args.jobs)
    _check_stdout_not_input(args.set)   # the progress lines and the summary go to stderr
    summary = run_set(args.set, args.output, args.jobs, args.quiet, debug=args.debug)
    if summary.failures or not args.quiet:   # a quiet run that built every kit says only its folder
        words = load_words(summary.language) if summary.language in available_languages() else None
        for line in summary_lines(summary, words):
            _tell(line)
    for number, trace in summary.traces:   # --debug: each of kitgen's own faults, whole
        _tell(f"kit {number}:\n{trace.rstrip()}")
    if summary.written:
        _emit(f"{summary.folder}\n")
    return summary.exit_status



def _cmd_serve(args) -> int:
    from .web.server import serve

    serve(args.host, args.port, host_given=args.host is not None, open_browser=args.open,
          workers=max(1, args.workers), queue=max(0, args.queue))
    return EXIT_OK


def _place_limit(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        value = 0
    if not 1 <= value <= 100:
        raise argparse.ArgumentTypeError(f"--limit must be a whole number from 1 to 100, got {text!r}")
    return value


def _check_target(text):
    """``--target`` of ``kitgen check``: minutes, 0.5 to 60, or None."""
    if text is None:
        return None
    try:
        value = float(text)
    except ValueError:
        value = float("nan")
    if not 0.5 <= value <= 60.0:
        raise UserError("errors.check_target", value=repr(text[:40]))
    return value


def _cmd_check(args) -> int:
    """The accuracy report (kitgen.check) on stdout, in the kit's language."""
    from .check.accuracy import check_kit, diameter_for_target
    import dataclasses

    from .check.report import report_lines
    from .kit import build_from_plan, build_kit
    from .recipe.load import load_recipe
    from .recipe.schema import PARTS

    target = _check_target(args.target)
    path = _recipe_path(args.recipe)
    # The check is of the whole instrument, whatever parts the recipe prints.
    recipe = dataclasses.replace(load_recipe(path), parts=PARTS, accuracy_page=False)
    with speaking(recipe.language, recipe.language_file or None), _at_recipe_line(path):
        kit = build_kit(recipe)
        accuracy = check_kit(kit)
        diameter = diameter_for_target(kit, accuracy, target, build_from_plan) if target is not None else None
        lines = report_lines(kit, accuracy, target, diameter)
    _emit("".join(line + "\n" for line in lines))
    return EXIT_OK


def _cmd_places(args) -> int:
    """The places matching the query, best first, one a line: ``Name,
    REGION, CC``, latitude, longitude, time zone and population, separated
    by tabs.  No match: the one-line message that a recipe's ``place``
    would give, with close spellings."""
    from .places import PlaceError, query_for, resolve, search

    found = search(args.query, limit=args.limit)
    if not found:
        try:
            found = [resolve(args.query)]
        except PlaceError as exc:
            raise UserError.of(exc) from None
    _emit("".join(f"{query_for(p)}\t{p.latitude_deg:.5f}\t{p.longitude_deg:.5f}\t{p.timezone}\t{p.population}\n"
                  for p in found))
    return EXIT_OK


#: The commands that build kits, which run with the garbage collector's
#: passes rare (kitgen.collect), their own imports included.
BUILDING = frozenset({"build", "geometry", "preview", "check", "batch"})

COMMANDS = {"build": _cmd_build, "geometry": _cmd_geometry, "new": _cmd_new, "stars": _cmd_stars,
            "calibrate": _cmd_calibrate, "preview": _cmd_preview,
            "batch": _cmd_batch, "serve": _cmd_serve, "places": _cmd_places, "check": _cmd_check}


def main(argv=None, handlers_installed: bool = False) -> int:
    """Run one command; returns the exit status.  ``--debug`` may stand
    anywhere on the line and lets failures raise with their traceback.
    The handlers of the terminating signals (:mod:`kitgen.interrupt`) go
    in first, unless the entry point (:mod:`kitgen.start`) put them in
    already, and come out again at the end."""
    previous = None if handlers_installed else interrupt.install()
    try:
        return _main(argv)
    finally:
        interrupt.restore(previous)


def _main(argv) -> int:
    argv = list(sys.argv[1:] if argv is None else argv)
    debug = "--debug" in argv
    argv = [a for a in argv if a != "--debug"]
    args = None
    try:
        parser = _parser()
        try:
            args = parser.parse_args(argv)
        except SystemExit as exc:  # --help, --version, or a usage mistake already said on stderr
            code = exc.code if isinstance(exc.code, int) else EXIT_USER
            if code == EXIT_OK:
                _flush_stdout(wrote=True)
            return code
        if not args.command:
            parser.print_help(sys.stderr)
            return EXIT_USER
        args.debug = debug
        output = getattr(args, "output", None)
        blank = output is not None and not output.strip()   # "" or spaces: an unset variable, a slip
        if blank and args.command == "batch":
            raise UserError("errors.output_empty_folder")
        if blank:
            raise UserError("errors.output_empty")
        with rare_collections() if args.command in BUILDING else contextlib.nullcontext():
            status = COMMANDS[args.command](args)
        _flush_stdout()
        return status
    except UserError as exc:
        if debug:
            raise
        words = _words_of(exc, args)
        # (stderr pointed at an input is refused on stdout, so that not even the refusal is written into it)
        _tell(one_line(Message("errors.report", message=exc).text(words)), exc.key == "errors.stderr_is_input")
        return EXIT_USER
    except KeyboardInterrupt:
        _tell(Message("errors.interrupted").text())
        return EXIT_INTERRUPTED
    except interrupt.Stopped as exc:
        _tell(Message("errors.terminated").text())
        return exc.exit_status
    except Exception as exc:  # an internal fault: one line unless --debug
        if debug:
            raise
        _tell(one_line(Message("errors.internal", kind=type(exc).__name__, detail=exc).text()))
        return EXIT_INTERNAL


def _tell(line: str, on_stdout: bool = False) -> None:
    """Say one line on stderr (``on_stdout``: on stdout, where stderr is an
    input file, :func:`_check_stdout_not_input`); if the stream cannot
    take it (closed, a full disk), nothing more can be said, and the exit
    status speaks."""
    stream = sys.stdout if on_stdout else sys.stderr
    try:
        print(line, file=stream, flush=True)
    except (OSError, ValueError, AttributeError):
        _quiet(stream)


def _emit(data) -> None:
    """Write ``data`` (text or bytes) to stdout and flush it, so that a
    failure (a full disk, a closed descriptor, a closed pipe) is met here
    and said in one line (:func:`_stdout_error`), never by Python at exit."""
    from .outfile import write_all

    try:
        if sys.stdout is None:  # started with stdout closed (``>&-``)
            raise OSError(errno.EBADF, "closed")
        buffer = getattr(sys.stdout, "buffer", None)
        if buffer is None:  # a text-only stream put in place of stdout
            sys.stdout.write(data if isinstance(data, str) else data.decode("utf-8", "replace"))
        else:
            if isinstance(data, str):
                data = data.encode(getattr(sys.stdout, "encoding", None) or "utf-8", "replace")
            sys.stdout.flush()
            write_all(buffer, data)
        sys.stdout.flush()
    except (OSError, ValueError) as exc:
        _quiet(sys.stdout)
        raise _stdout_error(exc) from None


def _flush_stdout(wrote: bool = False) -> None:
    """Flush stdout inside the command, so a failure is reported in one
    line; ``wrote``: something was meant to be on it (``--help``), so a
    closed stdout is a failure too."""
    if sys.stdout is None:
        if wrote:
            raise _stdout_error(OSError(errno.EBADF, "closed"))
        return
    try:
        sys.stdout.flush()
    except (OSError, ValueError) as exc:
        _quiet(sys.stdout)
        raise _stdout_error(exc) from None


def _stdout_error(exc: BaseException) -> UserError:
    """The one line for a write to stdout that failed."""
    from .outfile import write_advice

    code = getattr(exc, "errno", None)
    if code == errno.EPIPE:
        advice = Message("errors.stdout_pipe")
    elif code == errno.EBADF or isinstance(exc, ValueError):
        advice = Message("errors.stdout_closed")
    else:
        advice = write_advice(exc)
    return UserError("errors.stdout_failed", advice=advice)


def _check_stdout_not_input(*inputs) -> None:
    """Refuse a stdout or stderr that the shell pointed at one of the
    build's inputs (``kitgen geometry r.yaml > r.yaml``, ``kitgen build
    r.yaml 2>> r.yaml``): the same file system and inode as fd 1 or 2.
    When it is stderr, the refusal itself goes to stdout (:func:`_main`),
    so that not even it is written into the input."""
    path = _input_at(sys.stdout, inputs)
    if path is not None:
        raise UserError("errors.stdout_is_input", path=path)
    path = _input_at(sys.stderr, inputs)
    if path is not None:
        raise UserError("errors.stderr_is_input", path=path)


def _input_at(stream, inputs):
    """The one of ``inputs`` that ``stream`` (an open file) writes into, or
    None."""
    if stream is None:
        return None
    try:
        out = os.fstat(stream.fileno())
    except (OSError, ValueError, AttributeError):
        return None
    for path in inputs:
        try:
            st = os.stat(path)
        except (OSError, ValueError):
            continue
        if (st.st_dev, st.st_ino) == (out.st_dev, out.st_ino):
            return path
    return None


def _words_of(exc: UserError, args):
    """The words to say ``exc`` in: the language file or the language the
    recipe asked for (:func:`kitgen.errors.speaking`), else a command's own
    ``--language``, else ``None`` (English)."""
    from .recipe.load import load_language_file
    from .template_files import available_languages
    from .words.templates import load_words, words_from_tree

    try:
        if exc.language_file:
            return words_from_tree(load_language_file(exc.language_file))
        language = exc.language or getattr(args, "language", None)
        if isinstance(language, str) and language in available_languages():
            return load_words(language)
    except Exception:  # the words of the message never hide the message
        pass
    return None


def _quiet(stream) -> None:
    """After a failed write, point ``stream``'s descriptor at the null
    device and drop what is buffered, so that Python's final flush at exit
    adds no second message."""
    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, stream.fileno())
        os.close(devnull)
    except (OSError, ValueError, AttributeError):
        pass


if __name__ == "__main__":
    sys.exit(main())
