"""The set's output folder, made fresh and swapped in whole (#12).

Everything is written into a temporary folder beside the target
(``.NAME.RANDOM.kitgen.dir``, the temporary names of
:mod:`kitgen.outfile`), which takes the target's place only when complete:
a reader, an interrupt or a crash sees the earlier set or the new one,
never a mix, and a failed run leaves nothing behind.  An earlier folder is
replaced only when it is recognisably a set's output (its names are the
ones written here and its PDFs carry kitgen's signature), so a user's
folder is never emptied.

The swap itself is :mod:`kitgen.outfile`'s (#11): one ``renameat2`` with
``RENAME_EXCHANGE`` on Linux, elsewhere two renames with the terminating
signals held; ``outfile.write_folder_atomic`` itself writes flat folders
only, and the set's folder holds a sub-folder (``kits/``).
"""

from __future__ import annotations

import os
import shutil
import tempfile
import time
from concurrent.futures import ThreadPoolExecutor
from contextlib import contextmanager
from pathlib import Path

from .. import outfile
from ..errors import Message, UserError
from ..outfile import OLD_DIR_SUFFIX, STALE_SECONDS, TEMP_DIR_SUFFIX, made_by_kitgen, write_error
from .printfiles import is_print_file_name

KITS = "kits"
MANIFEST = "manifest.csv"
_OWN_NAMES = {KITS, MANIFEST}

#: Files a desktop's file manager writes into any folder it shows (the
#: Finder's ``.DS_Store`` and, on other disks, its ``._`` companions;
#: Windows Explorer's thumbnail caches and ``desktop.ini``; KDE's
#: ``.directory``): a coordinator who looked at the kits in one does not
#: make the folder theirs, and they go with the earlier set it holds.
DESKTOP_FILES = frozenset({".DS_Store", "Thumbs.db", "ehthumbs.db", "desktop.ini", ".directory"})


def _desktop_file(entry) -> bool:
    return (entry.name in DESKTOP_FILES or entry.name.startswith("._")) and entry.is_file(follow_symlinks=False)


def target_folder(folder) -> Path:
    """The folder ``-o`` names: itself, or the folder it links to where it
    is a symbolic link (made fresh there, the link kept); a name longer
    than the file system takes is refused in one line."""
    folder = Path(folder)
    outfile.check_name_length(folder)
    try:
        return Path(os.path.realpath(folder)) if folder.is_symlink() else folder
    except OSError as exc:
        raise write_error(folder, exc) from None


def check_output_folder(folder: Path, inputs=()) -> None:
    """Refuse, before any work, a target (named as :func:`target_folder`
    gives it, its name's length checked there) that is a file, that holds one of
    ``inputs`` (the set file, the roster) or the current folder, or that
    holds anything a set does not write."""
    folder = Path(folder)
    if folder.exists() and not folder.is_dir():
        raise UserError("errors.batch_folder_is_file", path=folder)
    if not folder.exists():
        return
    real = folder.resolve()
    for p in [Path.cwd(), *inputs]:
        p = Path(p).resolve()
        if p == real or real in p.parents:
            raise UserError("errors.batch_folder_holds_input", path=folder, input=p)
    outfile.check_not_mount(folder)
    foreign = _foreign_entries(folder)
    if foreign:
        raise UserError("errors.batch_folder_foreign", path=folder, names=", ".join(foreign[:3])
                        + (", …" if len(foreign) > 3 else ""))


def _is_set_output(folder: Path) -> bool:
    """Whether every entry of ``folder`` is one a set writes: an empty
    folder, or the manifest, the print files and ``kits/`` of kitgen PDFs
    (and a desktop's own files, :data:`DESKTOP_FILES`)."""
    return not _foreign_entries(folder)


def _foreign_entries(folder: Path) -> list[str]:
    """The entries of ``folder`` (and of its ``kits/``, as ``kits/NAME``)
    that a set does not write, sorted by name."""
    foreign = []
    for entry in sorted(os.scandir(folder), key=lambda e: e.name):
        if _desktop_file(entry):
            continue
        if entry.name not in _OWN_NAMES and not is_print_file_name(entry.name):
            foreign.append(entry.name)
        elif entry.name == KITS:
            if not entry.is_dir(follow_symlinks=False):
                foreign.append(entry.name)
                continue
            foreign += [f"{KITS}/{e.name}" for e in sorted(os.scandir(entry.path), key=lambda e: e.name)
                        if not _desktop_file(e) and not (e.is_file(follow_symlinks=False) and made_by_kitgen(e.path))]
        elif not entry.is_file(follow_symlinks=False):
            foreign.append(entry.name)
        elif entry.name.endswith(".pdf") and not made_by_kitgen(entry.path):
            foreign.append(entry.name)
        elif entry.name == MANIFEST and not _is_manifest(entry.path):
            foreign.append(entry.name)
    return foreign


def _is_manifest(path) -> bool:
    """Whether ``path`` starts as a set's manifest does, after its byte
    order mark (kitgen.batch.manifest) or, written by an earlier kitgen,
    without one."""
    try:
        with open(path, "rb") as fh:
            return fh.read(19).removeprefix(b"\xef\xbb\xbf").startswith(b"kit,owner,")
    except OSError:
        return False


@contextmanager
def fresh_folder(folder):
    """``with fresh_folder(DIR) as tmp:`` write into ``tmp``; on a clean
    exit ``tmp`` becomes ``DIR`` (an earlier ``DIR``, checked by
    :func:`check_output_folder`, is removed), on any exception it is
    removed and ``DIR`` is left as it was."""
    folder = Path(folder)
    parent = folder.parent if str(folder.parent) else Path(".")
    try:
        parent.mkdir(parents=True, exist_ok=True)
        _clean_stale(parent, folder.name)
        tmp = Path(tempfile.mkdtemp(prefix=outfile._temp_prefix(folder.name), suffix=TEMP_DIR_SUFFIX, dir=parent))
        os.chmod(tmp, 0o777 & ~_umask())   # mkdtemp's is 0700; the folder gets the usual mode
        (tmp / KITS).mkdir()
    except OSError as exc:
        raise write_error(folder, exc, Message("errors.doing_make_folder")) from None
    try:
        yield tmp
        _sync_tree(tmp)
        _swap_in(tmp, folder)
    except OSError as exc:
        shutil.rmtree(tmp, ignore_errors=True)
        raise write_error(folder, exc) from None
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise


def write_file(path: Path, data: bytes) -> None:
    """A new file in the temporary folder, flushed to the disk."""
    fd = os.open(path, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o666)
    with os.fdopen(fd, "wb") as fh:
        fh.write(data)
        fh.flush()
        os.fsync(fh.fileno())


#: Files written at once (:class:`BackgroundWrites`): flushes to one disk
#: at the same time are often made in one go (a journal's one commit).
WRITE_THREADS = 4


class BackgroundWrites:
    """``with BackgroundWrites() as files:`` ``files.write(path, data)``
    hands a new file (:func:`write_file`) to :data:`WRITE_THREADS`
    threads that write and flush the files while the caller builds the
    next kit: writing and ``fsync`` wait on the disk with Python's lock
    released, so the build goes on meanwhile (on a disk whose flushes
    took 20 ms each, a 40-kit set took 1.5 s instead of 2.4 s on one
    worker; on a fast disk no change was measured).  The first failed
    write is raised by the next ``write`` or on leaving the block, which
    waits for every file; leaving it with an exception drops the files
    not yet begun."""

    def __init__(self):
        self._threads = ThreadPoolExecutor(max_workers=WRITE_THREADS, thread_name_prefix="kitgen-write")
        self._pending: list = []

    def write(self, path: Path, data: bytes) -> None:
        self._raise_failed()
        self._pending.append(self._threads.submit(write_file, path, data))

    def _raise_failed(self) -> None:
        waiting = []
        for future in self._pending:
            if future.done():
                future.result()   # its OSError, if it failed
            else:
                waiting.append(future)
        self._pending = waiting

    def __enter__(self) -> "BackgroundWrites":
        return self

    def __exit__(self, kind, exc, tb) -> None:
        if kind is not None:
            self._threads.shutdown(wait=True, cancel_futures=True)
            return
        try:
            for future in self._pending:
                future.result()
        finally:
            self._threads.shutdown(wait=True, cancel_futures=True)


def _clean_stale(parent: Path, name: str) -> None:
    """Remove what a killed run (SIGKILL, a machine stopped) left for this
    folder: temporary folders of kitgen's naming, older than
    ``outfile.STALE_SECONDS``, holding nothing but a set's own files."""
    prefix = outfile._temp_prefix(name)
    now = time.time()
    try:
        entries = list(os.scandir(parent))
    except OSError:
        return
    for entry in entries:
        if not (entry.name.startswith(prefix) and entry.name.endswith((TEMP_DIR_SUFFIX, OLD_DIR_SUFFIX))):
            continue
        try:
            stale = entry.is_dir(follow_symlinks=False) and now - entry.stat().st_mtime > STALE_SECONDS
            if stale and _is_set_output(Path(entry.path)):
                shutil.rmtree(entry.path, ignore_errors=True)
        except OSError:
            continue


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


def _swap_in(tmp: Path, folder: Path) -> None:
    """``tmp`` in the place of ``folder`` (outfile's swap), then the
    earlier folder, checked to be a set's own, removed."""
    old = outfile._swap_in(tmp, folder)
    if old is not None:
        shutil.rmtree(old, ignore_errors=True)


def _sync_tree(tmp: Path) -> None:
    """Make the set's folders durable before the swap (best effort)."""
    for path in (tmp / KITS, tmp):
        outfile.sync_folder(path)