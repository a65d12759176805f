"""What the visible sheets of a record showed when it was written, kept so any later version can check them.

The listing names every visible sheet in order and, for each non-empty cell, its coordinate, the
kind of value, the value as canonical text (numbers by ``repr`` of the double, dates ISO 8601,
text as is) and its number format. The cell that shows the fingerprint is named but its value left
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
from datetime import date, datetime, time
from typing import Any

from openpyxl.utils.cell import coordinate_to_tuple
from openpyxl.worksheet.worksheet import Worksheet

from rankwise.records.canonical import canonical_bytes
from rankwise.records.compare import format_changed, value_changed

LISTING_FORMAT = 1
"""Version of the listing's form; raised when its meaning changes."""
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
        listed.append({"title": sheet.title, "cells": cells})
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


def listing_differences(listing: dict[str, Any], sheets: list[Worksheet], fingerprint: str) -> Iterator[str]:
    """Every way ``sheets`` (the file's visible sheets) differ from ``listing``, in plain words; the
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
        signed = {coordinate: (kind, text, number_format) for coordinate, kind, text, number_format in entry["cells"]}
        if sheet.title == fingerprint_title:
            signed[fingerprint_coordinate] = ("text", fingerprint, None)
        now = {cell.coordinate: (*_kind_and_text(cell.value), cell.number_format) for cell in _filled_cells(sheet)}
        for coordinate in sorted(signed.keys() | now.keys(), key=coordinate_to_tuple):
            yield from _cell_difference(sheet, coordinate, signed.get(coordinate), now.get(coordinate))


def _cell_difference(sheet: Worksheet, coordinate: str, signed: tuple | None, now: tuple | None) -> Iterator[str]:
    """The difference, if any, between a cell as listed and as the file has it (None: empty)."""
    if (signed and signed[:2]) != (now and now[:2]):
        yield value_changed(sheet.title, coordinate, _value(signed), sheet[coordinate].value)
    elif signed is not None and signed[2] is not None and signed[2] != now[2]:
        yield format_changed(sheet.title, coordinate, signed[2], now[2])


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


def _value(entry: tuple | None) -> Any:
    """The value a listed cell held, for a message (None when it was empty)."""
    if entry is None:
        return None
    kind, text, _ = entry
    if kind == "number":
        return float(text)
    if kind == "truth":
        return text == "true"
    if kind == "date":
        try:
            return datetime.fromisoformat(text)
        except ValueError:
            return text
    return text


def _well_formed(listing: Any) -> bool:
    """True when ``listing`` has the form ``sheet_listing`` writes."""
    if not isinstance(listing, dict) or listing.get("listing_format") != LISTING_FORMAT:
        return False
    sheets, fingerprint_cell = listing.get("sheets"), listing.get("fingerprint_cell")
    if not (isinstance(sheets, list) and _strings(fingerprint_cell, 2)):
        return False
    for entry in sheets:
        if not (isinstance(entry, dict) and isinstance(entry.get("title"), str)
                and isinstance(entry.get("cells"), list)):
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
