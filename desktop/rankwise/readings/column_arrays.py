"""A group's cells as numpy arrays (kind, value, decimals per row), kept in step with each edit.

The sheet changes these arrays cell by cell as it changes the cells, so the counts behind the
status line and the planner's starting values cost milliseconds on a million readings instead of a
pass over every cell after every edit. ``ColumnArrays.mirrors`` tells whether the arrays still
belong to a list of cells; anything else that replaces the list gets fresh arrays on next use.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence

import numpy as np

from rankwise.readings.cells import Cell, CellKind, GroupCounts
from rankwise.readings.suspicious import flag_rows

KIND_CODES = {CellKind.EMPTY: 0, CellKind.NUMBER: 1, CellKind.NOTE: 2, CellKind.CENSORED: 3, CellKind.INVALID: 4}
"""The code of each kind of cell in ``ColumnArrays.kinds``."""

EMPTY, NUMBER, NOTE, CENSORED, INVALID = (KIND_CODES[CellKind.EMPTY], KIND_CODES[CellKind.NUMBER], KIND_CODES[CellKind.NOTE],
                                           KIND_CODES[CellKind.CENSORED], KIND_CODES[CellKind.INVALID])

NO_DECIMALS = -1
"""``ColumnArrays.decimals`` of a cell that is not a reading with known decimals."""


def _code(cell: Cell) -> int:
    return KIND_CODES[cell.kind]


def _value(cell: Cell) -> float:
    return float(cell.value) if cell.kind is CellKind.NUMBER else np.nan


def _decimals(cell: Cell) -> int:
    return cell.decimals if cell.kind is CellKind.NUMBER and cell.decimals is not None else NO_DECIMALS


_ARRAY_ANSWERS = ("rows", "measured")
"""Answers that are arrays as long as the column, found again in one numpy pass (not pickled)."""


class ColumnArrays:
    """One group's cells as arrays: ``kinds`` (codes of ``KIND_CODES``), ``values`` (the readings,
    NaN elsewhere) and ``decimals`` (of the readings, ``NO_DECIMALS`` elsewhere)."""

    __slots__ = ("_cells", "kinds", "values", "decimals", "_answers")

    def __init__(self, cells: list[Cell]) -> None:
        self._cells = cells
        count = len(cells)
        self.kinds = np.fromiter(map(_code, cells), dtype=np.int8, count=count)
        self.values = np.fromiter(map(_value, cells), dtype=np.float64, count=count)
        self.decimals = np.fromiter(map(_decimals, cells), dtype=np.int32, count=count)
        self._answers: dict[str, object] = {}
        """What the window asked since the last change (it asks the same several times per edit)."""

    def copy_for(self, cells: list[Cell]) -> ColumnArrays:
        """A copy of these arrays for ``cells``, a copy of the list they mirror (numpy copies, no pass over the cells)."""
        if len(cells) != self.kinds.size:
            raise ValueError("the cells are not a copy of the list these arrays mirror")
        twin = ColumnArrays.__new__(ColumnArrays)
        twin._cells, twin._answers = cells, {}
        twin.kinds, twin.values, twin.decimals = self.kinds.copy(), self.values.copy(), self.decimals.copy()
        return twin

    def __getstate__(self) -> tuple:
        # not the cells (their group gives them back), nor the answers that are only a pass over the arrays
        answers = {key: answer for key, answer in self._answers.items() if key not in _ARRAY_ANSWERS}
        return self.kinds, self.values, self.decimals, answers

    def __setstate__(self, state: tuple) -> None:
        self.kinds, self.values, self.decimals, self._answers = state
        self._cells = None

    def adopt(self, cells: list[Cell]) -> None:
        """Mirror ``cells`` again after being unpickled (``cells``: the group's list, as long as these arrays)."""
        if len(cells) != self.kinds.size:
            raise ValueError("the cells are not the list these arrays were made from")
        self._cells = cells

    def mirrors(self, cells: list[Cell]) -> bool:
        """True when these arrays are those of ``cells`` (the same list, as long)."""
        return cells is self._cells and len(cells) == self.kinds.size

    # ----- kept in step with the list (each called right after the same change to it) -------------

    def set(self, row: int, cell: Cell) -> None:
        """``cells[row] = cell`` (``row`` inside the column)."""
        self._answers.clear()
        self.kinds[row], self.values[row], self.decimals[row] = _code(cell), _value(cell), _decimals(cell)

    def insert(self, row: int, cells: Sequence[Cell]) -> None:
        """``cells[row:row] = cells``."""
        self._answers.clear()
        self.kinds = np.insert(self.kinds, row, np.fromiter(map(_code, cells), dtype=np.int8, count=len(cells)))
        self.values = np.insert(self.values, row, np.fromiter(map(_value, cells), dtype=np.float64, count=len(cells)))
        self.decimals = np.insert(self.decimals, row, np.fromiter(map(_decimals, cells), dtype=np.int32,
                                                                   count=len(cells)))

    def delete(self, start: int, stop: int) -> None:
        """``del cells[start:stop]``."""
        self._answers.clear()
        self.kinds = np.delete(self.kinds, np.s_[start:stop])
        self.values = np.delete(self.values, np.s_[start:stop])
        self.decimals = np.delete(self.decimals, np.s_[start:stop])

    # ----- what the window asks ---------------------------------------------------------------------

    def counts(self) -> GroupCounts:
        """The count of ``rankwise.readings.entry_counts.count_entries`` without its flags: readings used,
        entries not used, readings below a detection limit, empty cells between the first and last entry."""
        if "counts" not in self._answers:
            self._answers["counts"] = self._count()
        return self._answers["counts"]

    def _count(self) -> GroupCounts:
        tally = np.bincount(self.kinds, minlength=len(KIND_CODES))
        filled = self.kinds.size - int(tally[EMPTY])
        if filled:
            first = int(np.argmax(self.kinds != EMPTY))
            last = self.kinds.size - 1 - int(np.argmax(self.kinds[::-1] != EMPTY))
            blanks = last - first + 1 - filled
        else:
            blanks = 0
        return GroupCounts(used=int(tally[NUMBER]), skipped=int(tally[NOTE] + tally[INVALID]),
                           censored=int(tally[CENSORED]), blanks=blanks)

    def reading_rows(self) -> np.ndarray:
        """The rows of the measured readings (read-only)."""
        if "rows" not in self._answers:
            self._answers["rows"] = _read_only(np.flatnonzero(self.kinds == NUMBER).astype(np.int32))
        return self._answers["rows"]

    def squares_about_mean(self) -> float:
        """The sum of the squared deviations of the measured readings from their mean (for the pooled spread)."""
        if "squares" not in self._answers:
            measured = self.measured()
            self._answers["squares"] = float(np.sum((measured - measured.mean()) ** 2)) if measured.size else 0.0
        return self._answers["squares"]

    def finest_decimals(self) -> int:
        """The most decimals of the measured readings, ``NO_DECIMALS`` when none is known."""
        if "decimals" not in self._answers:
            self._answers["decimals"] = int(self.decimals.max()) if self.decimals.size else NO_DECIMALS
        return self._answers["decimals"]

    def flags(self, text_of: Callable[[int], str], lsl: float | None, usl: float | None,
              unit: str) -> dict[int, tuple[str, ...]]:
        """``rankwise.readings.suspicious.flag_rows`` of the measured readings (``text_of(row)``: a
        row's text), kept until the next change; the caller must not change what it returns."""
        key = ("flags", lsl, usl, unit)
        if key not in self._answers:
            self._answers[key] = flag_rows(self.reading_rows(), self.measured(), text_of, lsl=lsl, usl=usl, unit=unit)
        return self._answers[key]

    def measured(self) -> np.ndarray:
        """The measured readings in row order (readings below a detection limit, notes and blanks left
        out; read-only). When every row holds a reading it is a view of ``values``, not a copy, valid
        until the next change."""
        if "measured" not in self._answers:
            rows = self.reading_rows()
            every_row = rows.size == self.values.size
            self._answers["measured"] = _read_only(self.values.view() if every_row else self.values[rows])
        return self._answers["measured"]


def _read_only(array: np.ndarray) -> np.ndarray:
    array.setflags(write=False)
    return array
