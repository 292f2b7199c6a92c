"""The ``kitgen`` command line.

Results on stdout, messages on stderr; exit 0 on success, 2 for a mistake
in the input, 1 for an internal fault, 130 when interrupted.  A failure is
one line, never a traceback, unless ``--debug`` asks for one.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from . import __version__
from .errors import (EXIT_INTERNAL, EXIT_INTERRUPTED, EXIT_OK, EXIT_TERMINATED, EXIT_USER, Message, UserError,
                     one_line, speaking)


class _Parser(argparse.ArgumentParser):
    """argparse, but a mistake on the command line is one line too."""

    def error(self, message):
        self.exit(EXIT_USER, f"kitgen: error: {one_line(message)} (see {self.prog} --help)\n")


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

    n = sub.add_parser("new", help="write a commented starter recipe")
    n.add_argument("-o", "--output", help="the recipe file to write (default: stdout)")

    s = sub.add_parser("stars", help="list the built-in star catalogue")
    s.add_argument("--name", help="only stars whose name contains this text")
    s.add_argument("--max-mag", type=float, help="only stars at least this bright (magnitude)")
    s.add_argument("--epoch", type=int, help="year of the listed places (default: this year)")

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
                   help="the folder to write: kits/, print-card.pdf, print-film.pdf, manifest.csv "
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


def _default_output(recipe: str, suffix: str) -> Path:
    return Path(recipe).with_suffix(suffix)


def _cmd_build(args) -> int:
    from .kit import build_kit
    from .outfile import check_target, write_atomic
    from .recipe.load import load_recipe
    from .render.pdf import build_pdf

    out = Path(args.output) if args.output else _default_output(args.recipe, ".pdf")
    check_target(out, args.force, (Path(args.recipe),))
    recipe = load_recipe(args.recipe)
    with speaking(recipe.language, recipe.language_file or None):
        kit = build_kit(recipe)
        write_atomic(out, build_pdf(kit)[1], args.force, (Path(args.recipe),))
    _print_notes(kit)
    print(out)
    return EXIT_OK


def _print_notes(kit) -> None:
    """Say on stderr what the build thinned or shortened to keep every
    scale legible, one line a note, in the kit's language (the ``notes``
    section of its template, prefix and all, as errors use ``errors.report``)."""
    for note in kit.notes:
        print(one_line(Message("notes.report", message=note).text(kit.words)), file=sys.stderr)


def _write_into_folder(folder: Path, files: dict, args) -> None:
    """Write ``{file name: bytes}`` into ``folder`` (made if need be): every
    target is checked before the first is written, names are sanitised so
    that none can leave the folder, and each file is written atomically."""
    from .outfile import check_target, inside_folder, safe_file_name, write_atomic, write_error

    files = {safe_file_name(name): data for name, data in files.items()}
    for name in files:
        check_target(folder / name, args.force, (Path(args.recipe),))
    try:
        folder.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise write_error(folder, exc, Message("errors.doing_make_folder")) from None
    for name, data in files.items():
        write_atomic(inside_folder(folder, name), data, args.force, (Path(args.recipe),))
        print(folder / name)


def _cmd_geometry(args) -> int:
    from .recipe.load import load_recipe

    kit_recipe = load_recipe(args.recipe)
    with speaking(kit_recipe.language, kit_recipe.language_file or None):
        return _write_geometry(args, kit_recipe)


def _write_geometry(args, kit_recipe) -> int:
    from .kit import build_kit
    from .outfile import check_target, write_atomic

    if args.format == "json":
        from .render.json_export import render_json

        if args.output:
            check_target(Path(args.output), args.force, (Path(args.recipe),))
        data = render_json(build_kit(kit_recipe))
        if args.output:
            write_atomic(Path(args.output), data, args.force, (Path(args.recipe),))
            print(args.output)
        else:
            sys.stdout.buffer.write(data)
        return EXIT_OK
    from .render.svg import render_svg_files

    if not args.output:
        raise UserError("errors.svg_needs_folder")
    folder = Path(args.output)
    if folder.exists() and not folder.is_dir():
        raise UserError("errors.svg_folder_is_file", path=folder)
    _write_into_folder(folder, render_svg_files(build_kit(kit_recipe)), args)
    return EXIT_OK


def _cmd_new(args) -> int:
    from .outfile import write_atomic
    from .recipe.starter import starter_recipe

    text = starter_recipe().encode("utf-8")
    if args.output:
        out = Path(args.output)
        if out.exists():
            raise UserError("errors.new_exists", path=out)
        write_atomic(out, text)
        print(out)
    else:
        sys.stdout.buffer.write(text)
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
    sys.stdout.write(format_star_table(stars, epoch + 0.5, load_words("en")))
    return EXIT_OK


def _cmd_calibrate(args) -> int:
    from .layout.calibration import calibration_page
    from .layout.sheets import MAX_MARGIN_MM, MIN_MARGIN_MM, SheetError, make_sheet, parse_sheet_option
    from .outfile import check_target, write_atomic
    from .render.calibration_pdf import render_calibration_pdf
    from .words.templates import load_words

    try:
        value = parse_sheet_option(args.sheet)
    except SheetError as exc:
        raise UserError("errors.sheet_option", problem=exc) from None
    if not MIN_MARGIN_MM <= args.margin <= MAX_MARGIN_MM:
        raise UserError("errors.margin_option", value=f"{args.margin:g}", low=f"{MIN_MARGIN_MM:g}",
                        high=f"{MAX_MARGIN_MM:g}")
    try:
        sheet = make_sheet(value, args.margin)
    except SheetError as exc:
        raise UserError.of(exc, key="--margin") from None
    words = load_words(args.language)
    name = value if isinstance(value, str) else f"{value[0]:g}x{value[1]:g}mm"
    out = Path(args.output) if args.output else Path(f"calibration-{name}.pdf")
    check_target(out, args.force)
    write_atomic(out, render_calibration_pdf(calibration_page(sheet), words), args.force)
    print(out)
    return EXIT_OK


def _cmd_preview(args) -> int:
    from .kit import build_kit
    from .recipe.load import load_recipe
    from .render.pdf import build_pdf
    from .render.preview import MAX_DPI, MIN_DPI, render_previews

    if not MIN_DPI <= args.dpi <= MAX_DPI:
        raise UserError("errors.dpi_option", value=f"{args.dpi:g}", low=f"{MIN_DPI:g}", high=f"{MAX_DPI:g}")
    folder = Path(args.output)
    if folder.exists() and not folder.is_dir():
        raise UserError("errors.preview_folder_is_file", path=folder)
    recipe = load_recipe(args.recipe)
    with speaking(recipe.language, recipe.language_file or None):
        kit = build_kit(recipe)
        pictures = render_previews(build_pdf(kit)[1], args.dpi)
        digits = max(2, len(str(len(pictures))))
        names = [f"{Path(args.recipe).stem}-page-{k:0{digits}d}.png" for k in range(1, len(pictures) + 1)]
        _write_into_folder(folder, dict(zip(names, pictures)), args)
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
    summary = run_set(args.set, args.output, args.jobs, args.quiet)
    words = load_words(summary.language) if summary.language in available_languages() else None
    lines = summary_lines(summary, words)
    for line in lines[:-1]:
        print(line, file=sys.stderr)
    if summary.failures or not args.quiet:
        print(lines[-1], file=sys.stderr)
    print(summary.folder)
    return summary.exit_status


def _cmd_serve(args) -> int:
    from .web.server import serve

    serve(args.host, args.port, host_given=args.host is not None, open_browser=args.open,
          workers=max(1, args.workers), queue=max(0, args.queue))
    return EXIT_OK


COMMANDS = {"build": _cmd_build, "geometry": _cmd_geometry, "new": _cmd_new, "stars": _cmd_stars,
            "calibrate": _cmd_calibrate, "preview": _cmd_preview,
            "batch": _cmd_batch, "serve": _cmd_serve}


class _Terminated(BaseException):
    """Raised by the SIGTERM handler so that a killed build cleans up as an
    interrupted one does (``write_atomic`` removes its temporary file)."""


def _on_sigterm(signum, frame):
    raise _Terminated()


def main(argv=None) -> int:
    """Run one command; returns the exit status.  ``--debug`` may stand
    anywhere on the line and lets failures raise with their traceback."""
    import signal

    argv = list(sys.argv[1:] if argv is None else argv)
    debug = "--debug" in argv
    argv = [a for a in argv if a != "--debug"]
    parser = _parser()
    args = parser.parse_args(argv)
    if not args.command:
        parser.print_help(sys.stderr)
        return EXIT_USER
    try:
        previous = signal.signal(signal.SIGTERM, _on_sigterm)
    except ValueError:  # not the main thread: leave signals alone
        previous = None
    try:
        return COMMANDS[args.command](args)
    except UserError as exc:
        if debug:
            raise
        words = _words_of(exc, args)
        print(one_line(Message("errors.report", message=exc).text(words)), file=sys.stderr)
        return EXIT_USER
    except KeyboardInterrupt:
        print(Message("errors.interrupted").text(), file=sys.stderr)
        return EXIT_INTERRUPTED
    except _Terminated:
        print(Message("errors.terminated").text(), file=sys.stderr)
        return EXIT_TERMINATED
    except BrokenPipeError:
        _quiet_stdout()
        return EXIT_OK
    except Exception as exc:  # an internal fault: one line unless --debug
        if debug:
            raise
        print(one_line(Message("errors.internal", kind=type(exc).__name__, detail=exc).text()), file=sys.stderr)
        return EXIT_INTERNAL
    finally:
        if previous is not None:
            signal.signal(signal.SIGTERM, previous)


def _words_of(exc: UserError, args):
    """The words to say ``exc`` in: the language file or the language the
    recipe asked for (:func:`kitgen.errors.speaking`), else a command's own
    ``--language``, else ``None`` (English)."""
    from .words.templates import available_languages, load_words, load_words_file

    try:
        if exc.language_file:
            return load_words_file(exc.language_file)
        language = exc.language or getattr(args, "language", None)
        if isinstance(language, str) and language in available_languages():
            return load_words(language)
    except Exception:  # the words of the message never hide the message
        pass
    return None


def _quiet_stdout() -> None:
    """After a closed pipe (``kitgen stars | head``), point stdout at the
    null device so that Python's final flush reports nothing."""
    import os

    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
    except (OSError, ValueError):
        pass


if __name__ == "__main__":
    sys.exit(main())
