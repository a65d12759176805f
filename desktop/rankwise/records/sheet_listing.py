"""What the visible sheets of a record showed when it was written, kept so any later version can check them.

The listing names every visible sheet in order and, for each non-empty cell, its coordinate, the
kind of value, the value as canonical text (numbers by ``repr`` of the double, dates ISO 8601,
text as is) and its number format; since listing form 2 also each sheet's look (shown or hidden,
protected, hidden rows and columns, unreadable cells: ``rankwise.records.sheet_looks``).
A sheet is compared with its listing by what a reader sees (``rankwise.records.shown``), so a
re-save by a spreadsheet program is no change, and a row deleted or inserted is named as such. The cell that shows the fingerprint is named but its value left
out, because the fingerprint covers the listing's SHA-256 and cannot cover itself. The listing is
stored as compressed canonical JSON in base64 (``pack_listing``); the decision record
resources/decisions/record-fingerprint.md describes it.
"""

from __future__ import annotations

import base64
import binascii
import json
import zlib
from collections.abc import Iterable, Iterator
from difflib import SequenceMatcher
from datetime import date, datetime, time
from typing import Any

from openpyxl.utils import get_column_letter
from openpyxl.utils.cell import coordinate_to_tuple
from openpyxl.worksheet.worksheet import Worksheet

from rankwise.records.canonical import canonical_bytes
from rankwise.records.sheet_looks import SIGNED_LOOK, look_differences, sheet_look, well_formed_look
from rankwise.records.shown import displayed, meaning

LISTING_FORMAT = 2
"""Version of the listing's form; raised when its meaning changes (2: each sheet's look added)."""
KNOWN_FORMATS = (1, 2)
"""Listing forms this version reads: form 1 has no looks (every sheet then looked as ``SIGNED_LOOK``)."""
PART_LENGTH = 30000
"""Characters of the packed listing per cell (a spreadsheet cell holds at most 32,767)."""


def sheet_listing(sheets: Iterable[Worksheet], fingerprint_stand_in: str) -> dict[str, Any]:
    """The listing of ``sheets`` as a file gives them back; the one cell holding
    ``fingerprint_stand_in`` is named as the fingerprint cell and its value left out.

    Raises ValueError when no cell, or more than one, holds ``fingerprint_stand_in``.
    """
    listed, fingerprint_cells = [], []
    for sheet in sheets:
        cells = []
        for cell in _filled_cells(sheet):
            if cell.value == fingerprint_stand_in:
                fingerprint_cells.append([sheet.title, cell.coordinate])
            else:
                cells.append([cell.coordinate, *_kind_and_text(cell.value), cell.number_format])
        listed.append({"title": sheet.title, "cells": cells, "look": sheet_look(sheet)})
    if len(fingerprint_cells) != 1:
        raise ValueError(f"fingerprint_stand_in must be in exactly one cell; found in {len(fingerprint_cells)}")
    return {"listing_format": LISTING_FORMAT, "sheets": listed, "fingerprint_cell": fingerprint_cells[0]}


def pack_listing(listing: dict[str, Any]) -> list[str]:
    """The listing's canonical JSON, zlib-compressed, in base64, cut into cell-sized parts."""
    text = base64.b64encode(zlib.compress(canonical_bytes(listing), 9)).decode("ascii")
    return [text[start:start + PART_LENGTH] for start in range(0, len(text), PART_LENGTH)] or [""]


def unpack_listing(parts: Iterable[str]) -> dict[str, Any] | None:
    """The listing that ``pack_listing`` cut into ``parts``; None when it is damaged or of an unknown form."""
    try:
        listing = json.loads(zlib.decompress(base64.b64decode("".join(parts), validate=True)))
    except (ValueError, TypeError, zlib.error, binascii.Error):
        return None
    return listing if _well_formed(listing) else None


def listing_differences(listing: dict[str, Any], sheets: list[Worksheet], fingerprint: str,
                        mark: str = ".") -> Iterator[str]:
    """Every way ``sheets`` (the file's sheets other than the program sheet) differ from ``listing``,
    in plain words, values as the cells show them (``mark``: the record's decimal mark); the
    fingerprint cell must show ``fingerprint``, the fingerprint stored with the record."""
    signed_titles = [entry["title"] for entry in listing["sheets"]]
    titles_now = [sheet.title for sheet in sheets]
    if signed_titles != titles_now:
        yield f"The sheets were changed: the record has {signed_titles}, the file has {titles_now}."
    by_title = {sheet.title: sheet for sheet in sheets}
    fingerprint_title, fingerprint_coordinate = listing["fingerprint_cell"]
    for entry in listing["sheets"]:
        sheet = by_title.get(entry["title"])
        if sheet is None:
            continue
        yield from look_differences(sheet.title, entry.get("look", SIGNED_LOOK), sheet_look(sheet))
        signed = {coordinate: (kind, text, number_format) for coordinate, kind, text, number_format in entry["cells"]}
        if sheet.title == fingerprint_title:
            signed[fingerprint_coordinate] = ("text", fingerprint, None)
        now = {cell.coordinate: (*_kind_and_text(cell.value), cell.number_format) for cell in _filled_cells(sheet)}
        if sheet.title == fingerprint_title and fingerprint_coordinate in now:
            now[fingerprint_coordinate] = (*now[fingerprint_coordinate][:2], None)
        yield from _sheet_changes(sheet.title, signed, now, mark)


def _sheet_changes(title: str, signed: dict[str, tuple], now: dict[str, tuple], mark: str) -> Iterator[str]:
    """The rows deleted or inserted (one line each) and the cells changed, in the order of the sheet."""
    signed_rows, now_rows = _by_row(signed), _by_row(now)
    last = max([0, *signed_rows, *now_rows])
    before = [_row_key(signed_rows.get(row, {})) for row in range(1, last + 1)]
    after = [_row_key(now_rows.get(row, {})) for row in range(1, last + 1)]
    while before and after and before[-1] == after[-1] == ():
        before.pop()
        after.pop()
    matcher = SequenceMatcher(None, before, after, autojunk=False)
    for operation, first, end, first_now, end_now in matcher.get_opcodes():
        if operation == "equal":
            continue
        paired = min(end - first, end_now - first_now) if operation == "replace" else 0
        for offset in range(paired):
            yield from _row_changes(title, signed_rows.get(first + offset + 1, {}),
                                    now_rows.get(first_now + offset + 1, {}), first_now + offset + 1, mark)
        for row in range(first + paired + 1, end + 1):
            if signed_rows.get(row):
                yield (f"Row {row} of '{title}' was deleted; it showed "
                       f"{_row_text(signed_rows, row, signed_rows, mark)}.")
        for row in range(first_now + paired + 1, end_now + 1):
            if now_rows.get(row):
                yield (f"A row was inserted as row {row} of '{title}'; it shows "
                       f"{_row_text(now_rows, row, now_rows, mark)}.")


def _by_row(cells: dict[str, tuple]) -> dict[int, dict[int, tuple]]:
    rows: dict[int, dict[int, tuple]] = {}
    for coordinate, entry in cells.items():
        row, column = coordinate_to_tuple(coordinate)
        rows.setdefault(row, {})[column] = entry
    return rows


def _row_key(row: dict[int, tuple]) -> tuple:
    return tuple((column, meaning(*row[column])) for column in sorted(row))


def _row_text(rows: dict[int, dict[int, tuple]], row: int, labels: dict[int, dict[int, tuple]], mark: str) -> str:
    """A row's cells as a reader would read them out: each value after its column's heading
    (the nearest text above it), e.g. "Entry 4, Before cure 2.48, After cure 2.05"."""
    cells = rows[row]
    return ", ".join(f"{_heading(labels, row, column)}{displayed(*cells[column], mark)}".strip()
                     for column in sorted(cells))


def _heading(rows: dict[int, dict[int, tuple]], row: int, column: int) -> str:
    """The nearest text above (row, column), followed by a space; "" when the cell holds text itself."""
    if rows[row][column][0] == "text":
        return ""
    for above in range(row - 1, 0, -1):
        entry = rows.get(above, {}).get(column)
        if entry is not None and entry[0] == "text":
            return f"{entry[1]} "
    return f"column {get_column_letter(column)} "


def _row_changes(title: str, signed: dict[int, tuple], now: dict[int, tuple], row: int, mark: str) -> Iterator[str]:
    """The cells of one row that a reader sees differently, in plain words."""
    for column in sorted(signed.keys() | now.keys()):
        was, is_now = signed.get(column), now.get(column)
        coordinate = f"{get_column_letter(column)}{row}"
        if was is None or is_now is None or meaning(*was)[:2] != meaning(*is_now)[:2]:
            yield value_changed(title, coordinate, _text_of(was, mark), _text_of(is_now, mark))
        elif was[2] is not None and meaning(*was)[2] != meaning(*is_now)[2]:
            yield (f"Sheet '{title}', cell {coordinate}: the same value is now shown as "
                   f"{displayed(*is_now, mark)} (format '{is_now[2]}') instead of {displayed(*was, mark)} "
                   f"(format '{was[2]}').")


def value_changed(title: str, coordinate: str, signed: str, now: str) -> str:
    """Plain words for a cell that shows another value than when it was signed."""
    return f"Sheet '{title}', cell {coordinate}: showed {signed} when signed, now shows {now}."


def _text_of(entry: tuple | None, mark: str) -> str:
    return "(empty)" if entry is None else displayed(*entry, mark)


def _filled_cells(sheet: Worksheet) -> Iterator[Any]:
    """The cells of ``sheet`` that hold a value, row by row."""
    for row in sheet.iter_rows():
        for cell in row:
            if cell.value is not None:
                yield cell


def _kind_and_text(value: Any) -> tuple[str, str]:
    """A cell value's kind and canonical text: numbers by repr of the double, dates ISO 8601, text as is."""
    if isinstance(value, bool):
        return "truth", "true" if value else "false"
    if isinstance(value, (int, float)):
        return "number", repr(float(value))
    if isinstance(value, (datetime, date, time)):
        return "date", value.isoformat()
    return "text", str(value)


def _well_formed(listing: Any) -> bool:
    """True when ``listing`` has the form ``sheet_listing`` writes."""
    if not isinstance(listing, dict) or listing.get("listing_format") not in KNOWN_FORMATS:
        return False
    sheets, fingerprint_cell = listing.get("sheets"), listing.get("fingerprint_cell")
    if not (isinstance(sheets, list) and _strings(fingerprint_cell, 2)):
        return False
    for entry in sheets:
        if not (isinstance(entry, dict) and isinstance(entry.get("title"), str)
                and isinstance(entry.get("cells"), list)):
            return False
        if listing["listing_format"] >= 2 and not well_formed_look(entry.get("look")):
            return False
        for cell in entry["cells"]:
            if not (_strings(cell, 4) and cell[1] in ("number", "truth", "date", "text")
                    and _is_coordinate(cell[0]) and (cell[1] != "number" or _is_number(cell[2]))):
                return False
    return _is_coordinate(fingerprint_cell[1])


def _strings(item: Any, count: int) -> bool:
    return isinstance(item, list) and len(item) == count and all(isinstance(part, str) for part in item)


def _is_number(text: str) -> bool:
    try:
        float(text)
    except ValueError:
        return False
    return True


def _is_coordinate(text: str) -> bool:
    try:
        coordinate_to_tuple(text)
    except (ValueError, TypeError, AttributeError):
        return False
    return True
