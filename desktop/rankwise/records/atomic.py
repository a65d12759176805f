"""Atomic file writes: a temporary file beside the target, then one rename over it.

A new file gets the permissions the user's umask gives any new file; a replaced file keeps its own.
A target that is a symbolic link stays a link: the file it points to is the one replaced.
Temporary files left by a write that was cut short are removed by ``remove_interrupted_saves``.
"""

from __future__ import annotations

import os
import re
import stat
import tempfile
import time
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


INTERRUPTED_WRITE = re.compile(r"^\..+\.[a-z0-9_]{8}\.tmp$")
"""The name ``write_atomically`` gives its temporary file (``.{target name}.{8 random characters}.tmp``)."""


def remove_interrupted_saves(folder: str | os.PathLike[str], quiet_s: float = 10.0) -> list[Path]:
    """Remove the temporary files that interrupted atomic writes (a kill, a power cut) left in ``folder``.

    A temporary file counts as left over when no running process has it open and it has not
    changed for ``quiet_s`` seconds: a write in progress keeps its file open and keeps writing.
    Where the open files cannot be seen (no ``/proc``), an hour without change is asked instead.
    Returns the files removed; a folder that cannot be read gives [].
    """
    in_use = files_open_by_processes()
    if in_use is None:
        in_use, quiet_s = set(), max(quiet_s, 3600.0)
    try:
        candidates = [entry for entry in Path(folder).iterdir() if INTERRUPTED_WRITE.match(entry.name)]
        now = time.time()
        candidates = [entry for entry in candidates if entry.is_file() and now - entry.stat().st_mtime >= quiet_s]
    except OSError:
        return []
    removed = []
    for entry in candidates:
        if os.path.realpath(entry) in in_use:
            continue
        try:
            entry.unlink()
        except OSError:
            continue
        removed.append(entry)
    return removed


def files_open_by_processes() -> set[str] | None:
    """The paths of the files the processes this user may look at have open; None without ``/proc``."""
    opened: set[str] = set()
    try:
        processes = [name for name in os.listdir("/proc") if name.isdigit()]
    except OSError:
        return None
    for process in processes:
        folder = f"/proc/{process}/fd"
        try:
            descriptors = os.listdir(folder)
        except OSError:
            continue
        for descriptor in descriptors:
            try:
                opened.add(os.readlink(f"{folder}/{descriptor}"))
            except OSError:
                continue
    return opened
