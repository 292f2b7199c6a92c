"""Class sets from the page: a roster and shared options, built by
``kitgen batch`` (#12) in a folder of the server's private temporary
folder, then zipped for download.

A set's whole state is on disk, in ``sets/ID/``: ``state.json`` (running,
done or failed, and the message of a failure), the set file and roster it
was built from, the batch's output folder and, once done, ``set.zip``.
Any worker of a server that shares the folder can tell its progress and
serve it.  ``ID`` is a random token (128 bits), so one teacher cannot
guess another's set; finished sets are removed after :data:`KEEP_SECONDS`.
"""

from __future__ import annotations

import csv
import io
import json
import os
import re
import secrets
import shutil
import subprocess
import sys
import threading
import time
import zipfile
from pathlib import Path

import yaml

from ..errors import one_line
from ..words.templates import load_words

try:  # class sets (#12); the page says it has none without them
    from .. import batch
except ImportError:
    batch = None

#: How long a set stays for download.
KEEP_SECONDS = 3600
#: Longest time one set may build.
TIMEOUT_SECONDS = 600
#: Most pupils in one roster (a large school year).
MAX_ROSTER_ROWS = 400
ID_CHARS = frozenset("ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_")


def batch_available() -> bool:
    """Whether this kitgen has the ``batch`` command (#12)."""
    return batch is not None


def roster_rows(text: str) -> int:
    """Pupils in a roster: its non-empty lines after the header."""
    return max(0, sum(1 for line in text.splitlines() if line.strip()) - 1)


def roster_columns(text: str) -> set[str]:
    """The column names of a roster's header line."""
    try:
        header = next(csv.reader(io.StringIO(text)), [])
    except csv.Error:
        return set()
    return {name.strip() for name in header}


def set_folder(root: Path, set_id: str) -> Path | None:
    """The folder of set ``set_id``, or ``None`` for an id that is not one
    of ours (wrong characters or length) or no longer there."""
    if not 16 <= len(set_id) <= 64 or not set(set_id) <= ID_CHARS:
        return None
    folder = root / "sets" / set_id
    return folder if folder.is_dir() else None


def _write_state(folder: Path, **state) -> None:
    tmp = folder / "state.json.tmp"
    tmp.write_text(json.dumps(state), encoding="utf-8")
    os.replace(tmp, folder / "state.json")


def read_state(folder: Path) -> dict:
    try:
        state = json.loads((folder / "state.json").read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return {"state": "failed", "message": ""}
    state.setdefault("done", 0)
    return state


def prepare(root: Path, defaults: dict, roster_text: str) -> tuple[str, Path]:
    """A new set's folder with its set file and roster; ``(id, folder)``."""
    set_id = secrets.token_urlsafe(16)
    folder = root / "sets" / set_id
    folder.mkdir(parents=True, mode=0o700)
    (folder / "roster.csv").write_text(roster_text, encoding="utf-8")
    (folder / "set.yaml").write_text(
        yaml.safe_dump({"defaults": defaults, "roster": "roster.csv"}, allow_unicode=True, sort_keys=False),
        encoding="utf-8")
    _write_state(folder, state="running", total=roster_rows(roster_text), started=time.time())
    return set_id, folder


def _progress_line() -> re.Pattern:
    """The progress line ``kitgen batch`` writes when stderr is not a
    terminal (kitgen.batch.progress, errors.batch_progress: always
    English there), its ``done`` and
    ``total`` captured, read from the template itself so that the two
    never disagree."""
    pattern = re.escape(load_words("en").template("errors.batch_progress"))
    pattern = pattern.replace(r"\{done\}", r"(?P<done>\d+)").replace(r"\{total\}", r"(?P<total>\d+)")
    return re.compile("^" + re.sub(r"\\\{\w+\\\}", ".*", pattern))


PROGRESS_LINE = _progress_line()


def run(folder: Path) -> None:
    """Build the set in ``folder`` with ``kitgen batch``, following its
    progress lines, and zip its output; records the progress and the
    outcome in ``state.json``.  Runs on a pool thread; the batch itself
    is a child process, killed when it outlasts :data:`TIMEOUT_SECONDS`."""
    state = json.loads((folder / "state.json").read_text(encoding="utf-8"))
    jobs = str(max(1, min(2, os.cpu_count() or 1)))
    command = [sys.executable, "-m", "kitgen", "batch", "set.yaml", "-o", "out", "-j", jobs]
    said: list[str] = []
    with subprocess.Popen(command, cwd=folder, stdin=subprocess.DEVNULL, stdout=subprocess.DEVNULL,
                          stderr=subprocess.PIPE, text=True, encoding="utf-8", errors="replace") as child:
        timer = threading.Timer(TIMEOUT_SECONDS, child.kill)
        timer.start()
        try:
            for line in child.stderr:
                found = PROGRESS_LINE.match(line)
                if found:
                    state.update(done=int(found.group("done")), total=int(found.group("total")))
                    _write_state(folder, **state)
                elif line.strip() and ": note:" not in line:
                    said.append(one_line(line))
            status = child.wait()
        finally:
            timer.cancel()
    out = folder / "out"
    if not (out / "manifest.csv").is_file():
        _write_state(folder, **{**state, "state": "failed", "message": said[-1] if said else f"exit {status}"})
        return
    tmp = folder / "set.zip.tmp"
    with zipfile.ZipFile(tmp, "w", zipfile.ZIP_DEFLATED) as z:
        for path in sorted(out.rglob("*")):
            if path.is_file():
                z.write(path, path.relative_to(out).as_posix())
    os.replace(tmp, folder / "set.zip")
    # Kits the batch could not build are named in its manifest and on its
    # stderr; the others are in the zip.
    _write_state(folder, **{**state, "state": "done", "message": " ".join(said[-3:]) if status else ""})


def sweep(root: Path, now: float | None = None) -> None:
    """Remove the sets older than :data:`KEEP_SECONDS`."""
    now = time.time() if now is None else now
    sets = root / "sets"
    if not sets.is_dir():
        return
    for folder in sets.iterdir():
        try:
            if now - folder.stat().st_mtime > KEEP_SECONDS:
                shutil.rmtree(folder, ignore_errors=True)
        except OSError:
            pass
