"""One cell of readings: the text exactly as typed or read, and what it means."""

from __future__ import annotations

import enum
from dataclasses import dataclass


class CellKind(str, enum.Enum):
    """What a cell holds."""

    EMPTY = "empty"
    """Nothing typed; blanks at the end of a column are normal."""
    NUMBER = "number"
    """A reading that is used."""
    NOTE = "note"
    """A text note such as "n/a", "scrap" or "re-measure": kept, skipped, and counted."""
    CENSORED = "censored"
    """A reading below a detection limit, written "<0.05": kept and ranked below every measured reading."""
    INVALID = "invalid"
    """An attempt at a number that cannot be read (e.g. "0,4,2", "12..5", or the wrong unit)."""


@dataclass(frozen=True, slots=True)
class Cell:
    """A cell of the readings sheet.

    Attributes:
        text: the text exactly as typed or read from the file.
        kind: what the text means (see ``CellKind``).
        value: the reading, for NUMBER cells only; otherwise None.
        limit: the detection limit, for CENSORED cells only ("<0.05" gives 0.05); otherwise None.
        decimals: the number of decimals as typed (the gauge's resolution), for NUMBER and
            CENSORED cells; otherwise None.
        reason: plain words why the cell is not used as a reading; "" for numbers and blanks.
    """

    text: str
    kind: CellKind
    value: float | None = None
    limit: float | None = None
    decimals: int | None = None
    reason: str = ""

    @property
    def is_reading(self) -> bool:
        """True for a cell whose number is used as a reading."""
        return self.kind is CellKind.NUMBER

    @property
    def is_skipped(self) -> bool:
        """True for a cell with text that is not used (a note or an unreadable entry)."""
        return self.kind is CellKind.NOTE or self.kind is CellKind.INVALID


EMPTY_CELL = Cell("", CellKind.EMPTY)
"""The cell past the end of a column, and every blank."""


@dataclass(frozen=True, slots=True)
class SkippedCell:
    """A cell with text that is not used as a reading, and why.

    Attributes:
        text: the text exactly as typed or read.
        reason: plain words why it is not used.
        row: in a sheet, the 0-based row of the grid; in an opened file, the row number a
            spreadsheet program shows (1-based, header and title lines counted).
        column: the group's name (sheet) or the header of the file's column (file).
    """

    text: str
    reason: str
    row: int
    column: str


@dataclass(frozen=True, slots=True)
class GroupCounts:
    """How a group's cells divide up.

    Attributes:
        used: readings used (numbers).
        skipped: text notes and unreadable entries, not used.
        censored: readings below a detection limit (used as ties below every measured reading).
        blanks: empty cells between entries.
    """

    used: int
    skipped: int
    censored: int
    blanks: int
