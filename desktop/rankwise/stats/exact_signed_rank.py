"""Exact distribution of the signed-rank statistic W+ given the tied mid-ranks, and its p-values.

If the change did nothing, each non-zero difference is as likely to be positive as negative,
independently (Wilcoxon 1945); the distribution of W+ given the observed mid-ranks of |d| is
counted by sign flips, one rank at a time (Hollander & Wolfe 1999, section 3.1).
"""

from __future__ import annotations

import numpy as np

from rankwise.stats.progress import SILENT, Monitor
from rankwise.stats.ranks import rank_groups


def exact_cost(doubled_ranks: np.ndarray) -> float:
    """Work of the sign-flip count: steps times the length of the reduced support."""
    if doubled_ranks.size == 0:
        return 0.0
    step = np.gcd.reduce(doubled_ranks)
    return float(doubled_ranks.size) * float(doubled_ranks.sum() // step)


def signed_rank_null(doubled_ranks: np.ndarray, monitor: Monitor = SILENT) -> tuple[np.ndarray, np.ndarray]:
    """Exact distribution of W+ when each rank's sign is + or - with chance 1/2, independently.

    ``doubled_ranks`` are twice the (mid-)ranks of the non-zero |d|, so whole numbers. The
    count runs over sums in units of their greatest common divisor, one rank at a time, in
    floating-point probabilities (nothing overflows). Returns the values W+ can take (in rank
    units, ascending) and their probabilities. Cancellable through ``monitor``.
    """
    doubled_ranks = np.asarray(doubled_ranks, dtype=np.int64)
    if doubled_ranks.size == 0:
        return np.array([0.0]), np.array([1.0])
    step = int(np.gcd.reduce(doubled_ranks))
    reduced = doubled_ranks // step
    total = int(reduced.sum())
    probabilities = np.zeros(total + 1)
    probabilities[0] = 1.0
    reach = 0
    for index, r in enumerate(np.sort(reduced)):
        monitor.step(index / reduced.size)
        r = int(r)
        head = probabilities[: reach + 1].copy()
        probabilities[: reach + 1] *= 0.5
        probabilities[r : r + reach + 1] += 0.5 * head
        reach += r
    monitor.step(1.0)
    support = np.flatnonzero(probabilities > 0.0)
    return support * step / 2.0, probabilities[support]


def exact_p(support: np.ndarray, probabilities: np.ndarray, w_plus: float, alternative: str) -> float:
    """One- or two-sided (doubling) p of the observed W+ under its exact null distribution."""
    tolerance = 1e-9
    lower = float(probabilities[support <= w_plus + tolerance].sum())
    upper = float(probabilities[support >= w_plus - tolerance].sum())
    if alternative == "b-greater":
        return min(1.0, upper)
    if alternative == "b-less":
        return min(1.0, lower)
    return min(1.0, 2.0 * min(lower, upper))


def signed_rank_p(d: np.ndarray, zero_method: str, alternative: str) -> float:
    """Exact p of the signed-rank test on the whole-number differences ``d``, given their ties.

    Zeros: "wilcox" leaves them out before ranking, "pratt" ranks them with the rest and gives
    them no sign. Two-sided p doubles the smaller tail.
    """
    zero = d == 0
    ranked = ~zero if zero_method == "wilcox" else np.ones(d.size, dtype=bool)
    ranks = np.zeros(d.size)
    if ranked.any():
        (ranks_ranked,), _ = rank_groups([np.abs(d[ranked])], [np.abs(d[ranked])])
        ranks[ranked] = ranks_ranked
    support, probabilities = signed_rank_null(np.rint(2.0 * ranks[~zero]).astype(np.int64))
    return exact_p(support, probabilities, float(ranks[d > 0].sum()), alternative)
