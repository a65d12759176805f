"""What the readings charts and the printed page draw, taken from a result and its analysis."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from rankwise.stats import (
    Analysis,
    PairedResult,
    PlanResult,
    SeveralGroupsResult,
    TwoGroupResult,
)
from rankwise.wording import format_reading


@dataclass(frozen=True)
class ReadingsView:
    """Readings per group, ready to draw.

    Attributes:
        names: the groups' names, in order.
        values: the readings used per group, in entry order (a result's own runs of numbers, not copied).
        medians: each group's median.
        paired: True when values[0][i] and values[1][i] are the same part.
        unit: the readings' unit, or "".
        characteristic: what was measured, or "".
        lsl, usl, nominal: specification limits and nominal, or None.
        decimals: the gauge resolution in decimals, or None when not known.
        decimal_mark: the decimal mark the readings were typed with ("." or ",").
    """

    names: tuple[str, ...]
    values: tuple[Sequence[float], ...]
    medians: tuple[float, ...]
    paired: bool
    unit: str
    characteristic: str
    lsl: float | None
    usl: float | None
    nominal: float | None
    decimals: int | None
    decimal_mark: str = "."

    def format(self, value: float) -> str:
        """A reading as text at the gauge's resolution and in the typed decimal mark (the wording layer's one rule)."""
        return format_reading(value, self.decimals, self.decimal_mark)

    def axis_label(self) -> str:
        """The reading axis' label: the characteristic (or "Reading") and the unit."""
        title = self.characteristic or "Reading"
        return f"{title} ({self.unit})" if self.unit else title


def _first_set(analysis: Analysis, attribute: str):
    """The first group's non-empty value of ``attribute`` (limits are the same for all groups)."""
    for group in analysis.groups:
        value = getattr(group, attribute)
        if value not in (None, ""):
            return value
    return None


def readings_view(result, analysis: Analysis) -> ReadingsView | None:
    """The readings behind ``result`` (None for a planning result, which has no readings)."""
    if isinstance(result, (TwoGroupResult, PairedResult)):
        names = (result.name_a, result.name_b)
        values = (result.values_a, result.values_b)
        medians = (result.summary_a.median, result.summary_b.median)
    elif isinstance(result, SeveralGroupsResult):
        names = tuple(summary.name for summary in result.summaries)
        values = result.values
        medians = tuple(summary.median for summary in result.summaries)
    elif isinstance(result, PlanResult):
        return None
    else:
        raise ValueError(f"result must be a two-group, paired, several-groups or plan result, not {type(result).__name__}")
    decimals = [group.decimals for group in analysis.groups if group.decimals is not None]
    return ReadingsView(
        names=names,
        values=values,
        medians=medians,
        paired=isinstance(result, PairedResult),
        unit=_first_set(analysis, "unit") or "",
        characteristic=analysis.settings.characteristic,
        lsl=_first_set(analysis, "lsl"),
        usl=_first_set(analysis, "usl"),
        nominal=_first_set(analysis, "nominal"),
        decimals=max(decimals) if decimals else None,
        decimal_mark=analysis.decimal_mark,
    )


def stacked_offsets(values, *, spacing: float, half_width: float) -> np.ndarray:
    """Sideways offsets that set equal readings side by side, centred on zero.

    Readings that share a value (ties, common with coarse gauges) would hide one another; here
    the k-th of m equal readings moves ``(k - (m - 1) / 2) * spacing`` sideways, the spacing
    shrinking when m readings would not fit in ``+/- half_width``. Returned in entry order.
    """
    array = np.asarray(values, dtype=float)
    offsets = np.zeros(array.size)
    if array.size == 0:
        return offsets
    keys = np.round(array, 9)
    for value in np.unique(keys):
        members = np.flatnonzero(keys == value)
        count = members.size
        if count == 1:
            continue
        step = min(spacing, 2.0 * half_width / (count - 1))
        offsets[members] = (np.arange(count) - (count - 1) / 2.0) * step
    return offsets
