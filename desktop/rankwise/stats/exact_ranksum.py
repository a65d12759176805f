"""Exact permutation distribution of the rank-sum statistic, given the observed ties.

If the change did nothing, every way of splitting the N combined readings into n_a readings of A
and n_b of B is equally likely (probability 1 / C(N, n_a)), and the ties stay where they are. The
distribution of A's rank sum over these splits is counted with a dynamic program over the
readings in rank order (the idea of the shift algorithm of Streitberg & Roehmel 1986, Statistical
Software Newsletter 12, 10-17), on doubled mid-ranks so that every rank is a whole number.

Probabilities, not counts, are carried: after i readings, a cell holds the chance that the first
i readings contain k of the tracked group with a given partial sum. Every entry stays in [0, 1], so
nothing overflows at large N (counts such as C(1200, 600) would). Each reading costs a few
vectorised updates: the rows k are taken in about a dozen bands, each over its own columns.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from rankwise.stats.progress import SILENT, Monitor

_BANDS = 12
"""Rows of the table are updated in about this many bands, each over its own columns."""

MAX_TABLE_CELLS = 60_000_000
"""Largest working table (about 480 MB of float64) the exact count may use; beyond, it refuses."""

_PROGRESS_EVERY = 16
"""Report progress (and look for a stop request) after this many readings."""


@dataclass(frozen=True)
class RankSumDistribution:
    """Distribution of 2 U_a (twice the Mann-Whitney U of group A) if the change did nothing.

    Twice U is a whole number even with tied mid-ranks, so observed values are looked up exactly.

    Attributes:
        twice_u: the values 2 U_a can take, ascending (int64).
        probabilities: the chance of each value (sums to 1).
    """

    twice_u: np.ndarray
    probabilities: np.ndarray

    def at_most(self, twice_u_observed: int) -> float:
        """P(2 U_a <= observed)."""
        return float(self.probabilities[self.twice_u <= twice_u_observed].sum())

    def at_least(self, twice_u_observed: int) -> float:
        """P(2 U_a >= observed)."""
        return float(self.probabilities[self.twice_u >= twice_u_observed].sum())


def rank_sum_distribution(doubled_ranks: np.ndarray, n_a: int, monitor: Monitor = SILENT) -> RankSumDistribution:
    """Exact distribution of 2 U_a when n_a of the readings with these doubled mid-ranks form group A.

    ``doubled_ranks`` are twice the mid-ranks of all N readings of both groups (whole numbers, in
    any order). Raises ``ValueError`` when they are not whole numbers or ``n_a`` is not in 1..N-1,
    and ``Cancelled`` when the monitor says so.
    """
    doubled = np.sort(np.asarray(doubled_ranks, dtype=float).ravel())
    n_total = doubled.size
    if not 0 < n_a < n_total:
        raise ValueError(f"n_a must lie between 1 and {n_total - 1} (the number of readings less one); got {n_a}.")
    if not np.array_equal(doubled, np.rint(doubled)):
        raise ValueError("doubled_ranks must be whole numbers (twice the mid-ranks).")
    doubled = doubled.astype(np.int64)
    n_b = n_total - n_a
    # Track the smaller group: fewer rows, and every partial sum stays within a small range.
    n_tracked = min(n_a, n_b)
    sums = _tracked_sum_distribution(doubled, n_tracked, monitor)
    twice_u_tracked = sums.doubled_sums - n_tracked * (n_tracked + 1)
    twice_u_a = twice_u_tracked if n_tracked == n_a else 2 * n_a * n_b - twice_u_tracked
    order = np.argsort(twice_u_a)
    return RankSumDistribution(twice_u=twice_u_a[order], probabilities=sums.probabilities[order])


def no_ties_distribution(n_a: int, n_b: int, monitor: Monitor = SILENT) -> RankSumDistribution:
    """Exact distribution of 2 U_a with no ties (ranks 1..N), the case of the printed tables."""
    if n_a < 1 or n_b < 1:
        raise ValueError(f"n_a and n_b must be at least 1; got {n_a} and {n_b}.")
    return rank_sum_distribution(2 * np.arange(1, n_a + n_b + 1), n_a, monitor)


@dataclass(frozen=True)
class _SumDistribution:
    doubled_sums: np.ndarray
    probabilities: np.ndarray


def _tracked_sum_distribution(doubled: np.ndarray, n_tracked: int, monitor: Monitor) -> _SumDistribution:
    """Distribution of the sum of ``n_tracked`` of the ascending ``doubled`` ranks, drawn at random.

    The ranks are divided by their common divisor and centred on a whole number near their mean;
    a cell (k, c) holds the chance that the readings seen so far include k tracked ones whose
    centred values add up to c. Taking reading i moves mass from (k, c) to (k + 1, c + delta_i):
    the same shift for every k, so a band of rows moves in one array update.
    """
    n_total = doubled.size
    divisor = int(np.gcd.reduce(doubled))
    values = doubled // divisor
    centre = int(round(values.sum() / n_total))
    deltas = values - centre
    ascending = np.sort(deltas)
    room_below = int(-np.minimum(ascending[:n_tracked], 0).sum())
    room_above = int(np.maximum(ascending[::-1][:n_tracked], 0).sum())
    pad = int(np.abs(deltas).max())
    width = room_below + room_above + 1 + 2 * pad
    origin = room_below + pad
    if (n_tracked + 1) * width > MAX_TABLE_CELLS:
        raise ValueError(
            f"The exact p-value for these {n_total} readings would need more memory than this program "
            "allows; choose to compute the p-value by the normal approximation instead."
        )
    table = np.zeros((n_tracked + 1, width))
    table[0, origin] = 1.0
    # Columns that may hold mass, per row (inclusive); rows are updated in bands of a few rows,
    # each over its own columns, because row k lives near k times the mean shift seen so far.
    low = np.full(n_tracked + 1, 2 * width)  # rows not reached yet hold an empty range
    high = np.full(n_tracked + 1, -1)
    low[0] = high[0] = origin
    band = max(4, (n_tracked + 1) // _BANDS + 1)
    rows = np.arange(n_tracked + 1, dtype=float)
    for i, delta in enumerate(deltas.tolist()):
        remaining = n_total - i
        # P(next reading is tracked | k tracked so far) = (n_tracked - k) / remaining.
        take = (n_tracked - rows) / remaining
        first_row = max(1, n_tracked - remaining)
        last_row = min(i + 1, n_tracked)
        for top in range(last_row + 1, first_row, -band):
            bottom = max(first_row, top - band)
            _take_reading(table, bottom, top, delta, take, low, high)
        table[0, origin] *= 1.0 - take[0]
        reached = slice(1, last_row + 1)
        low[reached] = np.minimum(low[reached], low[: last_row] + delta)
        high[reached] = np.maximum(high[reached], high[: last_row] + delta)
        if i % _PROGRESS_EVERY == 0:
            monitor.step(i / n_total)
    monitor.step(1.0)
    final = table[n_tracked]
    reachable = np.flatnonzero(final > 0.0)
    probabilities = final[reachable]
    probabilities = probabilities / probabilities.sum()
    doubled_sums = ((reachable - origin) + n_tracked * centre) * divisor
    return _SumDistribution(doubled_sums=doubled_sums.astype(np.int64), probabilities=probabilities)


def _take_reading(table: np.ndarray, bottom: int, top: int, delta: int, take: np.ndarray,
                  low: np.ndarray, high: np.ndarray) -> None:
    """Update rows bottom..top-1 for one more reading: stay with 1 - take, or come from row k - 1."""
    source_low = int(low[bottom - 1:top - 1].min())
    source_high = int(high[bottom - 1:top - 1].max())
    moved = table[bottom - 1:top - 1, source_low:source_high + 1] * take[bottom - 1:top - 1, None]
    rows_here = table[bottom:top]
    kept_low, kept_high = int(low[bottom:top].min()), int(high[bottom:top].max())
    rows_here[:, kept_low:kept_high + 1] *= (1.0 - take[bottom:top])[:, None]
    rows_here[:, source_low + delta:source_high + 1 + delta] += moved
