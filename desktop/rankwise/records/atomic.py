"""Atomic file writes: a temporary file beside the target, then one rename over it."""

from __future__ import annotations

import os
import tempfile
from collections.abc import Callable
from pathlib import Path


def write_atomically(path: str | os.PathLike[str], write: Callable[[Path], None]) -> None:
    """Call ``write(temporary_path)``, then replace ``path`` with the result in one step.

    The temporary file lies in the target's folder (so the rename never crosses file systems).
    If ``write`` fails, the temporary file is removed and an existing ``path`` is left untouched.
    """
    target = Path(path)
    handle, temporary = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=target.parent)
    os.close(handle)
    temporary_path = Path(temporary)
    try:
        write(temporary_path)
        with open(temporary_path, "rb+") as written:
            os.fsync(written.fileno())
        os.replace(temporary_path, target)
    except BaseException:
        temporary_path.unlink(missing_ok=True)
        raise
