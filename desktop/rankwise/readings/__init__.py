"""Readings: the Qt-free model of groups and cells, value parsing, and opening and saving CSV/XLSX files.

- ``parse_reading(text, decimal=..., unit=...) -> Cell``: one typed or read value, text kept.
- ``ReadingSheet``: groups of cells as typed; every edit one undoable step; ``subscribe`` for
  ``SheetChange`` notices; ``snapshot()`` / ``from_snapshot``; ``to_analysis(question, settings)``.
- ``open_readings(path, ...) -> ReadingSet`` or ``ReadingsError``; ``ReadingSheet.from_reading_set``.
- ``open_characteristics(path, by=...) -> CharacteristicsTable``: one row per part, a process column,
  one column per characteristic; ``to_analysis(a, b)`` compares two processes on all of them.
- ``save_sheet(sheet, path)``: the texts as typed, CSV or XLSX, written atomically.

Every public name loads its module on first use (PEP 562), so the window starts without the file
readers (pandas) until a file is opened.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from rankwise.stats.public_names import load_on_first_use

_MODULE_OF = {
    "Cell": "cells",
    "CellKind": "cells",
    "GroupCounts": "cells",
    "SkippedCell": "cells",
    "ReadingsError": "errors",
    "CharacteristicColumn": "characteristics",
    "CharacteristicsTable": "characteristics",
    "open_characteristics": "characteristics",
    "open_readings": "open",
    "machine_decimal": "parse",
    "parse_reading": "parse",
    "ReadingGroup": "reading_set",
    "ReadingSet": "reading_set",
    "SourceInfo": "reading_set",
    "save_sheet": "save",
    "GroupColumn": "sheet",
    "ReadingSheet": "sheet",
    "SheetChange": "sheet",
    "GroupSnapshot": "snapshot",
    "SheetSnapshot": "snapshot",
}
"""Each public name and the module (inside this package) that defines it."""

__all__ = sorted(_MODULE_OF)


__getattr__, __dir__ = load_on_first_use(__name__, _MODULE_OF, globals())


if TYPE_CHECKING:
    from rankwise.readings.cells import Cell, CellKind, GroupCounts, SkippedCell
    from rankwise.readings.characteristics import CharacteristicColumn, CharacteristicsTable, open_characteristics
    from rankwise.readings.errors import ReadingsError
    from rankwise.readings.open import open_readings
    from rankwise.readings.parse import machine_decimal, parse_reading
    from rankwise.readings.reading_set import ReadingGroup, ReadingSet, SourceInfo
    from rankwise.readings.save import save_sheet
    from rankwise.readings.sheet import GroupColumn, ReadingSheet, SheetChange
    from rankwise.readings.snapshot import GroupSnapshot, SheetSnapshot
