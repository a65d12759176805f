"""Two independent groups: Mann-Whitney U / Wilcoxon rank-sum comparison of B against A.

``compare_two`` validates the readings, ranks them on their gauge grid, finds the p-value (the
exact conditional permutation distribution given the observed ties, or the normal approximation
with tie and continuity correction), the critical U, the Hodges-Lehmann shift with the set of
shifts the test accepts (Moses' interval, or with ties the exact inversion; one-sided bounds for
one-sided questions), the effect sizes, the same-shape companions and plain-words warnings, and returns one
frozen ``TwoGroupResult``. Conventions: two-sided exact p by doubling
(resources/decisions/two-sided-exact-p.md); the automatic method switch
(resources/decisions/exact-method-choice.md).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from math import comb

import numpy as np
from scipy.special import ndtr

from rankwise.stats import shape
from rankwise.stats.analysis import ALTERNATIVES, METHODS
from rankwise.stats.critical import critical_value, smallest_equal_size, smallest_partner_size
from rankwise.stats.exact_ranksum import RankSumDistribution, exact_count_seconds, rank_sum_distribution
from rankwise.stats.frozen_floats import FrozenFloats
from rankwise.stats.grid import Grid, find_grid
from rankwise.stats.hodges_lehmann import hodges_lehmann_shift, moses_interval
from rankwise.stats.inputs import check_choice, check_differences, check_level, clean_group
from rankwise.stats.progress import SILENT, Monitor
from rankwise.stats.ranks import rank_groups
from rankwise.stats.results import ConfidenceInterval, NullDistribution, TieBlock, TwoGroupResult
from rankwise.stats.shift_inversion import accepted_shifts
from rankwise.stats.summary import summarize

AUTO_EXACT_READINGS = 100
"""With "auto", the exact p-value is always used up to this many readings in both groups together."""

AUTO_EXACT_SECONDS = 0.3
"""Beyond that, "auto" stays exact while the cheapest exact count is estimated to take at most this long."""

NO_SINGLE_SHIFT = ("; the exact test given the ties accepts no single shift: on this gauge the groups "
                   "differ in a way a shift alone does not describe")
"""Added to the interval's method text when the test inversion finds no shift it accepts."""

COMPANION_LIMIT = 200_000
"""Largest number of readings for which the same-shape check and the companion tests are run."""

FEW_READINGS = 5
"""A group with fewer readings than this gets a warning."""

TIE_SHARE_WARNING = 0.5
"""Warn when at least this share of the readings sits in tie blocks."""

_P_TOLERANCE = 1e-12
"""Sums of exact probabilities carry rounding noise; p within this of alpha counts as equal."""


def compare_two(
    a: Sequence[float] | np.ndarray,
    b: Sequence[float] | np.ndarray,
    *,
    alternative: str = "two-sided",
    alpha: float = 0.05,
    confidence: float = 0.95,
    method: str = "auto",
    estimate_shift: bool = True,
    margin: float | None = None,
    name_a: str = "A",
    name_b: str = "B",
    monitor: Monitor = SILENT,
) -> TwoGroupResult:
    """Compare group B with the reference group A by the Mann-Whitney U / Wilcoxon rank-sum test.

    Args:
        a, b: the readings of A (reference, e.g. the current process) and of B (e.g. the
            changed process). Blanks (None, NaN) are dropped and counted.
        alternative: "two-sided" (B differs from A), "b-greater" (B tends to read higher than A)
            or "b-less" (B tends to read lower).
        alpha: significance level; confidence: level of the shift's interval.
        method: "exact" (exact conditional permutation distribution given the ties), "normal"
            (tie-corrected variance, continuity correction 0.5) or "auto" (exact while affordable).
        estimate_shift: False skips the Hodges-Lehmann shift and its interval (huge data).
        margin: equivalence margin in the readings' unit: "same within +/- margin?", or None.
        name_a, name_b: the groups' names, used in every warning.
        monitor: progress and cancellation for the exact count.

    Raises ``ValueError`` for an empty group, a non-numeric or infinite reading, or an argument
    outside its allowed values; ``Cancelled`` when the monitor says so.
    """
    check_choice("alternative", alternative, ALTERNATIVES)
    check_choice("method", method, METHODS)
    alpha = check_level("alpha", alpha)
    confidence = check_level("confidence", confidence)
    margin = _check_margin(margin, alpha)
    values_a, dropped_a = clean_group(a, name_a)
    values_b, dropped_b = clean_group(b, name_b)
    check_differences(values_a, values_b, f"The readings of {name_a} and {name_b}")
    n_a, n_b = values_a.size, values_b.size
    grid = find_grid(values_a, values_b)
    counts_a, counts_b = grid.to_counts(values_a), grid.to_counts(values_b)
    (ranks_a, ranks_b), tie_blocks = rank_groups([counts_a, counts_b], [values_a, values_b])

    rank_sum_a, rank_sum_b = float(ranks_a.sum()), float(ranks_b.sum())
    u_a = rank_sum_a - n_a * (n_a + 1) / 2.0
    u_b = n_a * n_b - u_a
    tie_sum = float(sum(block.count**3 - block.count for block in tie_blocks))
    normal = _normal_approximation(u_a, n_a, n_b, tie_sum, alternative)

    affordable = exact_affordable(n_a, n_b, tie_blocks)
    use_exact = method == "exact" or (method == "auto" and affordable)
    distribution = None
    if use_exact or affordable:
        doubled = np.rint(2.0 * np.concatenate([ranks_a, ranks_b]))
        distribution = rank_sum_distribution(doubled, n_a, monitor)
    twice_u_a = int(round(2.0 * u_a))
    exact = _exact_figures(distribution, twice_u_a, alternative, alpha) if distribution is not None else None

    critical = critical_value(n_a, n_b, alpha, alternative)
    p_value = exact.p_value if use_exact else normal.p_value
    significant = p_value <= alpha + _P_TOLERANCE

    if estimate_shift or margin is not None:
        counts_a.sort()  # in place: the counts are not needed in entry order any more
        counts_b.sort()
        sorted_a, sorted_b = counts_a, counts_b
    shift = shift_ci = None
    if estimate_shift:
        shift = float(grid.to_readings(hodges_lehmann_shift(sorted_a, sorted_b)))
        shift_ci = _shift_interval(sorted_a, sorted_b, grid, confidence, bool(tie_blocks), alternative)
    equivalence_ci = equivalent = None
    if margin is not None:
        equivalence_ci = _shift_interval(sorted_a, sorted_b, grid, 1.0 - 2.0 * alpha, bool(tie_blocks))
        equivalent = equivalence_ci.lies_strictly_inside(-margin, margin)

    companions = _companions(values_a, values_b, alternative, grid)
    prob_b_greater = u_b / (n_a * n_b)
    min_parts = smallest_equal_size(alpha, alternative) if critical.u is None else None
    warnings = _warnings(
        name_a, name_b, n_a, n_b, values_a, values_b, tie_blocks, alpha,
        alternative, critical.u, exact, use_exact, shift_ci, companions[0],
    )
    return TwoGroupResult(
        name_a=name_a,
        name_b=name_b,
        n_a=n_a,
        n_b=n_b,
        n_dropped_a=dropped_a,
        n_dropped_b=dropped_b,
        values_a=_kept_readings(a, values_a, dropped_a),
        values_b=_kept_readings(b, values_b, dropped_b),
        ranks_a=FrozenFloats.handed_over(ranks_a),
        ranks_b=FrozenFloats.handed_over(ranks_b),
        tie_blocks=tie_blocks,
        rank_sum_a=rank_sum_a,
        rank_sum_b=rank_sum_b,
        u_a=u_a,
        u_b=u_b,
        u=min(u_a, u_b),
        alternative=alternative,
        alpha=alpha,
        confidence=confidence,
        p_value=float(p_value),
        method="exact" if use_exact else "normal",
        p_exact=None if exact is None else exact.p_value,
        p_normal=normal.p_value,
        mid_p=None if exact is None else exact.mid_p,
        z=normal.z,
        critical_u=critical.u,
        attained_alpha=exact.attained_alpha if exact is not None else critical.attained_alpha,
        significant=bool(significant),
        shift=shift,
        shift_ci=shift_ci,
        prob_b_greater=float(prob_b_greater),
        rank_biserial=float(2.0 * prob_b_greater - 1.0),
        summary_a=summarize(name_a, values_a, dropped_a),
        summary_b=summarize(name_b, values_b, dropped_b),
        null_distribution=null_distribution_of(distribution, u_a),
        shape=companions[0],
        brunner_munzel=companions[1],
        mood_median=companions[2],
        margin=margin,
        equivalent=equivalent,
        equivalence_ci=equivalence_ci,
        min_parts_needed=min_parts,
        warnings=warnings,
    )


def _kept_readings(given: Sequence[float] | np.ndarray, cleaned: np.ndarray, dropped: int) -> FrozenFloats:
    """The readings as the result keeps them: the given run itself when it was frozen and had no
    blank, the array the cleaning made when it dropped blanks, otherwise a copy of the caller's."""
    if dropped:
        return FrozenFloats.handed_over(cleaned)
    return FrozenFloats(given if isinstance(given, FrozenFloats) else cleaned)


def exact_affordable(n_a: int, n_b: int, tie_blocks: tuple[TieBlock, ...] = ()) -> bool:
    """True when "auto" uses the exact distribution: up to ``AUTO_EXACT_READINGS`` readings, and
    beyond while the cheapest exact count for these sizes and ties is estimated to take at most
    ``AUTO_EXACT_SECONDS`` (see the decision record)."""
    n_total = n_a + n_b
    if n_total <= AUTO_EXACT_READINGS:
        return True
    return exact_count_seconds(_block_sizes(tie_blocks, n_total), min(n_a, n_b), n_total) <= AUTO_EXACT_SECONDS


def _block_sizes(tie_blocks: tuple[TieBlock, ...], n_total: int) -> np.ndarray | None:
    """How many readings share each distinct value, ascending, from the tie blocks; None without ties."""
    if not tie_blocks:
        return None
    first = np.array([block.first_rank for block in tie_blocks]) - 1
    count = np.array([block.count for block in tie_blocks])
    inside = np.zeros(n_total + 1, dtype=np.int64)  # +1 from the second reading of a block to its end
    np.add.at(inside, first + 1, 1)
    np.add.at(inside, first + count, -1)
    starts = np.flatnonzero(np.cumsum(inside[:n_total]) == 0)
    return np.diff(np.append(starts, n_total))


def _check_margin(margin: float | None, alpha: float) -> float | None:
    if margin is None:
        return None
    margin = float(margin)
    if not (np.isfinite(margin) and margin > 0.0):
        raise ValueError(f"margin must be a positive number in the readings' unit, or None; got {margin!r}.")
    if alpha >= 0.5:
        raise ValueError(f"With a margin, alpha must be below 0.5 (the interval is at 1 - 2 alpha); got {alpha!r}.")
    return margin


@dataclass(frozen=True)
class _NormalFigures:
    p_value: float
    z: float


def _normal_approximation(u_a: float, n_a: int, n_b: int, tie_sum: float, alternative: str) -> _NormalFigures:
    """Normal approximation with tie-corrected variance and continuity correction 0.5.

    var U = n_a n_b / 12 ((N + 1) - sum(t^3 - t) / (N (N - 1))). The p-values follow the same
    formulas as scipy.stats.mannwhitneyu(method="asymptotic", use_continuity=True). ``z`` is for B
    against A (positive when B tends to read higher), corrected by 0.5 towards zero.
    """
    n_total = n_a + n_b
    mean = n_a * n_b / 2.0
    variance = n_a * n_b / 12.0 * ((n_total + 1) - tie_sum / (n_total * (n_total - 1)))
    u_b = n_a * n_b - u_a
    if not variance > 0.0:
        return _NormalFigures(p_value=1.0, z=0.0)
    sd = np.sqrt(variance)
    # The standard normal upper tail at z is ndtr(-z), as scipy.stats.norm.sf computes it.
    if alternative == "b-greater":
        p = ndtr(-(u_b - mean - 0.5) / sd)
    elif alternative == "b-less":
        p = ndtr(-(u_a - mean - 0.5) / sd)
    else:
        p = min(1.0, 2.0 * ndtr(-(max(u_a, u_b) - mean - 0.5) / sd))
    z = np.sign(u_b - mean) * max(abs(u_b - mean) - 0.5, 0.0) / sd
    return _NormalFigures(p_value=float(p), z=float(z))


@dataclass(frozen=True)
class _ExactFigures:
    p_value: float
    mid_p: float
    attained_alpha: float
    smallest_p: float


def _exact_figures(distribution: RankSumDistribution, twice_u_a: int, alternative: str, alpha: float) -> _ExactFigures:
    """p, mid-p, the test's true size at alpha and the smallest p these ties allow.

    "b-greater" means small U of A; two-sided p doubles the smaller one-sided p (capped at 1).
    """
    probabilities = distribution.probabilities
    at_most = np.cumsum(probabilities)
    at_least = np.cumsum(probabilities[::-1])[::-1]
    p_all, mid_all = _p_values(at_most, at_least, probabilities, alternative)
    index = int(np.searchsorted(distribution.twice_u, twice_u_a))
    if index >= distribution.twice_u.size or distribution.twice_u[index] != twice_u_a:
        raise ValueError("The observed U is not in the exact distribution; the ranks are inconsistent.")
    rejected = p_all <= alpha + _P_TOLERANCE
    return _ExactFigures(
        p_value=float(min(1.0, p_all[index])),
        mid_p=float(min(1.0, mid_all[index])),
        attained_alpha=float(probabilities[rejected].sum()),
        smallest_p=float(min(1.0, p_all.min())),
    )


def _p_values(at_most, at_least, probabilities, alternative):
    """p-value and mid-p-value at every point of the support."""
    mid_low = at_most - 0.5 * probabilities
    mid_high = at_least - 0.5 * probabilities
    if alternative == "b-greater":
        return at_most, mid_low
    if alternative == "b-less":
        return at_least, mid_high
    return np.minimum(1.0, 2.0 * np.minimum(at_most, at_least)), np.minimum(1.0, 2.0 * np.minimum(mid_low, mid_high))


def null_distribution_of(distribution: RankSumDistribution | None, u_a: float) -> NullDistribution | None:
    """The result's form of the exact distribution of U of A if the change did nothing (None for none),
    with the observed U of A; a record rebuilds a characteristic's distribution through it too."""
    if distribution is None:
        return None
    return NullDistribution(
        statistic="U of A",
        support=FrozenFloats(distribution.twice_u / 2.0),
        probabilities=FrozenFloats(distribution.probabilities),
        observed=float(u_a),
        exact=True,
    )


def _shift_interval(sorted_a: np.ndarray, sorted_b: np.ndarray, grid: Grid, level: float, ties: bool,
                    alternative: str = "two-sided") -> ConfidenceInterval:
    """The shifts B - A that fit the readings at ``level``: two-sided, or one bound for a one-sided question.

    Without ties, Moses' order statistics of the differences: [D_(C+1), D_(n_a n_b - C)] with C
    the two-sided critical U at 1 - level; for "b-greater" the lower bound D_(C+1) alone and for
    "b-less" the upper bound D_(n_a n_b - C) alone, C the one-sided critical U (Moses 1953;
    Hollander & Wolfe 1999, section 4.3). With readings that tie on a gauge grid, where it is
    affordable, the set of every shift the exact tie-aware test (of the same sidedness) accepts,
    with open or closed ends (``rankwise.stats.shift_inversion``). Otherwise with ties the same
    order statistics are used as an approximation: closed, so tied differences at an end are
    inside; they cover at least the level but are wider than needed (about 99 % for a 95 %
    interval on whole-number gauges, by the simulation in the tests). The method text says which.
    """
    one_sided = {"b-greater": "lower bound: ", "b-less": "upper bound: "}.get(alternative, "")
    accepted = None
    if ties and grid.decimals is not None:
        accepted = accepted_shifts(sorted_a, sorted_b, level, alternative)
        if accepted is not None and not accepted.empty:
            return ConfidenceInterval(
                low=float(grid.to_readings(accepted.low)),
                high=float(grid.to_readings(accepted.high)),
                level=float(level),
                method=f"{one_sided}every shift the exact test given the ties accepts (test inversion)",
                low_included=accepted.low_included,
                high_included=accepted.high_included,
            )
    n_a, n_b = sorted_a.size, sorted_b.size
    critical = critical_value(n_a, n_b, 1.0 - level, alternative)
    low, high = moses_interval(sorted_a, sorted_b, critical.u)
    source = "exact critical U" if critical.exact else "critical U from the Edgeworth expansion"
    method = f"{one_sided}Moses order statistics of the differences, {source}"
    if ties:
        method += " (readings tie: approximate, no-ties critical value, conservative)"
        if accepted is not None and accepted.empty:
            method += NO_SINGLE_SHIFT
    tails = 2.0 if alternative == "two-sided" else 1.0
    if critical.u is None:
        attained = 1.0 - tails * float(_extreme_split_probability(n_a, n_b))
    elif critical.attained_alpha is not None:
        attained = 1.0 - critical.attained_alpha
    else:
        attained = None
    return ConfidenceInterval(
        low=-np.inf if alternative == "b-less" else float(grid.to_readings(low)),
        high=np.inf if alternative == "b-greater" else float(grid.to_readings(high)),
        level=float(level),
        method=method,
        attained_level=attained,
        low_included=alternative != "b-less",
        high_included=alternative != "b-greater",
    )


def _extreme_split_probability(n_a: int, n_b: int) -> float:
    """1 / C(N, n_a): the chance of the most extreme split with no ties."""
    return 1.0 / comb(n_a + n_b, n_a)


def _companions(values_a: np.ndarray, values_b: np.ndarray, alternative: str, grid: Grid):
    """Same-shape check, Brunner-Munzel and Mood's median test (skipped for huge data); ``grid`` is
    the readings' common grid."""
    if values_a.size + values_b.size > COMPANION_LIMIT:
        return None, None, None
    return (
        shape.check_shape(values_a, values_b, grid),
        shape.brunner_munzel(values_a, values_b, alternative, grid),
        shape.mood_median([values_a, values_b], grid),
    )


def _warnings(name_a, name_b, n_a, n_b, values_a, values_b,
              tie_blocks: tuple[TieBlock, ...], alpha, alternative, critical_u, exact, use_exact,
              shift_ci, shape_check) -> tuple[str, ...]:
    """Plain-words notes, naming the groups."""
    notes = []
    level = f"{alpha * 100:g}%"
    if max(values_a.max(), values_b.max()) == min(values_a.min(), values_b.min()):
        notes.append(f"All readings of {name_a} and {name_b} are the same value; the ranks cannot show any difference.")
    for name, n in ((name_a, n_a), (name_b, n_b)):
        if n < FEW_READINGS:
            notes.append(f"{name} has only {n} reading{'s' if n != 1 else ''}; with so few, a real change can easily go unseen.")
    if critical_u is None:
        direction = "in either direction" if alternative == "two-sided" else "in the chosen direction"
        notes.append(
            f"With {n_a} readings of {name_a} and {n_b} of {name_b}, no result can reach significance at "
            f"the {level} level {direction}. Measure at least {smallest_equal_size(alpha, alternative)} parts "
            f"in each group, or keep {name_a} at {n_a} and measure at least "
            f"{smallest_partner_size(n_a, alpha, alternative)} parts of {name_b}."
        )
    elif exact is not None and exact.smallest_p > alpha + _P_TOLERANCE:
        notes.append(
            f"These readings tie so much that even the most extreme split would give p = {exact.smallest_p:.3g}, "
            f"above the {level} level: no significant difference can be shown with them."
        )
    tied = sum(block.count for block in tie_blocks)
    share = tied / (n_a + n_b)
    if share >= TIE_SHARE_WARNING:
        how = ("the exact p-value accounts for these ties" if use_exact
               else "the normal approximation is rougher with so many ties")
        notes.append(f"{share:.0%} of the readings share their value with another reading (coarse gauge resolution); {how}.")
    if shift_ci is not None and shift_ci.attained_level is not None and shift_ci.attained_level < shift_ci.level:
        notes.append(
            f"With so few readings the interval for the shift cannot reach {shift_ci.level * 100:g}% confidence; "
            f"it spans all differences ({shift_ci.attained_level * 100:.3g}% confidence)."
        )
    if shape_check is not None and shape_check.differ:
        notes.append(
            f"The spreads or shapes of {name_a} and {name_b} differ, so the result says whether {name_b} tends to "
            f"read higher or lower than {name_a}, not that its median moved; the Brunner-Munzel test, which "
            "allows unequal spreads, is shown beside it."
        )
    return tuple(notes)
