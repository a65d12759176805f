"""Reading a whole column of a file: fast paths for clean numbers, every other cell read one by one.

A column of a big export is mostly plain numbers. A text file's column that holds only numbers
and blanks is read straight as numbers by pandas' C parser; its texts are read only when the cells
are asked for. Other columns are converted all at once where every text is a plain number (Python's
``float`` reads a plain decimal exactly as ``parse_reading`` does: the nearest binary number), and
cell by cell with ``parse_reading`` otherwise. Cells are built on demand, since a million of them
take seconds and are rarely all needed.
"""

from __future__ import annotations

import functools
import math
import re
from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np

from rankwise.readings.cells import EMPTY_CELL, Cell, CellKind
from rankwise.readings.errors import ReadingsError
from rankwise.readings.parse import SMALLEST_NORMAL, parse_reading
from rankwise.stats.grid import find_grid

_PLAIN_NUMBER = re.compile(r"[+-]?[0-9]+(?:[.,][0-9]*)?|[+-]?[.,][0-9]+")
CONVERT_CHUNK = 50_000
"""Texts read as plain numbers in one step. Joining, searching and converting texts each hold
Python's interpreter lock for the whole call: over 10^6 texts at once (0.1 to 0.3 s a call) they
stopped the window's thread, which needs the lock to turn; between chunks the lock is let go."""
_PLAIN_CHARACTERS = {".": re.compile(r"[^0-9.+\-\n]"), ",": re.compile(r"[^0-9,+\-\n]")}


@dataclass(frozen=True)
class RawColumn:
    """One column of a file as read: its header and the texts of its data rows.

    Attributes:
        header: the column's header name.
        texts: the cells' texts in file order ("" for a blank), as a numpy object array; None
            when the column was read straight as numbers (then ``typed`` holds them, NaN for
            blanks, and ``load_texts`` reads the texts when they are needed).
        typed: numbers the file stored as numbers (XLSX) or read straight as numbers (text
            files), NaN elsewhere; None when the texts are all there is.
        not_readings: rows the file stored as dates, times or true/false (XLSX), or None.
        load_texts: reads the texts of a column read straight as numbers.
    """

    header: str
    texts: np.ndarray | None
    typed: np.ndarray | None = None
    not_readings: np.ndarray | None = None
    load_texts: Callable[[], np.ndarray] | None = field(default=None, repr=False, compare=False)

    @functools.cached_property
    def cell_texts(self) -> np.ndarray:
        """The texts of every row (read from the file on first use for a column read as numbers)."""
        return self.texts if self.texts is not None else self.load_texts()


@dataclass(frozen=True)
class ParsedColumn:
    """A column read as readings.

    Attributes:
        values: each row's number, NaN where the row holds no reading (blank, note, unreadable, censored).
        odd_rows: the rows that are neither plain numbers nor blank, with their cells.
        raw: the column as read.
        decimal: the decimal mark the texts were read with.
        text_decimals: the most decimals written, found from the texts (None when no number or
            when the column was read straight as numbers).
    """

    values: np.ndarray
    odd_rows: dict[int, Cell] = field(default_factory=dict)
    raw: RawColumn | None = None
    decimal: str = "."
    text_decimals: int | None = None

    @functools.cached_property
    def decimals(self) -> int | None:
        """The most decimals written in the column (the gauge's resolution), or None when it holds no number.

        For a column read straight as numbers this is the finest decimal the numbers need, so
        trailing zeros typed in every reading ("0.420", "0.430") are not counted.
        """
        if self.raw.texts is not None:
            return self.text_decimals
        numbers = self.values[~np.isnan(self.values)]
        return find_grid(numbers).decimals if numbers.size else None

    def cell(self, row: int) -> Cell:
        """The cell of ``row`` as read."""
        if row in self.odd_rows:
            return self.odd_rows[row]
        text = self.raw.cell_texts[row]
        if text == "":
            return EMPTY_CELL
        if self.raw.typed is not None and not np.isnan(self.raw.typed[row]):
            # A stored number, or a plain number checked to read as this value: no need to parse again.
            return Cell(text, CellKind.NUMBER, value=float(self.raw.typed[row]), decimals=_decimals_of(text.strip()))
        return parse_reading(text, decimal=self.decimal)

    def cells(self, rows: np.ndarray) -> tuple[Cell, ...]:
        """``cell`` of each of ``rows`` (a 10^6-row column in about a second): equal entries share one
        ``Cell`` (cells never change), so each distinct text is read once."""
        texts = self.raw.cell_texts[rows].tolist()
        typed = self.raw.typed[rows].tolist() if self.raw.typed is not None else [math.nan] * len(texts)
        odd, made, cells = self.odd_rows, {}, []
        for row, text, number in zip(rows.tolist(), texts, typed):
            if row in odd:
                cells.append(odd[row])
            elif text == "":
                cells.append(EMPTY_CELL)
            else:
                key = (text, number) if number == number else text
                cell = made.get(key)
                if cell is None or (number == 0.0 and math.copysign(1.0, number) != math.copysign(1.0, cell.value)):
                    cell = made[key] = (Cell(text, CellKind.NUMBER, value=number, decimals=_decimals_of(text.strip()))
                                        if number == number else parse_reading(text, decimal=self.decimal))
                cells.append(cell)
        return tuple(cells)

    @property
    def length(self) -> int:
        """Rows up to the last one that is not blank."""
        if self.raw.texts is None and self.values.size and not np.isnan(self.values[-1]):
            return self.values.size
        filled = ~np.isnan(self.values) if self.raw.texts is None else self.raw.texts != ""
        if not filled.any():
            return 0
        return filled.size - int(np.argmax(filled[::-1]))


def parse_column(raw: RawColumn, decimal: str) -> ParsedColumn:
    """Read every row of ``raw`` as a reading, with ``decimal`` ("." or ",") as the decimal mark."""
    if raw.texts is None:
        return ParsedColumn(raw.typed, {}, raw, decimal)
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
    fast, most = _read_plain_column(plain, decimal)
    odd: dict[int, Cell] = {}
    if fast is not None:
        values[filled] = fast
        decimals = max(decimals, most if plain.size else -1)
    else:
        for row in np.flatnonzero(filled):
            text = texts[row]
            if _PLAIN_NUMBER.fullmatch(text) and ("," if decimal == "." else ".") not in text:
                value = float(text.replace(",", "."))
                if _keeps_its_digits(value, text):
                    values[row] = value
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
    return ParsedColumn(values, odd, raw, decimal, decimals if decimals >= 0 else None)


def _read_plain_column(plain: np.ndarray, decimal: str) -> tuple[np.ndarray | None, int]:
    """``_read_plain_numbers`` of the texts ``plain`` and the most digits after their decimal mark,
    worked out ``CONVERT_CHUNK`` texts at a time; (None, 0) when not every text is a plain number."""
    parts, most = [], 0
    for start in range(0, plain.size, CONVERT_CHUNK):
        chunk = plain[start:start + CONVERT_CHUNK]
        joined = "\n".join(chunk)
        part = _read_plain_numbers(chunk, joined, decimal)
        if part is None:
            return None, 0
        parts.append(part)
        most = _most_fraction_digits(joined, at_least=most)
    return (np.concatenate(parts) if parts else np.empty(0)), most


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
    magnitude = np.abs(values)
    if not (np.isfinite(magnitude) & ((magnitude >= SMALLEST_NORMAL) | (magnitude == 0))).all() or "0" * 300 in joined:
        return None  # too many digits for a float, or too small for one: read cell by cell, which flags them
    return values


def _keeps_its_digits(value: float, text: str) -> bool:
    """True when a number read from plain digits is what they say: finite, and not too small for a float."""
    if value == 0:
        return not any(ch in "123456789" for ch in text)
    return math.isfinite(value) and abs(value) >= SMALLEST_NORMAL


def check_texts_match(header: str, texts: np.ndarray, numbers: np.ndarray, decimal: str) -> np.ndarray:
    """Return ``texts`` if reading them gives ``numbers`` (blanks where NaN); else the file has changed."""
    if texts.shape == numbers.shape:
        blank = np.isnan(numbers)
        again = parse_column(RawColumn(header, texts), decimal).values
        if np.array_equal(again[~blank], numbers[~blank]) and (texts[blank] == "").all():
            return texts
    raise ReadingsError(
        f"The file changed after it was opened (column '{header}' reads differently now); open it again."
    )


def _decimals_of(text: str) -> int:
    mantissa, _, exponent = text.lower().partition("e")
    fraction = mantissa.replace(",", ".").partition(".")[2]
    return max(0, len(fraction) - int(exponent or 0))


def _most_fraction_digits(joined: str, at_least: int = 0) -> int:
    """The most digits after the decimal mark among plain number texts joined by newlines (or
    ``at_least``, when none has more)."""
    most = at_least
    while re.search(rf"[.,][0-9]{{{most + 1}}}", joined):
        most += 1
    return most
