"""Exact permutation distribution of the rank-sum statistic, given the observed ties.

If the change did nothing, every way of splitting the N combined readings into n_a readings of A
and n_b of B is equally likely (probability 1 / C(N, n_a)), and the ties stay where they are. The
distribution of A's rank sum over these splits is counted with a dynamic program over the
readings in rank order (the idea of the shift algorithm of Streitberg & Roehmel 1986, Statistical
Software Newsletter 12, 10-17), on doubled mid-ranks so that every rank is a whole number.

Counts are carried, each at most C(N, n_small) (about 1e29 at 50 + 50; the table-size limit keeps
every count that can be asked for far below the float64 limit), and divided by their total at the
end. The rows of the table (how many of the tracked group so far) lie one after the other in one
flat array, spaced so that taking a reading is one array update for all rows at once.

Two shapes of data have much cheaper exact counts, and the cheapest of the three is used
(``exact_count_seconds`` estimates each from measured costs on the development machine):

- no ties: the counts of U are the coefficients of the Gaussian binomial coefficient
  (Mann & Whitney 1947; ``rankwise.stats.critical.lower_tail_probabilities``), m steps over half
  the support, m the smaller group: 3 readings against 100,000 take about a millisecond;
- few distinct values (a coarse gauge): the count runs over the tie blocks instead of the
  readings, the number of the tracked group's readings in each block following the
  hypergeometric law given those still to place, and only the (readings, sum) pairs that occur
  are kept: 400 readings on a 3-value gauge take a few milliseconds.
"""

from __future__ import annotations

import threading
from dataclasses import dataclass
from math import lgamma

import numpy as np
from scipy.special import gammaln

from rankwise.stats.critical import lower_tail_probabilities
from rankwise.stats.progress import SILENT, Monitor

MAX_TABLE_CELLS = 60_000_000
"""Largest working table (about 480 MB of float64) the exact count may use; beyond, it refuses."""

_PROGRESS_EVERY = 16
"""Report progress (and look for a stop request) after this many readings."""

KEPT_TABLE_CELLS = 1_000_000
"""Working tables up to this many cells (8 MB each) are kept for the thread's next count."""


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
    costs = _costs(block_sizes_of(doubled), n_tracked, n_total)
    way = min(costs, key=costs.get)
    if way == "no ties":
        sums = _no_ties_sum_distribution(n_total, n_tracked, monitor)
    elif way == "blocks":
        sums = _block_sum_distribution(doubled, n_tracked, monitor)
    else:
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


_SECONDS_PER_SERIES_CELL = 4e-9
_SECONDS_PER_BLOCK_STATE = 2.5e-7
_SECONDS_PER_BLOCK = 4e-5
_SECONDS_PER_TABLE_CELL = 7e-10
_SECONDS_PER_READING = 1e-5
SECONDS_PER_COUNT = 6e-4
"""Measured costs on the development machine (tests/benchmarks/bench_two_groups.py): a cell of the
no-ties series per step, a (readings, sum) pair made in the count by tie blocks, one tie block, a
unit of the reading-by-reading table work (n_small^2 n_large N of them; measured 6e-10 to 1.2e-9 s
a unit from 50 + 50 to 120 + 120 and 40 + 400, more when other work shares the 2 cores), one
reading's update, and what every count costs whatever its way (ranking, sorting, looking up)."""


def exact_count_seconds(block_sizes: np.ndarray | None, n_tracked: int, n_total: int) -> float:
    """Estimated seconds of the cheapest exact count.

    ``block_sizes``: how many readings share each distinct value, in ascending order of value
    (None when no two readings tie); ``n_tracked``: the smaller group's size; ``n_total``: N.
    """
    return min(_costs(block_sizes, n_tracked, n_total).values()) + SECONDS_PER_COUNT


def block_sizes_of(doubled_ranks: np.ndarray) -> np.ndarray | None:
    """The sizes of the tie blocks (singles included) in ascending order, or None without ties."""
    _, sizes = np.unique(np.asarray(doubled_ranks), return_counts=True)
    return None if sizes.size == np.asarray(doubled_ranks).size else sizes


def _costs(block_sizes: np.ndarray | None, n_tracked: int, n_total: int) -> dict[str, float]:
    """Estimated seconds of each way to count."""
    small, large = n_tracked, n_total - n_tracked
    costs = {"readings": small * small * large * n_total * _SECONDS_PER_TABLE_CELL + n_total * _SECONDS_PER_READING}
    if block_sizes is None:
        costs["no ties"] = small * (small * large // 2 + 1) * _SECONDS_PER_SERIES_CELL
    else:
        costs["blocks"] = (_block_states(block_sizes, n_tracked, n_total) * _SECONDS_PER_BLOCK_STATE
                           + len(block_sizes) * _SECONDS_PER_BLOCK)
    return costs


def _block_states(sizes: np.ndarray, n_tracked: int, n_total: int) -> float:
    """An upper bound on the (readings, sum) pairs the count by tie blocks makes (the last block
    takes whatever is left, one way)."""
    states, made = 1.0, 0.0
    span = 0
    for size in np.asarray(sizes)[:-1].tolist():
        choices = min(size, n_tracked) + 1
        made += states * choices
        span += min(size, n_tracked) * 2 * n_total
        states = min(states * choices, (n_tracked + 1.0) * (span + 1.0))
        if made > 1e12:
            break
    return made + states


def _no_ties_sum_distribution(n_total: int, n_tracked: int, monitor: Monitor) -> _SumDistribution:
    """Doubled rank sums of n_tracked of the ranks 1..N without ties: the series of the Gaussian
    binomial coefficient over the lower half of U, mirrored (the distribution is symmetric)."""
    n_other = n_total - n_tracked
    top = n_tracked * n_other
    if top // 2 + 1 > MAX_TABLE_CELLS:
        raise ValueError(_too_big(n_total))
    lower = lower_tail_probabilities(n_tracked, n_other, top // 2, monitor)
    counts = np.concatenate([lower, lower[: top + 1 - lower.size][::-1]])
    probabilities = counts / counts.sum()
    doubled_sums = 2 * np.arange(top + 1, dtype=np.int64) + n_tracked * (n_tracked + 1)
    return _SumDistribution(doubled_sums=doubled_sums, probabilities=probabilities)


def _block_sum_distribution(doubled: np.ndarray, n_tracked: int, monitor: Monitor) -> _SumDistribution:
    """Doubled rank sums of n_tracked readings drawn at random, counted over the tie blocks.

    Given k tracked readings placed before a block of t readings, with R readings left, the block
    holds j tracked ones with the hypergeometric chance C(t, j) C(R - t, q - j) / C(R, q), q = n_tracked - k.
    Only the (k, sum) pairs that occur are kept, merged after every block.
    """
    scores, sizes = np.unique(doubled, return_counts=True)
    log_factorial = gammaln(np.arange(doubled.size + 2, dtype=float))
    placed = np.zeros(1, dtype=np.int64)
    sums = np.zeros(1, dtype=np.int64)
    probabilities = np.ones(1)
    remaining = doubled.size
    for index, (score, size) in enumerate(zip(scores.tolist(), sizes.tolist())):
        to_place = n_tracked - placed
        # j from the fewest the rest can still take up to the most this block can hold.
        fewest = np.maximum(0, to_place - (remaining - size))
        most = np.minimum(size, to_place)
        width = int((most - fewest).max()) + 1
        j = fewest[:, None] + np.arange(width)[None, :]
        possible = j <= most[:, None]
        j = np.where(possible, j, fewest[:, None])
        log_chance = (_log_choose(log_factorial, size, j) + _log_choose(log_factorial, remaining - size, to_place[:, None] - j)
                      - _log_choose(log_factorial, remaining, to_place)[:, None])
        chance = np.where(possible, np.exp(log_chance), 0.0) * probabilities[:, None]
        if possible.sum() > MAX_TABLE_CELLS:
            raise ValueError(_too_big(doubled.size))
        new_placed = (placed[:, None] + j)[possible]
        new_sums = (sums[:, None] + j * score)[possible]
        key = new_placed * (int(new_sums.max()) + 1) + new_sums
        unique_keys, where = np.unique(key, return_inverse=True)
        probabilities = np.bincount(where, weights=chance[possible])
        first = np.zeros(unique_keys.size, dtype=np.int64)
        first[where] = np.arange(where.size)
        placed, sums = new_placed[first], new_sums[first]
        remaining -= size
        monitor.step(index / scores.size)
    monitor.step(1.0)
    reachable = probabilities > 0.0
    probabilities = probabilities[reachable] / probabilities[reachable].sum()
    return _SumDistribution(doubled_sums=sums[reachable], probabilities=probabilities)


def _too_big(n_total: int) -> str:
    """The refusal of an exact count beyond the working memory, in the words of the window's method picker."""
    return (f"The exact p-value for these {n_total} readings would need more memory than this program "
            "allows; choose to compute the p-value by the normal approximation instead.")


def _log_choose(log_factorial: np.ndarray, n, k):
    """log C(n, k) from a table of log factorials (k within 0..n)."""
    return log_factorial[n + 1] - log_factorial[k + 1] - log_factorial[n - k + 1]


@dataclass(frozen=True)
class _SumDistribution:
    doubled_sums: np.ndarray
    probabilities: np.ndarray


def _tracked_sum_distribution(doubled: np.ndarray, n_tracked: int, monitor: Monitor) -> _SumDistribution:
    """Distribution of the sum of ``n_tracked`` of the ascending ``doubled`` ranks, drawn at random.

    The ranks are divided by their common divisor. Row k counts the ways the readings seen so far
    hold k tracked ones, by their sum s; taking reading i adds row k - 1, moved by its rank r_i, to
    row k. The rows lie one after the other in one flat array, row k's sum s at k R + s, so that
    this move is the same flat offset R + r_i for every row: one array update per reading over the
    rows still able to reach n_tracked. R is kept just wide enough that neighbouring rows' ranges
    (from the sum of the k smallest ranks to the sum of the k largest seen) never meet, and is
    widened (the rows copied) as the ranges grow. Counts are carried: each is at most C(N, n_tracked).
    """
    n_total = doubled.size
    divisor = int(np.gcd.reduce(doubled))
    ranks = (doubled // divisor).tolist()
    prefix = [0]
    for rank in ranks:
        prefix.append(prefix[-1] + rank)
    widths = _row_strides(np.asarray(prefix, dtype=np.int64), n_tracked)
    top_sum = prefix[n_total] - prefix[n_total - n_tracked]
    largest = n_tracked * int(widths.max(initial=1)) + top_sum + 1
    if 2 * largest > MAX_TABLE_CELLS or _log_choose_exact(n_total, n_tracked) > _LOG_LARGEST_COUNT:
        raise ValueError(_too_big(n_total))
    # The next table is written into `spare`: no overlapping update, no temporary copy.
    table, spare = _working_tables(largest)
    stride = 1
    table[:n_tracked + top_sum + 1] = 0.0
    table[0] = 1.0
    spare[:n_tracked + top_sum + 1] = table[:n_tracked + top_sum + 1]
    for i, rank in enumerate(ranks):
        # Rows k - 1 = first - 1 .. last - 1 move into rows first .. last (those that can still reach n_tracked).
        first, last = max(1, n_tracked - (n_total - i - 1)), min(i + 1, n_tracked)
        if widths[i] > stride:
            wider = int(widths[i:i + max(8, i // 2)].max())
            used = n_tracked * wider + top_sum + 1
            _restride(table, spare, stride, wider, prefix, i, first - 1, min(last, i), used)
            table, spare = spare, table
            spare[:used] = 0.0
            spare[0] = table[0]  # row 0 (no tracked reading yet) is never written again
            stride = wider
        begin = (first - 1) * stride + prefix[first - 1]
        end = (last - 1) * stride + prefix[i] - prefix[i - last + 1] + 1
        move = stride + rank
        np.add(table[begin + move:end + move], table[begin:end], out=spare[begin + move:end + move])
        # Row `first` below the moved range keeps its counts (every other cell of the rows is written above).
        kept = first * stride + prefix[first]
        spare[kept:begin + move] = table[kept:begin + move]
        table, spare = spare, table
        if i % _PROGRESS_EVERY == 0:
            monitor.step(i / n_total)
    monitor.step(1.0)
    low = n_tracked * stride + prefix[n_tracked]
    final = table[low:n_tracked * stride + top_sum + 1]
    reachable = np.flatnonzero(final > 0.0)
    probabilities = final[reachable] / final[reachable].sum()
    doubled_sums = (reachable + prefix[n_tracked]) * divisor
    return _SumDistribution(doubled_sums=doubled_sums.astype(np.int64), probabilities=probabilities)


_LOG_LARGEST_COUNT = 700.0
"""Counts up to e^700 (about 1e304) fit a float64; the table-size limit keeps C(N, n_tracked) far below."""


def _log_choose_exact(n: int, k: int) -> float:
    """log C(n, k) for any whole n >= k >= 0."""
    return lgamma(n + 1) - lgamma(k + 1) - lgamma(n - k + 1)


def _row_strides(prefix: np.ndarray, n_tracked: int) -> np.ndarray:
    """For each reading i (0-based), the least row stride R that keeps the rows it fills apart.

    After reading i (s = i + 1 readings seen), row k spans sums from prefix[k] (the k smallest
    ranks) to prefix[s] - prefix[s - k] (the k largest seen); rows k and k + 1 stay apart when
    R > top(k) - prefix[k + 1]. That gap grows with k by r[s - k - 1] - r[k + 1] >= 0 while
    s - k - 1 >= k + 1 and shrinks after (the ranks ascend), so its largest value over the rows
    filled lies at the row nearest (s - 2) / 2.
    """
    n_total = prefix.size - 1
    seen = np.arange(1, n_total + 1)
    first = np.maximum(1, n_tracked - (n_total - seen))
    last = np.minimum(seen, n_tracked) - 1  # pairs (k, k + 1) with both rows filled: k in first..last
    strides = np.ones(n_total, dtype=np.int64)
    for middle in ((seen - 2) // 2, (seen - 1) // 2):
        k = np.clip(middle, first, np.maximum(last, first))
        gap = prefix[seen] - prefix[seen - k] - prefix[k + 1] + 1
        np.maximum(strides, np.where(first <= last, gap, 1), out=strides)
    return strides


def _restride(table: np.ndarray, widened: np.ndarray, stride: int, wider: int, prefix: list[int], seen: int,
              first_row: int, last_row: int, size: int) -> None:
    """Write into ``widened`` (zero elsewhere) the rows first_row..last_row of ``table`` (those that hold
    mass after ``seen`` readings and can still reach the end) at row stride ``wider``."""
    widened[:size] = 0.0
    for k in range(first_row, last_row + 1):
        low, high = prefix[k], prefix[seen] - prefix[seen - k] + 1
        widened[k * wider + low:k * wider + high] = table[k * stride + low:k * stride + high]


class _Workspace(threading.local):
    """Each thread's two working tables, kept between counts: a fresh table of a few megabytes costs
    a page fault per 4 kB when the operating system hands its memory back and forth, which took as
    long as the count itself when many results were held in memory."""

    tables: tuple[np.ndarray, np.ndarray] | None = None


_WORKSPACE = _Workspace()


def _working_tables(cells: int) -> tuple[np.ndarray, np.ndarray]:
    """Two tables of ``cells`` cells each, contents undefined; small ones reuse the thread's kept pair."""
    kept = _WORKSPACE.tables
    if kept is not None and kept[0].size >= cells:
        return kept[0][:cells], kept[1][:cells]
    tables = np.empty(cells), np.empty(cells)
    if cells <= KEPT_TABLE_CELLS:
        _WORKSPACE.tables = tables
    return tables
