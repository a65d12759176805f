"""Entries worth a second look: a likely slipped decimal point, a reading beyond the limits.

Flags are advice only: a flagged reading is used exactly as typed. The slipped-decimal check
compares each reading with the median size of the others in its group; a tenfold jump is what a
decimal point typed one place off produces (common practice, no source).
"""

from __future__ import annotations

from collections.abc import Callable, Sequence

import numpy as np

from rankwise.readings.cells import Cell, CellKind

SLIP_RATIO = 7.0
"""A reading this many times the others' typical size (or this many times smaller) is flagged."""

MIN_OTHERS = 4
"""The slipped-decimal check needs at least this many other readings in the group."""


def flag_readings(
    cells: Sequence[Cell], *, lsl: float | None = None, usl: float | None = None, unit: str = ""
) -> dict[int, tuple[str, ...]]:
    """Plain-words remarks on suspicious readings, by row; rows without remarks are left out."""
    rows = np.array([row for row, cell in enumerate(cells) if cell.kind is CellKind.NUMBER], dtype=np.intp)
    values = np.array([cells[row].value for row in rows], dtype=float)
    return flag_rows(rows, values, lambda row: cells[row].text, lsl=lsl, usl=usl, unit=unit)


def flag_rows(
    rows: np.ndarray, values: np.ndarray, text_of: Callable[[int], str], *, lsl: float | None = None,
    usl: float | None = None, unit: str = "",
) -> dict[int, tuple[str, ...]]:
    """``flag_readings`` of a group's readings given as arrays: their ``rows`` and ``values`` in row order,
    and ``text_of(row)``, the text of a row (looked up for the flagged rows only)."""
    flags: dict[int, list[str]] = {}
    suffix = f" {unit}" if unit else ""
    if lsl is not None:
        for position in np.flatnonzero(values < lsl):
            row = int(rows[position])
            flags.setdefault(row, []).append(f"{text_of(row).strip()} is below the lower limit (LSL {lsl:g}{suffix}).")
    if usl is not None:
        for position in np.flatnonzero(values > usl):
            row = int(rows[position])
            flags.setdefault(row, []).append(f"{text_of(row).strip()} is above the upper limit (USL {usl:g}{suffix}).")
    for position, remark in _slipped_decimals(values).items():
        row = int(rows[position])
        flags.setdefault(row, []).append(remark.format(text=text_of(row).strip()))
    return {row: tuple(remarks) for row, remarks in sorted(flags.items())}


def _slipped_decimals(values: np.ndarray) -> dict[int, str]:
    """Positions whose reading is about ten times larger or smaller than the group's median size.

    The median of all sizes stands for "the others": one slipped reading barely moves it.
    """
    if values.size < MIN_OTHERS + 1:
        return {}
    sizes = np.abs(values)
    typical = float(np.median(sizes))
    if typical <= 0.0:
        return {}
    ratios = sizes / typical
    found = {
        int(position): (
            f"{{text}} is about {ratios[position]:.0f} times the other readings: a slipped decimal point? "
            "It is used as typed."
        )
        for position in np.flatnonzero(ratios >= SLIP_RATIO)
    }
    ordinary = values[(ratios > 1.0 / SLIP_RATIO) & (ratios < SLIP_RATIO)]
    if ordinary.size and ordinary.min() > 0.0 and ordinary.max() <= 3.0 * ordinary.min():
        for position in np.flatnonzero((ratios > 0.0) & (ratios <= 1.0 / SLIP_RATIO)):
            found[int(position)] = (
                f"{{text}} is about 1/{1.0 / ratios[position]:.0f} of the other readings: "
                "a slipped decimal point? It is used as typed."
            )
    return found
