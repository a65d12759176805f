"""Timings of the paired, several-groups and planning statistics against scipy in the same run.

Run as a script (not collected by pytest):  .venv/bin/python tests/benchmarks/bench_paired_several.py
Prints one row per task: our time, the reference's time, their ratio (ours / reference), and the
largest difference between the two p-values. Data are invented (seeded random gauge readings).
"""

from __future__ import annotations

import time

import numpy as np
from scipy import stats

from rankwise.stats.paired import compare_paired
from rankwise.stats.planning import simulate_power
from rankwise.stats.several import compare_several


def best_of(repeats, function):
    """Shortest wall time of ``repeats`` calls, and the last call's value."""
    best = float("inf")
    value = None
    for _ in range(repeats):
        start = time.perf_counter()
        value = function()
        best = min(best, time.perf_counter() - start)
    return best, value


def w_plus(d):
    """Sum of the mid-ranks of |d| over the positive differences (zeros dropped)."""
    nonzero = d[d != 0]
    ranks = stats.rankdata(np.abs(nonzero))
    return ranks[nonzero > 0].sum()


def gauge_pairs(n, seed):
    rng = np.random.default_rng(seed)
    a = np.round(rng.normal(10.0, 0.2, n), 2)
    return a, np.round(a + rng.normal(0.01, 0.05, n), 2)


def main():
    rows = []

    a, b = gauge_pairs(16, 1)
    d = np.rint(b * 100) - np.rint(a * 100)
    ours, result = best_of(5, lambda: compare_paired(a, b, method="exact"))
    theirs, reference = best_of(1, lambda: stats.permutation_test(
        (d,), w_plus, permutation_type="samples", n_resamples=np.inf, alternative="two-sided"))
    rows.append(("signed-rank exact p, 16 tied pairs (whole result) vs scipy permutation_test", ours, theirs, abs(result.p_value - reference.pvalue)))

    a, b = gauge_pairs(100_000, 2)
    d = np.rint(b * 100) - np.rint(a * 100)
    ours, result = best_of(3, lambda: compare_paired(a, b, method="normal"))
    theirs, reference = best_of(3, lambda: stats.wilcoxon(d, method="asymptotic", correction=True))
    rows.append(("signed-rank normal p + pseudo-median + CI, 10^5 pairs vs scipy wilcoxon", ours, theirs, abs(result.p_value - reference.pvalue)))

    rng = np.random.default_rng(3)
    groups = {f"g{i}": np.round(rng.normal(5.0 + 0.001 * i, 0.1, 100_000), 2) for i in range(4)}
    ours, result = best_of(3, lambda: compare_several(groups, method="normal"))
    theirs, reference = best_of(3, lambda: stats.kruskal(*[np.rint(v * 100) for v in groups.values()]))
    rows.append(("Kruskal-Wallis + Dunn + Mood, 4 x 10^5 readings vs scipy kruskal", ours, theirs, abs(result.p_value - reference.pvalue)))

    small = {"a": [1.1, 1.3, 1.2, 1.4], "b": [1.5, 1.3, 1.6, 1.2], "c": [1.2, 1.1, 1.0, 1.3]}
    ours, result = best_of(3, lambda: compare_several(small, method="exact"))
    theirs, reference = best_of(1, lambda: stats.permutation_test(
        [np.array(v) for v in small.values()], lambda *s: stats.kruskal(*s).statistic,
        permutation_type="independent", n_resamples=np.inf, alternative="greater"))
    rows.append(("Kruskal-Wallis exact permutation p, 4 + 4 + 4 vs scipy permutation_test", ours, theirs, abs(result.p_value - reference.pvalue)))

    def scipy_power():
        generator = np.random.default_rng(4)
        x = generator.normal(0.0, 1.0, (2000, 44))
        y = generator.normal(0.74, 1.0, (2000, 44))
        return np.mean(stats.mannwhitneyu(x, y, axis=1, method="exact").pvalue <= 0.05)

    ours, result = best_of(3, lambda: simulate_power(44, 44, 0.74, 1.0, n_sim=2000))
    theirs, reference = best_of(1, scipy_power)
    rows.append(("simulated power, 2000 studies of 44 + 44 vs scipy mannwhitneyu (axis)", ours, theirs, abs(result - reference)))

    width = max(len(r[0]) for r in rows)
    print(f"{'task':<{width}}  {'ours s':>9}  {'scipy s':>9}  {'ratio':>7}  {'|dp|':>9}")
    for task, ours, theirs, gap in rows:
        gap_text = "" if gap is None else f"{gap:.1e}"
        print(f"{task:<{width}}  {ours:9.4f}  {theirs:9.4f}  {ours / theirs:7.3g}  {gap_text:>9}")


if __name__ == "__main__":
    main()
