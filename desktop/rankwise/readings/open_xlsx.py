"""Workbooks (XLSX): safety checks on the zip container, sheet choice, cells as stored values.

Reading uses python-calamine (a Rust reader) rather than openpyxl's read-only mode: on the
benchmark here it reads a large sheet several times faster (tests/benchmarks/bench_open_readings.py
prints both). Formula cells give their stored (last calculated) values; dates, times and
true/false values are kept as text and are never readings, nor are stored values that are not
finite numbers (inf, nan) or too small for a float (2e-400, which a reader would make 0): their
text is read like typed text, which flags them. Every workbook is measured by
``workbook_check`` before the reader sees it.
"""

from __future__ import annotations

import datetime as dt
import math
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import python_calamine

from rankwise.readings import workbook_check
from rankwise.readings.columns import RawColumn
from rankwise.readings.errors import ReadingsError
from rankwise.readings.layout import is_number_text

OLE_SIGNATURE = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
"""The start of old .xls workbooks and of password-protected (encrypted) XLSX workbooks."""
_SMALLEST_NORMAL = 2.2250738585072014e-308
"""The smallest positive normal binary64 number (IEEE 754; sys.float_info.min)."""


@dataclass(frozen=True)
class WorkbookSheet:
    """One sheet of a workbook, read: its rows as values, the other sheets' names, and notes on the choice.

    Attributes:
        notes: plain words on which sheet was read when that was not plain (a hidden sheet, another
            sheet than the active one) and on merged cells spread over the rows they span.
    """

    name: str
    names: tuple[str, ...]
    rows: list[list[object]]
    notes: tuple[str, ...] = ()


@dataclass(frozen=True)
class StoredText:
    """A stored value that is not a number a reading can be (infinite, not a number, or too small for a float).

    Its ``text`` goes through the same reading as typed text, which flags it with the reason.
    """

    text: str


def read_sheet(path: Path, sheet: str | int | None) -> WorkbookSheet:
    """The rows of one sheet (by name or 0-based position; by default the active visible sheet).

    Every part of the workbook is measured first (``workbook_check``); a sheet is read only when
    the cells the reader would make room for stay within a readings export's size.
    """
    check = workbook_check.check_workbook(path)
    try:
        workbook = python_calamine.CalamineWorkbook.from_path(str(path))
        return _choose_and_read(path, workbook, check, sheet)
    except ReadingsError:
        raise
    except python_calamine.PasswordError as error:
        raise ReadingsError(
            f"The workbook '{path.name}' is protected by a password; save a copy without the password and open that."
        ) from error
    except BaseException as error:  # the reader's errors, and its panics, for broken parts of the container or its XML
        if not isinstance(error, Exception) and type(error).__name__ != "PanicException":
            raise
        raise workbook_check.damaged(path) from error


def _choose_and_read(path: Path, workbook, check: workbook_check.WorkbookCheck, sheet: str | int | None) -> WorkbookSheet:
    metadata = list(workbook.sheets_metadata)
    names = tuple(m.name for m in metadata)
    if not names:
        raise ReadingsError(f"The workbook '{path.name}' has no sheets; check that it is the right file.")
    parts = workbook_check.sheet_parts(check)
    kinds = {m.name: m for m in reversed(metadata)}  # the reader takes the first sheet of a name
    if sheet is not None:
        name = _sheet_name(path, sheet, names)
        if kinds[name].typ != python_calamine.SheetTypeEnum.WorkSheet:
            raise ReadingsError(f"The sheet '{name}' of '{path.name}' is a chart, not a sheet of cells; choose another sheet.")
        notes = ()
        if kinds[name].visible != python_calamine.SheetVisibleEnum.Visible:
            notes = (f"Sheet '{name}' is hidden in the workbook; it was read because it was chosen.",)
        rows, merged = _read_rows(path, workbook, check, parts, name)
        return WorkbookSheet(name, names, rows, notes + merged)
    worksheets = [m for m in metadata if m.typ == python_calamine.SheetTypeEnum.WorkSheet]
    visible = [m.name for m in worksheets if m.visible == python_calamine.SheetVisibleEnum.Visible]
    hidden = [m.name for m in worksheets if m.name not in visible]
    active = workbook_check.active_sheet_position(check)
    first = names[active] if 0 <= active < len(names) and names[active] in visible else (visible[0] if visible else None)
    if first is None:
        raise ReadingsError(
            f"Every sheet of the workbook '{path.name}' is hidden ({_listed(hidden)}); show the sheet with the "
            "readings in a spreadsheet program and save, or choose it by name."
        )
    rows, merged = _read_rows(path, workbook, check, parts, first)
    if _holds_numbers(rows):
        return WorkbookSheet(first, names, rows, merged)
    for name in visible:
        if name != first:
            other, other_merged = _read_rows(path, workbook, check, parts, name)
            if _holds_numbers(other):
                note = f"The sheet the workbook opens on, '{first}', holds no numbers; the readings were read from sheet '{name}'."
                return WorkbookSheet(name, names, other, (note,) + other_merged)
    if hidden:
        raise ReadingsError(
            f"The visible sheets of '{path.name}' hold no readings; only hidden sheets ({_listed(hidden)}) might: "
            "show the sheet with the readings in a spreadsheet program and save, or choose it by name."
        )
    return WorkbookSheet(first, names, rows, merged)


def _listed(names: list[str]) -> str:
    shown = ", ".join(f"'{n}'" for n in names[:5])
    return shown + (f" and {len(names) - 5} more" if len(names) > 5 else "")


def _read_rows(
    path: Path, workbook, check: workbook_check.WorkbookCheck, parts: dict[str, str], name: str
) -> tuple[list[list[object]], tuple[str, ...]]:
    """The rows of sheet ``name`` once its cells are known to fit, with merged group labels spread down, and notes."""
    extent = check.extent_of(parts.get(name))
    if extent.damaged:
        raise ReadingsError(
            f"The sheet '{name}' of '{path.name}' is damaged ({extent.damaged}); open the workbook in a spreadsheet "
            "program and save it again, or export the sheet as CSV."
        )
    if extent.cells > workbook_check.MAX_SHEET_CELLS or extent.filled > workbook_check.MAX_SHEET_CELLS:
        raise ReadingsError(
            f"The sheet '{name}' of '{path.name}' spans {workbook_check.describe_extent(extent)} (A1 to "
            f"{column_letters(extent.columns)}{extent.rows}), far more cells than a readings export holds "
            f"(at most {workbook_check.MAX_SHEET_CELLS:,}); check that this is the right file, or export the readings as CSV."
        )
    sheet = workbook.get_sheet_by_name(name)
    rows = sheet.to_python(skip_empty_area=False)
    for (row, column), text in extent.tiny.items():
        if row < len(rows) and column < len(rows[row]):
            rows[row][column] = StoredText(text)
    return rows, _spread_merged_labels(rows, sheet.merged_cell_ranges or ())


def _spread_merged_labels(rows: list[list[object]], merged) -> tuple[str, ...]:
    """Write the text of cells merged over several rows into every row of the merge's first column.

    A group label merged over the rows of its group applies to each of them. Merged numbers are
    left in their first cell (a reading is one reading however tall its cell), and merges within
    one row (titles, labels beside a limit) are left as they are.
    """
    spread: list[str] = []
    budget = sum(len(row) for row in rows)
    for (top, left), (bottom, _right) in merged:
        if bottom <= top or top >= len(rows) or left >= len(rows[top]):
            continue
        label = rows[top][left]
        if not isinstance(label, str) or not label.strip():
            continue
        for row in range(top + 1, min(bottom, len(rows) - 1) + 1):
            budget -= 1
            if budget < 0:
                raise ReadingsError("The workbook's merged cells overlap far more than any sheet allows; it is damaged.")
            if left < len(rows[row]) and rows[row][left] in ("", None):
                rows[row][left] = label
        spread.append(f"{column_letters(left + 1)}{top + 1}:{column_letters(left + 1)}{bottom + 1}")
    if not spread:
        return ()
    shown = ", ".join(spread[:4]) + (f" and {len(spread) - 4} more" if len(spread) > 4 else "")
    return (f"Labels in merged cells ({shown}) were applied to every row they span.",)


def column_letters(column: int) -> str:
    """The letters of a 1-based column number (1 gives "A", 16384 gives "XFD")."""
    letters = ""
    while column > 0:
        column, rest = divmod(column - 1, 26)
        letters = chr(65 + rest) + letters
    return letters


def is_stored_number(value: object) -> bool:
    """True for a number the workbook stores that can be a reading: finite, and zero or not too small for a float."""
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        return False
    return math.isfinite(value) and (value == 0 or abs(value) >= _SMALLEST_NORMAL)


def _holds_numbers(rows: list[list[object]]) -> bool:
    """True when the first rows hold a stored number or a text that reads as one."""
    return any(is_stored_number(v) or (isinstance(v, str) and is_number_text(v)) for row in rows[:200] for v in row)


def _sheet_name(path: Path, sheet: str | int, names: tuple[str, ...]) -> str:
    if isinstance(sheet, int) and not isinstance(sheet, bool):
        if 0 <= sheet < len(names):
            return names[sheet]
    elif isinstance(sheet, str) and sheet in names:
        return sheet
    raise ReadingsError(
        f"The workbook '{path.name}' has no sheet {sheet!r}; its sheets are: {', '.join(names)}."
    )


def value_text(value: object, decimal: str = ".") -> str:
    """The text for a stored value: numbers in their shortest exact form with ``decimal`` as the mark, dates in ISO form."""
    if value is None:
        return ""
    if isinstance(value, StoredText):
        return value.text
    if isinstance(value, bool):
        return "TRUE" if value else "FALSE"
    if isinstance(value, int):
        return str(value)
    if isinstance(value, float):
        if value.is_integer() and abs(value) < 1e15:
            return str(int(value))
        return repr(value).replace(".", decimal)
    if isinstance(value, (dt.datetime, dt.date, dt.time)):
        return value.isoformat()
    if isinstance(value, dt.timedelta):
        return str(value)
    return str(value)


def raw_columns(
    rows: list[list[object]], first_data_row: int, headers: list[str], decimal: str, wanted: list[int]
) -> list[RawColumn]:
    """The ``wanted`` columns' data rows as texts, stored numbers and not-a-reading marks.

    Stored numbers are written with the workbook's decimal mark, so that the texts read back the same.
    """
    data = rows[first_data_row:]
    columns = []
    for j in wanted:
        header = headers[j]
        values = [row[j] if j < len(row) else None for row in data]
        texts = np.empty(len(values), dtype=object)
        texts[:] = [value_text(v, decimal) for v in values]
        typed = np.array(
            [float(v) if is_stored_number(v) else np.nan for v in values],
            dtype=float,
        )
        not_readings = np.array(
            [isinstance(v, (bool, dt.datetime, dt.date, dt.time, dt.timedelta)) for v in values], dtype=bool
        )
        columns.append(RawColumn(header, texts, typed, not_readings))
    return columns
