"""Text exports (CSV, TXT, TSV): encoding, field separator, and the columns' texts.

The encoding is found from a byte-order mark, then UTF-16 without a mark (NUL bytes in every
other place), then strict UTF-8, and the common Western single-byte code page (cp1252) as the
fallback. The separator is the one of comma, semicolon, tab and pipe that splits the lines most
consistently. Big files are read by pandas' C parser, keeping every cell's text as written.
"""

from __future__ import annotations

import codecs
import csv
import re
from collections import Counter
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import pandas as pd

from rankwise.readings.columns import CONVERT_CHUNK
from rankwise.readings.errors import ReadingsError
from rankwise.readings.parse import SMALLEST_NORMAL

SAMPLE_CHARACTERS = 1 << 18
"""How much of a text file is looked at to find its encoding, separator, header and layout."""
SAMPLE_ROWS = 120
"""Rows looked at to find the header, the decimal mark and the layout."""
MAX_CELL_CHARACTERS = 10_000
"""A cell longer than this is not part of a readings export."""
MAX_TEXT_BYTES = 1 << 30
"""A text file larger than this (1 GiB) is not a readings export."""
MAX_ROWS = 5_000_000
"""A text file with more lines than this is not a readings export (a spreadsheet holds 1,048,576 rows)."""
MAX_COLUMNS = 1_000
"""A table wider than this is not a readings export (each column would be looked at as a possible group)."""

DELIMITERS = (";", "\t", "|", ",")
"""Candidate separators, in order of preference when they split the lines equally well."""

_NO_DELIMITER = "\x1f"
"""Stands in for the separator of a single-column file (the unit separator never occurs in exports)."""
_LINE_BREAK = re.compile(r"\r\n|\r|\n")
"""Line ends as CSV readers see them (not the other breaks ``str.splitlines`` knows)."""
_CONTROL_CHARACTERS = re.compile(r"[\x00-\x08\x0b\x0c\x0e-\x1f]")
_DECIMAL_COMMA_LINE = re.compile(r"\s*[+-]?\d*,\d+\s*")


@dataclass(frozen=True)
class TextSample:
    """The start of a text file, understood.

    Attributes:
        encoding: the encoding the file is read with.
        delimiter: the field separator, or "" for a single column.
        rows: the first rows, split into fields.
        complete: True when the sample holds the whole file.
    """

    encoding: str
    delimiter: str
    rows: list[list[str]]
    complete: bool


def find_encoding(head: bytes, path: Path) -> str:
    """The encoding of a text file from its first bytes; binary content raises ``ReadingsError``."""
    if head.startswith(codecs.BOM_UTF8):
        return "utf-8-sig"
    if head.startswith((codecs.BOM_UTF16_LE, codecs.BOM_UTF16_BE)):
        return "utf-16"
    if b"\x00" in head:
        even, odd = head[0::2].count(0), head[1::2].count(0)
        if odd > 0.3 * len(head) / 2 and even == 0:
            return "utf-16-le"
        if even > 0.3 * len(head) / 2 and odd == 0:
            return "utf-16-be"
        raise not_a_spreadsheet(path)
    try:
        codecs.getincrementaldecoder("utf-8")().decode(head, final=False)
    except UnicodeDecodeError:
        pass
    else:
        return "utf-8"
    try:
        head.decode("cp1252")
    except UnicodeDecodeError:
        return "latin-1"
    return "cp1252"


def not_a_spreadsheet(path: Path) -> ReadingsError:
    """The error for a file that is neither a text export nor a workbook."""
    return ReadingsError(
        f"'{path.name}' is not a spreadsheet or a text export (it holds binary data); "
        "open a CSV or XLSX file of readings."
    )


def check_size(path: Path) -> None:
    """Refuse a text file too big, or with too many lines, to be a readings export, before any reader loads it."""
    size = path.stat().st_size
    if size > MAX_TEXT_BYTES:
        raise ReadingsError(
            f"'{path.name}' is {size / 1e9:,.1f} GB, far more than a readings export (at most "
            f"{MAX_TEXT_BYTES / 1e9:,.1f} GB); check that this is the right file, or split it."
        )
    if size <= MAX_ROWS:
        return
    lines = 0
    with open(path, "rb") as stream:
        while piece := stream.read(16 << 20):
            lines += piece.count(b"\n") or piece.count(b"\r")
            if lines > MAX_ROWS:
                raise ReadingsError(
                    f"'{path.name}' has more than {MAX_ROWS:,} lines, more than a readings export holds; "
                    "check that this is the right file, or split it."
                )


def read_sample(path: Path, encoding: str) -> TextSample:
    """The first rows of a text file, split with the separator that fits them best."""
    try:
        with open(path, encoding=encoding, newline="") as stream:
            text = stream.read(SAMPLE_CHARACTERS)
            complete = stream.read(1) == ""
    except UnicodeDecodeError as error:
        raise ReadingsError(
            f"'{path.name}' cannot be read as {encoding} text; choose the file's encoding (for example UTF-8 or cp1252)."
        ) from error
    if not complete and "\n" not in text and "\r" not in text:
        raise ReadingsError(
            f"'{path.name}' starts with a line of more than {SAMPLE_CHARACTERS:,} characters, far too long for readings; "
            "check that this is the right file."
        )
    controls = len(_CONTROL_CHARACTERS.findall(text, 0, 100_000))
    if controls > 0.01 * min(len(text), 100_000) or "\x00" in text:
        raise not_a_spreadsheet(path)
    lines = _LINE_BREAK.split(text)
    if lines and lines[-1] == "":
        lines.pop()
    if not complete and lines:
        lines.pop()
    lines = lines[:SAMPLE_ROWS]
    delimiter = find_delimiter(lines)
    rows = split_lines(lines, delimiter, path)
    return TextSample(encoding, delimiter, rows, complete and len(lines) < SAMPLE_ROWS)


def find_delimiter(lines: list[str]) -> str:
    """The separator splitting the non-blank lines into the most consistent number of fields."""
    filled = [line for line in lines if line.strip()]
    if not filled:
        return ""
    if sum(1 for line in filled if _DECIMAL_COMMA_LINE.fullmatch(line)) >= 0.6 * len(filled):
        candidates = [d for d in DELIMITERS if d != ","]
    else:
        candidates = list(DELIMITERS)
    best, best_score = "", 0.0
    for delimiter in candidates:
        try:
            widths = [len(row) for row in csv.reader(filled, delimiter=delimiter)]
        except csv.Error:  # a field longer than the csv module takes: not this separator's table
            continue
        width, count = Counter(widths).most_common(1)[0]
        score = count / len(widths) if width > 1 else 0.0
        if score > best_score + 1e-9:
            best, best_score = delimiter, score
    return best


def split_lines(lines: list[str], delimiter: str, path: Path | None = None) -> list[list[str]]:
    """Lines split into fields (quotes honoured); a single column when there is no separator.

    A field longer than the csv module takes (131,072 characters) raises ``ReadingsError``.
    """
    try:
        return [row if row else [""] for row in csv.reader(lines, delimiter=delimiter or _NO_DELIMITER)]
    except csv.Error as error:
        name = f"'{path.name}'" if path is not None else "The text"
        raise ReadingsError(
            f"{name} holds a cell of more than {csv.field_size_limit():,} characters, far too long for a reading; "
            "check that this is the right file."
        ) from error


def read_columns(
    path: Path, sample: TextSample, first_data_row: int, width: int, wanted: list[int]
) -> dict[int, np.ndarray]:
    """The texts of the ``wanted`` columns from ``first_data_row`` to the end, "" for blanks."""
    if sample.complete:
        rows = sample.rows[first_data_row:]
        return {j: _column(rows, j) for j in wanted}
    try:
        frame = pd.read_csv(
            path, dtype=str, na_filter=False, **_csv_options(sample, first_data_row, width, wanted)
        )
    except (pd.errors.ParserError, ValueError, UnicodeDecodeError):
        return _read_columns_slowly(path, sample, first_data_row, wanted)
    return {j: frame[j].to_numpy(dtype=object) for j in wanted}


def read_number_columns(
    path: Path, sample: TextSample, first_data_row: int, width: int, wanted: list[int], numeric: list[int],
    decimal: str,
) -> tuple[dict[int, np.ndarray], dict[int, np.ndarray]] | None:
    """The ``numeric`` columns straight as numbers (NaN for blanks) and the others as texts.

    None when a ``numeric`` column holds anything but plain numbers and blanks (the caller then
    reads texts), or when the whole file is in the sample anyway.
    """
    if sample.complete or not numeric:
        return None
    try:
        frame = pd.read_csv(
            path,
            dtype={j: ("float64" if j in numeric else str) for j in wanted},
            decimal=decimal,
            keep_default_na=False,
            na_values={j: [""] for j in numeric},
            **_csv_options(sample, first_data_row, width, wanted),
        )
    except (pd.errors.ParserError, ValueError, TypeError, UnicodeDecodeError):
        return None
    numbers = {j: frame[j].to_numpy(dtype=np.float64) for j in numeric}
    if any(np.isinf(column).any() for column in numbers.values()):
        return None
    if any((np.abs(column) < SMALLEST_NORMAL).any() for column in numbers.values()) and _may_underflow(path):
        return None  # a zero or tiny number may stand for a text too small for a float: read the texts
    texts = {j: frame[j].to_numpy(dtype=object) for j in wanted if j not in numeric}
    return texts, numbers


_TOO_SMALL = re.compile(rb"[0-9.,][eE]-0*[1-9][0-9]{2}|[.,]0{300}")
"""Number texts that may be too small for a float (2e-400, or 0. and 300 zeros): such a file is read as texts."""


def _may_underflow(path: Path) -> bool:
    """True when the file holds a number text that may be too small for a float (it would read as 0)."""
    tail = b""
    with open(path, "rb") as stream:
        while piece := stream.read(16 << 20):
            if _TOO_SMALL.search(tail + piece):
                return True
            tail = piece[-400:]
    return False


def _csv_options(sample: TextSample, first_data_row: int, width: int, wanted: list[int]) -> dict:
    """Options for pandas' C parser: rows from ``first_data_row``, columns named by position."""
    options = dict(
        sep=sample.delimiter or _NO_DELIMITER, header=None, names=list(range(width)),
        skiprows=first_data_row, encoding=sample.encoding, skip_blank_lines=False, engine="c", index_col=False,
    )
    if len(wanted) < width:
        options["usecols"] = wanted
    return options


def _read_columns_slowly(path: Path, sample: TextSample, first_data_row: int, wanted: list[int]) -> dict[int, np.ndarray]:
    """Row by row, for files the fast parser refuses (ragged rows, mixed line ends, late encoding slips)."""
    try:
        with open(path, encoding=sample.encoding, errors="strict", newline="") as stream:
            lines = _LINE_BREAK.split(stream.read())
        if lines and lines[-1] == "":
            lines.pop()
    except UnicodeDecodeError as error:
        raise ReadingsError(
            f"'{path.name}' is not {sample.encoding} text throughout; choose the file's encoding "
            "(for example cp1252) when opening it."
        ) from error
    rows = split_lines(lines[first_data_row:], sample.delimiter, path)
    return {j: _column(rows, j) for j in wanted}


def _column(rows: list[list[str]], j: int) -> np.ndarray:
    column = np.empty(len(rows), dtype=object)
    column[:] = [row[j] if j < len(row) else "" for row in rows]
    return column


def check_cell_lengths(path: Path, columns: dict[int, np.ndarray], first_data_row: int) -> None:
    """Refuse a file with a cell far too long for a reading (a damaged or wrong file)."""
    too_long = re.compile(rf"[^\n]{{{MAX_CELL_CHARACTERS + 1}}}")
    for column in columns.values():
        # a chunk at a time: one search over the whole column holds the interpreter lock too long
        if any(too_long.search("\n".join(column[start:start + CONVERT_CHUNK]))
               for start in range(0, column.size, CONVERT_CHUNK)):
            row = next(i for i, text in enumerate(column) if len(text) > MAX_CELL_CHARACTERS)
            raise ReadingsError(
                f"Row {first_data_row + row + 1} of '{path.name}' holds a cell of {len(column[row]):,} characters, "
                "far too long for a reading; check that this is the right file."
            )
