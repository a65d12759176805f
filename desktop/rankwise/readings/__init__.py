"""Readings: the Qt-free model of groups and cells, value parsing, and opening and saving CSV/XLSX files.

- ``parse_reading(text, decimal=..., unit=...) -> Cell``: one typed or read value, text kept.
- ``ReadingSheet``: groups of cells as typed; every edit one undoable step; ``subscribe`` for
  ``SheetChange`` notices; ``snapshot()`` / ``from_snapshot``; ``to_analysis(question, settings)``.
- ``open_readings(path, ...) -> ReadingSet`` or ``ReadingsError``; ``ReadingSheet.from_reading_set``.
- ``save_sheet(sheet, path)``: the texts as typed, CSV or XLSX, written atomically.
"""

from rankwise.readings.cells import Cell, CellKind, GroupCounts, SkippedCell
from rankwise.readings.errors import ReadingsError
from rankwise.readings.open import open_readings
from rankwise.readings.parse import machine_decimal, parse_reading
from rankwise.readings.reading_set import ReadingGroup, ReadingSet, SourceInfo
from rankwise.readings.save import save_sheet
from rankwise.readings.sheet import GroupColumn, ReadingSheet, SheetChange
from rankwise.readings.snapshot import GroupSnapshot, SheetSnapshot

__all__ = [
    "Cell",
    "CellKind",
    "GroupColumn",
    "GroupCounts",
    "GroupSnapshot",
    "ReadingGroup",
    "ReadingSet",
    "ReadingSheet",
    "ReadingsError",
    "SheetChange",
    "SheetSnapshot",
    "SkippedCell",
    "SourceInfo",
    "machine_decimal",
    "open_readings",
    "parse_reading",
    "save_sheet",
]
