"""Hodges-Lehmann shift of B against A and its distribution-free (Moses) confidence interval.

The shift is the median of all n_a n_b differences b_j - a_i (Hodges & Lehmann 1963, Ann. Math.
Statist. 34, 598-611); the interval runs from the (C + 1)-th to the (n_a n_b - C)-th smallest
difference, C the two-sided critical U at 1 - confidence (Moses 1953; Hollander & Wolfe 1999,
section 4.3). With many readings the differences are never all built: order statistics are
SELECTED from the sorted samples, because row i of the difference table, b_j - a_i over the
sorted b, is itself sorted. Each round draws a random sample of the remaining candidates, takes
two sample quantiles that bracket the wanted rank (the Floyd-Rivest idea), and counts per row with
a binary search how many differences lie below each (Monahan 1984, ACM TOMS 10, 265-270, on the
same row-wise candidate ranges; Johnson & Mizoguchi 1978, SIAM J. Comput. 7, 147-153). Memory
stays O(n_a + n_b + sample); a few rounds of O(n_a log n_b) each suffice. Up to 2^18 differences
(512 x 512 readings) are simply listed and partitioned once for every rank asked.

The same selector serves the one-sample (paired) question: ``select_walsh_sums`` selects among
the n (n + 1) / 2 sums d_i + d_j, i <= j, whose halves are the Walsh averages.

Readings should be passed as whole numbers on their gauge grid (``rankwise.stats.grid``): then
every difference is computed and compared exactly.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

_DIRECT_LIMIT = 1 << 18
"""Candidates are gathered and partitioned directly once at most this many remain."""

_SAMPLE_SIZE = 4096
"""Candidates sampled per round to place the bracketing pivots."""

_SEED = 20260
"""Fixed seed: the selection is exact either way; the seed only makes its path repeatable."""


def select_pairwise_differences(sorted_a: np.ndarray, sorted_b: np.ndarray, ranks: Sequence[int]) -> np.ndarray:
    """The ``ranks``-th smallest (1-based) of the differences b_j - a_i over all pairs.

    ``sorted_a`` and ``sorted_b`` must be ascending. Raises ``ValueError`` for a rank outside
    1..n_a n_b or unsorted input.
    """
    a = _ascending(sorted_a, "sorted_a")
    b = _ascending(sorted_b, "sorted_b")
    return _select(b, a, np.zeros(a.size, dtype=np.int64), ranks)


def select_walsh_sums(sorted_d: np.ndarray, ranks: Sequence[int]) -> np.ndarray:
    """The ``ranks``-th smallest (1-based) of the sums d_i + d_j over i <= j (n (n + 1) / 2 of them).

    Halve the result for the Walsh averages (d_i + d_j) / 2 of the signed-rank pseudo-median.
    """
    d = _ascending(sorted_d, "sorted_d")
    # Row i holds d_j - (-d_i) for j >= i: sorted along the row, starting at column i.
    return _select(d, -d, np.arange(d.size, dtype=np.int64), ranks)


def hodges_lehmann_shift(sorted_a: np.ndarray, sorted_b: np.ndarray) -> float:
    """Median of all b_j - a_i (the mean of the two middle differences when n_a n_b is even)."""
    total = len(sorted_a) * len(sorted_b)
    middle = [(total + 1) // 2, total // 2 + 1]
    low, high = select_pairwise_differences(sorted_a, sorted_b, middle).tolist()
    return (0.0 + low + high) / 2.0  # numpy.mean's arithmetic: the sum starts from +0.0


def moses_interval(sorted_a: np.ndarray, sorted_b: np.ndarray, critical: int | None) -> tuple[float, float]:
    """[D_(C+1), D_(n_a n_b - C)] over the sorted differences, C = ``critical``.

    With ``critical`` None (no critical value exists at these sizes), the whole range of the
    differences [D_(1), D_(n_a n_b)] is returned; its coverage then falls short of the level.
    """
    total = len(sorted_a) * len(sorted_b)
    c = 0 if critical is None else int(critical)
    if not 0 <= c < (total + 1) // 2:
        raise ValueError(f"critical must lie between 0 and {(total - 1) // 2}; got {critical}.")
    low, high = select_pairwise_differences(sorted_a, sorted_b, [c + 1, total - c])
    return float(low), float(high)


def _ascending(values: np.ndarray, name: str) -> np.ndarray:
    array = np.asarray(values, dtype=float).ravel()
    if array.size == 0:
        raise ValueError(f"{name} must hold at least one reading.")
    if np.any(array[1:] < array[:-1]):
        raise ValueError(f"{name} must be sorted ascending.")
    return array


def _select(columns: np.ndarray, row_offsets: np.ndarray, first_column: np.ndarray, ranks: Sequence[int]) -> np.ndarray:
    """Order statistics of columns[j] - row_offsets[i] over rows i and columns j >= first_column[i]."""
    total = int((columns.size - first_column).sum())
    wanted = [int(r) for r in ranks]
    for rank in wanted:
        if not 1 <= rank <= total:
            raise ValueError(f"ranks must lie between 1 and {total}; got {rank}.")
    if total <= _DIRECT_LIMIT:  # few enough to list: one partition places every wanted rank
        listed = _candidates(columns, row_offsets, first_column, columns.size - first_column)
        distinct = sorted(set(wanted))
        placed = np.partition(listed, [rank - 1 for rank in distinct])
        return np.array([float(placed[rank - 1]) for rank in wanted])
    rng = np.random.default_rng(_SEED)
    whole = _whole_numbers(columns) and _whole_numbers(row_offsets)
    found: dict[int, float] = {}
    for rank in sorted(set(wanted)):
        if rank - 1 in found:  # the next order statistic: one counting pass, not a new search
            found[rank] = _next_order_statistic(columns, row_offsets, first_column, rank, found[rank - 1], whole)
        else:
            found[rank] = _select_one(columns, row_offsets, first_column, rank, rng, whole)
    return np.array([found[rank] for rank in wanted])


def _whole_numbers(values: np.ndarray) -> bool:
    """True when every value is a whole number small enough for exact float arithmetic."""
    return bool(np.all(values == np.rint(values)) and np.abs(values).max(initial=0.0) < 2.0**51)


def _next_order_statistic(columns, offsets, first, rank, previous, whole) -> float:
    """The rank-th entry given the (rank - 1)-th: the same value if it repeats, else the smallest larger entry."""
    right = np.full(offsets.size, columns.size, dtype=np.int64)
    up_to = _count_in_rows(columns, offsets, previous, first, right, strictly_below=False, whole=whole)
    if int((up_to - first).sum()) >= rank:
        return previous
    rows = np.flatnonzero(up_to < columns.size)
    return float((columns[up_to[rows]] - offsets[rows]).min())


def _select_one(columns: np.ndarray, offsets: np.ndarray, first: np.ndarray, rank: int,
                rng: np.random.Generator, whole: bool) -> float:
    """The rank-th smallest entry; candidates in row i are its columns left[i] .. right[i] - 1."""
    left = first.copy()
    right = np.full(offsets.size, columns.size, dtype=np.int64)
    below = 0  # entries known to be smaller than every candidate (ties: not larger)
    spread = 3.0
    while True:
        counts = right - left
        remaining = int(counts.sum())
        if remaining <= _DIRECT_LIMIT:
            return _select_directly(columns, offsets, left, counts, rank - below)
        sample = np.sort(_sample_candidates(columns, offsets, left, counts, remaining, rng))
        share = (rank - below) / remaining
        reach = spread * np.sqrt(share * (1.0 - share) * sample.size)
        last = sample.size - 1
        centre = share * sample.size
        low_pivot = sample[min(last, max(0, int(np.floor(centre - reach))))]
        high_pivot = sample[min(last, max(0, int(np.ceil(centre + reach))))] if reach else low_pivot
        under_low = _count_in_rows(columns, offsets, low_pivot, left, right, strictly_below=True, whole=whole)
        up_to_high = _count_in_rows(columns, offsets, high_pivot, left, right, strictly_below=False, whole=whole)
        smaller = below + int((under_low - left).sum())
        not_larger = below + int((up_to_high - left).sum())
        if rank <= smaller:
            right = under_low
        elif rank > not_larger:
            below = not_larger
            left = up_to_high
        elif low_pivot == high_pivot:
            return float(low_pivot)
        else:
            below = smaller
            left, right = under_low, up_to_high
        # A round that kept most candidates (pivots too far apart) is followed by a single pivot,
        # which always removes at least the pivot itself.
        spread = 0.0 if (right - left).sum() > 0.5 * remaining else 3.0


def _count_in_rows(columns, offsets, pivot, left, right, *, strictly_below: bool, whole: bool) -> np.ndarray:
    """Per row, the first column whose difference is >= pivot (strictly_below) or > pivot.

    A binary search for offsets + pivot finds it; for values that are not whole numbers the float
    sum can round differently from the difference columns - offsets, so the boundary is then
    moved, a whole run of equal columns at a time, until it agrees with the differences
    themselves (rounding is monotone, so the differences along a row stay sorted).
    """
    side = "left" if strictly_below else "right"
    position = np.clip(np.searchsorted(columns, offsets + pivot, side=side), left, right)
    if whole:  # whole numbers: offsets + pivot is exact, the search already agrees
        return position

    def beyond(diff):  # the difference lies past the boundary
        return diff >= pivot if strictly_below else diff > pivot

    while True:
        before = np.maximum(position - 1, 0)
        back = (position > left) & beyond(columns[before] - offsets)
        if not back.any():
            break
        position[back] = np.maximum(np.searchsorted(columns, columns[before[back]], side="left"), left[back])
    while True:
        at = np.minimum(position, columns.size - 1)
        forward = (position < right) & ~beyond(columns[at] - offsets)
        if not forward.any():
            break
        position[forward] = np.minimum(np.searchsorted(columns, columns[at[forward]], side="right"), right[forward])
    return position


def _sample_candidates(columns, offsets, left, counts, remaining, rng) -> np.ndarray:
    """Values of randomly drawn candidates (with replacement), uniform over all candidates."""
    picks = rng.integers(0, remaining, size=_SAMPLE_SIZE)
    ends = np.cumsum(counts)
    rows = np.searchsorted(ends, picks, side="right")
    within = picks - (ends[rows] - counts[rows])
    return columns[left[rows] + within] - offsets[rows]


def _select_directly(columns, offsets, left, counts, rank_among) -> float:
    """Gather the remaining candidates and partition them."""
    values = _candidates(columns, offsets, left, counts)
    return float(np.partition(values, rank_among - 1)[rank_among - 1])


def _candidates(columns, offsets, left, counts) -> np.ndarray:
    """The values of the candidates, columns left[i] .. left[i] + counts[i] - 1 of each row i, in any order."""
    if not left.any() and (counts == columns.size).all():  # every difference: the whole table
        return np.subtract.outer(columns, offsets).ravel()
    rows = np.repeat(np.arange(offsets.size), counts)
    starts = np.repeat(np.cumsum(counts) - counts, counts)
    positions = np.repeat(left, counts) + (np.arange(rows.size) - starts)
    return columns[positions] - offsets[rows]
