"""Reading a large file in a process of its own: the window's process only receives the outcome.

Python runs one thread of a process at a time. The file readers (pandas, the text checks, the
arrays of a 10^6-row export) keep that turn for tens of milliseconds at a stretch for a second or
more, and the window's thread, which needs a turn each time it draws, waited for each of them. In
a child process they take no turn from the window: the child reads the file, builds the sheet and
sends both back pickled (about 35 MB for 10^6 readings). A reader that crashes, or is killed, ends
the child, never the window; the window reports it in words. The child also writes the sheet's
lines for the recovery file's first copy (encoding 10^6 cells there, too, kept the window waiting).

    python -m rankwise.readings.read_aside FILE [--pieces-to PIECES]   (the pickled ``Outcome`` to standard output)
"""

from __future__ import annotations

import dataclasses
import os
import pickle
import signal
import subprocess
import sys
import tempfile
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np

from rankwise.readings.cell_codes import CellCodes
from rankwise.readings.cells import Cell
from rankwise.readings.entry_journal import WrittenPieces, piece_lines, sheet_header
from rankwise.readings.errors import ReadingsError
from rankwise.readings.reading_set import ReadingGroup, ReadingSet
from rankwise.readings.sheet import ReadingSheet


@dataclass(frozen=True)
class Outcome:
    """What reading a file gave.

    Attributes:
        kind: "opened" (``reading_set`` and ``sheet`` hold the readings), "many characteristics"
            (the file holds one row per part and many characteristics; nothing was read) or
            "failed" (``message`` says why, in plain words).
        pieces: the sheet's lines for the recovery file (``entry_journal.piece_lines``, in a file),
            when they were asked for and written (the recovery file's first copy takes them instead
            of encoding every cell on the window's side); else None.
    """

    kind: str
    reading_set: ReadingSet | None = None
    sheet: ReadingSheet | None = None
    message: str = ""
    pieces: WrittenPieces | None = None


def sheet_of(reading_set: ReadingSet) -> ReadingSheet:
    """The sheet of opened readings, marked saved, with what the window first asks of it worked out:
    each group's arrays (the window's edits keep them in step), counts, flags and the planner's values."""
    sheet = ReadingSheet.from_reading_set(reading_set)
    sheet.mark_saved()
    for index, group in enumerate(sheet.groups):
        arrays = group.arrays()
        sheet.counts(index)
        sheet.flags(index)
        arrays.squares_about_mean()
        arrays.finest_decimals()
    return sheet


def read_file(path: Path) -> Outcome:
    """Read ``path`` here, in this process (the child's work; also what a small file needs)."""
    from rankwise.readings.characteristics import is_characteristics_file
    from rankwise.readings.open import open_readings

    if is_characteristics_file(path):
        return Outcome("many characteristics")
    try:
        reading_set = open_readings(path)
        return Outcome("opened", reading_set, sheet_of(reading_set))
    except ReadingsError as error:
        return Outcome("failed", message=str(error))
    except OSError as error:
        return Outcome("failed", message=f"The file cannot be read ({error.strerror or error}). Check that it is "
                                         "there and not open in another program.")


class Known:
    """A picklable stand-in for a reading group's ``make_*`` builders: gives back what was built."""

    def __init__(self, value: Any) -> None:
        self.value = value

    def __call__(self) -> Any:
        return self.value


class KnownCells(Known):
    """``make_cells`` of a group whose cells were read: kept as ``CellCodes``, given as a tuple."""

    def __call__(self) -> tuple[Cell, ...]:
        return tuple(self.value.cells())


class KnownRows(Known):
    """``make_rows`` of a group whose file rows were found: kept as one array, given as a tuple."""

    def __call__(self) -> tuple[int, ...]:
        return tuple(self.value.tolist())


def _settled(reading_set: ReadingSet) -> ReadingSet:
    """The reading set with each group's lazily built parts built, so it can be pickled."""
    def settled(group: ReadingGroup) -> ReadingGroup:
        return dataclasses.replace(group, make_cells=KnownCells(CellCodes(group.cells)),
                                   make_decimals=Known(group.decimals),
                                   make_rows=KnownRows(np.asarray(group.file_rows, dtype=np.int64)))
    return dataclasses.replace(reading_set, groups=tuple(settled(group) for group in reading_set.groups))


def _child_main(path: str, pieces_to: str | None) -> int:
    """Read ``path`` and write the pickled outcome to standard output (anything a reader prints goes
    to standard error instead); with ``pieces_to``, also the piece lines of the sheet read, there."""
    out, sys.stdout = sys.stdout.buffer, sys.stderr
    try:
        outcome = read_file(Path(path))
    except MemoryError:
        outcome = Outcome("failed", message=f"'{Path(path).name}' needs more memory than this computer has free to "
                                            "read; close other programs, or open a part of the readings.")
    except Exception as error:  # noqa: BLE001 - any failure must reach the window in words
        outcome = Outcome("failed", message=_unexpected(f"{type(error).__name__}: {error}"))
    if outcome.reading_set is not None:
        outcome = dataclasses.replace(outcome, reading_set=_settled(outcome.reading_set))
    if outcome.sheet is not None and pieces_to is not None:
        outcome = dataclasses.replace(outcome, pieces=_write_pieces(outcome.sheet, Path(pieces_to)))
    out.write(pickle.dumps(outcome, protocol=pickle.HIGHEST_PROTOCOL))
    out.flush()
    return 0


def _write_pieces(sheet: ReadingSheet, path: Path) -> WrittenPieces | None:
    """Write the sheet's piece lines to ``path``; None (and no file) when they cannot be written."""
    snapshot = sheet.snapshot()
    try:
        with open(path, "w", encoding="utf-8", newline="\n") as stream:
            stream.writelines(piece_lines(snapshot))
    except OSError:
        path.unlink(missing_ok=True)
        return None
    return WrittenPieces(path, sheet_header(snapshot))


def _unexpected(what: str) -> str:
    return (f"The file could not be read: the reader stopped unexpectedly ({what}). The file is unchanged; "
            "open it in the program that made it and save it again, or open a copy.")


def child_command(path: Path, pieces_to: Path | None) -> list[str]:
    """The command that reads ``path`` in a child process (and writes the sheet's piece lines to ``pieces_to``)."""
    return [sys.executable, "-m", "rankwise.readings.read_aside", str(path),
            *(["--pieces-to", str(pieces_to)] if pieces_to is not None else [])]


class ChildReading:
    """One file read in a child process; ``outcome()`` waits for it (without holding the window's turn).

    ``pieces_to``: where the child may write the piece lines of the sheet it reads (``Outcome.pieces``).
    """

    def __init__(self, path: Path, pieces_to: Path | None = None) -> None:
        package_parent = str(Path(__file__).resolve().parents[2])
        paths = [package_parent, *filter(None, os.environ.get("PYTHONPATH", "").split(os.pathsep))]
        environment = dict(os.environ, PYTHONPATH=os.pathsep.join(paths))
        self._errors = tempfile.TemporaryFile()
        self._child = subprocess.Popen(child_command(path, pieces_to), stdin=subprocess.DEVNULL, stdout=subprocess.PIPE,
                                       stderr=self._errors, env=environment)
        self.cancelled = False

    def outcome(self) -> Outcome:
        """The child's outcome; a child that ended without one (a crash, a kill) gives "failed"."""
        with self._errors:
            data = self._child.stdout.read()
            self._child.stdout.close()
            code = self._child.wait()
            if code == 0 and not self.cancelled:
                try:
                    outcome = pickle.loads(data)
                    if isinstance(outcome, Outcome):
                        return outcome
                except (pickle.UnpicklingError, EOFError, AttributeError, ImportError, ValueError):
                    pass
            return Outcome("failed", message=_unexpected(_ending(code)))

    def cancel(self) -> None:
        """Stop reading (the window is closing); ``outcome()`` then returns "failed" at once."""
        self.cancelled = True
        if self._child.poll() is None:
            self._child.kill()


def _ending(code: int) -> str:
    if code < 0:
        try:
            return f"it ended with signal {signal.Signals(-code).name}"
        except ValueError:
            return f"it ended with signal {-code}"
    return f"it ended with exit code {code}"


if __name__ == "__main__":
    if len(sys.argv) not in (2, 4) or (len(sys.argv) == 4 and sys.argv[2] != "--pieces-to"):
        sys.exit("usage: python -m rankwise.readings.read_aside FILE [--pieces-to PIECES]")
    from rankwise.readings import read_aside  # pickled under its own name, not as __main__

    sys.exit(read_aside._child_main(sys.argv[1], sys.argv[3] if len(sys.argv) == 4 else None))
