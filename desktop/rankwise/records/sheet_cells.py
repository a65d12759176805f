"""Writing one cell of a result workbook: numbers as numbers, dates as dates, text never as a formula."""

from __future__ import annotations

import math
import re
from datetime import datetime

from openpyxl.styles import Alignment, Font
from openpyxl.worksheet.worksheet import Worksheet

from rankwise.wording.numbers import MISSING
from rankwise.wording.verdict_types import KeyNumber

FORMULA_STARTS = ("=", "+", "-", "@")
"""A text beginning with one of these would be taken for a formula by a spreadsheet program."""

BOLD = Font(bold=True)
TITLE = Font(bold=True, size=14)
WRAP = Alignment(wrap_text=True, vertical="top")
DATE_TIME_FORMAT = "yyyy-mm-dd hh:mm:ss"

_LEADING_NUMBER = re.compile(r"^[-+]?\d+(?:\.(\d+))?")


def put(sheet: Worksheet, row: int, column: int, value: object, number_format: str | None = None,
        *, bold: bool = False, wrap: bool = False) -> None:
    """Write ``value`` at (row, column), 1-based.

    Text is always stored as text: a text that begins with = + - or @ is marked as a string and
    quote-prefixed, so no spreadsheet program runs it as a formula. Non-finite numbers and None
    leave the cell empty, apart from a "—" for a missing value. Datetimes are stored as dates
    (without the UTC offset, which Excel cannot hold; write the offset beside them).
    """
    cell = sheet.cell(row=row, column=column)
    if value is None:
        return
    if isinstance(value, float) and not math.isfinite(value):
        value = MISSING
    if isinstance(value, datetime):
        cell.value = value.replace(tzinfo=None, microsecond=0)
        cell.number_format = DATE_TIME_FORMAT
    elif isinstance(value, str):
        cell.value = value
        cell.data_type = "s"
        if value.startswith(FORMULA_STARTS):
            cell.quotePrefix = True
    else:
        cell.value = value
        if number_format:
            cell.number_format = number_format
    if bold:
        cell.font = BOLD
    if wrap:
        cell.alignment = WRAP


def reading_format(decimals: int | None, unit: str = "") -> str:
    """The number format that shows a reading at the gauge's resolution, with its unit."""
    if decimals is None:
        base = "General"
    elif decimals == 0:
        base = "0"
    else:
        base = "0." + "0" * decimals
    if unit:
        return f'{base}" {unit.replace(chr(34), "")}"'
    return base


def key_number_cell(number: KeyNumber) -> tuple[object, str | None]:
    """What to store for a key number: its raw value with a format that shows it as ``text``,
    or the text itself when the number has no value or a value a format cannot show."""
    text = number.text
    if number.value is None or not math.isfinite(number.value) or text == MISSING:
        return text, None
    if text.startswith("<"):
        bound = text[1:].strip()
        return number.value, f'[<{bound}]"< {bound}";' + reading_format(len(bound.partition(".")[2]))
    if text.endswith("%"):
        digits = len(text[:-1].strip().partition(".")[2])
        return number.value, "0" + ("." + "0" * digits if digits else "") + "%"
    match = _LEADING_NUMBER.match(text)
    if match is None or "e" in text.lower()[match.end():match.end() + 1]:
        return number.value, "General"
    decimals = len(match.group(1) or "")
    unit = text[match.end():].strip()
    return number.value, reading_format(decimals, unit)
