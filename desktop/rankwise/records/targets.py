"""Where a result may be written: never over the file it was read from, never two outputs into one
file, never over an existing file unless the user agreed, and a PDF never over a record.

Files are compared by what they are, not by how they are named: a symbolic link and the file it
points to, or two hard links to one file, are one file.
"""

from __future__ import annotations

import os
from dataclasses import dataclass
from pathlib import Path

from rankwise.records.workbook import is_record_file


@dataclass(frozen=True)
class Target:
    """One file a command is asked to write.

    Attributes:
        path: the path as the user gave it (messages name it as given).
        what: what goes there, in words ("the signed record", "the PDF").
        ending: the file ending it must have (".xlsx", ".pdf").
    """

    path: Path
    what: str
    ending: str


def same_file(first: Path, second: Path) -> bool:
    """True when both paths name one file: the same real path (links followed), or for files that
    exist, the same file on disk (hard links)."""
    if os.path.realpath(first) == os.path.realpath(second):
        return True
    try:
        return os.path.samefile(first, second)
    except OSError:
        return False


def refusal(source: Path | None, targets: list[Target], *, replace: bool) -> str | None:
    """Why writing ``targets`` must not go ahead, in one plain sentence; None when it may.

    ``source`` is the file the result was read from (never written over); ``replace`` says the
    user agreed to replace existing files (a record is still never replaced by a PDF).
    """
    for index, target in enumerate(targets):
        path = target.path
        if source is not None and same_file(path, source):
            return (f"'{path}' is the readings file being read; it is never written over. "
                    f"Save {target.what} under another name.")
        for other in targets[:index]:
            if same_file(path, other.path):
                return (f"{other.what} and {target.what} would both go to '{path}'; "
                        f"give them different names.")
        record = path.is_file() and is_record_file(path)
        if record and target.ending != ".xlsx":
            return (f"'{path}' is a Rankwise result record; {target.what} is never written over a record. "
                    f"Choose another name.")
        if path.suffix.lower() != target.ending:
            return f"{target.what} must be saved with the ending {target.ending}; got '{path.name}'."
        if path.is_dir():
            return f"'{path}' is a folder; give a file name for {target.what}."
        if not path.parent.is_dir():
            return f"the folder '{path.parent}' does not exist; choose another place for {target.what}."
        if path.exists() and not replace:
            kind = "is a Rankwise result record" if record else "already exists"
            return f"'{path}' {kind} and is kept as it is; choose another name, or add --force to replace it."
    return None
