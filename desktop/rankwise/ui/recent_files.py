"""The list of recently opened files, kept in the user's settings."""

from __future__ import annotations

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
