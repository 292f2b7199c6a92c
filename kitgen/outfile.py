"""Write outputs safely: to a temporary file in the same folder, renamed
into place only when complete, and never over a file kitgen did not make.

The rename (``os.replace``) is atomic on one file system (POSIX
``rename(2)``), so a reader, a crash or an interrupt sees either the old
file or the whole new one, never a part of it.
"""

from __future__ import annotations

import ctypes
import errno
import hashlib
import os
import re
import signal
import stat
import tempfile
import time
import unicodedata
from pathlib import Path

from .errors import Message, UserError, few

#: How each kind of kitgen output says who made it.  A file counts as
#: kitgen's own only when it starts as that format starts and carries the
#: marker where kitgen puts it, so that a user's note or recipe that merely
#: mentions kitgen is never taken for an output.
#:
#: (start of the file, marker, where to look: "head" = the first
#: ``_HEAD_BYTES``, "anywhere" = the whole file up to ``_MAX_SCAN_BYTES``)
SIGNATURES: tuple[tuple[bytes, bytes, str], ...] = (
    (b"%PDF-", b"/Creator (kitgen)", "anywhere"),          # render/pdf.py: setCreator("kitgen")
    (b"{\"format\":\"kitgen-", b"", "head"),              # render/json_export.py
    (b"<?xml", b"<!-- made by kitgen -->", "head"),       # render/svg.py
    (b"\x89PNG\r\n\x1a\n", b"Software\x00kitgen", "anywhere"),  # a PNG tEXt chunk, for previews
)

_HEAD_BYTES = 4096
#: Larger files are never taken for kitgen's (its PDFs are well under this).
_MAX_SCAN_BYTES = 64 * 1024 * 1024
_CHUNK = 1024 * 1024

#: What to tell the user for the usual reasons a write fails.
_ADVICE = {
    errno.ENOSPC: Message("errors.write_disk_full"),
    errno.EDQUOT: Message("errors.write_quota"),
    errno.EROFS: Message("errors.write_read_only"),
    errno.EACCES: Message("errors.write_permission"),
    errno.EPERM: Message("errors.write_permission"),
    errno.ENAMETOOLONG: Message("errors.write_name_too_long"),
    errno.EIO: Message("errors.write_io"),
    errno.ENOTDIR: Message("errors.write_not_folder"),
}

#: What was being done, for :func:`write_error`.
CANNOT_WRITE = Message("errors.doing_write")


def write_advice(exc: OSError):
    """What to tell the user for an ``OSError`` met writing: advice of
    ours, or the system's own text (in the system's language)."""
    return _ADVICE.get(getattr(exc, "errno", None)) or (getattr(exc, "strerror", None) or str(exc))


def write_error(path, exc: OSError, doing: Message = CANNOT_WRITE) -> UserError:
    """A one-line :class:`UserError` for an ``OSError`` met writing
    ``path``."""
    return UserError("errors.write_failed", path=path, doing=doing, advice=write_advice(exc))


def write_all(fh, data: bytes) -> None:
    """Write all of ``data`` to the binary stream ``fh`` and flush it: a
    write may take only a part (a pipe takes what it holds, POSIX
    write(2)), and the rest must follow, or fail with an ``OSError``."""
    view = memoryview(data)
    while view:
        n = fh.write(view)
        if not n:
            raise OSError(errno.EIO, os.strerror(errno.EIO))
        view = view[n:]
    fh.flush()


def made_by_kitgen(path) -> bool:
    """Whether the existing file at ``path`` is a kitgen output (see
    :data:`SIGNATURES`); ``False`` when it cannot be read."""
    try:
        with open(path, "rb") as fh:
            head = fh.read(_HEAD_BYTES)
            for start, marker, where in SIGNATURES:
                if head.startswith(start):
                    if marker in head:
                        return True
                    return where == "anywhere" and _scan(fh, marker)
    except OSError:
        return False
    return False


def _scan(fh, marker: bytes) -> bool:
    """Search the rest of an open file for ``marker``, in chunks that
    overlap by the marker's length."""
    fh.seek(0)
    keep = b""
    read = 0
    while read < _MAX_SCAN_BYTES:
        chunk = fh.read(_CHUNK)
        if not chunk:
            return False
        read += len(chunk)
        if marker in keep + chunk:
            return True
        keep = chunk[-len(marker):]
    return False


def _same_file(a: Path, b: Path) -> bool:
    try:
        return os.path.samefile(a, b)
    except OSError:
        return False


def check_target(path, force: bool = False, protect: tuple = ()) -> None:
    """Refuse a target that is one of ``protect`` (the recipe, say; even
    with ``force``), a folder, or a file that kitgen did not make (unless
    ``force``)."""
    path = Path(path)
    for p in protect:
        if _same_file(path, Path(p)):
            raise UserError("errors.target_is_input", path=path)
    if path.is_dir():
        raise UserError("errors.target_is_folder", path=path)
    if path.exists() and not path.is_file():
        raise UserError("errors.target_not_regular", path=path)
    if path.exists() and not force and not made_by_kitgen(path):
        raise UserError("errors.target_foreign", path=path)


def write_atomic(path, data: bytes, force: bool = False, protect: tuple = ()) -> Path:
    """Write ``data`` to ``path`` through a temporary file in the same
    folder; on any failure (an ``OSError``, an exception, an interrupt) the
    temporary file is removed and an existing file at ``path`` is left as
    it was.  A new file gets the usual permissions (0666 less the umask);
    a replaced one keeps its own."""
    path = Path(path)
    check_target(path, force, protect)
    folder = path.parent if str(path.parent) else Path(".")
    if not folder.is_dir():
        raise UserError("errors.no_folder", path=path, folder=folder)
    check_name_length(path)
    clean_stale(folder)
    try:
        fd, tmp = tempfile.mkstemp(prefix=_temp_prefix(path.name), suffix=TEMP_FILE_SUFFIX, dir=folder)
    except OSError as exc:
        raise write_error(path, exc, Message("errors.doing_write_in", folder=folder)) from None
    try:
        with os.fdopen(fd, "wb") as fh:
            write_all(fh, data)
            os.fsync(fh.fileno())
            os.fchmod(fh.fileno(), _mode_for(path))
        os.replace(tmp, path)
    except OSError as exc:
        _remove(tmp)
        raise write_error(path, exc) from None
    except BaseException:
        _remove(tmp)
        raise
    sync_folder(folder)
    return path


def _mode_for(path: Path) -> int:
    try:
        return os.stat(path).st_mode & 0o777
    except OSError:
        umask = os.umask(0)
        os.umask(umask)
        return 0o666 & ~umask


def sync_folder(folder: Path) -> None:
    """Make the rename itself durable (best effort: not every system lets a
    folder be opened)."""
    try:
        fd = os.open(folder, os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


def _remove(tmp: str) -> None:
    try:
        os.unlink(tmp)
    except OSError:
        pass


#: Longest name of one file or folder that common file systems take, in
#: bytes (NAME_MAX of Linux ext4, XFS, Btrfs and tmpfs; macOS APFS counts
#: 255 UTF-8 bytes too).
MAX_NAME_BYTES = 255
#: Longest whole path, in bytes (Linux PATH_MAX).
MAX_PATH_BYTES = 4096


def check_name_length(path) -> None:
    """Refuse, as the user's mistake, a path with a name longer than the
    file system takes, before any work is done (the system would only say
    so at the very end, when the output is written)."""
    raw = os.fsencode(Path(path))
    if len(raw) >= MAX_PATH_BYTES or any(len(part) > MAX_NAME_BYTES for part in raw.split(b"/")):
        raise UserError("errors.name_too_long", path=Path(path), limit=MAX_NAME_BYTES)


#: Longest stem of a file name made from a recipe value, in UTF-8 bytes:
#: room is left for a page number, a checksum and the suffix.
MAX_STEM_BYTES = 120
#: Kept as they are; anything else (separators, spaces, punctuation,
#: controls, bidirectional marks) becomes "-".
_SAFE_NAME = re.compile(r"[^\w.-]+")


def safe_file_name(name: str, suffix: str = "") -> str:
    """A file name made from ``name`` (a recipe's name, a part's kind ...)
    that stays inside its folder and says what it names: letters and
    digits of every script kept (NFC), anything else ("/", spaces,
    controls, bidirectional marks) becomes ``-``; no leading dot or dash
    (so never ``..``, a hidden file or an option), at most
    :data:`MAX_STEM_BYTES` bytes, never empty; then ``suffix``.  A name
    that had to be changed gets 8 hex digits of its SHA-256, so two
    different names never give one file name."""
    text = unicodedata.normalize("NFC", str(name))
    stem = _SAFE_NAME.sub("-", text).strip(".-")
    stem = "".join(c for c in stem if unicodedata.category(c)[0] in "LNP" or c in ".-_")
    cut = stem.encode("utf-8")[:MAX_STEM_BYTES].decode("utf-8", "ignore").strip(".-")
    if cut != str(name) or not cut:
        digest = hashlib.sha256(str(name).encode("utf-8", "surrogatepass")).hexdigest()[:8]
        cut = f"{cut}-{digest}" if cut else f"kitgen-{digest}"
    return cut + suffix


def inside_folder(folder, name: str) -> Path:
    """``folder / name``, refusing (as an internal fault) any name that
    would leave the folder; use with :func:`safe_file_name`."""
    base = Path(folder).resolve()
    target = (base / name).resolve()
    if target.parent != base:
        raise ValueError(f"file name {name!r} leaves the output folder")
    return Path(folder) / name


# -- temporary files and folders, and the ones an interrupted run left ---------------------------

#: kitgen's temporary names: ".NAME.RANDOM.kitgen.part" for a file,
#: ".NAME.RANDOM.kitgen.dir" for a folder being filled and
#: ".NAME.RANDOM.kitgen.old" for the folder it replaced.
TEMP_FILE_SUFFIX = ".kitgen.part"
TEMP_DIR_SUFFIX = ".kitgen.dir"
OLD_DIR_SUFFIX = ".kitgen.old"
_TEMP_NAME = re.compile(r"^\..+\.[A-Za-z0-9_]{6,}\.kitgen\.(part|dir|old)$", re.S)
#: A temporary of kitgen's older than this (seconds) is an interrupted
#: run's: no run of kitgen takes anywhere near as long to write.
STALE_SECONDS = 10 * 60


def _temp_prefix(name: str) -> str:
    """The start of a temporary name for ``name``: short enough that the
    whole stays within :data:`MAX_NAME_BYTES`."""
    return "." + name.encode("utf-8", "surrogateescape")[:64].decode("utf-8", "ignore") + "."


def _looks_like_output(path: Path) -> bool:
    """A regular file that is empty, or starts as one of kitgen's outputs
    starts (:data:`SIGNATURES`): what a half-written output can hold."""
    try:
        with open(path, "rb", opener=lambda p, f: os.open(p, f | os.O_NOFOLLOW | os.O_NONBLOCK)) as fh:
            if not stat.S_ISREG(os.fstat(fh.fileno()).st_mode):
                return False
            head = fh.read(16)
    except OSError:
        return False
    return head == b"" or any(head.startswith(start[:16]) for start, _, _ in SIGNATURES)


def clean_stale(folder, now: float | None = None) -> list[Path]:
    """Remove what an interrupted run of kitgen left in ``folder``
    (killed with SIGKILL, or the machine stopped): temporary files and
    folders named as kitgen names them, older than :data:`STALE_SECONDS`,
    holding only what kitgen writes.  A file is removed only when it is
    empty or starts as a kitgen output, or, inside a temporary folder, is a
    second link to a file that lives on elsewhere (a user's file carried
    into the new folder); anything else is left where it is.  Best
    effort: returns what was removed."""
    now = time.time() if now is None else now
    removed = []
    try:
        entries = list(os.scandir(folder))
    except OSError:
        return removed
    for entry in entries:
        if not _TEMP_NAME.match(entry.name):
            continue
        try:
            st = entry.stat(follow_symlinks=False)
        except OSError:
            continue
        if now - st.st_mtime < STALE_SECONDS:
            continue
        path = Path(entry.path)
        if entry.name.endswith(TEMP_FILE_SUFFIX):
            if stat.S_ISREG(st.st_mode) and _looks_like_output(path):
                _remove(path)
                removed.append(path)
        elif stat.S_ISDIR(st.st_mode):
            if _empty_own_folder(path):
                removed.append(path)
    return removed


def _empty_own_folder(folder: Path) -> bool:
    """Remove from ``folder`` kitgen's outputs and second links, then the
    folder itself if nothing else was in it."""
    try:
        for entry in os.scandir(folder):
            st = entry.stat(follow_symlinks=False)
            if stat.S_ISREG(st.st_mode) and (st.st_nlink > 1 or made_by_kitgen(entry.path)
                                              or _looks_like_output(Path(entry.path))):
                os.unlink(entry.path)
        os.rmdir(folder)
        return True
    except OSError:
        return False


# -- a set of files written into a folder as a whole ---------------------------------------------

#: The signals that end kitgen (kitgen.cli installs their handlers), held
#: back while a folder is swapped so that no handler runs half way.
_HELD_SIGNALS = {getattr(signal, n) for n in ("SIGINT", "SIGTERM", "SIGHUP", "SIGQUIT", "SIGALRM",
                                              "SIGUSR1", "SIGUSR2", "SIGXCPU", "SIGVTALRM", "SIGPROF")
                 if hasattr(signal, n)}


def write_folder_atomic(folder, files: dict, force: bool = False, protect: tuple = (), own=None) -> list[Path]:
    """Write ``{file name: bytes}`` as the folder ``folder``, as a whole:
    the files go into a fresh temporary folder beside it, which then takes
    the folder's place in one rename (Linux ``renameat2`` with
    ``RENAME_EXCHANGE``; elsewhere two renames with the terminating
    signals held), so a reader, an interrupt or a crash sees the earlier
    set or the new one, never a mix.  Returns the paths written, in order.

    Names must be made by :func:`safe_file_name`.  What the folder held
    before is dealt with so: a file of the new set's names is replaced (a
    file kitgen did not make only with ``force``; one of ``protect``, the
    build's inputs, never); a file kitgen made that ``own(name)`` claims
    (an earlier, larger kit's pages, say) is dropped; every other file is
    kept, carried into the new folder as a hard link (the same file, not a
    copy), but a file kitgen did not make only with ``force``.  A folder
    that holds sub-folders or other non-files, or holds the current
    folder, is refused: it is no folder of kitgen's own."""
    folder = Path(folder)
    check_name_length(folder)
    for name in files:
        if name != safe_file_name(name) or not name:
            raise ValueError(f"file name {name!r} is not safe; make it with safe_file_name")
        check_name_length(folder / name)
    own = own or (lambda name: False)
    if folder.is_symlink():
        folder = Path(os.path.realpath(folder))
    if folder.exists() and not folder.is_dir():
        raise UserError("errors.target_not_folder", path=folder)
    keep, gone = _folder_plan(folder, files, force, protect, own)
    parent = folder.parent if str(folder.parent) else Path(".")
    try:
        parent.mkdir(parents=True, exist_ok=True)
    except FileExistsError:  # a part of the path is a file
        raise write_error(folder, OSError(errno.ENOTDIR, os.strerror(errno.ENOTDIR)),
                          Message("errors.doing_make_folder")) from None
    except OSError as exc:
        raise write_error(folder, exc, Message("errors.doing_make_folder")) from None
    clean_stale(parent)
    try:
        tmp = Path(tempfile.mkdtemp(prefix=_temp_prefix(folder.name), suffix=TEMP_DIR_SUFFIX, dir=parent))
    except OSError as exc:
        raise write_error(folder, exc, Message("errors.doing_write_in", folder=parent)) from None
    try:
        for name in keep:
            os.link(folder / name, tmp / name)
        for name, data in files.items():
            _write_synced(tmp / name, data)
        os.chmod(tmp, _folder_mode(folder))
        sync_folder(tmp)
        swapped = _swap_in(tmp, folder)
    except OSError as exc:
        _discard(tmp, [*keep, *files])
        raise write_error(folder, exc) from None
    except BaseException:
        _discard(tmp, [*keep, *files])
        raise
    if swapped is not None:  # the earlier folder: its files live on in the new one, or were to go
        _discard(swapped, [*keep, *gone])
    sync_folder(parent)
    return [folder / name for name in files]


def check_not_mount(folder: Path) -> None:
    """Refuse a folder that is a disk's own root (a memory stick's, say):
    an output folder is written beside it and swapped into its place,
    which no system lets a mount point take (POSIX rename(2): EBUSY);
    said before any work, where it had failed once everything was built."""
    try:
        mount = os.path.ismount(folder)
    except OSError:
        return
    if mount:
        raise UserError("errors.folder_is_mount", path=folder)


def _folder_plan(folder: Path, files: dict, force: bool, protect: tuple, own) -> tuple[list, list]:
    """Check what ``folder`` holds against the new set: (the names of the
    files to carry over, the names of the files to let go)."""
    if not folder.exists():
        return [], []
    here = Path.cwd().resolve()
    real = folder.resolve()
    if here == real or real in here.parents:
        raise UserError("errors.folder_is_current", path=folder)
    check_not_mount(folder)
    keep, gone, foreign, others = [], [], [], []
    for entry in sorted(os.scandir(folder), key=lambda e: e.name):
        path = Path(entry.path)
        if not entry.is_file(follow_symlinks=False):
            others.append(entry.name)
            continue
        if entry.name in files:
            check_target(path, force, protect)
            gone.append(entry.name)
            continue
        mine = made_by_kitgen(path)
        if mine and own(entry.name):
            gone.append(entry.name)
            continue
        if not mine:
            foreign.append(entry.name)
        keep.append(entry.name)
    if others:
        raise UserError("errors.folder_not_files", path=folder, names=few(others, 3))
    if foreign and not force:
        raise UserError("errors.folder_foreign", path=folder, names=few(foreign, 3))
    return keep, gone


def _discard(folder: Path, names) -> None:
    """Remove the files ``names`` from ``folder``, then the folder if that
    leaves it empty (best effort)."""
    for name in names:
        _remove(folder / name)
    try:
        os.rmdir(folder)
    except OSError:
        pass


def _write_synced(path: Path, data: bytes) -> None:
    fd = os.open(path, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o666)
    with os.fdopen(fd, "wb") as fh:
        write_all(fh, data)
        os.fsync(fh.fileno())


def _folder_mode(folder: Path) -> int:
    try:
        return os.stat(folder).st_mode & 0o7777
    except OSError:
        umask = os.umask(0)
        os.umask(umask)
        return 0o777 & ~umask


_RENAME_EXCHANGE = 2  # linux/fs.h
_AT_FDCWD = -100


def _exchange(a: Path, b: Path) -> bool:
    """Swap two paths in one step (Linux ``renameat2(2)`` with
    ``RENAME_EXCHANGE``); ``False`` where the system cannot."""
    try:
        libc = ctypes.CDLL(None, use_errno=True)
        renameat2 = libc.renameat2
    except (OSError, AttributeError):
        return False
    renameat2.argtypes = [ctypes.c_int, ctypes.c_char_p, ctypes.c_int, ctypes.c_char_p, ctypes.c_uint]
    if renameat2(_AT_FDCWD, os.fsencode(a), _AT_FDCWD, os.fsencode(b), _RENAME_EXCHANGE) == 0:
        return True
    err = ctypes.get_errno()
    if err in (errno.ENOSYS, errno.EINVAL, errno.ENOTSUP, errno.EOPNOTSUPP):
        return False
    raise OSError(err, os.strerror(err), str(b))


def _swap_in(new: Path, folder: Path) -> Path | None:
    """Put the filled folder ``new`` in the place of ``folder``; returns
    where the earlier folder now is (``None`` when there was none)."""
    if not folder.exists():
        os.rename(new, folder)
        return None
    if _exchange(new, folder):
        return new
    old = Path(tempfile.mkdtemp(prefix=_temp_prefix(folder.name), suffix=OLD_DIR_SUFFIX, dir=new.parent))
    held = signal.pthread_sigmask(signal.SIG_BLOCK, _HELD_SIGNALS) if hasattr(signal, "pthread_sigmask") else None
    try:
        os.rename(folder, old)  # over the empty folder just made
        os.rename(new, folder)
    finally:
        if held is not None:
            signal.pthread_sigmask(signal.SIG_SETMASK, held)
    return old
