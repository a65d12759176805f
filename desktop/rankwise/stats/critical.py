"""Critical values of the Mann-Whitney U statistic (no ties), for any group sizes.

With no ties, the number of ways U can equal u is the coefficient of q^u in the Gaussian binomial
coefficient [N choose m]_q = prod_{j=1..m} (1 - q^(n + j)) / (1 - q^j) (Mann & Whitney 1947;
Andrews 1976, The Theory of Partitions, ch. 3). Only the lower tail is needed, so the series is
truncated near the expected critical value: m steps of one running sum and one subtraction each.
The printed tables stop at 20 or 40 readings per group; this works at any size.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
from math import comb, lgamma, log

import numpy as np
from scipy.stats import norm

from rankwise.stats.analysis import ALTERNATIVES
from rankwise.stats.inputs import check_choice, check_level
from rankwise.stats.progress import SILENT, Monitor

EXACT_WORK_LIMIT = 100_000_000
"""Largest (smaller size) x (truncation point) counted exactly (about 0.3 s; e.g. 580 + 580)."""


_RELATIVE_TOLERANCE = 1e-10
"""A tail equal to the level up to rounding counts as equal (e.g. 7/70 at 10 % for 4 + 4)."""


@dataclass(frozen=True)
class CriticalValue:
    """The critical U for given sizes and level, and how it was found.

    Attributes:
        u: largest u with P(U <= u) <= the level per tail; None when none exists.
        attained_alpha: the test's true size at that value (both tails when two-sided), or None.
        exact: True when counted exactly; False when the sizes were too large to count and the
            Edgeworth expansion gave the value (it agreed with the exact count in every balanced
            case checked from 100 + 100 to 600 + 300, but may differ by one).
    """

    u: int | None
    attained_alpha: float | None
    exact: bool


def _tail_level(alpha: float, alternative: str) -> float:
    """The probability allowed in the lower tail: alpha/2 when two-sided, else alpha."""
    check_level("alpha", alpha)
    check_choice("alternative", alternative, ALTERNATIVES)
    return alpha / 2.0 if alternative == "two-sided" else alpha


def _check_sizes(n_a: int, n_b: int) -> tuple[int, int]:
    """Both sizes as ints of at least 1, else ``ValueError``."""
    if int(n_a) != n_a or int(n_b) != n_b or n_a < 1 or n_b < 1:
        raise ValueError(f"n_a and n_b must be whole numbers of at least 1; got {n_a!r} and {n_b!r}.")
    return int(n_a), int(n_b)


def lower_tail_probabilities(n_a: int, n_b: int, u_max: int, monitor: Monitor = SILENT) -> np.ndarray:
    """P(U = u) for u = 0..u_max with no ties (U of either group: the distribution is symmetric).

    The series of [N choose m]_q is built in floating point and rescaled after every step (the
    counts themselves would overflow past N of about 1000); the last step divides by C(N, m).
    ``monitor`` sees the progress after every step and may stop the count.
    """
    n_a, n_b = _check_sizes(n_a, n_b)
    m, n = min(n_a, n_b), max(n_a, n_b)
    u_max = int(min(u_max, m * n))
    length = u_max + 1
    series = np.zeros(length)
    series[0] = 1.0
    log_scale = 0.0
    for j in range(1, m + 1):
        # Divide by (1 - q^j): a running sum with stride j.
        padded = np.zeros(-(-length // j) * j)
        padded[:length] = series
        series = np.cumsum(padded.reshape(-1, j), axis=0).ravel()[:length]
        # Multiply by (1 - q^(n + j)).
        step = n + j
        if step < length:
            series[step:] -= series[:-step].copy()
        top = series.max()
        series /= top
        log_scale += log(top)
        monitor.step(j / m)
    log_total = lgamma(m + n + 1) - lgamma(m + 1) - lgamma(n + 1)
    return series * np.exp(log_scale - log_total)


def _extreme_split_rare_enough(n_a: int, n_b: int, tail: float) -> bool:
    """True when the most extreme split (chance 1 / C(N, n_a)) has probability at most ``tail``."""
    if n_a + n_b <= 1000:
        return comb(n_a + n_b, n_a) >= 1.0 / tail  # exact: Python compares int and float exactly
    return lgamma(n_a + n_b + 1) - lgamma(n_a + 1) - lgamma(n_b + 1) >= -log(tail)


def critical_value(n_a: int, n_b: int, alpha: float = 0.05, alternative: str = "two-sided") -> CriticalValue:
    """The largest u with P(U <= u) <= alpha (alpha/2 per tail when two-sided), no ties, any sizes.

    Counted exactly while (smaller size) x (truncation point) stays within ``EXACT_WORK_LIMIT``;
    beyond, from the Edgeworth expansion (see ``edgeworth_critical_u``). The value depends on the
    sizes, level and sidedness only, so it is worked out once per such question and remembered
    (many characteristics of one part share their sizes).
    """
    n_a, n_b = _check_sizes(n_a, n_b)
    _tail_level(alpha, alternative)
    return _critical_value(n_a, n_b, float(alpha), alternative, EXACT_WORK_LIMIT)


@lru_cache(maxsize=256)
def _critical_value(n_a: int, n_b: int, alpha: float, alternative: str, work_limit: int) -> CriticalValue:
    """``critical_value`` for checked arguments (a frozen result, safe to share)."""
    tail = _tail_level(alpha, alternative)
    tails = 2 if alternative == "two-sided" else 1
    if not _extreme_split_rare_enough(n_a, n_b, tail):
        return CriticalValue(u=None, attained_alpha=None, exact=True)
    m = min(n_a, n_b)
    half = n_a * n_b // 2 if tail < 0.5 else n_a * n_b
    guess = normal_critical_u(n_a, n_b, tail)
    sd = np.sqrt(n_a * n_b * (n_a + n_b + 1) / 12.0)
    u_max = min(half, max(guess, 0) + int(0.25 * sd) + 16)
    if m * u_max > work_limit:
        return CriticalValue(u=edgeworth_critical_u(n_a, n_b, tail), attained_alpha=None, exact=False)
    while True:
        cumulative = np.cumsum(lower_tail_probabilities(n_a, n_b, u_max))
        allowed = np.flatnonzero(cumulative <= tail * (1.0 + _RELATIVE_TOLERANCE))
        if allowed[-1] < u_max or u_max >= half:
            u = int(allowed[-1])
            return CriticalValue(u=u, attained_alpha=float(min(1.0, tails * cumulative[u])), exact=True)
        u_max = min(half, 2 * u_max)


def normal_critical_u(n_a: int, n_b: int, tail: float) -> int:
    """floor(n_a n_b / 2 - 0.5 - z_(1 - tail) sd): the normal approximation with continuity correction.

    sd = sqrt(n_a n_b (N + 1) / 12) (no ties). May be negative when no value exists.
    """
    sd = np.sqrt(n_a * n_b * (n_a + n_b + 1) / 12.0)
    return int(np.floor(n_a * n_b / 2.0 - 0.5 - norm.isf(tail) * sd))


def edgeworth_critical_u(n_a: int, n_b: int, tail: float) -> int:
    """Largest u whose Edgeworth-corrected lower tail is at most ``tail`` (no ties).

    P(U <= u) ~ Phi(x) - phi(x) g2 (x^3 - 3x) / 24 with x = (u + 0.5 - n_a n_b / 2) / sd and the
    excess kurtosis of U, g2 = -6 (m^2 + n^2 + mn + m + n) / (5 mn (m + n + 1)) (Fix & Hodges 1955,
    Ann. Math. Statist. 26, 301-312; the formula from memory, checked against exact counts in the tests).
    """
    mean = n_a * n_b / 2.0
    sd = np.sqrt(n_a * n_b * (n_a + n_b + 1) / 12.0)
    excess = -6.0 * (n_a**2 + n_b**2 + n_a * n_b + n_a + n_b) / (5.0 * n_a * n_b * (n_a + n_b + 1))
    guess = normal_critical_u(n_a, n_b, tail)
    candidates = np.arange(guess - 64, guess + 65)
    x = (candidates + 0.5 - mean) / sd
    lower_tail = norm.cdf(x) - norm.pdf(x) * excess * (x**3 - 3.0 * x) / 24.0
    return int(candidates[lower_tail <= tail][-1])


def critical_u(n_a: int, n_b: int, alpha: float = 0.05, alternative: str = "two-sided") -> int | None:
    """Largest u with P(U <= u) <= alpha (alpha/2 per tail when two-sided) with no ties; None if none.

    Reject "no difference" when the smaller U is at most this value. Any sizes: exact while
    affordable (see ``critical_value``), which covers every size a printed table shows and far more.
    """
    return critical_value(n_a, n_b, alpha, alternative).u


def smallest_equal_size(alpha: float = 0.05, alternative: str = "two-sided") -> int:
    """The smallest n such that n + n readings could reach significance at ``alpha`` (no ties).

    A critical value exists once the most extreme split, with chance 1 / C(2n, n), is rare enough.
    """
    tail = _tail_level(alpha, alternative)
    n = 1
    while not _extreme_split_rare_enough(n, n, tail):
        n += 1
    return n


def smallest_partner_size(n_fixed: int, alpha: float = 0.05, alternative: str = "two-sided") -> int:
    """With one group kept at ``n_fixed`` readings, the fewest in the other to make significance possible."""
    if int(n_fixed) != n_fixed or n_fixed < 1:
        raise ValueError(f"n_fixed must be a whole number of at least 1; got {n_fixed!r}.")
    tail = _tail_level(alpha, alternative)
    n = 1
    while not _extreme_split_rare_enough(n_fixed, n, tail):
        n += 1
    return n
