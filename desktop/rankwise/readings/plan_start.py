"""Starting values for planning how many parts to measure, taken from what the sheet already knows.

The spread comes from the readings on the sheet: the pooled standard deviation of the chosen
groups (each group about its own mean), or, for the same parts measured twice, the standard
deviation of the row-by-row differences. The shift worth detecting comes from the tolerance: a
stated share of the width USL - LSL (one tenth by default: a common rule of thumb, no source).
Readings below a detection limit, notes and empty cells are left out of the spread.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from rankwise.readings.column_arrays import NO_DECIMALS, NUMBER

if TYPE_CHECKING:
    from rankwise.readings.sheet import GroupColumn

TOLERANCE_SHARE = 0.1
"""The share of the tolerance width taken as the shift worth detecting, unless stated otherwise."""


@dataclass(frozen=True)
class PlanStart:
    """What the sheet says about a plan's starting values, and where each came from.

    Attributes:
        spread: the spread (standard deviation) estimated from the readings, or None when the
            sheet has too few readings.
        spread_count: how many readings (or, for the same parts, differences) it rests on.
        spread_groups: the groups the readings come from.
        of_differences: True when ``spread`` is that of row-by-row differences (same parts).
        shift: ``share`` of the tolerance width, or None when no group has both LSL and USL.
        tolerance: (group name, LSL, USL) the shift was taken from, or None.
        share: the share of the tolerance width used.
        decimals: the finest resolution of the readings used, as decimals, or None.
        unit: the readings' unit, or "".
    """

    spread: float | None
    spread_count: int
    spread_groups: tuple[str, ...]
    of_differences: bool
    shift: float | None
    tolerance: tuple[str, float, float] | None
    share: float
    decimals: int | None
    unit: str


def plan_start(columns: Sequence[GroupColumn], *, paired: bool = False, share: float = TOLERANCE_SHARE) -> PlanStart:
    """Starting values for a plan over ``columns`` (A and B in that order for the same parts)."""
    if not 0.0 < share <= 1.0:
        raise ValueError(f"share must lie above 0 and at most 1; got {share!r}.")
    arrays = [column.arrays() for column in columns]
    measured = [column.measured() for column in arrays]
    decimals = max((column.finest_decimals() for column in arrays), default=NO_DECIMALS)
    decimals = None if decimals == NO_DECIMALS else decimals
    if paired and len(columns) >= 2:
        a, b = arrays[0], arrays[1]
        rows = min(a.kinds.size, b.kinds.size)
        both = (a.kinds[:rows] == NUMBER) & (b.kinds[:rows] == NUMBER)  # the rows measured at both stages
        differences = b.values[:rows][both] - a.values[:rows][both]
        spread = float(np.std(differences, ddof=1)) if differences.size >= 2 else None
        count = int(differences.size)
    else:
        pooled = [column for column in arrays if column.measured().size >= 2]
        degrees = sum(column.measured().size - 1 for column in pooled)
        spread = math.sqrt(sum(column.squares_about_mean() for column in pooled) / degrees) if degrees else None
        count = sum(column.measured().size for column in pooled)
    if spread is not None and not spread > 0.0:
        spread = None
    tolerance = next(((column.name, column.lsl, column.usl) for column in columns
                      if column.lsl is not None and column.usl is not None and column.usl > column.lsl), None)
    return PlanStart(
        spread=spread,
        spread_count=count if spread is not None else 0,
        spread_groups=tuple(column.name for column, group in zip(columns, measured) if group.size),
        of_differences=paired,
        shift=None if tolerance is None else share * (tolerance[2] - tolerance[1]),
        tolerance=tolerance,
        share=share,
        decimals=decimals,
        unit=next((column.unit for column in columns if column.unit), ""),
    )

