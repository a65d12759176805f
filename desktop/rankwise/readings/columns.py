"""Reading a whole column of a file: a fast path for clean numbers, every other cell read one by one.

A column of a big export is mostly plain numbers. Those are converted all at once (Python's
``float`` reads a plain decimal exactly as ``parse_reading`` does: the nearest binary number);
only the cells that are not plain numbers (blanks aside) go through ``parse_reading``. Cells are
built on demand, since a million of them take seconds and are rarely all needed.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

import numpy as np

from rankwise.readings.cells import EMPTY_CELL, Cell, CellKind
from rankwise.readings.parse import parse_reading

_PLAIN_NUMBER = re.compile(r"[+-]?[0-9]+(?:[.,][0-9]*)?|[+-]?[.,][0-9]+")
_PLAIN_CHARACTERS = {".": re.compile(r"[^0-9.+\-\n]"), ",": re.compile(r"[^0-9,+\-\n]")}


@dataclass(frozen=True)
class RawColumn:
    """One column of a file as read: its header and the texts of its data rows.

    Attributes:
        header: the column's header name.
        texts: the cells' texts in file order ("" for a blank), as a numpy object array.
        typed: numbers the file stored as numbers (XLSX), NaN elsewhere; None for text files.
        not_readings: rows the file stored as dates, times or true/false (XLSX), or None.
    """

    header: str
    texts: np.ndarray
    typed: np.ndarray | None = None
    not_readings: np.ndarray | None = None


@dataclass(frozen=True)
class ParsedColumn:
    """A column read as readings.

    Attributes:
        values: each row's number, NaN where the row holds no reading (blank, note, unreadable, censored).
        decimals: the most decimals written in the column, or None when it holds no number.
        odd_rows: the rows that are neither plain numbers nor blank, with their cells.
    """

    values: np.ndarray
    decimals: int | None
    odd_rows: dict[int, Cell] = field(default_factory=dict)
    raw: RawColumn | None = None
    decimal: str = "."

    def cell(self, row: int) -> Cell:
        """The cell of ``row`` as read."""
        if row in self.odd_rows:
            return self.odd_rows[row]
        text = self.raw.texts[row]
        if text == "":
            return EMPTY_CELL
        if self.raw.typed is not None and not np.isnan(self.raw.typed[row]):
            return Cell(text, CellKind.NUMBER, value=float(self.raw.typed[row]), decimals=_decimals_of(text))
        return parse_reading(text, decimal=self.decimal)

    def is_blank(self) -> np.ndarray:
        """True for the rows that are blank."""
        return self.raw.texts == ""


def parse_column(raw: RawColumn, decimal: str) -> ParsedColumn:
    """Read every row of ``raw`` as a reading, with ``decimal`` ("." or ",") as the decimal mark."""
    texts = raw.texts
    values = np.full(texts.shape[0], np.nan)
    decimals = -1
    filled = texts != ""
    if raw.typed is not None:
        typed = ~np.isnan(raw.typed)
        values[typed] = raw.typed[typed]
        filled &= ~typed
        decimals = max((_decimals_of(text) for text in texts[typed]), default=-1)
        if raw.not_readings is not None:
            filled &= ~raw.not_readings
    plain = texts[filled]
    joined = "\n".join(plain)
    fast = _read_plain_numbers(plain, joined, decimal)
    odd: dict[int, Cell] = {}
    if fast is not None:
        values[filled] = fast
        decimals = max(decimals, _most_fraction_digits(joined) if plain.size else -1)
    else:
        for row in np.flatnonzero(filled):
            text = texts[row]
            if _PLAIN_NUMBER.fullmatch(text) and ("," if decimal == "." else ".") not in text:
                values[row] = float(text.replace(",", "."))
                decimals = max(decimals, _decimals_of(text))
                continue
            cell = parse_reading(text, decimal=decimal)
            if cell.kind is CellKind.NUMBER:
                values[row] = cell.value
            else:
                odd[int(row)] = cell
            if cell.decimals is not None:
                decimals = max(decimals, cell.decimals)
    if raw.not_readings is not None:
        for row in np.flatnonzero(raw.not_readings):
            text = texts[row]
            odd[int(row)] = Cell(
                text, CellKind.NOTE, reason=f"'{text}' is a date, a time or a true/false value, not a reading."
            )
    return ParsedColumn(values, decimals if decimals >= 0 else None, odd, raw, decimal)


def _read_plain_numbers(texts: np.ndarray, joined: str, decimal: str) -> np.ndarray | None:
    """All texts (``joined`` by newlines) as floats when every one is a plain number; else None.

    A plain number is digits with at most one decimal mark and a sign; anything else goes to
    ``parse_reading`` cell by cell.
    """
    if texts.size == 0:
        return np.empty(0)
    if _PLAIN_CHARACTERS[decimal].search(joined):
        return None
    if decimal == ",":
        texts = np.array(joined.replace(",", ".").split("\n"), dtype=object)
    try:
        values = texts.astype(np.float64)
    except ValueError:
        return None
    return values


def _decimals_of(text: str) -> int:
    mantissa, _, exponent = text.lower().partition("e")
    fraction = mantissa.replace(",", ".").partition(".")[2]
    return max(0, len(fraction) - int(exponent or 0))


def _most_fraction_digits(joined: str) -> int:
    """The most digits after the decimal mark among plain number texts joined by newlines."""
    most = 0
    while re.search(rf"[.,][0-9]{{{most + 1}}}", joined):
        most += 1
    return most
