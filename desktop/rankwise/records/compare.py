"""Cell-by-cell and value-by-value comparison, reported in plain words."""

from __future__ import annotations

import io
import math
from collections.abc import Iterator
from datetime import datetime
from typing import Any

from openpyxl import Workbook, load_workbook
from openpyxl.worksheet.worksheet import Worksheet
from openpyxl.writer.excel import save_workbook


def saved_and_reloaded(workbook: Workbook) -> Workbook:
    """``workbook`` as a spreadsheet file would give it back (numbers, dates and formats as stored)."""
    buffer = io.BytesIO()
    save_workbook(workbook, buffer)
    buffer.seek(0)
    return load_workbook(buffer)


def _shown(value: Any) -> str:
    """A cell's value for a message."""
    if value is None or value == "":
        return "(empty)"
    if isinstance(value, datetime):
        return value.isoformat(sep=" ")
    return repr(value) if isinstance(value, str) else str(value)


def sheet_differences(expected: Worksheet, actual: Worksheet) -> Iterator[str]:
    """Every cell whose value or number format differs between two sheets, in plain words."""
    rows = max(expected.max_row, actual.max_row)
    columns = max(expected.max_column, actual.max_column)
    for row in range(1, rows + 1):
        for column in range(1, columns + 1):
            want = expected.cell(row=row, column=column)
            got = actual.cell(row=row, column=column)
            if want.value != got.value:
                yield value_changed(actual.title, got.coordinate, want.value, got.value)
            elif want.value is not None and want.number_format != got.number_format:
                yield format_changed(actual.title, got.coordinate, want.number_format, got.number_format)


def value_changed(title: str, coordinate: str, signed: Any, now: Any) -> str:
    """Plain words for a cell whose value differs from what was signed."""
    return (f"Sheet '{title}', cell {coordinate}: the signed data give "
            f"{_shown(signed)}, the sheet now shows {_shown(now)}.")


def format_changed(title: str, coordinate: str, signed_format: str, format_now: str) -> str:
    """Plain words for a cell whose value is shown differently from when it was signed."""
    return (f"Sheet '{title}', cell {coordinate}: the way the value is shown was "
            f"changed from '{signed_format}' to '{format_now}'.")


def data_differences(stored: Any, recomputed: Any, path: str = "") -> Iterator[str]:
    """Where two plain JSON data trees differ; numbers agree within 1e-9 relative (1e-12 absolute)."""
    if isinstance(stored, dict) and isinstance(recomputed, dict):
        for key in sorted(set(stored) | set(recomputed)):
            yield from data_differences(stored.get(key), recomputed.get(key), f"{path}.{key}" if path else key)
    elif isinstance(stored, list) and isinstance(recomputed, list):
        if len(stored) != len(recomputed):
            yield f"{path}: {len(stored)} entries on record, {len(recomputed)} recomputed"
            return
        for index, (a, b) in enumerate(zip(stored, recomputed)):
            yield from data_differences(a, b, f"{path}[{index}]")
    elif _numbers(stored, recomputed):
        if not math.isclose(stored, recomputed, rel_tol=1e-9, abs_tol=1e-12):
            yield f"{path}: {stored!r} on record, {recomputed!r} recomputed"
    elif stored != recomputed:
        yield f"{path}: {stored!r} on record, {recomputed!r} recomputed"


def _numbers(*values: Any) -> bool:
    return all(isinstance(v, (int, float)) and not isinstance(v, bool) for v in values)
