"""Write outputs safely: to a temporary file in the same folder, renamed
into place only when complete, and never over a file kitgen did not make.
"""

from __future__ import annotations

import os
import tempfile
from pathlib import Path

from .errors import UserError

#: Bytes every kitgen output carries near its start or end, so that a later
#: run can tell its own earlier output from a user's file.
MARKER = b"kitgen"


def made_by_kitgen(path: Path) -> bool:
    """Whether the existing file at ``path`` looks like a kitgen output."""
    try:
        with open(path, "rb") as fh:
            head = fh.read(4096)
            fh.seek(0, os.SEEK_END)
            size = fh.tell()
            fh.seek(max(0, size - 4096))
            tail = fh.read()
    except OSError:
        return False
    return MARKER in head or MARKER in tail


def check_target(path: Path, force: bool = False, protect: tuple[Path, ...] = ()) -> None:
    """Refuse a target that is one of ``protect`` (the recipe, say), a
    folder, or a file that kitgen did not make (unless ``force``)."""
    path = Path(path)
    for p in protect:
        try:
            if path.exists() and p.exists() and path.resolve() == Path(p).resolve():
                raise UserError(f"{path}: refusing to write over the input file")
        except OSError:
            pass
    if path.is_dir():
        raise UserError(f"{path}: is a folder; give a file name")
    if path.exists() and not force and not made_by_kitgen(path):
        raise UserError(f"{path}: exists and was not made by kitgen; choose another name or use --force")


def write_atomic(path, data: bytes, force: bool = False, protect: tuple[Path, ...] = ()) -> Path:
    """Write ``data`` to ``path`` through a temporary file in the same
    folder; on any failure the temporary file is removed and an existing
    file at ``path`` is left as it was."""
    path = Path(path)
    check_target(path, force, protect)
    folder = path.parent if str(path.parent) else Path(".")
    if not folder.is_dir():
        raise UserError(f"{path}: the folder {folder} does not exist")
    try:
        fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".part", dir=folder)
    except OSError as exc:
        raise UserError(f"{path}: cannot write in {folder}: {exc.strerror}") from None
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
        os.chmod(tmp, 0o666 & ~_umask())  # mkstemp makes 0600; outputs get the usual mode
        os.replace(tmp, path)
    except OSError as exc:
        _remove(tmp)
        raise UserError(f"{path}: cannot write: {exc.strerror}") from None
    except BaseException:
        _remove(tmp)
        raise
    return path


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


def _remove(tmp: str) -> None:
    try:
        os.unlink(tmp)
    except OSError:
        pass
