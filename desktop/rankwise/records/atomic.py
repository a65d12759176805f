"""Atomic file writes: a temporary file beside the target, then one rename over it.

A new file gets the permissions the user's umask gives any new file; a replaced file keeps its own.
A target that is a symbolic link stays a link: the file it points to is the one replaced.
"""

from __future__ import annotations

import os
import stat
import tempfile
from collections.abc import Callable
from pathlib import Path


def user_umask() -> int:
    """The process's umask (read by setting it and putting it back at once)."""
    mask = os.umask(0o077)
    os.umask(mask)
    return mask


def mode_for(target: Path) -> int:
    """The permission bits a write to ``target`` should leave: those of the file it replaces,
    or for a new file what the umask allows of read and write for all (0666)."""
    try:
        return stat.S_IMODE(os.stat(target).st_mode)
    except FileNotFoundError:
        return 0o666 & ~user_umask()


def write_atomically(path: str | os.PathLike[str], write: Callable[[Path], None]) -> None:
    """Call ``write(temporary_path)``, then replace ``path`` with the result in one step.

    The temporary file lies in the target's folder (so the rename never crosses file systems).
    If ``write`` fails, the temporary file is removed and an existing ``path`` is left untouched.
    """
    target = Path(os.path.realpath(path))
    handle, temporary = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=target.parent)
    os.close(handle)
    temporary_path = Path(temporary)
    try:
        write(temporary_path)
        if not temporary_path.exists() or temporary_path.stat().st_size == 0:
            raise OSError(0, "nothing was written")
        with open(temporary_path, "rb+") as written:
            os.fsync(written.fileno())
        os.chmod(temporary_path, mode_for(target))
        os.replace(temporary_path, target)
    except BaseException:
        temporary_path.unlink(missing_ok=True)
        raise
