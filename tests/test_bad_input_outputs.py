"""Outputs that fail or end early keep the README's promises (#11): one
line on stderr, the right exit status, nothing half-written, nothing of
the user's changed.

* Standard output: the kernel's own ENOSPC from ``/dev/full`` (Linux
  null(4)), a descriptor closed before the start, and a pipe whose reader
  stops at once (EPIPE, POSIX write(2)); a stdout the shell pointed at the
  recipe.
* A set of files (``preview``, ``geometry --format svg``) is swapped in as
  a whole folder: checked by inode, by the names left, and with a real
  process stopped by a real signal half way through.
* Signals: hang-up, quit and the others end a run as SIGINT and SIGTERM
  do, from the very first import; what a killed run left is cleaned up by
  the next one.
"""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import pytest

from kitgen import outfile
from kitgen.cli import main
from kitgen.errors import EXIT_USER, UserError

RECIPE = "latitude: 52.2\nepoch: 2027\ntitle: Larkspur Valley School\nparts: [rule, alidade]\n"
PDF = b"%PDF-1.4\n/Creator (kitgen)\n%%EOF\n"
SVG = b'<?xml version="1.0"?>\n<!-- made by kitgen -->\n'
PNG = b"\x89PNG\r\n\x1a\n....Software\x00kitgen...."


def kitgen(*args, cwd, **kw) -> subprocess.CompletedProcess:
    kw.setdefault("stdout", subprocess.PIPE)
    kw.setdefault("stderr", subprocess.PIPE)
    return subprocess.run([sys.executable, "-m", "kitgen", *map(str, args)], cwd=cwd, timeout=300, **kw)


def one_line(err: bytes) -> str:
    text = err.decode("utf-8")
    lines = [line for line in text.splitlines() if not line.startswith("kitgen: note:")]
    assert len(lines) == 1 and "Traceback" not in text, text
    return lines[0]


@pytest.fixture
def kit_dir(tmp_path):
    (tmp_path / "r.yaml").write_text(RECIPE, encoding="utf-8")
    return tmp_path


# -- standard output -----------------------------------------------------------------------------

@pytest.mark.parametrize("args", [["build", "r.yaml"], ["geometry", "r.yaml"], ["preview", "r.yaml"],
                                  ["geometry", "r.yaml", "--format", "svg"], ["new"], ["calibrate", "--sheet", "a5"],
                                  ["batch", "set.yaml"]])
def test_an_empty_output_name_is_refused(kit_dir, args):
    """``-o ""`` (an unset shell variable, say) names no file: refused in
    one line, and nothing written in its stead (such as r.pdf)."""
    (kit_dir / "set.yaml").write_text("kits:\n  - latitude: 40\n", encoding="utf-8")
    before = sorted(p.name for p in kit_dir.iterdir())
    run = kitgen(*args, "-o", "", cwd=kit_dir)
    assert run.returncode == EXIT_USER
    said = "-o names no folder (it is empty)" if args[0] == "batch" else "-o names no file (it is empty)"
    assert said in one_line(run.stderr)
    assert sorted(p.name for p in kit_dir.iterdir()) == before



@pytest.mark.skipif(not os.path.exists("/dev/full"), reason="no /dev/full on this system")
@pytest.mark.parametrize("args", [["new"], ["stars"], ["geometry", "r.yaml"], ["--help"],
                                  ["build", "r.yaml", "-o", "kit.pdf"], ["places", "Lisbon"]])
def test_stdout_on_a_full_disk(kit_dir, args):
    with open("/dev/full", "wb") as full:
        run = kitgen(*args, cwd=kit_dir, stdout=full, stderr=subprocess.PIPE)
    assert run.returncode == EXIT_USER
    assert "standard output" in one_line(run.stderr) and "disk is full" in one_line(run.stderr)


@pytest.mark.parametrize("args", [["new"], ["stars"], ["geometry", "r.yaml"], ["--version"]])
def test_stdout_closed_from_the_start(kit_dir, args):
    run = subprocess.run([sys.executable, "-m", "kitgen", *args], cwd=kit_dir, stderr=subprocess.PIPE,
                         preexec_fn=lambda: os.close(1), timeout=300)
    assert run.returncode == EXIT_USER
    assert "standard output" in one_line(run.stderr) and "closed" in one_line(run.stderr)


def test_a_pipe_closed_by_its_reader_is_not_success(kit_dir):
    """The reader takes one byte and goes: the whole kit's JSON (several
    pipe buffers, 64 KiB on Linux, pipe(7)) cannot all pass, and the exit
    status must not say it did."""
    (kit_dir / "r.yaml").write_text("latitude: 52.2\nepoch: 2027\n", encoding="utf-8")
    p = subprocess.Popen([sys.executable, "-m", "kitgen", "geometry", "r.yaml"], cwd=kit_dir,
                         stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    p.stdout.read(1)
    p.stdout.close()
    err = p.stderr.read()
    assert p.wait(timeout=300) == EXIT_USER
    assert "closed the pipe" in one_line(err)


@pytest.mark.parametrize("args", [["build", "r.yaml", "-o", "kit.pdf"], ["geometry", "r.yaml"],
                                  ["preview", "r.yaml", "-o", "look"], ["batch", "set.yaml", "-o", "out"]])
def test_stderr_onto_the_recipe_is_refused(kit_dir, args):
    """``kitgen build r.yaml 2>> r.yaml``: fd 2 is the recipe (or the set),
    so its notes, progress or refusal would be appended to it; refused
    before anything is built, said on stdout, the file unchanged."""
    (kit_dir / "set.yaml").write_text("kits:\n  - latitude: 40\n", encoding="utf-8")
    target = kit_dir / args[1]
    before = target.read_bytes()
    with open(target, "ab") as err:
        run = kitgen(*args, cwd=kit_dir, stderr=err)
    assert run.returncode == EXIT_USER
    assert target.read_bytes() == before
    assert run.stdout.decode("utf-8").strip() == (f"kitgen: error: standard error is the input file {args[1]}; "
                                                  "the messages would be written into it, so send them elsewhere")
    assert not {"kit.pdf", "look", "out"} & {p.name for p in kit_dir.iterdir()}


@pytest.mark.parametrize("mode, args", [("ab", ["geometry"]), ("r+b", ["geometry"]), ("ab", ["build"]),
                                        ("ab", ["geometry", "-o", "g.json"]), ("ab", ["preview", "-o", "look"])])
def test_stdout_onto_the_recipe_is_refused(kit_dir, mode, args):
    """``kitgen geometry r.yaml >> r.yaml``: fd 1 is the recipe (same
    st_dev and st_ino), refused before anything is written; so is a
    command that would only list what it wrote there."""
    recipe = kit_dir / "r.yaml"
    with open(recipe, mode) as out:
        run = kitgen(args[0], "r.yaml", *args[1:], cwd=kit_dir, stdout=out, stderr=subprocess.PIPE)
    assert run.returncode == EXIT_USER
    assert "standard output is the input file" in one_line(run.stderr)
    assert recipe.read_text(encoding="utf-8") == RECIPE
    assert sorted(p.name for p in kit_dir.iterdir()) == ["r.yaml"]


def test_stdout_onto_the_language_file_is_refused(kit_dir):
    from importlib import resources

    lang = kit_dir / "mine.yaml"
    lang.write_bytes(resources.files("kitgen.templates").joinpath("fr.yaml").read_bytes())
    before = lang.read_bytes()
    (kit_dir / "r.yaml").write_text(RECIPE + "language_file: mine.yaml\n", encoding="utf-8")
    with open(lang, "ab") as out:
        run = kitgen("geometry", "r.yaml", cwd=kit_dir, stdout=out, stderr=subprocess.PIPE)
    assert run.returncode == EXIT_USER and "mine.yaml" in one_line(run.stderr)
    assert lang.read_bytes() == before


# -- files the build reads are never written over -------------------------------------------------

@pytest.mark.parametrize("command", [["build"], ["geometry"]])
def test_never_over_the_language_file_even_with_force(kit_dir, capsys, command):
    from importlib import resources

    lang = kit_dir / "mine.yaml"
    lang.write_bytes(resources.files("kitgen.templates").joinpath("de.yaml").read_bytes())
    before = lang.read_bytes()
    (kit_dir / "r.yaml").write_text(RECIPE + "language_file: mine.yaml\n", encoding="utf-8")
    code = main([*command, str(kit_dir / "r.yaml"), "-o", str(lang), "--force"])
    assert code == EXIT_USER
    assert lang.read_bytes() == before


# -- names ---------------------------------------------------------------------------------------

@pytest.mark.parametrize("recipe", [".", "/", "..", "./"])
@pytest.mark.parametrize("command", ["build", "geometry", "preview"])
def test_a_recipe_path_naming_a_folder(kit_dir, capsys, recipe, command):
    extra = ["-o", str(kit_dir / "look")] if command == "preview" else []
    assert main([command, recipe, *extra]) == EXIT_USER
    err = capsys.readouterr().err
    assert "is a folder, not a file (recipe)" in err and len(err.splitlines()) == 1


@pytest.mark.parametrize("name", ["x" * 256 + ".pdf", "é" * 128 + ".pdf", "ok/" + "y" * 300 + "/kit.pdf"])
def test_an_over_long_output_name_is_refused_before_any_work(kit_dir, capsys, monkeypatch, name):
    from kitgen import kit

    monkeypatch.setattr(kit, "build_kit", lambda *a, **k: pytest.fail("built before refusing"))
    assert main(["build", str(kit_dir / "r.yaml"), "-o", str(kit_dir / name)]) == EXIT_USER
    assert "longer than 255 bytes" in capsys.readouterr().err


def test_preview_names_of_two_recipes_never_meet(kit_dir):
    """Recipes whose names differ only in characters a file name cannot
    keep as they are write different pages (#11)."""
    stems = ["école", "ecole", "my school", "my-school", "my_school", "学校"]
    names = {outfile.safe_file_name(s) for s in stems}
    assert len(names) == len(stems)
    assert "école" in names and "学校" in names


# -- a set of files swapped in whole -------------------------------------------------------------

def test_folder_written_whole_and_an_earlier_larger_set_replaced(tmp_path):
    folder = tmp_path / "look"
    first = {f"r-page-{k:02d}.png": PNG + bytes([k]) for k in range(1, 6)}
    outfile.write_folder_atomic(folder, first)
    assert sorted(p.name for p in folder.iterdir()) == sorted(first)
    (folder / "other-page-01.png").write_bytes(PNG)   # another recipe's page, kitgen's own
    kept_inode = (folder / "other-page-01.png").stat().st_ino
    second = {f"r-page-{k:02d}.png": PNG + bytes([10 + k]) for k in range(1, 3)}
    own = lambda n: n.startswith("r-page-")  # noqa: E731
    written = outfile.write_folder_atomic(folder, second, own=own)
    assert [p.name for p in written] == list(second)
    assert sorted(p.name for p in folder.iterdir()) == sorted([*second, "other-page-01.png"])
    assert (folder / "other-page-01.png").stat().st_ino == kept_inode
    assert all((folder / n).read_bytes() == d for n, d in second.items())
    assert [p.name for p in tmp_path.iterdir()] == ["look"]   # no temporary folder left


def test_a_folder_with_the_user_s_files(tmp_path):
    folder = tmp_path / "look"
    folder.mkdir()
    (folder / "notes.txt").write_text("mine")
    with pytest.raises(UserError) as exc:
        outfile.write_folder_atomic(folder, {"r-page-01.png": PNG})
    assert "notes.txt" in str(exc.value) and "--force" in str(exc.value)
    assert sorted(p.name for p in folder.iterdir()) == ["notes.txt"]
    inode = (folder / "notes.txt").stat().st_ino
    outfile.write_folder_atomic(folder, {"r-page-01.png": PNG}, force=True)
    assert sorted(p.name for p in folder.iterdir()) == ["notes.txt", "r-page-01.png"]
    assert (folder / "notes.txt").stat().st_ino == inode and (folder / "notes.txt").read_text() == "mine"
    (folder / "sub").mkdir()
    with pytest.raises(UserError, match="other than files"):
        outfile.write_folder_atomic(folder, {"r-page-01.png": PNG}, force=True)


def test_a_foreign_file_of_the_same_name_needs_force_and_an_input_never(tmp_path):
    folder = tmp_path / "look"
    folder.mkdir()
    (folder / "plate.svg").write_text("my drawing")
    with pytest.raises(UserError, match="not made by kitgen"):
        outfile.write_folder_atomic(folder, {"plate.svg": b"<?xml?><!-- made by kitgen -->"})
    with pytest.raises(UserError, match="input file"):
        outfile.write_folder_atomic(folder, {"plate.svg": b"<?xml"}, force=True, protect=(folder / "plate.svg",))
    assert (folder / "plate.svg").read_text() == "my drawing"


def test_the_current_folder_is_refused(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    for target in (".", str(tmp_path), str(tmp_path.parent)):
        with pytest.raises(UserError, match="current folder"):
            outfile.write_folder_atomic(Path(target), {"r-page-01.png": PNG})


@pytest.mark.parametrize("fault", [KeyboardInterrupt, OSError(28, "No space left on device")])
def test_a_fault_half_way_leaves_the_earlier_set(tmp_path, monkeypatch, fault):
    folder = tmp_path / "look"
    first = {f"r-page-{k:02d}.png": PNG + bytes([k]) for k in range(1, 4)}
    outfile.write_folder_atomic(folder, first)
    real = outfile._write_synced
    count = []

    def failing(path, data):
        count.append(path)
        if len(count) == 2:
            raise fault
        real(path, data)

    monkeypatch.setattr(outfile, "_write_synced", failing)
    with pytest.raises((KeyboardInterrupt, UserError)):
        outfile.write_folder_atomic(folder, {n: b"new" + d for n, d in first.items()})
    assert {p.name: p.read_bytes() for p in folder.iterdir()} == first
    assert [p.name for p in tmp_path.iterdir()] == ["look"]


def test_swapped_without_renameat2_too(tmp_path, monkeypatch):
    """Where the system has no RENAME_EXCHANGE, two renames with the
    terminating signals held."""
    monkeypatch.setattr(outfile, "_exchange", lambda a, b: False)
    folder = tmp_path / "look"
    outfile.write_folder_atomic(folder, {"a.svg": SVG + b"1"})
    outfile.write_folder_atomic(folder, {"a.svg": SVG + b"2"})
    assert (folder / "a.svg").read_bytes() == SVG + b"2"
    assert [p.name for p in tmp_path.iterdir()] == ["look"]


_SLOW_FOLDER = textwrap.dedent("""
    import os, sys, time
    from kitgen import outfile
    READY = sys.argv[1]
    real = outfile._write_synced
    def slow(path, data):
        real(path, data)
        if path.name.endswith("-01.png"):
            open(READY, "w").close()   # a page is written, not all: tell the test
            time.sleep(60)
    outfile._write_synced = slow
    from kitgen.start import run
    sys.argv = ["kitgen"] + sys.argv[2:]
    sys.exit(run())
""")


@pytest.mark.parametrize("sig", [signal.SIGHUP, signal.SIGQUIT, signal.SIGTERM, signal.SIGINT])
def test_real_signal_half_way_through_a_preview(kit_dir, sig):
    """A real process, stopped by a real signal with half of its pages
    written: the folder keeps the earlier pages, nothing else is left."""
    look = kit_dir / "look"
    look.mkdir()
    earlier = {f"r-page-0{k}.png": PNG + b"earlier" for k in (1, 2, 3)}
    for name, data in earlier.items():
        (look / name).write_bytes(data)
    ready = kit_dir.parent / f"ready-{kit_dir.name}-{int(sig)}"
    p = subprocess.Popen([sys.executable, "-c", _SLOW_FOLDER, str(ready), "preview", "r.yaml", "-o", "look",
                          "--dpi", "30"], cwd=kit_dir, stderr=subprocess.PIPE)
    try:
        deadline = time.monotonic() + 240
        while not ready.exists():
            assert p.poll() is None, p.stderr.read()
            assert time.monotonic() < deadline
            time.sleep(0.05)
        p.send_signal(sig)
        err = p.communicate(timeout=60)[1]
    finally:
        if p.poll() is None:
            p.kill()
            p.wait()
    assert p.returncode == (130 if sig == signal.SIGINT else 128 + sig)
    assert "no file was left half-written" in one_line(err)
    assert {p.name: p.read_bytes() for p in look.iterdir()} == earlier
    assert sorted(p.name for p in kit_dir.iterdir()) == ["look", "r.yaml"]


# -- signals from the very start ------------------------------------------------------------------

_SIGNAL_IN_IMPORT = textwrap.dedent("""
    import importlib.abc, os, signal, sys
    SIG = int(sys.argv[1])
    class Finder(importlib.abc.MetaPathFinder):
        def find_spec(self, name, path, target=None):
            if name == "kitgen.cli":
                os.kill(os.getpid(), SIG)
            return None
    sys.meta_path.insert(0, Finder())
    from kitgen.start import run
    sys.argv = ["kitgen", "stars"]
    sys.exit(run())
""")


@pytest.mark.parametrize("sig", [signal.SIGINT, signal.SIGHUP, signal.SIGQUIT, signal.SIGTERM, signal.SIGUSR1])
def test_a_signal_while_kitgen_is_still_importing(tmp_path, sig):
    run = subprocess.run([sys.executable, "-c", _SIGNAL_IN_IMPORT, str(int(sig))], cwd=tmp_path,
                         capture_output=True, timeout=120)
    assert run.returncode == (130 if sig == signal.SIGINT else 128 + sig), run.stderr
    assert run.stdout == b""
    assert "kitgen: " in one_line(run.stderr)


# -- what a killed run left ----------------------------------------------------------------------

def test_stale_temporaries_are_removed_on_the_next_run(kit_dir, capsys):
    old = time.time() - outfile.STALE_SECONDS - 60
    stale_pdf = kit_dir / ".kit.pdf.abc123xy.kitgen.part"
    stale_pdf.write_bytes(PDF[:7])
    empty = kit_dir / ".kit.pdf.zz9zz9zz.kitgen.part"
    empty.write_bytes(b"")
    foreign = kit_dir / ".notes.txt.abcdefgh.kitgen.part"   # kitgen's name, not kitgen's content
    foreign.write_text("a user's words")
    fresh = kit_dir / ".kit.pdf.fresh123.kitgen.part"       # maybe another run's, still writing
    fresh.write_bytes(PDF[:7])
    folder = kit_dir / ".look.abcdef12.kitgen.dir"
    folder.mkdir()
    (folder / "r-page-01.png").write_bytes(PNG)
    for p in (stale_pdf, empty, foreign, folder / "r-page-01.png", folder):
        os.utime(p, (old, old))
    assert main(["build", str(kit_dir / "r.yaml"), "-o", str(kit_dir / "kit.pdf")]) == 0
    names = sorted(p.name for p in kit_dir.iterdir())
    assert names == sorted([foreign.name, fresh.name, "kit.pdf", "r.yaml"])


def test_svg_folder_of_a_smaller_kit_holds_only_its_files(kit_dir, capsys):
    """geometry --format svg for a full kit, then for a kit of one part
    into the same folder: the folder then holds that part's file alone
    (the earlier kit's were kitgen's own), and the user's note beside them
    stays, with --force, as the very same file."""
    full = kit_dir / "full.yaml"
    full.write_text("latitude: 52.2\nepoch: 2027\n", encoding="utf-8")
    svg = kit_dir / "svg"
    assert main(["geometry", str(full), "--format", "svg", "-o", str(svg)]) == 0
    assert len(list(svg.iterdir())) >= 6
    note = svg / "notes.txt"
    note.write_text("cut the rete first")
    inode = note.stat().st_ino
    one = kit_dir / "one.yaml"
    one.write_text("latitude: 52.2\nepoch: 2027\nparts: [rule]\n", encoding="utf-8")
    assert main(["geometry", str(one), "--format", "svg", "-o", str(svg)]) == EXIT_USER  # the note is not kitgen's
    assert main(["geometry", str(one), "--format", "svg", "-o", str(svg), "--force"]) == 0
    assert sorted(p.name for p in svg.iterdir()) == ["notes.txt", "rule.svg"]
    assert note.stat().st_ino == inode and note.read_text() == "cut the rete first"
    out = capsys.readouterr().out.splitlines()
    assert out[-1].endswith("rule.svg")
