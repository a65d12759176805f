"""Location and spread of one group's readings."""

from __future__ import annotations

import numpy as np

from rankwise.stats.results import GroupSummary


def summarize(name: str, values: np.ndarray, n_dropped: int = 0) -> GroupSummary:
    """Median, quartiles (numpy's linear interpolation) and extremes of one group's readings."""
    values = np.asarray(values, dtype=float)
    q1, median, q3 = np.percentile(values, [25.0, 50.0, 75.0])
    return GroupSummary(
        name=name,
        n=int(values.size),
        n_dropped=int(n_dropped),
        median=float(median),
        q1=float(q1),
        q3=float(q3),
        minimum=float(values.min()),
        maximum=float(values.max()),
    )
