"""Location and spread of one group's readings, and the quantiles of sorted readings they use."""

from __future__ import annotations

import numpy as np

from rankwise.stats.results import GroupSummary


def summarize(name: str, values: np.ndarray, n_dropped: int = 0) -> GroupSummary:
    """Median, quartiles (numpy's linear interpolation) and extremes of one group's readings."""
    ordered = np.sort(np.asarray(values, dtype=float).ravel())
    return GroupSummary(
        name=name,
        n=int(ordered.size),
        n_dropped=int(n_dropped),
        median=linear_quantile(ordered, 0.5),
        q1=linear_quantile(ordered, 0.25),
        q3=linear_quantile(ordered, 0.75),
        minimum=float(ordered[0]),
        maximum=float(ordered[-1]),
    )


def linear_quantile(ordered: np.ndarray, fraction: float) -> float:
    """The ``fraction`` quantile of ascending readings by linear interpolation between order
    statistics (Hyndman & Fan 1996, The American Statistician 50, 361-365, definition 7, numpy's
    default), in numpy.percentile's arithmetic, so both give the same float: at position
    h = (n - 1) fraction, x_(k) + (x_(k+1) - x_(k)) g below g = h - k = 1/2, else
    x_(k+1) - (x_(k+1) - x_(k)) (1 - g)."""
    position = (ordered.size - 1) * fraction
    if position >= ordered.size - 1:
        return float(ordered[-1])
    below = int(position)
    weight = position - below
    low, high = float(ordered[below]), float(ordered[below + 1])
    step = high - low
    return high - step * (1.0 - weight) if weight >= 0.5 else low + step * weight


def sorted_median(ordered: np.ndarray) -> float:
    """The median of ascending readings as numpy.median computes it: the middle reading, or the
    sum of the two middle ones halved."""
    middle = ordered.size // 2
    if ordered.size % 2:  # numpy's mean adds from +0.0: a middle reading of -0.0 comes out as 0.0
        return 0.0 + float(ordered[middle])
    return (0.0 + float(ordered[middle - 1]) + float(ordered[middle])) / 2.0
