"""What a reader can see and find on a sheet beyond its values: whether the sheet, its rows and its
columns are shown, whether any text is written in the colour of its background (or too small to
read), and whether the sheet is protected against accidental edits."""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any

from openpyxl.styles.colors import COLOR_INDEX
from openpyxl.utils import column_index_from_string, get_column_letter
from openpyxl.worksheet.worksheet import Worksheet

WHITE = "FFFFFF"
THEME_COLOURS = {0: WHITE, 1: "000000"}
"""Theme colours 0 (light 1, the window background) and 1 (dark 1, the text) as the default
Office theme sets them (ECMA-376 Part 1, 20.1.6.2 clrScheme); others are not judged."""
SMALLEST_READABLE_POINTS = 4.0
"""Text set smaller than this cannot be read on screen or paper (common practice, no source)."""
LOWEST_SHOWN_ROW = 1.0
NARROWEST_SHOWN_COLUMN = 0.5
"""A row lower than this (points) or a column narrower than this (characters) shows nothing."""
SIGNED_LOOK = {"state": "visible", "protected": True, "hidden_rows": [], "hidden_columns": [],
               "unreadable_cells": []}
"""How every visible sheet looked when written by a Rankwise that did not yet list looks."""


def sheet_look(sheet: Worksheet) -> dict[str, Any]:
    """The sheet's state, protection, hidden rows and columns (within the part in use) and the
    cells whose text cannot be read, as plain JSON data."""
    return {
        "state": "visible" if sheet.sheet_state == "visible" else "hidden",
        "protected": bool(sheet.protection.sheet),
        "hidden_rows": _hidden_rows(sheet),
        "hidden_columns": _hidden_columns(sheet),
        "unreadable_cells": [cell.coordinate for row in sheet.iter_rows() for cell in row
                             if cell.value not in (None, "") and _unreadable(cell)],
    }


def well_formed_look(look: Any) -> bool:
    """True when ``look`` has the form ``sheet_look`` gives."""
    return (isinstance(look, dict) and look.get("state") in ("visible", "hidden")
            and isinstance(look.get("protected"), bool)
            and all(isinstance(look.get(key), list) for key in ("hidden_rows", "hidden_columns", "unreadable_cells")))


def look_differences(title: str, signed: dict[str, Any], now: dict[str, Any]) -> Iterator[str]:
    """Each way the sheet's look differs from when it was signed, in plain words."""
    if signed["state"] != now["state"]:
        yield (f"Sheet '{title}' is hidden." if now["state"] == "hidden"
               else f"Sheet '{title}' was hidden when signed and is shown now.")
    if signed["protected"] and not now["protected"]:
        yield f"Sheet '{title}' is no longer protected against edits."
    elif now["protected"] and not signed["protected"]:
        yield f"Sheet '{title}' was unprotected when signed and is protected now."
    for key, noun in (("hidden_rows", "Row"), ("hidden_columns", "Column")):
        for item in _added(now[key], signed[key]):
            yield f"{noun} {item} of '{title}' is hidden."
        for item in _added(signed[key], now[key]):
            yield f"{noun} {item} of '{title}' was hidden when signed and is shown now."
    for coordinate in _added(now["unreadable_cells"], signed["unreadable_cells"]):
        yield (f"Cell {coordinate} of '{title}' cannot be read: its text is the colour of its background "
               f"or too small to see.")
    for coordinate in _added(signed["unreadable_cells"], now["unreadable_cells"]):
        yield f"Cell {coordinate} of '{title}' could not be read when signed and can be now."


def _added(items: list, base: list) -> list:
    known = set(base)
    return [item for item in items if item not in known]


def _hidden_rows(sheet: Worksheet) -> list[int]:
    last = sheet.max_row
    return sorted(row for row, dimension in sheet.row_dimensions.items()
                  if row <= last and (dimension.hidden or (dimension.height is not None
                                                           and dimension.height < LOWEST_SHOWN_ROW)))


def _hidden_columns(sheet: Worksheet) -> list[str]:
    last = sheet.max_column
    hidden = set()
    for key, dimension in sheet.column_dimensions.items():
        narrow = dimension.customWidth and dimension.width is not None and dimension.width < NARROWEST_SHOWN_COLUMN
        if not (dimension.hidden or narrow):
            continue
        first = dimension.min or column_index_from_string(key)
        final = dimension.max or first
        hidden.update(range(first, min(final, last) + 1))
    return [get_column_letter(column) for column in sorted(hidden)]


def _unreadable(cell) -> bool:
    """True when the cell's text is set in its background's colour, or too small to read."""
    font = cell.font
    if font is not None and font.sz is not None and float(font.sz) < SMALLEST_READABLE_POINTS:
        return True
    text_colour = _rgb(font.color if font is not None else None) or "000000"
    fill = cell.fill
    background = WHITE
    if fill is not None and fill.fill_type == "solid":
        background = _rgb(fill.fgColor) or background
    return text_colour == background


def _rgb(colour) -> str | None:
    """A colour as six hex digits, or None when it is automatic or cannot be judged."""
    if colour is None:
        return None
    kind = getattr(colour, "type", None)
    if kind == "rgb" and isinstance(colour.rgb, str):
        return colour.rgb[-6:].upper()
    if kind == "indexed" and isinstance(colour.indexed, int) and colour.indexed < len(COLOR_INDEX):
        return COLOR_INDEX[colour.indexed][-6:].upper()
    if kind == "theme" and not colour.tint:
        return THEME_COLOURS.get(colour.theme)
    return None
