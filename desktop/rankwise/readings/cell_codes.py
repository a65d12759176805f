"""A column of cells in a compact form to send to another process: its distinct cells and a code per row.

An opened export of 10^6 readings holds a few hundred distinct ``Cell`` objects (equal entries share
one; cells never change). Pickled as a list, each row costs a memo reference, and unpickling the list
is one long step that keeps the interpreter from every other thread of the receiving process; as
codes it is one array, and the list is rebuilt in short steps.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from rankwise.readings.cells import Cell

_STEP = 65_536
"""Rows rebuilt per step (each step a millisecond or so)."""


class CellCodes:
    """``cells`` as ``distinct`` (each cell object once) and ``codes`` (for each row, the position of
    its cell in ``distinct``)."""

    __slots__ = ("distinct", "codes")

    def __init__(self, cells: Sequence[Cell]) -> None:
        positions: dict[int, int] = {}
        self.distinct: list[Cell] = []
        codes = np.empty(len(cells), dtype=np.int32)
        for row, cell in enumerate(cells):
            code = positions.get(id(cell))
            if code is None:
                code = positions[id(cell)] = len(self.distinct)
                self.distinct.append(cell)
            codes[row] = code
        self.codes = codes

    def __getstate__(self) -> tuple[list[Cell], np.ndarray]:
        return self.distinct, self.codes

    def __setstate__(self, state: tuple[list[Cell], np.ndarray]) -> None:
        self.distinct, self.codes = state

    def cells(self) -> list[Cell]:
        """The cells, row by row (the same objects as ``distinct``)."""
        pick, cells = self.distinct.__getitem__, []
        for start in range(0, self.codes.size, _STEP):
            cells.extend(map(pick, self.codes[start:start + _STEP].tolist()))
        return cells
