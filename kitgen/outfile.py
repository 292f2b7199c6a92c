"""Write outputs safely: to a temporary file in the same folder, renamed
into place only when complete, and never over a file kitgen did not make.

The rename (``os.replace``) is atomic on one file system (POSIX
``rename(2)``), so a reader, a crash or an interrupt sees either the old
file or the whole new one, never a part of it.
"""

from __future__ import annotations

import errno
import os
import re
import tempfile
from pathlib import Path

from .errors import Message, UserError

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


def write_error(path, exc: OSError, doing: Message = CANNOT_WRITE) -> UserError:
    """A one-line :class:`UserError` for an ``OSError`` met writing
    ``path``; the system's own text (in the system's language) for a
    reason without advice here."""
    advice = _ADVICE.get(exc.errno) or (exc.strerror or str(exc))
    return UserError("errors.write_failed", path=path, doing=doing, advice=advice)


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
    try:
        fd, tmp = tempfile.mkstemp(prefix=f".{path.name[:64]}.", suffix=".part", dir=folder)
    except OSError as exc:
        raise write_error(path, exc, Message("errors.doing_write_in", folder=folder)) from None
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
            os.fchmod(fh.fileno(), _mode_for(path))
        os.replace(tmp, path)
    except OSError as exc:
        _remove(tmp)
        raise write_error(path, exc) from None
    except BaseException:
        _remove(tmp)
        raise
    _sync_folder(folder)
    return path


def _mode_for(path: Path) -> int:
    try:
        return os.stat(path).st_mode & 0o777
    except OSError:
        umask = os.umask(0)
        os.umask(umask)
        return 0o666 & ~umask


def _sync_folder(folder: Path) -> None:
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


#: Characters allowed in a file name made from a recipe value.
_SAFE_NAME = re.compile(r"[^A-Za-z0-9._-]+")
MAX_NAME_CHARS = 80


def safe_file_name(name: str, suffix: str = "") -> str:
    """A file name made from ``name`` (a part's kind, a title ...) that
    stays inside its folder: only ASCII letters, digits, ``.``, ``_`` and
    ``-``; no path separator, no leading dot (so never ``..`` or a hidden
    file), at most :data:`MAX_NAME_CHARS` characters, never empty; then
    ``suffix``."""
    stem = _SAFE_NAME.sub("-", str(name)).strip(".-")[:MAX_NAME_CHARS].strip(".-")
    return (stem or "kitgen") + suffix


def inside_folder(folder, name: str) -> Path:
    """``folder / name``, refusing (as an internal fault) any name that
    would leave the folder; use with :func:`safe_file_name`."""
    base = Path(folder).resolve()
    target = (base / name).resolve()
    if target.parent != base:
        raise ValueError(f"file name {name!r} leaves the output folder")
    return Path(folder) / name
