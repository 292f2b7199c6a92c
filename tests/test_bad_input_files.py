"""Nothing lost: outputs are complete or absent, never half-written, and
never written over a file kitgen did not make.

Faults are met for real where the machine allows it, and simulated where
it does not (each test says which):

* an interrupt or an exception mid-render: ``render_pdf`` patched to fail,
  and a real SIGINT / SIGTERM sent to a real process caught in the middle
  of writing;
* a full disk: the kernel's own ENOSPC from ``/dev/full`` (Linux null(4)),
  and a real 200 KiB tmpfs in a private mount namespace where ``unshare``
  and ``mount`` are allowed;
* a read-only folder: a real read-only tmpfs the same way (``chmod`` does
  not stop root, who runs CI), and ``EROFS`` / ``EACCES`` simulated.
"""

from __future__ import annotations

import errno
import os
import shutil
import signal
import subprocess
import sys
import textwrap
import time
from importlib import resources
from pathlib import Path

import pytest
import yaml

from kitgen import outfile
from kitgen.cli import main
from kitgen.errors import EXIT_INTERNAL, EXIT_INTERRUPTED, EXIT_TERMINATED, EXIT_USER, UserError

RECIPE = "latitude: 52.2\nepoch: 2027\ntitle: Larkspur Valley School\n"


#: How a note of the build begins in English: templates/en.yaml's notes.report.
NOTE_PREFIX = yaml.safe_load(resources.files("kitgen.templates").joinpath("en.yaml").read_text(
    encoding="utf-8"))["notes"]["report"].format(message="")


def run(argv, capsys) -> tuple[int, str]:
    """The exit status and the one line of stderr besides the build's notes
    (none on success: the notes, what the build thinned to stay legible,
    are all a successful command says there)."""
    try:
        code = main([str(a) for a in argv])
    except SystemExit as exc:
        code = exc.code
    _, err = capsys.readouterr()
    assert "Traceback" not in err
    others = [line for line in err.splitlines() if not line.startswith(NOTE_PREFIX)]
    assert len(others) <= (0 if code == 0 else 1), err
    return code, "\n".join(others).strip()


@pytest.fixture
def kit_dir(tmp_path):
    (tmp_path / "r.yaml").write_text(RECIPE, encoding="utf-8")
    return tmp_path


@pytest.fixture(scope="module")
def built_pdf(tmp_path_factory) -> bytes:
    """A real kit PDF, built once by the command."""
    d = tmp_path_factory.mktemp("built")
    (d / "r.yaml").write_text(RECIPE, encoding="utf-8")
    assert main(["build", str(d / "r.yaml"), "-o", str(d / "kit.pdf")]) == 0
    return (d / "kit.pdf").read_bytes()


def leftovers(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir() if p.name.endswith(".part"))


# -- kitgen knows its own outputs, and only those --------------------------------------------

def test_every_output_kind_is_known_as_kitgen_s(kit_dir, capsys, built_pdf):
    (kit_dir / "kit.pdf").write_bytes(built_pdf)
    assert run(["geometry", kit_dir / "r.yaml", "-o", kit_dir / "g.json"], capsys)[0] == 0
    assert run(["geometry", kit_dir / "r.yaml", "--format", "svg", "-o", kit_dir / "svg"], capsys)[0] == 0
    svgs = sorted((kit_dir / "svg").glob("*.svg"))
    assert len(svgs) == 6
    for p in [kit_dir / "kit.pdf", kit_dir / "g.json", *svgs]:
        assert outfile.made_by_kitgen(p), p
    # ... so a second run writes over them without --force.
    assert run(["build", kit_dir / "r.yaml", "-o", kit_dir / "kit.pdf"], capsys)[0] == 0
    assert run(["geometry", kit_dir / "r.yaml", "-o", kit_dir / "g.json"], capsys)[0] == 0
    assert run(["geometry", kit_dir / "r.yaml", "--format", "svg", "-o", kit_dir / "svg"], capsys)[0] == 0


def test_files_that_only_mention_kitgen_are_not_kitgen_s(kit_dir, capsys):
    assert run(["new", "-o", kit_dir / "mine.yaml"], capsys)[0] == 0
    (kit_dir / "notes.txt").write_text("kitgen made my astrolabe; kitgen kitgen\n")
    (kit_dir / "other.pdf").write_bytes(b"%PDF-1.4\n% kitgen\n1 0 obj <</Creator (someone else)>> endobj\n%%EOF\n")
    (kit_dir / "other.json").write_text('{"format": "other", "note": "kitgen-geometry"}')
    (kit_dir / "other.svg").write_text('<?xml version="1.0"?><svg><desc>kitgen</desc></svg>')
    for name in ("mine.yaml", "notes.txt", "other.pdf", "other.json", "other.svg"):
        p = kit_dir / name
        assert not outfile.made_by_kitgen(p), name
        before = p.read_bytes()
        code, err = run(["build", kit_dir / "r.yaml", "-o", p], capsys)
        assert code == EXIT_USER
        assert err == f"kitgen: error: {p}: exists and was not made by kitgen; choose another name or use --force"
        assert p.read_bytes() == before
    assert leftovers(kit_dir) == []


def test_force_writes_over_a_foreign_file(kit_dir, capsys):
    p = kit_dir / "other.pdf"
    p.write_bytes(b"not mine")
    assert run(["build", kit_dir / "r.yaml", "-o", p, "--force"], capsys)[0] == 0
    assert p.read_bytes().startswith(b"%PDF-")


@pytest.mark.parametrize("command", [["build"], ["geometry"]])
def test_never_over_the_recipe_itself_even_with_force(kit_dir, capsys, command):
    r = kit_dir / "r.yaml"
    os.link(r, kit_dir / "hard.yaml")
    (kit_dir / "soft.yaml").symlink_to(r)
    for target in (r, kit_dir / "hard.yaml", kit_dir / "soft.yaml", kit_dir / "." / "r.yaml"):
        code, err = run([*command, r, "-o", target, "--force"], capsys)
        assert code == EXIT_USER
        assert "refusing to write over the input file; choose another output name" in err
        assert r.read_text() == RECIPE
    assert leftovers(kit_dir) == []


def test_new_never_writes_over_a_file(kit_dir, capsys):
    code, err = run(["new", "-o", kit_dir / "r.yaml"], capsys)
    assert code == EXIT_USER and "exists; choose another name" in err
    assert (kit_dir / "r.yaml").read_text() == RECIPE


def test_output_that_is_a_folder_or_in_no_folder(kit_dir, capsys):
    (kit_dir / "out").mkdir()
    code, err = run(["build", kit_dir / "r.yaml", "-o", kit_dir / "out"], capsys)
    assert code == EXIT_USER and "is a folder; give a file name" in err
    code, err = run(["build", kit_dir / "r.yaml", "-o", kit_dir / "missing" / "kit.pdf"], capsys)
    assert code == EXIT_USER and "does not exist; create it first" in err
    code, err = run(["build", kit_dir / "r.yaml", "-o", "/dev/null"], capsys)
    assert code == EXIT_USER and "is not a regular file" in err


def test_new_output_gets_the_usual_mode(kit_dir, capsys):
    old = os.umask(0o022)
    try:
        assert run(["build", kit_dir / "r.yaml", "-o", kit_dir / "kit.pdf"], capsys)[0] == 0
    finally:
        os.umask(old)
    assert (kit_dir / "kit.pdf").stat().st_mode & 0o777 == 0o644


# -- an interrupted or failed build leaves the earlier output --------------------------------

@pytest.mark.parametrize("fault, code", [(KeyboardInterrupt, EXIT_INTERRUPTED), (RuntimeError, EXIT_INTERNAL),
                                         (MemoryError, EXIT_INTERNAL)])
def test_fault_mid_render_keeps_the_earlier_pdf(kit_dir, capsys, monkeypatch, built_pdf, fault, code):
    out = kit_dir / "kit.pdf"
    out.write_bytes(built_pdf)
    import kitgen.render.pdf

    def failing(kit, pages):
        raise fault("half way through the rete")

    monkeypatch.setattr(kitgen.render.pdf, "render_pdf", failing)
    got, err = run(["build", kit_dir / "r.yaml", "-o", out], capsys)
    assert got == code, err
    assert out.read_bytes() == built_pdf
    assert sorted(p.name for p in kit_dir.iterdir()) == ["kit.pdf", "r.yaml"]


@pytest.mark.parametrize("fault", [KeyboardInterrupt, OSError(errno.EIO, "Input/output error")])
def test_fault_while_writing_keeps_the_earlier_pdf(kit_dir, capsys, monkeypatch, built_pdf, fault):
    """The temporary file is full of the new kit when the fault comes (in
    the fsync before the rename); it goes, and the old PDF stays."""
    out = kit_dir / "kit.pdf"
    out.write_bytes(built_pdf)
    seen = []

    def failing_fsync(fd):
        seen.append([p for p in kit_dir.iterdir() if p.name.endswith(".part") and p.stat().st_size > 1000])
        raise fault

    monkeypatch.setattr(outfile.os, "fsync", failing_fsync)
    got, err = run(["build", kit_dir / "r.yaml", "-o", out], capsys)
    assert seen and seen[0], "the fault came before the temporary file was written"
    assert got == (EXIT_INTERRUPTED if fault is KeyboardInterrupt else EXIT_USER), err
    if fault is not KeyboardInterrupt:
        assert "input/output error; write somewhere else with -o" in err
    assert out.read_bytes() == built_pdf
    assert leftovers(kit_dir) == []


# A shell starts background jobs (CI's among them) with SIGINT ignored, and
# Python then installs no handler of its own; a user's Ctrl-C reaches a
# foreground process, whose default handler the writer restores first.
_SLOW_WRITER = textwrap.dedent("""
    import os, signal, sys, time
    signal.signal(signal.SIGINT, signal.default_int_handler)
    from kitgen import outfile
    real_fsync = os.fsync
    def slow_fsync(fd):
        real_fsync(fd)
        open(sys.argv[1], "w").close()   # the temporary file is written: tell the test
        time.sleep(60)
    outfile.os.fsync = slow_fsync
    from kitgen.cli import main
    sys.exit(main(sys.argv[2:]))
""")


@pytest.mark.parametrize("sig, code", [(signal.SIGINT, EXIT_INTERRUPTED), (signal.SIGTERM, EXIT_TERMINATED),
                                       (signal.SIGHUP, 128 + signal.SIGHUP), (signal.SIGQUIT, 128 + signal.SIGQUIT)])
def test_real_signal_while_writing_keeps_the_earlier_pdf(kit_dir, built_pdf, sig, code):
    """A real process, stopped by a real signal while its temporary file
    is complete but not yet renamed; hang-up and quit as interrupt and
    SIGTERM (#11), exit 128 + the signal's number (the shells' convention)."""
    out = kit_dir / "kit.pdf"
    out.write_bytes(built_pdf)
    ready = kit_dir.parent / f"ready-{kit_dir.name}"
    p = subprocess.Popen([sys.executable, "-c", _SLOW_WRITER, str(ready), "build", "r.yaml", "-o", "kit.pdf"],
                         cwd=kit_dir, stderr=subprocess.PIPE, text=True)
    try:
        deadline = time.monotonic() + 120
        while not ready.exists():
            assert p.poll() is None, p.stderr.read()
            assert time.monotonic() < deadline
            time.sleep(0.05)
        assert len(leftovers(kit_dir)) == 1
        p.send_signal(sig)
        err = p.communicate(timeout=60)[1]
    finally:
        if p.poll() is None:
            p.kill()
            p.wait()
    assert p.returncode == code, err
    assert "no file was left half-written" in err and "Traceback" not in err
    assert out.read_bytes() == built_pdf
    assert sorted(x.name for x in kit_dir.iterdir()) == ["kit.pdf", "r.yaml"]


# -- a full disk and a read-only folder ---------------------------------------------------------

def test_full_disk_from_dev_full(kit_dir, capsys, monkeypatch, built_pdf):
    """The write goes to /dev/full, where the kernel answers ENOSPC."""
    if not os.path.exists("/dev/full"):
        pytest.skip("no /dev/full on this system")
    out = kit_dir / "kit.pdf"
    out.write_bytes(built_pdf)
    real_fdopen = os.fdopen

    def to_dev_full(fd, *a, **k):
        os.close(fd)
        return real_fdopen(os.open("/dev/full", os.O_WRONLY), *a, **k)

    monkeypatch.setattr(outfile.os, "fdopen", to_dev_full)
    got, err = run(["build", kit_dir / "r.yaml", "-o", out], capsys)
    assert got == EXIT_USER
    assert err == f"kitgen: error: {out}: cannot write: the disk is full; free some space or write somewhere else with -o"
    assert out.read_bytes() == built_pdf
    assert leftovers(kit_dir) == []


@pytest.mark.parametrize("err_no, needle", [
    (errno.EROFS, "cannot write in {folder}: the folder is on a read-only disk; write somewhere else with -o"),
    (errno.EACCES, "cannot write in {folder}: permission denied; write somewhere else with -o"),
    (errno.ENOSPC, "cannot write in {folder}: the disk is full"),
])
def test_folder_refusing_the_temporary_file_simulated(kit_dir, capsys, monkeypatch, err_no, needle):
    def refuse(*a, **k):
        raise OSError(err_no, os.strerror(err_no))

    monkeypatch.setattr(outfile.tempfile, "mkstemp", refuse)
    got, err = run(["build", kit_dir / "r.yaml", "-o", kit_dir / "kit.pdf"], capsys)
    assert got == EXIT_USER and needle.format(folder=kit_dir) in err
    assert not (kit_dir / "kit.pdf").exists()


@pytest.mark.skipif(os.geteuid() == 0, reason="root writes into a folder whatever its mode; "
                    "see the tmpfs and simulated tests")
def test_read_only_folder_by_mode(kit_dir, capsys):
    out_dir = kit_dir / "ro"
    out_dir.mkdir()
    out_dir.chmod(0o555)
    got, err = run(["build", kit_dir / "r.yaml", "-o", out_dir / "kit.pdf"], capsys)
    assert got == EXIT_USER and "permission denied" in err


def _private_tmpfs_script(body: str, size: str) -> str:
    return textwrap.dedent(f"""
        set -e
        mount -t tmpfs -o size={size} tmpfs "$MNT"
        {body}
    """)


def _in_private_mount(tmp_path, body: str, size: str = "200k"):
    """Run ``body`` (sh) with a fresh tmpfs at $MNT, in a private mount
    namespace that vanishes with the process; skip where not allowed."""
    if not shutil.which("unshare") or not shutil.which("mount"):
        pytest.skip("unshare or mount is not installed")
    mnt = tmp_path / "mnt"
    mnt.mkdir()
    probe = subprocess.run(["unshare", "--mount", "--propagation", "private", "sh", "-c",
                            f'mount -t tmpfs -o size=64k tmpfs "{mnt}"'], capture_output=True, text=True)
    if probe.returncode != 0:
        pytest.skip(f"no private tmpfs here (needs root and mount rights): {probe.stderr.strip()}")
    env = dict(os.environ, MNT=str(mnt), PY=sys.executable)
    return subprocess.run(["unshare", "--mount", "--propagation", "private", "sh", "-c",
                           _private_tmpfs_script(body, size)], capture_output=True, text=True, env=env,
                          cwd=tmp_path, timeout=300)


def test_real_full_disk_on_a_small_tmpfs(kit_dir, built_pdf):
    (kit_dir / "old.pdf").write_bytes(built_pdf)
    p = _in_private_mount(kit_dir, """
        cp old.pdf "$MNT/kit.pdf"
        set +e
        "$PY" -m kitgen build r.yaml -o "$MNT/kit.pdf" 2> err.txt
        echo "status $?"
        set -e
        cmp old.pdf "$MNT/kit.pdf" && echo "old kit intact"
        ls -a "$MNT"
    """, size="200k")
    assert p.returncode == 0, p.stderr
    err = (kit_dir / "err.txt").read_text()
    assert "status 2" in p.stdout, (p.stdout, err)
    assert err.count("\n") == 1 and "Traceback" not in err
    assert "cannot write: the disk is full; free some space or write somewhere else with -o" in err
    assert "old kit intact" in p.stdout
    assert ".part" not in p.stdout


def test_real_read_only_folder_on_a_tmpfs(kit_dir, built_pdf):
    (kit_dir / "old.pdf").write_bytes(built_pdf)
    p = _in_private_mount(kit_dir, """
        cp old.pdf "$MNT/kit.pdf"
        mount -o remount,ro "$MNT"
        set +e
        "$PY" -m kitgen build r.yaml -o "$MNT/kit.pdf" 2> err.txt
        echo "status $?"
        set -e
        cmp old.pdf "$MNT/kit.pdf" && echo "old kit intact"
    """, size="1m")
    assert p.returncode == 0, p.stderr
    err = (kit_dir / "err.txt").read_text()
    assert "status 2" in p.stdout, (p.stdout, err)
    assert err.count("\n") == 1 and "Traceback" not in err
    assert "the folder is on a read-only disk; write somewhere else with -o" in err
    assert "old kit intact" in p.stdout


# -- names that become file names ----------------------------------------------------------------

HOSTILE_NAMES = ["../../etc/passwd", "/etc/passwd", "..", ".", "", ".hidden", "a/b\\c", "plate\x00.svg",
                 "C:\\Windows\\x", "~root", "-rf", "name with spaces", "\u202eevil", "é" * 300, "x" * 300,
                 "con", "plate.svg/../..", "...."]


@pytest.mark.parametrize("name", HOSTILE_NAMES)
def test_sanitised_names_stay_in_the_folder(tmp_path, name):
    safe = outfile.safe_file_name(name, ".svg")
    stem = safe[: -len(".svg")]
    assert stem and not stem.startswith((".", "-"))
    assert "/" not in safe and "\\" not in safe and "\x00" not in safe
    assert len(stem.encode("utf-8")) <= outfile.MAX_STEM_BYTES + 9  # + "-" and 8 hex digits
    assert all(c.isalnum() or c in "._-" for c in safe)
    target = outfile.inside_folder(tmp_path, safe)
    assert target.resolve().parent == tmp_path.resolve()


def test_sanitised_names_never_collide_and_keep_unicode():
    """Two different names never give one file name (#11): a changed name
    carries a checksum of the original; letters of every script are kept."""
    names = HOSTILE_NAMES + ["école", "ecole", "École", "e\u0301cole", "学校", "مدرسة", "a b", "a-b", "a_b",
                             "a/b", "a\\b", "é" * 200, "é" * 201]
    safe = {}
    for name in names:
        safe.setdefault(outfile.safe_file_name(name, ".png"), set()).add(name)
    assert all(len(v) == 1 for v in safe.values()), {k: v for k, v in safe.items() if len(v) > 1}
    assert outfile.safe_file_name("学校") == "学校" and outfile.safe_file_name("école") == "école"


def test_ordinary_part_names_are_kept():
    for kind in ("plate", "rete", "mater_front", "mater_back", "rule", "alidade"):
        assert outfile.safe_file_name(f"{kind}.svg") == f"{kind}.svg"


@pytest.mark.parametrize("name", ["../x.svg", "/tmp/x.svg", "a/../../x.svg", ".."])
def test_inside_folder_refuses_an_escape(tmp_path, name):
    with pytest.raises(ValueError):
        outfile.inside_folder(tmp_path, name)


def test_write_atomic_directly_refuses_and_cleans(tmp_path):
    p = tmp_path / "user.txt"
    p.write_text("my own notes")
    with pytest.raises(UserError):
        outfile.write_atomic(p, b"{}")
    assert p.read_text() == "my own notes"
    outfile.write_atomic(tmp_path / "g.json", b'{"format":"kitgen-geometry"}\n')
    outfile.write_atomic(tmp_path / "g.json", b'{"format":"kitgen-geometry","v":2}\n')
    assert (tmp_path / "g.json").read_bytes().endswith(b'"v":2}\n')
    assert leftovers(tmp_path) == []
