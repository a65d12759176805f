"""The sheet of readings exactly as entered: every cell's text or number, and why any was skipped."""

from __future__ import annotations

from openpyxl.utils import get_column_letter
from openpyxl.worksheet.worksheet import Worksheet

from collections.abc import Sequence

from rankwise.readings import CellKind, SheetSnapshot
from rankwise.readings.entry_counts import count_entries, reason_not_used
from rankwise.records.sheet_cells import put, put_paragraph, reading_format, set_print_setup
from rankwise.stats.analysis import GroupEntries
from rankwise.wording.entries import CENSORED, NOT_USED, READINGS_USED

SHEET_TITLE = "Readings as entered"
FIRST_ENTRY_ROW = 12
"""Row of the first entry; rows above hold each group's name, unit, limits and counts."""
REASON_WIDTH = 60
"""Width of the column that says why an entry is not a plain reading, when it is not a group's column."""
LANDSCAPE_FROM = 6
"""Groups from which the sheet is printed across the page (landscape)."""

_DECIMAL_WORDS = {"auto": "recognised automatically", ".": "point", ",": "comma"}


def fill_readings_sheet(sheet: Worksheet, snapshot: SheetSnapshot, entries: Sequence[GroupEntries] = ()) -> None:
    """Write every group's cells in entry order: readings as numbers at their typed resolution,
    everything else as the text that was typed; then the list of entries not used and why.

    Each group's counts are those of the analysis (``entries``, the count the verdict shows);
    a group the analysis did not use is counted from its cells the same way."""
    counted = {group.name: group for group in entries}
    last_column = max(len(snapshot.groups) + 1, 4)
    sheet.column_dimensions["A"].width = 24
    for index, group in enumerate(snapshot.groups):
        sheet.column_dimensions[get_column_letter(index + 2)].width = max(12, min(40, len(group.name) + 4))
    if len(snapshot.groups) < 3:
        sheet.column_dimensions["D"].width = REASON_WIDTH
    set_print_setup(sheet, landscape=len(snapshot.groups) >= LANDSCAPE_FROM, title_row=FIRST_ENTRY_ROW - 1)

    put_paragraph(sheet, 1, 1, last_column,
                  "Readings exactly as typed or opened; entries that are not readings keep their text.", bold=True)
    put(sheet, 2, 1, "Decimal mark")
    put(sheet, 2, 2, _DECIMAL_WORDS.get(snapshot.decimal, snapshot.decimal))
    labels = ["Group", "Unit", "Lower limit (LSL)", "Upper limit (USL)", "Nominal", READINGS_USED, NOT_USED,
              CENSORED]
    for offset, label in enumerate(labels):
        put(sheet, 3 + offset, 1, label, bold=True)
    parts = snapshot.parts
    put(sheet, FIRST_ENTRY_ROW - 1, 1, "Entry" if parts.ids is None else f"Entry: part ({parts.column})", bold=True)

    longest = max((len(group.cells) for group in snapshot.groups), default=0)
    for row in range(longest):
        part = parts.id_of(row)
        put(sheet, FIRST_ENTRY_ROW + row, 1, f"{row + 1}: {part}" if part else row + 1)

    not_used = []
    for index, group in enumerate(snapshot.groups):
        column = index + 2
        decimals = max((c.decimals for c in group.cells if c.decimals is not None), default=None)
        limit_format = reading_format(decimals)
        put(sheet, 3, column, group.name, bold=True)
        put(sheet, 4, column, group.unit)
        put(sheet, 5, column, group.lsl, limit_format)
        put(sheet, 6, column, group.usl, limit_format)
        put(sheet, 7, column, group.nominal, limit_format)
        count = counted.get(group.name) or count_entries(group.name, group.cells)
        put(sheet, 8, column, count.readings)
        put(sheet, 9, column, len(count.not_used))
        put(sheet, 10, column, count.censored)
        put(sheet, FIRST_ENTRY_ROW - 1, column, group.name, bold=True)
        for row, cell in enumerate(group.cells):
            target = FIRST_ENTRY_ROW + row
            if cell.kind is CellKind.NUMBER:
                put(sheet, target, column, cell.value, reading_format(cell.decimals))
            elif cell.kind is not CellKind.EMPTY:
                put(sheet, target, column, cell.text, indent=True)  # clear of a number beside it
            if cell.kind in (CellKind.NOTE, CellKind.INVALID, CellKind.CENSORED):
                not_used.append((group.name, row + 1, cell.text, reason_not_used(cell)))

    _not_used_table(sheet, FIRST_ENTRY_ROW + longest + 1, last_column, not_used)
    sheet.freeze_panes = sheet.cell(row=FIRST_ENTRY_ROW, column=2)


def _not_used_table(sheet: Worksheet, row: int, last_column: int, entries: list[tuple[str, int, str, str]]) -> None:
    """Below the readings: each entry that is not a plain reading, where it is, and why."""
    put(sheet, row, 1, "Entries that are not plain readings", bold=True)
    if not entries:
        put(sheet, row + 1, 1, "none")
        return
    for column, heading in enumerate(("Group", "Entry", "As typed", "Why"), start=1):
        put(sheet, row + 1, column, heading, bold=True)
    for target, (name, entry, text, reason) in enumerate(entries, start=row + 2):
        put(sheet, target, 1, name)
        put(sheet, target, 2, entry)
        put(sheet, target, 3, text, indent=True)
        put_paragraph(sheet, target, 4, last_column, reason)

