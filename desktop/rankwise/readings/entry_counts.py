"""The one count of a group's entries: readings, notes and unreadable entries, empty cells, flags.

Screen, workbook and printed verdict all show this count (``rankwise.stats.analysis.GroupEntries``),
so they cannot disagree. Text in a cell is never called a blank, and empty cells above a group's
first entry or below its last are not counted: they are simply where the column starts or ends.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from typing import TYPE_CHECKING

import numpy as np

from rankwise.readings.cells import Cell, CellKind
from rankwise.readings.column_arrays import INVALID, NOTE
from rankwise.readings.suspicious import flag_readings, flag_rows
from rankwise.stats.analysis import Entry, GroupEntries

if TYPE_CHECKING:
    from rankwise.readings.sheet import GroupColumn


def count_entries(name: str, cells: Sequence[Cell], *, lsl: float | None = None, usl: float | None = None,
                  unit: str = "", censored: Callable[[Cell], bool] | None = None) -> GroupEntries:
    """How the ``cells`` of group ``name`` divide up.

    ``censored`` tells which cells are handed to the statistics as below a detection limit (by
    default the cells written "<limit"); the flags are those of ``rankwise.readings.suspicious``.
    """
    is_censored = censored or (lambda cell: cell.kind is CellKind.CENSORED)
    filled = [row for row, cell in enumerate(cells) if cell.kind is not CellKind.EMPTY]
    first, last = (filled[0], filled[-1]) if filled else (0, -1)
    readings = sum(1 for cell in cells if cell.kind in (CellKind.NUMBER, CellKind.CENSORED))
    flags = flag_readings(cells, lsl=lsl, usl=usl, unit=unit)
    return GroupEntries(
        name=name,
        readings=readings,
        censored=sum(1 for cell in cells if is_censored(cell)),
        not_used=tuple(Entry(row + 1, cell.text.strip(), reason_not_used(cell))
                       for row, cell in enumerate(cells) if cell.is_skipped),
        empty_between=sum(1 for cell in cells[first:last + 1] if cell.kind is CellKind.EMPTY),
        flagged=tuple(Entry(row + 1, cells[row].text.strip(), remark)
                      for row, remarks in flags.items() for remark in remarks),
    )


def count_column(column: GroupColumn) -> GroupEntries:
    """``count_entries`` of a sheet's group with the cells written "<limit" as the censored ones, taken
    from the group's arrays (``GroupColumn.arrays``): only the entries listed are looked at one by one."""
    arrays = column.arrays()
    counts = arrays.counts()
    cells = column.cells
    flags = flag_rows(arrays.reading_rows(), arrays.measured(), lambda row: cells[row].text,
                      lsl=column.lsl, usl=column.usl, unit=column.unit)
    return GroupEntries(
        name=column.name,
        readings=counts.used + counts.censored,
        censored=counts.censored,
        not_used=tuple(Entry(row + 1, cells[row].text.strip(), reason_not_used(cells[row]))
                       for row in np.flatnonzero((arrays.kinds == NOTE) | (arrays.kinds == INVALID)).tolist()),
        empty_between=counts.blanks,
        flagged=tuple(Entry(row + 1, cells[row].text.strip(), remark)
                      for row, remarks in flags.items() for remark in remarks),
    )


def reason_not_used(cell: Cell) -> str:
    """Why an entry is not a plain reading: the reason found when it was read, else the kind's."""
    if cell.reason:
        return cell.reason
    if cell.kind is CellKind.CENSORED:
        return "below the detection limit; ranked below every measured reading"
    if cell.kind is CellKind.NOTE:
        return "a note, not a reading"
    return "cannot be read as a number"
