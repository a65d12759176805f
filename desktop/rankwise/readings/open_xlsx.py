"""Workbooks (XLSX): safety checks on the zip container, sheet choice, cells as stored values.

Reading uses python-calamine (a Rust reader) rather than openpyxl's read-only mode: on the
benchmark here it reads a large sheet several times faster (tests/benchmarks/bench_open_readings.py
prints both). Formula cells give their stored (last calculated) values; dates, times and
true/false values are kept as text and are never readings.
"""

from __future__ import annotations

import datetime as dt
import zipfile
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import python_calamine

from rankwise.readings.columns import RawColumn
from rankwise.readings.errors import ReadingsError
from rankwise.readings.layout import is_number_text

MAX_UNPACKED_BYTES = 1 << 30
"""A workbook unpacking to more than this (1 GiB) is refused: no readings export is that big."""
MAX_PACKING_RATIO = 200
"""A member packed more than this many times (and over 10 MB unpacked) marks a zip bomb."""

OLE_SIGNATURE = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
"""The start of old .xls workbooks and of password-protected (encrypted) XLSX workbooks."""


@dataclass(frozen=True)
class WorkbookSheet:
    """One sheet of a workbook, read: its rows as values, and the other sheets' names."""

    name: str
    names: tuple[str, ...]
    rows: list[list[object]]


def check_container(path: Path) -> None:
    """Refuse damaged, encrypted, non-workbook and absurdly large zip containers with a plain sentence."""
    try:
        with zipfile.ZipFile(path) as archive:
            members = archive.infolist()
    except (zipfile.BadZipFile, OSError, ValueError, EOFError, NotImplementedError, RuntimeError) as error:
        raise ReadingsError(
            f"The workbook '{path.name}' is damaged and cannot be opened; open it in a spreadsheet program "
            "and save it again, or export the sheet as CSV."
        ) from error
    unpacked = sum(member.file_size for member in members)
    bomb = any(
        member.file_size > 10_000_000 and member.file_size > MAX_PACKING_RATIO * max(member.compress_size, 1)
        for member in members
    )
    if unpacked > MAX_UNPACKED_BYTES or bomb:
        raise ReadingsError(
            f"The workbook '{path.name}' would unpack to {unpacked / 1e9:,.1f} GB, far more than any readings "
            "export; it is damaged or not a real workbook, so it was not opened."
        )
    names = {member.filename for member in members}
    if "xl/workbook.xml" not in names:
        if "content.xml" in names:
            raise ReadingsError(
                f"'{path.name}' is an OpenDocument spreadsheet; save it as XLSX or CSV and open that."
            )
        raise ReadingsError(
            f"'{path.name}' is a zip archive, not an Excel workbook; open a CSV or XLSX file of readings."
        )


def read_sheet(path: Path, sheet: str | int | None) -> WorkbookSheet:
    """The rows of one sheet (by name or 0-based position; by default the first sheet holding numbers)."""
    try:
        workbook = python_calamine.CalamineWorkbook.from_path(str(path))
        names = tuple(workbook.sheet_names)
        if not names:
            raise ReadingsError(f"The workbook '{path.name}' has no sheets; check that it is the right file.")
        if sheet is None:
            for name in names:
                rows = workbook.get_sheet_by_name(name).to_python(skip_empty_area=False)
                if _holds_numbers(rows):
                    return WorkbookSheet(name, names, rows)
            return WorkbookSheet(names[0], names, workbook.get_sheet_by_name(names[0]).to_python(skip_empty_area=False))
        name = _sheet_name(path, sheet, names)
        return WorkbookSheet(name, names, workbook.get_sheet_by_name(name).to_python(skip_empty_area=False))
    except ReadingsError:
        raise
    except python_calamine.PasswordError as error:
        raise ReadingsError(
            f"The workbook '{path.name}' is protected by a password; save a copy without the password and open that."
        ) from error
    except Exception as error:  # the reader's errors for broken parts of the container or its XML
        raise ReadingsError(
            f"The workbook '{path.name}' is damaged and cannot be read; open it in a spreadsheet program "
            "and save it again, or export the sheet as CSV."
        ) from error


def _holds_numbers(rows: list[list[object]]) -> bool:
    """True when the first rows hold a stored number or a text that reads as one."""
    return any(
        (isinstance(v, (int, float)) and not isinstance(v, bool)) or (isinstance(v, str) and is_number_text(v))
        for row in rows[:200]
        for v in row
    )


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
            [float(v) if isinstance(v, (int, float)) and not isinstance(v, bool) else np.nan for v in values],
            dtype=float,
        )
        not_readings = np.array(
            [isinstance(v, (bool, dt.datetime, dt.date, dt.time, dt.timedelta)) for v in values], dtype=bool
        )
        columns.append(RawColumn(header, texts, typed, not_readings))
    return columns
