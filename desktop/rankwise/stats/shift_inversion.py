"""The shift's confidence set when readings tie: every shift the exact rank-sum test given the ties accepts.

A shift d belongs to the confidence set when the exact conditional test of A against B - d (the
permutation distribution given that comparison's own ties; two-sided p by doubling, or the
one-sided p of the question asked) does not reject at 1 - level (inverting a test into a
confidence set as in Lehmann 1975, Nonparametrics, ch. 2, and Bauer 1972, JASA 67, 687-690; both
cited from memory). Between two neighbouring pairwise differences B - A the comparison, and so p,
stays the same; at a difference itself some pairs tie and p can differ. So every difference and
one shift inside each gap between them are tried, and the set is reported with each end open
(the end is a difference the test rejects, the gap beside it is accepted) or closed. Every
candidate between the ends is tried too, so the reported set holds only accepted shifts; a set
with a rejected shift inside is not reported as an interval (None, the caller says so). Readings
must be whole numbers of the gauge step so that every comparison is exact. Each try costs one
exact count, so the inversion runs only while trying every candidate stays affordable.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from rankwise.stats.exact_ranksum import SECONDS_PER_COUNT, block_sizes_of, exact_count_seconds, rank_sum_distribution
from rankwise.stats.ranks import midranks_on_grid

INVERSION_SECONDS = 0.3
"""Largest estimated time for trying every candidate shift (each one exact count)."""

MAX_DIFFERENCES = 1_000_000
"""Largest n_a x n_b for which the pairwise differences are listed."""

_P_TOLERANCE = 1e-12
"""Sums of exact probabilities carry rounding noise; p within this of alpha counts as equal."""


@dataclass(frozen=True)
class AcceptedShifts:
    """The shifts (B - A, in gauge steps) the exact test accepts: an interval with open or closed ends.

    ``low`` is -inf and ``high`` +inf for a one-sided bound; an infinite end counts as open.
    ``empty`` is True when the test accepts no shift at all (the groups differ in a way no single
    shift on the gauge describes); the ends are then NaN.
    """

    low: float
    high: float
    low_included: bool
    high_included: bool
    empty: bool = False


NO_SHIFT = AcceptedShifts(low=float("nan"), high=float("nan"), low_included=False, high_included=False, empty=True)
"""The answer when the test accepts no shift at all."""


def accepted_shifts(counts_a: np.ndarray, counts_b: np.ndarray, level: float,
                    alternative: str = "two-sided") -> AcceptedShifts | None:
    """Every shift the exact tie-aware test accepts at ``level`` (the test's level is 1 - level).

    ``counts_a`` and ``counts_b`` are the readings in whole gauge steps. ``alternative``
    "two-sided" gives a two-sided set; "b-greater" (B reads higher) a lower bound, the set
    [low, +inf); "b-less" an upper bound, (-inf, high]. Returns None when the inversion is not
    affordable, when the readings are not whole numbers, when the test accepts every shift on a
    side that should be bounded (too few readings), or when a rejected shift lies between
    accepted ones; ``NO_SHIFT`` when the test accepts no shift at all.
    """
    a = np.asarray(counts_a, dtype=float)
    b = np.asarray(counts_b, dtype=float)
    if not (_whole(a) and _whole(b)) or a.size * b.size > MAX_DIFFERENCES:
        return None
    # k distinct readings of A and l of B make at least k + l - 1 distinct differences (b_1 - a_k <
    # ... < b_1 - a_1 < b_2 - a_1 < ... < b_l - a_1), so at least 2 (k + l - 1) + 1 tries.
    fewest_tries = 2 * (_distinct_count(a) + _distinct_count(b) - 1) + 1
    if fewest_tries * SECONDS_PER_COUNT > INVERSION_SECONDS:  # too many tries whatever each costs
        return None
    # Mid-ranks tie exactly where the readings do, so the readings' own tie blocks are the ranks' blocks.
    one_count = exact_count_seconds(block_sizes_of(np.concatenate([a, b])), min(a.size, b.size), a.size + b.size)
    if fewest_tries * one_count > INVERSION_SECONDS:
        return None
    differences = _distinct(np.subtract.outer(b.astype(np.int64), a.astype(np.int64)).ravel())
    # Twice the shifts tried, ascending: one below all differences, each difference, each gap, one above.
    tried = np.empty(2 * differences.size + 1, dtype=np.int64)
    tried[1::2] = 2 * differences
    tried[2:-1:2] = differences[:-1] + differences[1:]
    tried[0], tried[-1] = 2 * differences[0] - 1, 2 * differences[-1] + 1
    if tried.size * one_count > INVERSION_SECONDS:  # one_count includes SECONDS_PER_COUNT
        return None
    accepted = np.array([_p_value(a, b, int(t), alternative) > 1.0 - level + _P_TOLERANCE for t in tried])
    return accepted_set(tried, accepted, alternative, steps_per_unit=2)


def accepted_set(tried: np.ndarray, accepted: np.ndarray, alternative: str,
                 steps_per_unit: int) -> AcceptedShifts | None:
    """The accepted candidates as one set with open or closed ends.

    ``tried`` alternates gaps (even index) and candidate values (odd index), ascending, in
    ``1 / steps_per_unit`` of a gauge step. None when the set runs past the last candidate on a
    bounded side or has a rejected candidate inside; ``NO_SHIFT`` when nothing is accepted.
    """
    if alternative != "b-less" and accepted[0]:
        return None
    if alternative != "b-greater" and accepted[-1]:
        return None
    inside = np.flatnonzero(accepted)
    if inside.size == 0:
        return NO_SHIFT
    if inside.size != inside[-1] - inside[0] + 1:
        return None
    first, last = int(inside[0]), int(inside[-1])

    def end(index: int, side: int) -> float:
        """A candidate value itself, or, for an accepted gap, the rejected value beside it (an open end)."""
        return float(tried[index] if index % 2 == 1 else tried[index + side]) / steps_per_unit

    low, low_in = (-np.inf, False) if alternative == "b-less" else (end(first, -1), first % 2 == 1)
    high, high_in = (np.inf, False) if alternative == "b-greater" else (end(last, +1), last % 2 == 1)
    return AcceptedShifts(low=low, high=high, low_included=low_in, high_included=high_in)


def _doubled_ranks(a: np.ndarray, b: np.ndarray, twice_shift: int) -> tuple[np.ndarray, float]:
    """Twice the mid-ranks of A and B - shift together, and twice A's rank sum."""
    ranks = midranks_on_grid(np.concatenate([2.0 * a, 2.0 * b - twice_shift]))
    return np.rint(2.0 * ranks), float(2.0 * ranks[:a.size].sum())


def _p_value(a: np.ndarray, b: np.ndarray, twice_shift: int, alternative: str) -> float:
    """Exact p of A against B - shift given their ties: one-sided, or two-sided by doubling the smaller tail."""
    doubled, twice_sum_a = _doubled_ranks(a, b, twice_shift)
    distribution = rank_sum_distribution(doubled, a.size)
    twice_u_a = int(round(twice_sum_a)) - a.size * (a.size + 1)
    if alternative == "b-greater":  # B higher: small U of A
        return distribution.at_most(twice_u_a)
    if alternative == "b-less":
        return distribution.at_least(twice_u_a)
    return min(1.0, 2.0 * min(distribution.at_most(twice_u_a), distribution.at_least(twice_u_a)))


def _distinct(values: np.ndarray) -> np.ndarray:
    """The distinct values, ascending."""
    ordered = np.sort(values)
    return ordered[np.concatenate(([True], ordered[1:] != ordered[:-1]))]


def _distinct_count(values: np.ndarray) -> int:
    """How many distinct values there are."""
    ordered = np.sort(values)
    return int(np.count_nonzero(ordered[1:] != ordered[:-1])) + 1


def _whole(values: np.ndarray) -> bool:
    return bool(np.all(values == np.rint(values)) and np.abs(values).max(initial=0.0) < 2.0**50)
