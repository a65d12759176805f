"""Same parts measured twice: Wilcoxon signed-rank test, Hodges-Lehmann pseudo-median, equivalence.

Differences d = b - a are formed on the readings' common decimal grid, so floating-point noise
never splits equal differences. Conventions (Hollander & Wolfe 1999, Nonparametric Statistical
Methods, 2nd ed., ch. 3):

- zeros: "wilcox" drops parts with d = 0 before ranking (Wilcoxon 1945); "pratt" ranks them
  with the rest and leaves their ranks out of both sums (Pratt 1959);
- exact p: the sign-flip distribution of W+ given the observed mid-ranks of |d| (conditional on
  the ties), two-sided p by doubling the smaller tail;
- normal approximation: tie-corrected variance, continuity correction 0.5 (as
  ``scipy.stats.wilcoxon(..., method="asymptotic", correction=True)``);
- Hodges-Lehmann pseudo-median: the median of the Walsh averages over every complete pair;
- its interval (a one-sided bound for a one-sided question): with tied or zero changes, where
  affordable, every shift the exact signed-rank test given the ties accepts, parts whose change
  equals the shift treated by the same zero convention as the test (``rankwise.stats.change_inversion``);
  otherwise the Walsh order statistics at the no-ties critical value (approximate with ties).
"""

from __future__ import annotations

import functools
import math
from collections.abc import Sequence

import numpy as np
from scipy import stats as _dist

from rankwise.stats.change_inversion import accepted_changes
from rankwise.stats.exact_signed_rank import exact_cost as _exact_cost
from rankwise.stats.exact_signed_rank import exact_p as _exact_p
from rankwise.stats.exact_signed_rank import signed_rank_null
from rankwise.stats.frozen_floats import FrozenFloats
from rankwise.stats.grid import find_grid, snap_to_decimals
from rankwise.stats.hodges_lehmann import select_walsh_sums
from rankwise.stats.inputs import check_choice, check_level, readings_array
from rankwise.stats.progress import SILENT, Monitor
from rankwise.stats.ranks import rank_groups
from rankwise.stats.results import ConfidenceInterval, NullDistribution, PairedResult
from rankwise.stats.summary import summarize

ZERO_METHODS = ("wilcox", "pratt")
EXACT_BUDGET = 4e7
"""Largest (non-zero differences) x (reduced rank total) for which "auto" uses the exact p."""
NULL_CHART_LIMIT = 200
"""Largest number of non-zero differences for which the null distribution is kept for the chart."""
_EXACT_CRITICAL_LIMIT = 400
"""Largest n for which critical_t counts the exact no-ties distribution (normal beyond)."""
_P_TOLERANCE = 1e-12
"""Sums of exact probabilities carry rounding noise; p within this of alpha counts as equal."""


def compare_paired(
    a: Sequence[float],
    b: Sequence[float],
    *,
    alternative: str = "two-sided",
    alpha: float = 0.05,
    method: str = "auto",
    zero_method: str = "wilcox",
    confidence: float = 0.95,
    margin: float | None = None,
    name_a: str = "before",
    name_b: str = "after",
    monitor: Monitor = SILENT,
) -> PairedResult:
    """Wilcoxon signed-rank test on d = b - a for the same parts measured twice.

    ``a`` and ``b`` hold one reading per part in the same row order; a part with a blank (None or
    NaN) in either is left out and counted in ``n_dropped``, with a warning naming its rows.
    ``alternative``: "two-sided", "b-greater" (the second reading tends to be higher) or
    "b-less". ``method``: "exact", "normal" or "auto" (exact while affordable). ``margin``: the
    pseudo-median's (1 - 2 alpha) interval must lie strictly inside (-margin, +margin) for
    ``equivalent`` (two one-sided tests). ``critical_t`` is that of the non-zero differences
    ranked 1..n without ties; None under Pratt's convention with zeros (the ranks then start
    above the zeros' block, so no table applies). Raises ValueError for unequal lengths, non-numbers,
    infinite readings, no complete pair, or a wrong argument.
    """
    check_choice("alternative", alternative, ("two-sided", "b-greater", "b-less"))
    check_choice("method", method, ("auto", "exact", "normal"))
    check_choice("zero_method", zero_method, ZERO_METHODS)
    check_level("confidence", confidence)
    if not 0.0 < float(alpha) < 0.5:
        raise ValueError(f"alpha must lie strictly between 0 and 0.5; got {alpha!r}.")
    if margin is not None and not float(margin) > 0.0:
        raise ValueError(f"margin must be a positive number in the readings' unit; got {margin!r}.")
    values_a, values_b, dropped_rows = _complete_pairs(a, b, name_a, name_b)
    warnings: list[str] = []
    if dropped_rows:
        rows = ", ".join(str(r) for r in dropped_rows)
        warnings.append(
            f"Row(s) {rows} have a reading in only one column; {len(dropped_rows)} part(s) "
            "were left out of the comparison."
        )

    grid = find_grid(values_a, values_b)
    with np.errstate(over="ignore"):  # refused just below
        d_counts = grid.to_counts(values_b) - grid.to_counts(values_a)
    if grid.decimals is None:  # off every common grid: the changes as the decimals they are
        d_counts = snap_to_decimals(d_counts)
    differences = np.asarray(grid.to_readings(d_counts), dtype=float)
    if not np.isfinite(2.0 * np.abs(differences).max()):
        raise ValueError(f"The {name_a} and {name_b} readings are too large to subtract from each other: their "
                         "changes pass the largest number this computer can hold. Enter them in a larger unit "
                         "(e.g. thousands).")
    zero = d_counts == 0
    n_zero = int(zero.sum())
    ranked = ~zero if zero_method == "wilcox" else np.ones_like(zero)
    ranks, tie_blocks = _abs_ranks(d_counts, differences, ranked)
    signed_ranks = np.sign(d_counts) * ranks
    w_plus = float(ranks[d_counts > 0].sum())
    w_minus = float(ranks[d_counts < 0].sum())
    n_nonzero = int((~zero).sum())
    n_ranked = int(ranked.sum())
    if n_zero:
        if zero_method == "wilcox":
            warnings.append(
                f"{n_zero} part(s) read the same both times; they were left out of the ranking "
                "(Wilcoxon's convention for zero differences)."
            )
        else:
            warnings.append(
                f"{n_zero} part(s) read the same both times; they were ranked with the smallest "
                "ranks and left out of both rank sums (Pratt's convention for zero differences)."
            )
    if n_nonzero == 0:
        warnings.append("Every part read the same both times: there is no difference to test.")

    nonzero_doubled = np.rint(2.0 * ranks[~zero]).astype(np.int64)
    affordable = _exact_cost(nonzero_doubled) <= EXACT_BUDGET
    p_exact = None
    null_distribution = None
    if method == "exact" or affordable:
        support, probabilities = signed_rank_null(nonzero_doubled, monitor)
        p_exact = _exact_p(support, probabilities, w_plus, alternative)
        if n_nonzero <= NULL_CHART_LIMIT:
            null_distribution = NullDistribution(
                statistic="W+",
                support=support,
                probabilities=probabilities,
                observed=w_plus,
                exact=True,
            )
    z, p_normal = _normal_p(w_plus, ranks, d_counts, ranked, n_zero if zero_method == "pratt" else 0, alternative)
    used = "exact" if (method == "exact" or (method == "auto" and affordable)) else "normal"
    if method == "auto" and not affordable:
        warnings.append("Too many pairs for the exact p-value to be quick; the normal approximation was used.")
    p_value = p_exact if used == "exact" else p_normal

    critical = None
    if zero_method == "wilcox" or n_zero == 0:
        critical = critical_t(n_nonzero, alpha, alternative) if n_nonzero else None
    if n_nonzero and critical_t(n_nonzero, alpha, alternative) is None:
        needed = _pairs_needed(n_nonzero, alpha, alternative)
        warnings.append(
            f"With {n_nonzero} part(s) that changed, no result can reach significance at the "
            f"{alpha:g} level; at least {needed} parts with a difference are needed."
        )

    sorted_d = np.sort(d_counts)
    shift = float(grid.to_readings(_walsh_median(sorted_d)) / 2.0)
    shift_ci = _walsh_interval(sorted_d, grid, confidence, "", alternative, zero_method)
    if shift_ci is None:
        warnings.append(
            f"Too few pairs for a {confidence:.0%} distribution-free interval of the pseudo-median."
        )
    equivalent = None
    equivalence_ci = None
    if margin is not None:
        equivalence_ci = _walsh_interval(
            sorted_d, grid, 1.0 - 2.0 * alpha, " (two one-sided tests)", "two-sided", zero_method
        )
        if equivalence_ci is None:
            warnings.append("Too few pairs to show equivalence at this significance level.")
            equivalent = False
        else:
            equivalent = equivalence_ci.lies_strictly_inside(-margin, margin)

    return PairedResult(
        name_a=name_a,
        name_b=name_b,
        n=n_ranked,
        n_pairs=int(values_a.size),
        n_zero=n_zero,
        n_dropped=len(dropped_rows),
        values_a=FrozenFloats(values_a),
        values_b=FrozenFloats(values_b),
        differences=FrozenFloats(differences),
        signed_ranks=FrozenFloats(signed_ranks),
        tie_blocks=tie_blocks,
        w_plus=w_plus,
        w_minus=w_minus,
        zero_method=zero_method,
        alternative=alternative,
        alpha=float(alpha),
        confidence=float(confidence),
        p_value=float(p_value),
        method=used,
        p_exact=p_exact,
        p_normal=p_normal,
        z=z,
        critical_t=critical,
        significant=bool(p_value <= alpha + _P_TOLERANCE),
        shift=shift,
        shift_ci=shift_ci,
        summary_a=summarize(name_a, values_a, len(dropped_rows)),
        summary_b=summarize(name_b, values_b, len(dropped_rows)),
        null_distribution=null_distribution,
        margin=None if margin is None else float(margin),
        equivalent=equivalent,
        equivalence_ci=equivalence_ci,
        warnings=tuple(warnings),
    )


def _complete_pairs(a, b, name_a: str, name_b: str) -> tuple[np.ndarray, np.ndarray, list[int]]:
    """The complete pairs as float arrays, and the 1-based rows where one reading is blank."""
    columns = []
    for values, name in ((a, name_a), (b, name_b)):
        column = readings_array(values, f"The {name} readings")
        if np.isinf(column).any():
            row = int(np.flatnonzero(np.isinf(column))[0]) + 1
            raise ValueError(f"The {name} reading in row {row} is infinite; enter finite numbers only.")
        columns.append(column)
    if columns[0].size != columns[1].size:
        raise ValueError(
            f"The {name_a} and {name_b} readings must come in pairs, one row per part; "
            f"got {columns[0].size} and {columns[1].size} rows."
        )
    blank_a, blank_b = np.isnan(columns[0]), np.isnan(columns[1])
    complete = ~blank_a & ~blank_b
    if not complete.any():
        raise ValueError(f"No part has both a {name_a} and an {name_b} reading; enter at least one pair.")
    half_blank = np.flatnonzero(blank_a ^ blank_b) + 1
    return columns[0][complete], columns[1][complete], [int(r) for r in half_blank]


def _abs_ranks(d_counts: np.ndarray, differences: np.ndarray, ranked: np.ndarray):
    """Mid-ranks of |d| over the ranked differences (0 elsewhere), and the tie blocks of |d|.

    A tie block's ``counts_by_group`` counts its (negative, zero, positive) differences.
    """
    ranks = np.zeros(d_counts.size)
    signs = np.sign(d_counts[ranked])
    magnitudes = np.abs(d_counts[ranked])
    shown = np.abs(differences[ranked])
    if magnitudes.size == 0:
        return ranks, ()
    parts = [signs < 0, signs == 0, signs > 0]
    part_ranks, blocks = rank_groups([magnitudes[p] for p in parts], [shown[p] for p in parts])
    within = np.empty(magnitudes.size)
    for part, r in zip(parts, part_ranks):
        within[part] = r
    ranks[ranked] = within
    return ranks, blocks


def _normal_p(w_plus, ranks, d_counts, ranked, pratt_zeros, alternative) -> tuple[float, float]:
    """Continuity-corrected z (positive when the second reading is higher) and its p-value.

    Mean and variance of W+ given the mid-ranks; under Pratt's convention the zero block's ranks
    1..z are taken out of both (Cureton 1967), and its ties are not counted.
    """
    count = int(ranked.sum())
    mean = count * (count + 1) / 4.0 - pratt_zeros * (pratt_zeros + 1) / 4.0
    raw = count * (count + 1) * (2 * count + 1) - pratt_zeros * (pratt_zeros + 1) * (2 * pratt_zeros + 1)
    magnitudes = np.abs(d_counts[ranked & (d_counts != 0)])
    _, sizes = np.unique(magnitudes, return_counts=True)
    ties = float(np.sum(sizes.astype(float) ** 3 - sizes))
    variance = (raw - ties / 2.0) / 24.0
    if not variance > 0.0:
        return 0.0, 1.0
    se = math.sqrt(variance)
    gap = w_plus - mean
    if alternative == "b-greater":
        z = (gap - 0.5) / se
        return z, float(_dist.norm.sf(z))
    if alternative == "b-less":
        z = (gap + 0.5) / se
        return z, float(_dist.norm.cdf(z))
    z = (gap - 0.5 * np.sign(gap)) / se
    return float(z), float(min(1.0, 2.0 * _dist.norm.sf(abs(z))))


@functools.lru_cache(maxsize=64)
def _no_ties_cdf(n: int) -> np.ndarray:
    """P(W+ <= t) for t = 0 .. n(n+1)/2, ranks 1..n without ties (exact count)."""
    _, probabilities = signed_rank_null(2 * np.arange(1, n + 1))
    cdf = np.cumsum(probabilities)
    cdf.setflags(write=False)
    return cdf


def _tail_level(alpha: float, alternative: str) -> float:
    return alpha / 2.0 if alternative == "two-sided" else alpha


def critical_t(n: int, alpha: float = 0.05, alternative: str = "two-sided") -> int | None:
    """Largest t with P(T <= t) <= alpha (alpha/2 when two-sided) for n differences without ties.

    T is the smaller rank sum (or the one in the tested direction); reject when T <= t. None when
    no t qualifies (too few pairs). Exact count up to n = 400; beyond, the normal approximation
    with continuity correction, largest t with Phi((t + 0.5 - n(n+1)/4) / sd) <= level.
    """
    if int(n) != n or n < 1:
        raise ValueError(f"n must be a whole number of pairs, at least 1; got {n!r}.")
    check_level("alpha", alpha)
    check_choice("alternative", alternative, ("two-sided", "b-greater", "b-less"))
    n = int(n)
    level = _tail_level(alpha, alternative)
    if n <= _EXACT_CRITICAL_LIMIT:
        cdf = _no_ties_cdf(n)
        qualifying = np.flatnonzero(cdf <= level * (1.0 + 1e-12))
        return int(qualifying[-1]) if qualifying.size else None
    mean = n * (n + 1) / 4.0
    sd = math.sqrt(n * (n + 1) * (2 * n + 1) / 24.0)
    t = math.floor(mean - 0.5 + sd * _dist.norm.ppf(level))
    return t if t >= 0 else None


def _no_ties_tail(n: int, t: int) -> float:
    """P(T <= t) for n differences without ties (exact to n = 400, normal beyond)."""
    if n <= _EXACT_CRITICAL_LIMIT:
        return float(_no_ties_cdf(n)[t])
    mean = n * (n + 1) / 4.0
    sd = math.sqrt(n * (n + 1) * (2 * n + 1) / 24.0)
    return float(_dist.norm.cdf((t + 0.5 - mean) / sd))


def _pairs_needed(n: int, alpha: float, alternative: str) -> int:
    """Smallest number of non-zero differences for which significance at alpha is possible."""
    while critical_t(n, alpha, alternative) is None:
        n += 1
    return n


def _walsh_median(sorted_counts: np.ndarray) -> float:
    """Median of the Walsh sums d_i + d_j (i <= j), i.e. twice the pseudo-median.

    The sums are selected, never all formed (``rankwise.stats.hodges_lehmann.select_walsh_sums``).
    """
    total = sorted_counts.size * (sorted_counts.size + 1) // 2
    return float(np.mean(select_walsh_sums(sorted_counts, [(total + 1) // 2, total // 2 + 1])))


def _walsh_interval(sorted_counts: np.ndarray, grid, level: float, purpose: str, alternative: str,
                    zero_method: str) -> ConfidenceInterval | None:
    """The changes per part that fit the readings at ``level``, or None if too few pairs.

    Without tied or zero changes: [W_(C+1), W_(M-C)] over the sorted Walsh averages W, C the
    two-sided critical T at 1 - level for n differences without ties (Hollander & Wolfe 1999,
    section 3.3); for "b-greater" the lower bound W_(C+1) alone and for "b-less" the upper bound
    W_(M-C) alone, C the one-sided critical T. With tied or zero changes on a gauge grid, where it
    is affordable, every shift the exact signed-rank test given the ties accepts, with the test's
    own zero convention and open or closed ends (``rankwise.stats.change_inversion``); otherwise
    the same order statistics as an approximation (zeros counted as differences). ``purpose`` is
    added to the method's description.
    """
    n = sorted_counts.size
    one_sided = {"b-greater": "lower bound: ", "b-less": "upper bound: "}.get(alternative, "")
    magnitudes = np.abs(sorted_counts)
    tied = bool(np.any(sorted_counts == 0)) or np.unique(magnitudes).size < n
    accepted = None
    if tied and grid.decimals is not None:
        accepted = accepted_changes(sorted_counts, level, alternative, zero_method)
        if accepted is not None and not accepted.empty:
            zeros = ("left out, as the test leaves out parts with no change" if zero_method == "wilcox"
                     else "ranked and given no sign, as the test treats parts with no change (Pratt)")
            return ConfidenceInterval(
                low=float(grid.to_readings(accepted.low)),
                high=float(grid.to_readings(accepted.high)),
                level=float(level),
                method=f"{one_sided}every change the exact signed-rank test given the ties accepts (test "
                       f"inversion; parts whose change equals the one tried are {zeros}){purpose}",
                low_included=accepted.low_included,
                high_included=accepted.high_included,
            )
    c = critical_t(n, 1.0 - level, alternative)
    if c is None:
        return None
    total = n * (n + 1) // 2
    low, high = select_walsh_sums(sorted_counts, [c + 1, total - c])
    attained = 1.0 - (2.0 if alternative == "two-sided" else 1.0) * _no_ties_tail(n, c)
    approximate = " (changes tie or are zero: approximate)" if tied else ""
    if accepted is not None and accepted.empty:
        approximate += ("; the exact test given the ties accepts no single change: on this gauge the parts "
                        "changed in a way one typical change alone does not describe")
    return ConfidenceInterval(
        low=-np.inf if alternative == "b-less" else float(grid.to_readings(low)) / 2.0,
        high=np.inf if alternative == "b-greater" else float(grid.to_readings(high)) / 2.0,
        level=float(level),
        method=f"{one_sided}Walsh averages, {'exact' if n <= _EXACT_CRITICAL_LIMIT else 'normal-approximation'} "
        f"no-ties critical value{approximate}{purpose}",
        attained_level=attained if abs(attained - level) > 1e-12 else None,
        low_included=alternative != "b-less",
        high_included=alternative != "b-greater",
    )
