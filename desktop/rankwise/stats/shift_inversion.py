"""The shift's interval when readings tie: inversion of the exact rank-sum test given the ties.

A shift d belongs to the confidence set when the exact conditional test of A against B - d (the
permutation distribution given that comparison's own ties, two-sided p by doubling) does not
reject at 1 - level; the interval is the set's closed hull (inverting a test into an interval as in
Lehmann 1975, Nonparametrics, ch. 2, and Bauer 1972, JASA 67, 687-690; both cited from memory). Between
two neighbouring pairwise differences B - A the comparison, and so p, stays the same, so every
difference and one shift inside each gap between them are tried, walking in from both ends to
the outermost accepted ones; readings must be whole numbers of the gauge step so that every
comparison is exact. Each try costs one exact count, so the inversion is run only while trying
every shift would stay affordable.
"""

from __future__ import annotations

import numpy as np

from rankwise.stats.exact_ranksum import rank_sum_distribution
from rankwise.stats.ranks import rank_groups

INVERSION_STEPS = 2_000
"""Largest (shifts tried) x N: each exact count walks once over the N readings (about 75 us per
reading on the development machine), so the inversion stays within about 0.15 s."""

INVERSION_WORK = 100_000_000
"""Largest (shifts tried) x n_small^2 x n_large x N, the exact count's array work (about 0.05 s)."""

MAX_DIFFERENCES = 1_000_000
"""Largest n_a x n_b for which the pairwise differences are listed."""

_P_TOLERANCE = 1e-12
"""Sums of exact probabilities carry rounding noise; p within this of alpha counts as equal."""


def tie_aware_interval(counts_a: np.ndarray, counts_b: np.ndarray, level: float) -> tuple[float, float] | None:
    """The closed hull of all shifts (B - A, in gauge steps) the exact tie-aware test accepts at ``level``.

    ``counts_a`` and ``counts_b`` are the readings in whole gauge steps. Returns None when the
    inversion is not affordable, when the readings are not whole numbers, or when the accepted
    shifts reach past every difference (too few readings for any significance); the caller then
    keeps the order-statistic interval.
    """
    a = np.asarray(counts_a, dtype=float)
    b = np.asarray(counts_b, dtype=float)
    if not (_whole(a) and _whole(b)) or a.size * b.size > MAX_DIFFERENCES:
        return None
    differences = np.unique(np.subtract.outer(b.astype(np.int64), a.astype(np.int64)))
    # Twice the shifts tried, ascending: one below all differences, each difference, each gap, one above.
    tried = np.empty(2 * differences.size + 1, dtype=np.int64)
    tried[1::2] = 2 * differences
    tried[2:-1:2] = differences[:-1] + differences[1:]
    tried[0], tried[-1] = 2 * differences[0] - 1, 2 * differences[-1] + 1
    small, large = sorted((a.size, b.size))
    n_total = a.size + b.size
    if tried.size * n_total > INVERSION_STEPS or tried.size * small * small * large * n_total > INVERSION_WORK:
        return None
    def accepts(index: int) -> bool:
        return _two_sided_p(a, b, int(tried[index])) > 1.0 - level + _P_TOLERANCE

    if accepts(0) or accepts(tried.size - 1):
        return None
    # Only the outermost accepted shifts matter: walk in from each end to the first one.
    first = next((i for i in range(1, tried.size - 1) if accepts(i)), None)
    if first is None:
        return None
    last = next(i for i in range(tried.size - 2, first - 1, -1) if i == first or accepts(i))
    # A gap's hull reaches to the differences beside it: tried[i] for a gap lies between tried[i - 1] and tried[i + 1].
    low = tried[first] if first % 2 == 1 else tried[first - 1]
    high = tried[last] if last % 2 == 1 else tried[last + 1]
    return low / 2.0, high / 2.0


def _two_sided_p(a: np.ndarray, b: np.ndarray, twice_shift: int) -> float:
    """Exact two-sided p (doubling the smaller tail) of A against B - shift, given their ties."""
    doubled_a, doubled_b = 2.0 * a, 2.0 * b - twice_shift
    (ranks_a, ranks_b), _ = rank_groups([doubled_a, doubled_b], [doubled_a, doubled_b])
    distribution = rank_sum_distribution(np.rint(2.0 * np.concatenate([ranks_a, ranks_b])), a.size)
    twice_u_a = int(round(2.0 * ranks_a.sum())) - a.size * (a.size + 1)
    return min(1.0, 2.0 * min(distribution.at_most(twice_u_a), distribution.at_least(twice_u_a)))


def _whole(values: np.ndarray) -> bool:
    return bool(np.all(values == np.rint(values)) and np.abs(values).max(initial=0.0) < 2.0**50)
