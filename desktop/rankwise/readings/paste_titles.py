"""A block copied from a spreadsheet often brings its title row ("Before", "After") with it: words
over readings. Set apart, the titles name the groups the readings are pasted into."""

from __future__ import annotations

from rankwise.readings.cells import CellKind
from rankwise.readings.parse import parse_reading

_READING_KINDS = (CellKind.NUMBER, CellKind.CENSORED)


def split_title_row(block: list[list[str]], decimal: str = "auto") -> tuple[list[str], list[list[str]]]:
    """``(titles, body)`` when the block's first row holds only words and every titled column has a
    reading below its title; otherwise ``([], block)`` (a first row with any reading is data)."""
    if len(block) < 2 or not any(text.strip() for text in block[0]):
        return [], block
    for column, text in enumerate(block[0]):
        if not text.strip():
            continue
        if parse_reading(text, decimal=decimal).kind is not CellKind.NOTE:
            return [], block
        below = (line[column] for line in block[1:] if column < len(line))
        if not any(parse_reading(cell, decimal=decimal).kind in _READING_KINDS for cell in below):
            return [], block
    return [text.strip() for text in block[0]], block[1:]
