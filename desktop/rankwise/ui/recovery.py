"""Nothing lost: the entry is kept in a recovery file while the user types.

The file lives in the platform's application data folder (``QStandardPaths.AppDataLocation``). It is
written atomically after every change (temporary file beside it, then ``os.replace``), removed when
the window closes normally, and offered back at the next start when it is still there (after a
crash or a power cut).
"""

from __future__ import annotations

import json
import os
import tempfile
from datetime import datetime, timezone
from pathlib import Path
from typing import Any

from PySide6.QtCore import QStandardPaths

RECOVERY_FILE_NAME = "unsaved-readings.json"
_FORMAT = "rankwise-recovery-1"


def recovery_folder() -> Path:
    """The application data folder that holds the recovery file."""
    location = QStandardPaths.writableLocation(QStandardPaths.StandardLocation.AppDataLocation)
    if not location:
        location = os.path.join(tempfile.gettempdir(), "rankwise")
    return Path(location)


class RecoveryFile:
    """Reads and writes the recovery file: the sheet snapshot and the question, as plain JSON."""

    def __init__(self, path: Path | None = None) -> None:
        self.path = Path(path) if path is not None else recovery_folder() / RECOVERY_FILE_NAME

    def save(self, sheet_data: dict[str, Any], question_data: dict[str, Any], source: str = "") -> None:
        """Write the entry atomically; ``source`` names the file the readings came from, if any."""
        payload = {
            "format": _FORMAT,
            "saved_at": datetime.now(timezone.utc).isoformat(),
            "source": source,
            "sheet": sheet_data,
            "question": question_data,
        }
        self.path.parent.mkdir(parents=True, exist_ok=True)
        handle, temporary = tempfile.mkstemp(prefix=".recovery-", suffix=".tmp", dir=self.path.parent)
        try:
            with os.fdopen(handle, "w", encoding="utf-8") as stream:
                json.dump(payload, stream, ensure_ascii=False)
                stream.flush()
                os.fsync(stream.fileno())
            os.replace(temporary, self.path)
        except BaseException:
            Path(temporary).unlink(missing_ok=True)
            raise

    def load(self) -> dict[str, Any] | None:
        """The stored entry, or None when there is none or it cannot be read back."""
        try:
            payload = json.loads(self.path.read_text(encoding="utf-8"))
        except (OSError, ValueError):
            return None
        if not isinstance(payload, dict) or payload.get("format") != _FORMAT:
            return None
        return payload

    def exists(self) -> bool:
        """True when a recovery file is waiting to be offered back."""
        return self.path.is_file()

    def clear(self) -> None:
        """Remove the recovery file (after a normal close, a save, or a declined restore)."""
        self.path.unlink(missing_ok=True)
