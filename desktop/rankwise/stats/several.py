"""Several groups at once: Kruskal-Wallis H, Dunn's pairwise follow-up with Holm's adjustment.

Kruskal & Wallis (1952), JASA 47, 583-621: H from the groups' rank sums over the combined
ranking, divided by the tie correction 1 - sum(t^3 - t) / (N^3 - N); p from chi-square with k - 1
degrees of freedom, or from the permutation distribution of H for small groups. Dunn (1964),
Technometrics 6, 241-252: z for each pair from the difference of mean ranks, tie-corrected
variance; two-sided p. Holm (1979), Scandinavian Journal of Statistics 6, 65-70: step-down
adjustment that keeps the family's error rate at alpha.
"""

from __future__ import annotations

import functools
import itertools
import math
from collections.abc import Mapping, Sequence

import numpy as np
from scipy import stats as _dist

from rankwise.stats.frozen_floats import FrozenFloats
from rankwise.stats.grid import find_grid
from rankwise.stats.inputs import check_choice, check_level, clean_group
from rankwise.stats.progress import SILENT, Monitor
from rankwise.stats.ranks import rank_groups, tie_correction_sum
from rankwise.stats.results import PairComparison, SeveralGroupsResult
from rankwise.stats.shape import mood_median
from rankwise.stats.summary import summarize

COMPARISONS = ("all-pairs", "against-reference")
SMALL_GROUP = 5
"""With a group smaller than this, "auto" takes the permutation p instead of chi-square."""
EXACT_ASSIGNMENT_LIMIT = 1_000_000
"""Largest number of ways to split the readings into the groups that is enumerated exactly."""
EXACT_OUTER_LIMIT = 20_000
"""Largest number of choices of the first k - 2 groups walked one by one (bounds the time)."""
MONTE_CARLO_RESHUFFLES = 20_000
MONTE_CARLO_SEED = 20_261_201
"""Fixed seed, so the same readings always give the same Monte Carlo p-value."""
_CHUNK = 2_000


def compare_several(
    groups: Mapping[str, Sequence[float]],
    *,
    alpha: float = 0.05,
    comparison: str = "all-pairs",
    reference: str | None = None,
    method: str = "auto",
    monitor: Monitor = SILENT,
) -> SeveralGroupsResult:
    """Kruskal-Wallis test over two or more groups, with Dunn's pairs and Holm-adjusted p.

    ``groups`` maps each group's name to its readings (blanks None/NaN are dropped and counted).
    ``comparison``: "all-pairs" (k(k-1)/2 pairs) or "against-reference" (k - 1 pairs, each group
    against ``reference``; the first group when None). ``method``: "normal" (chi-square p),
    "exact" (permutation p: every split of the readings counted when there are at most a million
    and the count is quick, else 20 000 random reshuffles with a fixed seed) or "auto" (permutation p when a group has fewer than 5
    readings, chi-square otherwise). Raises ValueError for fewer than two groups, an empty group,
    non-numbers, or a wrong argument.
    """
    check_level("alpha", alpha)
    check_choice("comparison", comparison, COMPARISONS)
    check_choice("method", method, ("auto", "exact", "normal"))
    names = list(groups)
    if len(names) < 2:
        raise ValueError(f"groups must hold at least two groups of readings; got {len(names)}.")
    if comparison == "against-reference":
        reference = names[0] if reference is None else reference
        if reference not in groups:
            raise ValueError(f"reference must be the name of one of the groups ({', '.join(names)}); got {reference!r}.")
    else:
        reference = None
    cleaned = [clean_group(groups[name], name) for name in names]
    values = [c[0] for c in cleaned]
    sizes = np.array([v.size for v in values])
    total = int(sizes.sum())
    warnings: list[str] = []

    grid = find_grid(*values)
    counts = [grid.to_counts(v) for v in values]
    ranks, tie_blocks = rank_groups(counts, values)
    rank_sums = np.array([r.sum() for r in ranks])
    mean_ranks = rank_sums / sizes
    ties = tie_correction_sum(np.concatenate(counts))
    tie_correction = 1.0 - ties / (total**3 - total) if total > 1 else 0.0
    degenerate = not tie_correction > 0.0
    if degenerate:
        warnings.append("All readings are equal: there is nothing to rank, so no difference can be shown.")
        h = 0.0
    else:
        raw = 12.0 / (total * (total + 1)) * float(np.sum(rank_sums**2 / sizes)) - 3.0 * (total + 1)
        h = max(0.0, raw / tie_correction)
    df = len(names) - 1
    p_chi_square = float(_dist.chi2.sf(h, df)) if not degenerate else 1.0

    use_permutation = method == "exact" or (method == "auto" and sizes.min() < SMALL_GROUP)
    p_permutation = None
    used = "chi-square"
    if use_permutation and not degenerate:
        doubled = [np.rint(2.0 * r).astype(np.int64) for r in ranks]
        p_permutation, used, note = _permutation_p(doubled, monitor)
        if note:
            warnings.append(note)
    elif use_permutation:
        p_permutation, used = 1.0, "exact permutation"
    elif sizes.min() < SMALL_GROUP:
        warnings.append(
            "A group has fewer than 5 readings: the chi-square p-value is rough there; the "
            "permutation p-value is the better guide."
        )
    p_value = p_permutation if p_permutation is not None else p_chi_square

    pairs = _dunn_pairs(names, sizes, mean_ranks, total, ties, alpha, reference, degenerate)
    return SeveralGroupsResult(
        summaries=tuple(summarize(name, v, dropped) for name, (v, dropped) in zip(names, cleaned)),
        values=tuple(FrozenFloats(v) for v in values),
        ranks=tuple(FrozenFloats(r) for r in ranks),
        tie_blocks=tie_blocks,
        rank_sums=tuple(float(s) for s in rank_sums),
        mean_ranks=tuple(float(m) for m in mean_ranks),
        h=float(h),
        df=df,
        tie_correction=float(tie_correction),
        p_value=float(p_value),
        method=used,
        p_chi_square=p_chi_square,
        p_permutation=None if p_permutation is None else float(p_permutation),
        epsilon_squared=float(h / ((total**2 - 1) / (total + 1))) if total > 1 else 0.0,
        alpha=float(alpha),
        significant=bool(p_value <= alpha),
        comparison=comparison,
        reference=reference,
        pairs=pairs,
        mood_median=mood_median(values),
        warnings=tuple(warnings),
    )


def _dunn_pairs(names, sizes, mean_ranks, total, ties, alpha, reference, degenerate) -> tuple[PairComparison, ...]:
    """Dunn's z and two-sided p for each pair, Holm-adjusted over the pairs compared."""
    if reference is None:
        index_pairs = list(itertools.combinations(range(len(names)), 2))
    else:
        r = names.index(reference)
        index_pairs = [(r, j) for j in range(len(names)) if j != r]
    base = total * (total + 1) / 12.0 - ties / (12.0 * (total - 1)) if total > 1 else 0.0
    z_values = []
    for i, j in index_pairs:
        variance = base * (1.0 / sizes[i] + 1.0 / sizes[j])
        z_values.append(0.0 if degenerate or not variance > 0.0 else (mean_ranks[j] - mean_ranks[i]) / math.sqrt(variance))
    raw = np.minimum(1.0, 2.0 * _dist.norm.sf(np.abs(z_values)))
    adjusted = holm_adjust(raw)
    return tuple(
        PairComparison(
            group_a=names[i],
            group_b=names[j],
            mean_rank_a=float(mean_ranks[i]),
            mean_rank_b=float(mean_ranks[j]),
            z=float(z),
            p_value=float(p),
            p_adjusted=float(q),
            significant=bool(q <= alpha),
        )
        for (i, j), z, p, q in zip(index_pairs, z_values, raw, adjusted)
    )


def checked_p_values(p_values: Sequence[float] | np.ndarray) -> np.ndarray:
    """The p-values as a float array; a ValueError when one lies outside [0, 1] or is not a number."""
    p = np.asarray(p_values, dtype=float)
    if np.any((p < 0.0) | (p > 1.0)) or np.isnan(p).any():
        raise ValueError("p_values must all lie between 0 and 1.")
    return p


def holm_adjust(p_values: Sequence[float] | np.ndarray) -> np.ndarray:
    """Holm (1979) step-down adjusted p-values, in the order given.

    Sorted ascending, the i-th smallest (1-based) becomes max over j <= i of min(1, (m - j + 1) p_(j));
    the running maximum keeps the adjusted values in the order of the raw ones, which is why
    several pairs can share one adjusted value.
    """
    p = checked_p_values(p_values)
    if p.size == 0:
        return p.copy()
    order = np.argsort(p, kind="mergesort")
    multipliers = p.size - np.arange(p.size)
    stepped = np.maximum.accumulate(np.minimum(1.0, multipliers * p[order]))
    adjusted = np.empty_like(p)
    adjusted[order] = stepped
    return adjusted


def _permutation_p(doubled_ranks: list[np.ndarray], monitor: Monitor) -> tuple[float, str, str]:
    """P(H >= observed H) when every split of the readings into the groups is equally likely.

    H grows with sum R_i^2 / n_i, compared here as the whole number sum (2 R_i)^2 (L / n_i) with L
    the least common multiple of the sizes, so equal values of H are found exactly (in floating
    point, with a relative tolerance of 1e-12, only where that number would not fit in 64 bits). Every split
    is counted when there are at most ``EXACT_ASSIGNMENT_LIMIT`` (and the walk stays within
    ``EXACT_OUTER_LIMIT`` steps); otherwise a Monte Carlo
    estimate (b + 1) / (m + 1) from ``MONTE_CARLO_RESHUFFLES`` reshuffles with a fixed seed.
    Returns the p-value, the method's name and a note for the warnings.
    """
    # The sum over groups does not depend on their order; the largest two go last, where the
    # enumeration is vectorised.
    doubled_ranks = sorted(doubled_ranks, key=len)
    sizes = [r.size for r in doubled_ranks]
    pooled = np.concatenate(doubled_ranks)
    weights = np.array([math.lcm(*sizes) // n for n in sizes], dtype=np.int64)
    if float(pooled.sum()) ** 2 * float(weights.max()) >= 2.0**62:
        # Too large for whole numbers in int64: compare sum R_i^2 / n_i in floating point.
        weights = np.array([1.0 / n for n in sizes])
        pooled = pooled.astype(float)
    observed = np.sum(np.array([r.sum() for r in doubled_ranks], dtype=pooled.dtype) ** 2 * weights)
    observed = observed * (1.0 - 1e-12) if weights.dtype == float else int(observed)
    splits = math.factorial(len(pooled)) // math.prod(math.factorial(n) for n in sizes)
    if splits <= EXACT_ASSIGNMENT_LIMIT and _outer_choices(sizes) <= EXACT_OUTER_LIMIT:
        statistics = _all_split_statistics(pooled, sizes, weights, monitor)
        return float(np.mean(statistics >= observed)), "exact permutation", ""
    rng = np.random.default_rng(MONTE_CARLO_SEED)
    starts = np.cumsum([0] + sizes[:-1])
    at_least = 0
    for done in range(0, MONTE_CARLO_RESHUFFLES, _CHUNK):
        monitor.step(done / MONTE_CARLO_RESHUFFLES)
        shuffled = rng.permuted(np.tile(pooled, (_CHUNK, 1)), axis=1)
        sums = np.add.reduceat(shuffled, starts, axis=1)
        at_least += int(np.sum(np.sum(sums**2 * weights, axis=1) >= observed))
    monitor.step(1.0)
    p = (at_least + 1) / (MONTE_CARLO_RESHUFFLES + 1)
    error = math.sqrt(p * (1.0 - p) / MONTE_CARLO_RESHUFFLES)
    note = (
        f"Permutation p-value from {MONTE_CARLO_RESHUFFLES:,} random reshuffles (seed "
        f"{MONTE_CARLO_SEED}); its Monte Carlo standard error is {error:.4f}."
    )
    return p, "Monte Carlo permutation", note


def _all_split_statistics(pooled: np.ndarray, sizes: list[int], weights: np.ndarray, monitor: Monitor) -> np.ndarray:
    """The integer H-equivalent statistic for every split of ``pooled`` into groups of ``sizes``.

    The first k - 2 groups are chosen one combination at a time; the last two are filled for all
    their combinations at once.
    """
    results: list[np.ndarray] = []
    outer = [0]
    outer_total = _outer_choices(sizes)

    def fill(remaining: np.ndarray, group: int, partial: int) -> None:
        if group == len(sizes) - 2:
            chosen = _combinations(remaining.size, sizes[group])
            first = remaining[chosen].sum(axis=1)
            second = remaining.sum() - first
            results.append(partial + first**2 * weights[group] + second**2 * weights[group + 1])
            outer[0] += 1
            monitor.step(outer[0] / outer_total)
            return
        for picked in itertools.combinations(range(remaining.size), sizes[group]):
            picked = list(picked)
            share = remaining[picked].sum()
            fill(np.delete(remaining, picked), group + 1, partial + share**2 * weights[group])

    fill(pooled, 0, 0)
    return np.concatenate(results)


def _outer_choices(sizes: list[int]) -> int:
    """How many choices of the first k - 2 groups the enumeration walks through one by one."""
    return math.prod(math.comb(int(sum(sizes[g:])), sizes[g]) for g in range(len(sizes) - 2))


@functools.lru_cache(maxsize=8)
def _combinations(m: int, r: int) -> np.ndarray:
    """Every r-subset of range(m) as rows of an index array."""
    flat = np.fromiter(itertools.chain.from_iterable(itertools.combinations(range(m), r)), dtype=np.int32)
    chosen = flat.reshape(-1, r) if r else np.zeros((1, 0), dtype=np.int32)
    chosen.setflags(write=False)
    return chosen
