"""The change per part's confidence set when changes tie or are zero: inversion of the exact signed-rank test.

A shift s belongs to the set when the exact signed-rank test of the changes d - s, given their
ties, does not reject at 1 - level; parts whose change equals s are zeros at that shift and are
treated by the same zero convention as the test itself ("wilcox": left out before ranking;
"pratt": ranked, then given no sign), so the test, its inversion and the estimate use one
convention (the Hodges-Lehmann pseudo-median, the median of the Walsh averages, is the centre of
the shifts where the test balances and does not depend on it). The ranks and signs of d - s
change only where s crosses a Walsh average (d_i + d_j) / 2, i <= j (Tukey's construction, in
Hollander & Wolfe 1999, section 3.2), so every distinct Walsh average and one shift inside each
gap between them are tried, and the set is reported with open or closed ends as in
``rankwise.stats.shift_inversion``. Every candidate between the ends is tried; a set with a
rejected shift inside is not reported (None).
"""

from __future__ import annotations

import numpy as np

from rankwise.stats.exact_signed_rank import signed_rank_p
from rankwise.stats.shift_inversion import AcceptedShifts, accepted_set

INVERSION_WORK = 3e8
"""Largest (candidates tried) x n x (n (n + 1)), the sign-flip counts' work (about 0.3 s)."""

MAX_PAIRS = 2_000
"""Largest number of pairs for which the Walsh averages are listed."""

_COUNT_OVERHEAD = 2_000_000
"""The fixed cost of one count (ranking, setting up), in the same units of work."""

_P_TOLERANCE = 1e-12


def accepted_changes(d_counts: np.ndarray, level: float, alternative: str = "two-sided",
                     zero_method: str = "wilcox") -> AcceptedShifts | None:
    """Every shift of the changes (in gauge steps) the exact signed-rank test accepts at ``level``.

    ``d_counts`` are the changes in whole gauge steps. "b-greater" gives a lower bound
    [low, +inf), "b-less" an upper bound (-inf, high]. None when not affordable, when the changes
    are not whole numbers, when every shift on a side that should be bounded is accepted (too few
    parts), or when a rejected shift lies between accepted ones; ``NO_SHIFT`` when the test
    accepts no shift at all.
    """
    d = np.sort(np.asarray(d_counts, dtype=float))
    n = d.size
    if n == 0 or n > MAX_PAIRS or not (np.all(d == np.rint(d)) and np.abs(d).max() < 2.0**48):
        return None
    d = d.astype(np.int64)
    i, j = np.triu_indices(n)
    walsh = np.unique(d[i] + d[j])  # twice the Walsh averages
    # Four times the shifts tried: below all, each Walsh average, each gap, above all.
    tried = np.empty(2 * walsh.size + 1, dtype=np.int64)
    tried[1::2] = 2 * walsh
    tried[2:-1:2] = walsh[:-1] + walsh[1:]
    tried[0], tried[-1] = 2 * walsh[0] - 1, 2 * walsh[-1] + 1
    if tried.size * (n * n * (n + 1) + _COUNT_OVERHEAD) > INVERSION_WORK:
        return None
    four_d = 4 * d
    p = np.array([signed_rank_p(four_d - t, zero_method, alternative) for t in tried.tolist()])
    accepted = p > 1.0 - level + _P_TOLERANCE
    return accepted_set(tried, accepted, alternative, steps_per_unit=4)
