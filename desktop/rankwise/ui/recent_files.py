"""The list of recently opened files and the folders saved into, kept in the user's settings."""

from __future__ import annotations

import threading
from pathlib import Path

from PySide6.QtCore import QSettings

MAX_RECENT = 8
"""How many files the "Open recent" menu lists."""

_KEY = "recent_files"


def _settings() -> QSettings:
    return QSettings("Rankwise", "Rankwise")


def recent_files() -> list[Path]:
    """Recently opened files, newest first, that still exist."""
    stored = _settings().value(_KEY, [])
    if isinstance(stored, str):
        stored = [stored]
    return [Path(p) for p in (stored or []) if Path(p).is_file()]


def remember_file(path: Path) -> list[Path]:
    """Put ``path`` at the top of the recent list (once) and return the new list."""
    path = Path(path).resolve()
    kept = [p for p in recent_files() if p.resolve() != path]
    updated = [path, *kept][:MAX_RECENT]
    settings = _settings()
    settings.setValue(_KEY, [str(p) for p in updated])
    settings.sync()
    return updated


def forget_all() -> None:
    """Empty the recent list."""
    settings = _settings()
    settings.remove(_KEY)
    settings.sync()


_WRITTEN_KEY = "written_folders"
MAX_WRITTEN_FOLDERS = 20
"""How many folders Rankwise remembers having saved into (to tidy up after saves cut short)."""


def remember_written_folder(path: Path) -> None:
    """Remember the folder of a file about to be saved (newest first, once)."""
    folder = str(Path(path).resolve().parent)
    settings = _settings()
    stored = settings.value(_WRITTEN_KEY, [])
    stored = [stored] if isinstance(stored, str) else list(stored or [])
    settings.setValue(_WRITTEN_KEY, [folder, *[f for f in stored if f != folder]][:MAX_WRITTEN_FOLDERS])
    settings.sync()


def remove_interrupted_saves_in_the_background() -> threading.Thread:
    """Remove, on a thread of its own, the temporary files saves cut short left in the folders
    Rankwise saved into or opened from (``rankwise.records.atomic.remove_interrupted_saves``)."""
    from rankwise.records.atomic import remove_interrupted_saves

    stored = _settings().value(_WRITTEN_KEY, [])
    stored = [stored] if isinstance(stored, str) else list(stored or [])
    folders = dict.fromkeys([*stored, *(str(path.parent) for path in recent_files())])

    def tidy() -> None:
        for folder in folders:
            remove_interrupted_saves(folder)

    worker = threading.Thread(target=tidy, name="rankwise-tidy-up", daemon=True)
    worker.start()
    return worker
