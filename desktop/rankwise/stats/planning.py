"""How many parts to measure: Noether's (1987) sample sizes for the rank tests, checked by simulation.

Noether (1987), "Sample size determination for some common nonparametric tests", JASA 82,
645-647. For the rank-sum test with a share c = n_a / N of the parts in A and p = P(B > A):

    N = (z_(1-alpha/2) + z_(power))^2 / (12 c (1 - c) (p - 1/2)^2)

(z_(1-alpha) when one-sided). For the signed-rank test on n pairs, with p' = P(d1 + d2 > 0) for
two independent differences:

    n = (z_(1-alpha/2) + z_(power))^2 / (3 (p' - 1/2)^2)

(the signed-rank form is quoted from memory; it follows from the mean of W+ under the shift,
about n^2 p' / 2, against its null spread, about sqrt(n^3 / 12), and the simulation in the tests
confirms it). Both compare the statistic's mean under the shift with its spread when nothing
changed. Under a normal shift model with spread sigma, p = Phi(shift / (sigma sqrt 2)) and
p' = Phi(shift sqrt 2 / sigma_d), where sigma_d is the spread of the differences.

For k separate groups of n parts (Kruskal-Wallis), H is close to a non-central chi-square with
k - 1 degrees of freedom and non-centrality

    lambda = 12 N sum_i c_i (pi_i - 1/2)^2,   pi_i = sum_j c_j P(X_j < X_i),  c_i = n_i / N

(Andrews 1954, Ann. Math. Statist. 25, 724-736, from memory); for two groups it is Noether's
formula squared, which the tests check. The plan takes the least favourable pattern for a
shift worth detecting: two groups that far apart and the others half-way between them.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
from scipy import stats as _dist

from rankwise.stats.critical import critical_u
from rankwise.stats.inputs import check_choice, check_level
from rankwise.stats.paired import critical_t
from rankwise.stats.results import PlanResult, PowerPoint
from rankwise.stats.several import SMALL_GROUP

_CURVE_POINTS = 40
_SIMULATION_CELLS = 2_000_000
"""Readings simulated at once (rows x parts) in ``simulate_power``: bounds the memory used."""

ALTERNATIVES = ("two-sided", "b-greater", "b-less")

_DIRECTIONS = {"two-sided": "a change either way", "b-greater": "a rise only", "b-less": "a fall only"}
"""Each direction in the plan's plain words."""


def plan_group_size(
    shift: float | None = None,
    spread: float | None = None,
    *,
    prob_b_greater: float | None = None,
    alpha: float = 0.05,
    power: float = 0.8,
    ratio: float = 1.0,
    alternative: str = "two-sided",
    n_sim: int = 0,
    seed: int = 20_261_201,
) -> PlanResult:
    """Parts per group for the rank-sum test to detect ``shift`` with chance ``power`` (Noether 1987).

    Give the shift worth detecting and the readings' spread (standard deviation, same unit), or
    ``prob_b_greater`` = P(B > A) directly. ``ratio`` = n_b / n_a. ``alternative`` as for
    ``compare_two``; a one-sided plan needs the shift in its direction. With ``n_sim`` > 0 the
    plan is checked by simulating the exact test (``simulate_power``) at the planned sizes.
    """
    _check_plan_levels(alternative, alpha, power)
    if not float(ratio) > 0.0 or not math.isfinite(ratio):
        raise ValueError(f"ratio (parts in B per part in A) must be a positive number; got {ratio!r}.")
    p, standardized = _effect("prob_b_greater", shift, spread, prob_b_greater, alternative, math.sqrt(0.5))
    share_a = 1.0 / (1.0 + ratio)
    total = _z_sum(alpha, power, alternative) ** 2 / (12.0 * share_a * (1.0 - share_a) * (p - 0.5) ** 2)
    return _size_plan(
        _SizeRule(
            paired=False,
            partner=lambda m: _ceil(ratio * m),
            significance_possible=lambda n_a, n_b: critical_u(n_a, n_b, alpha, alternative) is not None,
            power_at=lambda n_a, n_b: _rank_sum_power(n_a, n_b, p, alpha, alternative),
            simulate=lambda n_a, n_b: simulate_power(
                n_a, n_b, standardized, 1.0, alpha=alpha, alternative=alternative, n_sim=n_sim, seed=seed),
            method="Noether (1987), Wilcoxon rank-sum test",
        ),
        (_ceil(share_a * total), _ceil((1.0 - share_a) * total)),
        alpha=alpha, power=power, ratio=ratio, alternative=alternative, shift=shift, spread=spread, p=p, n_sim=n_sim,
    )


def plan_paired_size(
    shift: float | None = None,
    spread: float | None = None,
    *,
    prob_sum_positive: float | None = None,
    alpha: float = 0.05,
    power: float = 0.8,
    alternative: str = "two-sided",
    n_sim: int = 0,
    seed: int = 20_261_201,
) -> PlanResult:
    """Parts to measure twice for the signed-rank test (Noether 1987, signed-rank form).

    ``shift``: the mean difference (after - before) worth detecting; ``spread``: the standard
    deviation of the differences (not of single readings). Or ``prob_sum_positive`` =
    P(d1 + d2 > 0) for two parts' differences. ``n_a`` = ``n_b`` = parts. With ``n_sim`` > 0 the
    plan is checked by simulating the exact signed-rank test (``simulate_paired_power``).
    """
    _check_plan_levels(alternative, alpha, power)
    p, standardized = _effect("prob_sum_positive", shift, spread, prob_sum_positive, alternative, math.sqrt(2.0))
    n = _ceil(_z_sum(alpha, power, alternative) ** 2 / (3.0 * (p - 0.5) ** 2))
    return _size_plan(
        _SizeRule(
            paired=True,
            partner=lambda m: m,
            significance_possible=lambda m, _: critical_t(m, alpha, alternative) is not None,
            power_at=lambda m, _: _signed_rank_power(m, p, alpha, alternative),
            simulate=lambda m, _: simulate_paired_power(
                m, standardized, 1.0, alpha=alpha, alternative=alternative, n_sim=n_sim, seed=seed),
            method="Noether (1987), Wilcoxon signed-rank test",
        ),
        (n, n),
        alpha=alpha, power=power, ratio=1.0, alternative=alternative, shift=shift, spread=spread, p=p, n_sim=n_sim,
    )


def plan_several_size(
    shift: float,
    spread: float,
    *,
    groups: int = 3,
    alpha: float = 0.05,
    power: float = 0.8,
    n_sim: int = 0,
    seed: int = 20_261_201,
) -> PlanResult:
    """Parts per group for the Kruskal-Wallis test to find ``shift`` between ``groups`` groups.

    ``shift``: the difference between two groups worth detecting; ``spread``: the readings'
    standard deviation (same unit). The plan holds for the least favourable pattern: two groups
    ``shift`` apart and every other group half-way between them. Sizes from the non-central
    chi-square approximation (see the module's note); with ``n_sim`` > 0 checked by simulating the
    tie-corrected Kruskal-Wallis test with its chi-square p-value (``simulate_several_power``).
    """
    _check_plan_levels("two-sided", alpha, power)
    groups = _positive_int("groups", groups)
    if groups < 3:
        raise ValueError(f"groups must be 3 or more for the several-groups plan; got {groups!r}.")
    _, standardized = _effect("prob_b_greater", abs(float(shift)) if shift is not None else None, spread, None,
                              "two-sided", math.sqrt(0.5))
    means = least_favourable_means(standardized, groups)
    n = 2
    while _kruskal_wallis_power(n, means, alpha) < power:
        n *= 2
    low = n // 2
    while n - low > 1:  # smallest n reaching the power, by halving the gap
        middle = (low + n) // 2
        low, n = (middle, n) if _kruskal_wallis_power(middle, means, alpha) < power else (low, middle)
    warnings = []
    if n < SMALL_GROUP:
        warnings.append(f"With fewer than {SMALL_GROUP} parts per group the verdict uses the permutation p-value; "
                        "the simulation checks the chi-square test, which is close but not the same.")
    curve = tuple(PowerPoint(n_a=m, n_b=m, power=_kruskal_wallis_power(m, means, alpha)) for m in _curve_sizes(n))
    return PlanResult(
        paired=False,
        n_a=n,
        n_b=n,
        alpha=float(alpha),
        power=float(power),
        ratio=1.0,
        alternative="two-sided",
        shift=float(shift),
        spread=float(spread),
        prob_b_greater=float(_dist.norm.cdf(abs(standardized) * math.sqrt(0.5))),
        method="Kruskal-Wallis test, non-central chi-square approximation (Noether's formula for several groups)",
        assumptions=_several_assumptions(groups, alpha),
        simulated_power=simulate_several_power(n, means, 1.0, alpha=alpha, n_sim=n_sim, seed=seed) if n_sim else None,
        power_curve=curve,
        warnings=tuple(warnings),
        groups=groups,
    )


def least_favourable_means(shift: float, groups: int) -> tuple[float, ...]:
    """Group means with two groups ``shift`` apart and the others half-way: the pattern with the
    least power among all whose extreme groups are ``shift`` apart (common practice, no source)."""
    return (-shift / 2.0, shift / 2.0) + (0.0,) * (groups - 2)


def _kruskal_wallis_power(n: int, means: tuple[float, ...], alpha: float) -> float:
    """Power of the Kruskal-Wallis test at ``n`` per group, normal readings of spread 1 about ``means``."""
    means_array = np.asarray(means, dtype=float)
    wins = _dist.norm.cdf((means_array[:, None] - means_array[None, :]) / math.sqrt(2.0))  # P(X_j < X_i)
    pi = wins.mean(axis=1)
    noncentrality = 12.0 * n * float(np.sum((pi - 0.5) ** 2))
    df = len(means) - 1
    return float(_dist.ncx2.sf(_dist.chi2.isf(alpha, df), df, noncentrality))


def simulate_several_power(
    n: int,
    means: tuple[float, ...],
    spread: float,
    *,
    alpha: float = 0.05,
    n_sim: int = 2000,
    seed: int = 20_261_201,
) -> float:
    """Share of simulated studies in which the Kruskal-Wallis test (chi-square p-value) finds a difference.

    Group i ~ Normal(means[i], spread), ``n`` parts each, no ties; H as ``compare_several``
    computes it without ties, rejected when H >= the chi-square critical value at ``alpha``.
    """
    n, n_sim = _positive_int("n", n), _positive_int("n_sim", n_sim)
    check_level("alpha", alpha)
    if not float(spread) > 0.0:
        raise ValueError(f"spread must be a positive standard deviation; got {spread!r}.")
    groups = len(means)
    total = groups * n
    critical = float(_dist.chi2.isf(alpha, groups - 1))
    rng = np.random.default_rng(seed)
    detected = 0
    rows = max(1, _SIMULATION_CELLS // total)
    for start in range(0, n_sim, rows):
        count = min(rows, n_sim - start)
        readings = rng.normal(0.0, spread, (count, groups, n)) + np.asarray(means, dtype=float)[None, :, None]
        ranks = np.argsort(np.argsort(readings.reshape(count, total), axis=1), axis=1) + 1.0
        rank_sums = ranks.reshape(count, groups, n).sum(axis=2)
        h = 12.0 / (total * (total + 1)) * np.sum(rank_sums**2, axis=1) / n - 3.0 * (total + 1)
        detected += int(np.sum(h >= critical))
    return detected / n_sim


@dataclass(frozen=True)
class _SizeRule:
    """What differs between the two plans: the test's sizes, its critical values and its power.

    partner(n_a): the size of B that goes with n_a; significance_possible(n_a, n_b): whether any
    result can be significant at these sizes; power_at(n_a, n_b): Noether's power; simulate(n_a,
    n_b): the simulated power of the exact test.
    """

    paired: bool
    partner: Callable[[int], int]
    significance_possible: Callable[[int, int], bool]
    power_at: Callable[[int, int], float]
    simulate: Callable[[int, int], float]
    method: str


def _size_plan(rule: _SizeRule, sizes: tuple[int, int], *, alpha, power, ratio, alternative, shift, spread, p,
               n_sim) -> PlanResult:
    """The plan from the formula's sizes: raised to the fewest that can show significance, with its curve."""
    n_a, n_b = sizes
    warnings = []
    if not rule.significance_possible(n_a, n_b):
        while not rule.significance_possible(n_a, n_b):
            n_a += 1
            n_b = max(n_b, rule.partner(n_a))
        raised = f"{n_a}" if rule.paired else f"{n_a} and {n_b}"
        warnings.append(
            f"The formula asks for fewer parts than any significant result needs at the {alpha:g} "
            f"level; raised to {raised}, the fewest for which significance is possible."
        )
    if min(n_a, n_b) < 10:
        warnings.append("Noether's formula is a large-sample approximation; with so few parts, check the plan by simulation.")
    curve = tuple(
        PowerPoint(n_a=m, n_b=rule.partner(m), power=rule.power_at(m, rule.partner(m))) for m in _curve_sizes(n_a)
    )
    return PlanResult(
        paired=rule.paired,
        n_a=n_a,
        n_b=n_b,
        alpha=float(alpha),
        power=float(power),
        ratio=float(ratio),
        alternative=alternative,
        shift=None if shift is None else float(shift),
        spread=None if spread is None else float(spread),
        prob_b_greater=float(p),
        method=rule.method,
        assumptions=_assumptions(shift is not None, paired=rule.paired, alternative=alternative, alpha=alpha),
        simulated_power=rule.simulate(n_a, n_b) if n_sim else None,
        power_curve=curve,
        warnings=tuple(warnings),
    )


def _check_plan_levels(alternative: str, alpha: float, power: float) -> None:
    check_choice("alternative", alternative, ALTERNATIVES)
    check_level("alpha", alpha)
    check_level("power", power)


def _z_sum(alpha: float, power: float, alternative: str) -> float:
    """z of the significance level plus z of the power, as in both of Noether's formulas."""
    return _z_level(alpha, alternative) + float(_dist.norm.ppf(power))


def simulate_power(
    n_a: int,
    n_b: int,
    shift: float,
    spread: float,
    *,
    alpha: float = 0.05,
    alternative: str = "two-sided",
    n_sim: int = 2000,
    seed: int = 20_261_201,
    exact: bool = True,
) -> float:
    """Share of simulated studies in which the rank-sum test finds the shift (normal readings).

    A ~ Normal(0, spread), B ~ Normal(shift, spread), no ties. Each study's U is computed from
    ranks, vectorised over studies. ``exact``: reject when the smaller U (or the U of the
    tested direction) is at most the exact critical U (``rankwise.stats.critical.critical_u``);
    otherwise by the normal approximation with continuity correction.
    """
    n_a, n_b, n_sim = _positive_int("n_a", n_a), _positive_int("n_b", n_b), _positive_int("n_sim", n_sim)
    check_choice("alternative", alternative, ALTERNATIVES)
    check_level("alpha", alpha)
    if not float(spread) > 0.0:
        raise ValueError(f"spread must be a positive standard deviation; got {spread!r}.")
    rng = np.random.default_rng(seed)
    critical = critical_u(n_a, n_b, alpha, alternative) if exact else None
    detected = 0
    rows = max(1, _SIMULATION_CELLS // (n_a + n_b))
    for start in range(0, n_sim, rows):
        count = min(rows, n_sim - start)
        readings = rng.normal(0.0, spread, (count, n_a + n_b))
        readings[:, n_a:] += shift
        ranks = np.argsort(np.argsort(readings, axis=1), axis=1) + 1.0
        u_b = ranks[:, n_a:].sum(axis=1) - n_b * (n_b + 1) / 2.0  # pairs where B reads higher
        u_a = n_a * n_b - u_b
        if exact:
            if critical is None:
                continue
            tested = {"two-sided": np.minimum(u_a, u_b), "b-greater": u_a, "b-less": u_b}[alternative]
            detected += int(np.sum(tested <= critical))
        else:
            detected += int(np.sum(_normal_rejects(u_b, n_a, n_b, alpha, alternative)))
    return detected / n_sim


def simulate_paired_power(
    n: int,
    shift: float,
    spread: float,
    *,
    alpha: float = 0.05,
    alternative: str = "two-sided",
    n_sim: int = 2000,
    seed: int = 20_261_201,
) -> float:
    """Share of simulated studies in which the exact signed-rank test finds the shift.

    Differences d ~ Normal(shift, spread), no ties and no zeros; reject when the smaller rank
    sum (or the one against the tested direction) is at most ``critical_t``.
    """
    n, n_sim = _positive_int("n", n), _positive_int("n_sim", n_sim)
    check_choice("alternative", alternative, ALTERNATIVES)
    check_level("alpha", alpha)
    if not float(spread) > 0.0:
        raise ValueError(f"spread must be a positive standard deviation; got {spread!r}.")
    critical = critical_t(n, alpha, alternative)
    if critical is None:
        return 0.0
    rng = np.random.default_rng(seed)
    detected = 0
    rows = max(1, _SIMULATION_CELLS // n)
    for start in range(0, n_sim, rows):
        count = min(rows, n_sim - start)
        d = rng.normal(shift, spread, (count, n))
        ranks = np.argsort(np.argsort(np.abs(d), axis=1), axis=1) + 1.0
        w_plus = np.where(d > 0, ranks, 0.0).sum(axis=1)
        w_minus = n * (n + 1) / 2.0 - w_plus
        tested = {"two-sided": np.minimum(w_plus, w_minus), "b-greater": w_minus, "b-less": w_plus}[alternative]
        detected += int(np.sum(tested <= critical))
    return detected / n_sim


def _effect(name, shift, spread, probability, alternative, scale) -> tuple[float, float]:
    """The probability the plan detects, and the shift in units of the spread.

    ``scale`` turns shift / spread into the argument of Phi: 1/sqrt(2) for two groups, sqrt(2)
    for pairs.
    """
    if probability is not None:
        if shift is not None or spread is not None:
            raise ValueError(f"Give either shift and spread, or {name}, not both.")
        if not 0.0 < float(probability) < 1.0 or probability == 0.5:
            raise ValueError(f"{name} must lie strictly between 0 and 1 and differ from 0.5; got {probability!r}.")
        p = float(probability)
        standardized = float(_dist.norm.ppf(p) / scale)
    else:
        if shift is None or spread is None:
            raise ValueError(f"Give the shift worth detecting and the spread, or {name}.")
        if not float(spread) > 0.0 or not math.isfinite(spread):
            raise ValueError(f"spread must be a positive standard deviation; got {spread!r}.")
        if not float(shift) != 0.0 or not math.isfinite(shift):
            raise ValueError(f"shift must be a non-zero number (the change worth detecting); got {shift!r}.")
        standardized = float(shift) / float(spread)
        p = float(_dist.norm.cdf(standardized * scale))
    if (alternative == "b-greater" and p < 0.5) or (alternative == "b-less" and p > 0.5):
        raise ValueError(
            f"The change worth detecting points the other way from the chosen direction ({_DIRECTIONS[alternative]}); "
            "a one-sided plan detects a change in its own direction only."
        )
    return p, standardized


def _z_level(alpha: float, alternative: str) -> float:
    return float(_dist.norm.isf(alpha / 2.0 if alternative == "two-sided" else alpha))


def _rank_sum_power(n_a: int, n_b: int, p: float, alpha: float, alternative: str) -> float:
    """Noether's formula solved for power at given sizes."""
    total = n_a + n_b
    share = n_a / total
    return float(_dist.norm.cdf(math.sqrt(12.0 * share * (1.0 - share) * total) * abs(p - 0.5) - _z_level(alpha, alternative)))


def _signed_rank_power(n: int, p: float, alpha: float, alternative: str) -> float:
    return float(_dist.norm.cdf(math.sqrt(3.0 * n) * abs(p - 0.5) - _z_level(alpha, alternative)))


def _normal_rejects(u_b, n_a, n_b, alpha, alternative) -> np.ndarray:
    """Normal approximation with continuity correction, no ties (B higher gives large U_b)."""
    mean = n_a * n_b / 2.0
    sd = math.sqrt(n_a * n_b * (n_a + n_b + 1) / 12.0)
    if alternative == "b-greater":
        return (u_b - mean - 0.5) / sd >= _dist.norm.isf(alpha)
    if alternative == "b-less":
        return (u_b - mean + 0.5) / sd <= -_dist.norm.isf(alpha)
    return (np.abs(u_b - mean) - 0.5) / sd >= _dist.norm.isf(alpha / 2.0)


def _curve_sizes(planned: int) -> list[int]:
    """Group sizes for the power chart: from 2 to twice the plan, at most 40 points."""
    top = max(2 * planned, 10)
    return sorted({int(round(v)) for v in np.linspace(2, top, _CURVE_POINTS)})


def _ceil(value: float) -> int:
    """Round up, ignoring floating-point dust just above a whole number."""
    return max(1, math.ceil(value - 1e-9))


def _positive_int(name: str, value) -> int:
    if int(value) != value or value < 1:
        raise ValueError(f"{name} must be a whole number of at least 1; got {value!r}.")
    return int(value)


def _several_assumptions(groups: int, alpha: float) -> tuple[str, ...]:
    """What the several-groups plan rests on, in plain words."""
    return (
        f"The test will be the Kruskal-Wallis test on {groups} separate groups at the {alpha:g} significance level.",
        "Every part is measured independently of the others.",
        "The plan is for the hardest case of that shift: two groups that far apart and every other group "
        "half-way between them; any other pattern with the same largest difference is found at least as often.",
        "All groups have the same bell-like shape and the same spread (standard deviation); the change only moves "
        "the readings.",
        "The sizes come from a large-sample approximation; the simulation shows how close it comes.",
        "A coarse gauge that makes many readings equal loses some power: plan a few parts more.",
    )


def _assumptions(from_shift: bool, *, paired: bool, alternative: str, alpha: float) -> tuple[str, ...]:
    """What the plan rests on, in plain words."""
    direction = _DIRECTIONS[alternative]
    notes = [
        f"The test will be the {'signed-rank test on the same parts' if paired else 'rank-sum test on two separate groups'} "
        f"at the {alpha:g} significance level, looking for {direction}.",
        "Every part is measured independently of the others.",
        "Noether's formula is a large-sample approximation; the simulation shows how close it comes.",
        "A coarse gauge that makes many readings equal loses some power: plan a few parts more.",
    ]
    if from_shift:
        if paired:
            notes.append(
                "The spread is the standard deviation of the differences (after minus before), and the "
                "differences are roughly bell-shaped; this only turns the shift into a probability."
            )
        else:
            notes.append(
                "Both groups have the same bell-like shape and the same spread (standard deviation); the "
                "change only moves the readings. This only turns the shift into a probability."
            )
    return tuple(notes)
