"""Companions of the rank-sum test: is the "same shape" assumption met, and tests that do not need it.

The rank-sum test speaks about a shift of the median only when the two groups have the same
shape and spread (the location-shift model). ``check_shape`` looks for a clear breach of that
model; ``brunner_munzel`` tests "B tends to read higher" without it; ``mood_median`` compares the
medians by counting readings above the grand median. The choice of checks is explained in
``resources/decisions/same-shape-check.md``.

Inputs are already-cleaned float arrays (no NaN). Readings are compared on their common decimal
grid (``rankwise.stats.grid``) so that floating-point noise never splits a tie.
"""

from __future__ import annotations

from collections.abc import Sequence
from functools import lru_cache
from itertools import accumulate

import numpy as np
from scipy import special as _special
from scipy import stats as _dist

from rankwise.stats.grid import Grid, find_grid
from rankwise.stats.ranks import midranks, midranks_on_grid, midranks_on_grid_together_and_within
from rankwise.stats.results import BrunnerMunzelResult, MoodMedianResult, ShapeCheck
from rankwise.stats.summary import linear_quantile, sorted_median

SHAPE_MIN_READINGS = 5
"""Fewest readings per group for which the same-shape check is attempted."""

SHAPE_ALPHA = 0.05
"""A check whose p-value falls below this counts as a clear difference of spread or shape."""

DISPERSION_METHOD = "Fligner-Killeen (median-centred), chi-square p"
_KS_EXACT_LIMIT = 10_000
"""Largest n_a * n_b for which the lattice-path count of the shape check is exact."""


def check_shape(a: np.ndarray, b: np.ndarray, grid: Grid | None = None) -> ShapeCheck | None:
    """Do A and B have the same spread and shape? None with fewer than 5 readings in a group.

    Two checks after aligning the medians (Conover, Johnson & Johnson 1981, Technometrics 23,
    351-361 for the first; Kolmogorov-Smirnov two-sample for the second):

    - dispersion: Fligner-Killeen test on |reading - group median|, scores
      Phi^-1(1/2 + rank / (2 (N + 1))) from mid-ranks, chi-square p with 1 degree of freedom;
    - shape: two-sample Kolmogorov-Smirnov distance between the median-aligned groups, the largest
      gap between their cumulative shares. Its p-value takes the aligned readings as if no
      medians had been estimated and no ties were present (exact lattice-path count up to
      n_a * n_b = 10 000; beyond, Kolmogorov's one-sample distribution at the effective size
      n_a n_b / (n_a + n_b), as Smirnov suggested), so it is a screen, not an exact test.

    ``differ`` is True when either p-value is below 0.05. ``grid``: the readings' common grid when
    the caller has found it already (``find_grid(a, b)``).
    """
    a = np.asarray(a, dtype=float)
    b = np.asarray(b, dtype=float)
    if a.size < SHAPE_MIN_READINGS or b.size < SHAPE_MIN_READINGS:
        return None
    grid = find_grid(a, b) if grid is None else grid
    counts_a, counts_b = grid.to_counts(a), grid.to_counts(b)
    # Doubled counts minus doubled medians: whole numbers on a grid, so deviations tie exactly.
    ordered_a, ordered_b = np.sort(counts_a), np.sort(counts_b)
    median_a, median_b = 2.0 * sorted_median(ordered_a), 2.0 * sorted_median(ordered_b)
    aligned_a, aligned_b = 2.0 * counts_a - median_a, 2.0 * counts_b - median_b
    # On a grid the deviations are whole numbers; below 2^52 they are their own grid at 0 decimals,
    # where midranks_on_grid ranks them as midranks would, without the grid search.
    largest = max(abs(2.0 * ordered_a[0] - median_a), abs(2.0 * ordered_a[-1] - median_a),
                  abs(2.0 * ordered_b[0] - median_b), abs(2.0 * ordered_b[-1] - median_b))
    dispersion_p = _fligner_killeen_p([np.abs(aligned_a), np.abs(aligned_b)],
                                      on_own_grid=grid.decimals is not None and largest < 2.0**52)
    # The same map of every reading keeps the order: the aligned readings come out sorted.
    shape_p = _kolmogorov_smirnov_p(2.0 * ordered_a - median_a, 2.0 * ordered_b - median_b)
    readings_a, readings_b = np.sort(a), np.sort(b)
    iqr_a = linear_quantile(readings_a, 0.75) - linear_quantile(readings_a, 0.25)
    iqr_b = linear_quantile(readings_b, 0.75) - linear_quantile(readings_b, 0.25)
    return ShapeCheck(
        spread_ratio=iqr_b / iqr_a if iqr_a > 0 else float("nan"),
        dispersion_method=DISPERSION_METHOD,
        dispersion_p=dispersion_p,
        shape_method=(
            "Kolmogorov-Smirnov distance after aligning medians, "
            + ("exact lattice-path p" if a.size * b.size <= _KS_EXACT_LIMIT else "Kolmogorov distribution p at the effective size")
        ),
        shape_p=shape_p,
        differ=bool(dispersion_p < SHAPE_ALPHA or shape_p < SHAPE_ALPHA),
    )


def _fligner_killeen_p(deviations: Sequence[np.ndarray], on_own_grid: bool = False) -> float:
    """Chi-square p of the Fligner-Killeen statistic on absolute deviations from group medians.

    Deviations that are all equal carry no information about spread: p = 1. ``on_own_grid``: the
    deviations are whole numbers below 2^52, compared exactly as they are.
    """
    sizes = [d.size for d in deviations]
    combined = np.concatenate(deviations)
    total = combined.size
    ranks = midranks_on_grid(combined) if on_own_grid else midranks(combined)
    scores = _special.ndtri(ranks / (2.0 * (total + 1.0)) + 0.5)  # the normal quantile
    variance = float(np.var(scores, ddof=1))
    if not variance > 0.0:
        return 1.0
    mean_score = scores.mean()
    bounds = [0, *accumulate(sizes)]
    statistic = sum((end - start) * (scores[start:end].mean() - mean_score) ** 2
                    for start, end in zip(bounds[:-1], bounds[1:])) / variance
    return float(_special.chdtrc(len(sizes) - 1, statistic))  # chi-square upper tail


def _kolmogorov_smirnov_p(x: np.ndarray, y: np.ndarray) -> float:
    """Two-sided p of the two-sample Kolmogorov-Smirnov distance (no-ties null distribution);
    ``x`` and ``y`` ascending."""
    m, n = x.size, y.size
    # The cumulative shares at every reading (the steps of both; a repeated reading adds nothing).
    points = np.concatenate([x, y])
    below_x = np.searchsorted(x, points, side="right")
    below_y = np.searchsorted(y, points, side="right")
    # The distance scaled by m n is a whole number: |n i - m j| at the lattice point (i, j).
    gap = int(np.max(np.abs(n * below_x - m * below_y)))
    if gap == 0:
        return 1.0
    if m * n <= _KS_EXACT_LIMIT:
        return _lattice_exceedance(m, n, gap)
    effective_size = round(m * n / (m + n))
    return float(min(1.0, _dist.kstwo.sf(gap / (m * n), effective_size)))


@lru_cache(maxsize=1024)
def _lattice_exceedance(m: int, n: int, gap: int) -> float:
    """P(max |n i - m j| >= gap) over a random path from (0, 0) to (m, n) (Hodges 1957).

    Every interleaving of m x-steps and n y-steps is equally likely; the probability of staying
    strictly inside the band is carried along the path in floating point, so nothing overflows.
    It depends on the sizes and the gap only, so it is remembered (characteristics share sizes).
    """
    inside = np.zeros((m + 1, n + 1))
    inside[0, 0] = 1.0
    for i in range(m + 1):
        for j in range(n + 1):
            if i == 0 and j == 0:
                continue
            if abs(n * i - m * j) >= gap:
                continue
            remaining = m + n - i - j + 1
            from_x = inside[i - 1, j] * (m - i + 1) / remaining if i > 0 else 0.0
            from_y = inside[i, j - 1] * (n - j + 1) / remaining if j > 0 else 0.0
            inside[i, j] = from_x + from_y
    return float(min(1.0, max(0.0, 1.0 - inside[m, n])))


def brunner_munzel(a: np.ndarray, b: np.ndarray, alternative: str, grid: Grid | None = None) -> BrunnerMunzelResult | None:
    """Brunner-Munzel test of P(B > A) + 1/2 P(B = A) = 1/2, tolerating unequal spreads.

    Brunner & Munzel (2000), Biometrical Journal 42, 17-25, in the form of Neubert & Brunner
    (2007), Computational Statistics & Data Analysis 51, 5192-5204: statistic from overall and
    within-group mid-ranks, Student t with Satterthwaite degrees of freedom. The statistic is
    positive when B tends to read higher; ``alternative`` is "two-sided", "b-greater" (B tends to
    read higher) or "b-less". None when a group has fewer than 2 readings or when the rank
    variance is zero (for example, all readings equal), where the test is not defined. ``grid``:
    the readings' common grid when the caller has found it already.
    """
    if alternative not in ("two-sided", "b-greater", "b-less"):
        raise ValueError(f"alternative must be 'two-sided', 'b-greater' or 'b-less'; got {alternative!r}.")
    a = np.asarray(a, dtype=float)
    b = np.asarray(b, dtype=float)
    n_a, n_b = a.size, b.size
    if n_a < 2 or n_b < 2:
        return None
    grid = find_grid(a, b) if grid is None else grid
    counts_a, counts_b = grid.to_counts(a), grid.to_counts(b)
    overall, (within_a, within_b) = midranks_on_grid_together_and_within([counts_a, counts_b])
    overall_a, overall_b = overall[:n_a], overall[n_a:]
    placement_a = overall_a - within_a
    placement_b = overall_b - within_b
    var_a = float(np.sum((placement_a - placement_a.mean()) ** 2) / (n_a - 1))
    var_b = float(np.sum((placement_b - placement_b.mean()) ** 2) / (n_b - 1))
    pooled = n_a * var_a + n_b * var_b
    if not pooled > 0.0:
        return None
    statistic = n_a * n_b * (overall_b.mean() - overall_a.mean()) / ((n_a + n_b) * np.sqrt(pooled))
    df = pooled**2 / ((n_a * var_a) ** 2 / (n_a - 1) + (n_b * var_b) ** 2 / (n_b - 1))
    # Student t tails: P(T <= x) = stdtr(df, x), P(T >= x) = stdtr(df, -x).
    if alternative == "b-greater":
        p = _special.stdtr(df, -statistic)
    elif alternative == "b-less":
        p = _special.stdtr(df, statistic)
    else:
        p = min(1.0, 2.0 * _special.stdtr(df, -abs(statistic)))
    return BrunnerMunzelResult(statistic=float(statistic), df=float(df), p_value=float(p))


def mood_median(groups: Sequence[np.ndarray], grid: Grid | None = None) -> MoodMedianResult | None:
    """Mood's MEDIAN test: do the groups share one median? (not Mood's test of scale)

    Mood (1950), Introduction to the Theory of Statistics, ch. 16: count, per group, the readings
    above the grand median and those not above it (a reading equal to the grand median counts as
    "not above"), then a chi-square test of that 2 x k table, with Yates' continuity correction
    when k = 2. This is the test ``scipy.stats.median_test`` computes; ``scipy.stats.mood`` is a
    different test, of spread. None with fewer than two groups or when no reading lies above the
    grand median (all readings equal, or too few distinct values), where the table has an empty row.
    ``grid``: the groups' common grid when the caller has found it already.
    """
    arrays = [np.asarray(g, dtype=float) for g in groups]
    if len(arrays) < 2 or any(g.size == 0 for g in arrays):
        return None
    grid = find_grid(*arrays) if grid is None else grid
    counts = [grid.to_counts(g) for g in arrays]
    grand_count = sorted_median(np.sort(np.concatenate(counts)))
    above = [int(np.count_nonzero(c > grand_count)) for c in counts]
    not_above = [c.size - k for c, k in zip(counts, above)]
    if sum(above) == 0 or sum(not_above) == 0:
        return None
    table = np.array([above, not_above], dtype=float)
    expected = np.outer(table.sum(axis=1), table.sum(axis=0)) / table.sum()
    deviation = np.abs(table - expected)
    if len(arrays) == 2:
        deviation = np.maximum(deviation - 0.5, 0.0)
    statistic = float(np.sum(deviation**2 / expected))
    return MoodMedianResult(
        grand_median=float(grid.to_readings(grand_count)),
        table=(tuple(above), tuple(not_above)),
        statistic=statistic,
        p_value=float(_special.chdtrc(len(arrays) - 1, statistic)),
    )
