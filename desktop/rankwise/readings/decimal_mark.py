"""One decimal mark per sheet: the sheet's stated mark, or the mark its first readings show.

With the sheet's mark on "auto", the first reading (group by group, row by row) whose text shows
its decimal mark beyond doubt ("0,998", "12.5") decides it for the whole sheet; until one does,
the machine's mark is used. A reading whose only separator is the other mark and could group
thousands ("1,002" in a decimal-point sheet) is then flagged, never read as 1002. The decision
is said in plain words (``status``) so that the window can show it.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

from rankwise.readings.cells import CellKind
from rankwise.readings.parse import decimal_shown, machine_decimal

if TYPE_CHECKING:
    from rankwise.readings.sheet import GroupColumn

_MARK_NAMES = {".": "decimal point", ",": "decimal comma"}


@dataclass(frozen=True)
class DecidingReading:
    """The reading that decided an "auto" sheet's decimal mark: the mark, and where the reading is (0-based)."""

    mark: str
    group: int
    row: int


def first_showing(
    groups: Sequence[GroupColumn], group_range: range | None = None, row_range: range | None = None
) -> DecidingReading | None:
    """The first cell, group by group and row by row (within the given ranges), whose text shows its decimal mark."""
    for g in group_range if group_range is not None else range(len(groups)):
        if g >= len(groups):
            break
        cells = groups[g].cells
        rows = range(len(cells)) if row_range is None else range(row_range.start, min(row_range.stop, len(cells)))
        for r in rows:
            cell = cells[r]
            if cell.kind is CellKind.EMPTY or cell.kind is CellKind.NOTE:
                continue
            mark = decimal_shown(cell.text)
            if mark is not None:
                return DecidingReading(mark, g, r)
    return None


def status(setting: str, decided: DecidingReading | None, groups: Sequence[GroupColumn]) -> str:
    """Plain words on the mark the sheet reads numbers with, and why."""
    if setting in _MARK_NAMES:
        return f"Numbers are read with a {_MARK_NAMES[setting]}, as chosen."
    if decided is not None:
        cell = groups[decided.group].cells[decided.row]
        return (f"Numbers are read with a {_MARK_NAMES[decided.mark]}, as the first reading that shows one, "
                f"'{cell.text.strip()[:20]}' ({groups[decided.group].name}, row {decided.row + 1}), is written.")
    return (f"Numbers are read with a {_MARK_NAMES[machine_decimal()]}, as this computer is set up, until a "
            "reading shows its decimal mark.")


def label(setting: str, decided: DecidingReading | None, groups: Sequence[GroupColumn]) -> str:
    """A few words on the same, for a status line: "Decimal comma (from 0,998 in A, row 1)"."""
    if setting in _MARK_NAMES:
        return f"{_MARK_NAMES[setting].capitalize()} (chosen)"
    if decided is not None:
        cell = groups[decided.group].cells[decided.row]
        return (f"{_MARK_NAMES[decided.mark].capitalize()} (from {cell.text.strip()[:12]} in "
                f"{groups[decided.group].name[:20]}, row {decided.row + 1})")
    return f"{_MARK_NAMES[machine_decimal()].capitalize()} (this computer's, until a reading shows one)"


def reading_mark(setting: str, decided: DecidingReading | None) -> str:
    """The mark typed text is read with: the stated one, the decided one, or "auto" (the machine's) until one decides."""
    if setting != "auto":
        return setting
    return decided.mark if decided is not None else "auto"
