"""Speed of the two-group engine, with references timed in the same run.

Run:  .venv/bin/python tests/benchmarks/bench_two_groups.py [--quick]

The exact permutation test of scipy enumerates all C(24, 12) = 2.7 million splits for the
first reference, which takes about a minute. Prints one table: each case, our time, the reference's time (or the target), the ratio and the
largest difference in p where a reference computes the same quantity. All readings are invented
(normal draws rounded to a gauge resolution) and exist only for timing.
"""

from __future__ import annotations

import argparse
import math
import time
import tracemalloc

import numpy as np
import scipy.stats

from rankwise.stats import compare_two
from rankwise.stats.exact_ranksum import rank_sum_distribution
from rankwise.stats.frozen_floats import FrozenFloats
from rankwise.stats.ranks import midranks


def best_time(function, repeats: int) -> float:
    """Shortest wall time of ``repeats`` calls (the machine is shared; the best is the least disturbed)."""
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        function()
        times.append(time.perf_counter() - start)
    return min(times)


def gauge_readings(rng: np.random.Generator, n: int, shift: float, decimals: int) -> np.ndarray:
    """Invented readings: normal draws around 10 (spread 1) rounded to the gauge's decimals."""
    return np.round(rng.normal(10.0 + shift, 1.0, n), decimals)


def exact_p_only(a: np.ndarray, b: np.ndarray) -> float:
    """The exact tie-aware two-sided p alone: ranks, the exact distribution, doubling."""
    ranks = midranks(np.concatenate([a, b]))
    distribution = rank_sum_distribution(np.rint(2 * ranks), a.size)
    twice_u = int(round(2 * ranks[: a.size].sum())) - a.size * (a.size + 1)
    return min(1.0, 2 * min(distribution.at_most(twice_u), distribution.at_least(twice_u)))


def peak_memory(function) -> int:
    """Peak bytes allocated by numpy and Python during one call (tracemalloc)."""
    tracemalloc.start()
    function()
    peak = tracemalloc.get_traced_memory()[1]
    tracemalloc.stop()
    return peak


def auto_table(rng: np.random.Generator) -> None:
    """Exact p where auto now counts exactly (goal 0.3 s each), each against the normal
    approximation's time in the same run: the exact count alone (ranks, distribution, p), and the
    whole compare_two without the shift by the exact and by the normal method."""
    n_large = 100_000
    cases = [
        ("3 + 10^5, B all above A (most extreme)", np.arange(3.0), 10.0 + rng.random(n_large)),
        ("3 + 10^5, continuous", rng.normal(10.0, 1.0, 3), rng.normal(10.0, 1.0, n_large)),
        ("10 + 10^4, continuous", rng.normal(10.0, 1.0, 10), rng.normal(10.3, 1.0, 10_000)),
        ("200 + 200 on a 3-value gauge", rng.integers(0, 3, 200).astype(float),
         np.minimum(rng.integers(0, 3, 200) + (rng.random(200) < 0.2), 2).astype(float)),
        ("150 + 250 on a 3-value gauge", rng.integers(0, 3, 150).astype(float), rng.integers(0, 3, 250).astype(float)),
    ]
    print(f"{'exact p where auto is exact':42} {'count s':>8} {'exact s':>8} {'normal s':>9} {'ratio':>6} {'auto':>6} "
          f"{'exact p':>10} {'normal p':>10}")
    for label, a, b in cases:
        count_time = best_time(lambda: exact_p_only(a, b), 3)
        exact_time = best_time(lambda: compare_two(a, b, method="exact", estimate_shift=False), 3)
        normal_time = best_time(lambda: compare_two(a, b, method="normal", estimate_shift=False), 3)
        exact = compare_two(a, b, method="exact", estimate_shift=False)
        auto = compare_two(a, b, estimate_shift=False)
        print(f"{label:42} {count_time:8.4f} {exact_time:8.4f} {normal_time:9.4f} {exact_time / normal_time:6.1f} {auto.method:>6} "
              f"{exact.p_value:10.3g} {exact.p_normal:10.3g}")
    extreme = compare_two(np.arange(3.0), 10.0 + np.arange(n_large, dtype=float), estimate_shift=False)
    print(f"most extreme split of 3 + 10^5: exact p {extreme.p_value:.6g}, 2 / C(100003, 3) = "
          f"{2 / math.comb(n_large + 3, 3):.6g}")
    print()


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="skip the 10^6 + 10^6 cases")
    parser.add_argument("--auto", action="store_true", help="only the table of shapes auto now counts exactly")
    arguments = parser.parse_args()
    quick = arguments.quick
    rng = np.random.default_rng(2026)
    auto_table(rng)
    if arguments.auto:
        return
    rows = []

    # 1. Exact tie-aware p, 12 + 12 tied readings, against scipy's exact permutation test.
    a, b = gauge_readings(rng, 12, 0.0, 0), gauge_readings(rng, 12, 0.8, 0)

    def rank_sum_a(x, y, axis):
        """A's rank sum for a whole batch of splits at once (scipy's vectorized form, its fastest)."""
        return scipy.stats.rankdata(np.concatenate([x, y], axis=axis), axis=axis)[..., : x.shape[axis]].sum(axis=axis)

    def reference():
        return scipy.stats.permutation_test((a, b), rank_sum_a, permutation_type="independent", vectorized=True,
                                            n_resamples=np.inf, alternative="two-sided").pvalue

    reference_time = best_time(reference, 1)
    reference_p = reference()
    ours = best_time(lambda: exact_p_only(a, b), 20)
    rows.append(("exact p, 12+12 tied (p only)", ours, "scipy permutation_test exact", reference_time,
                 abs(exact_p_only(a, b) - reference_p)))
    whole = best_time(lambda: compare_two(a, b, method="exact"), 10)
    rows.append(("compare_two exact, 12+12 tied (all fields)", whole, "scipy permutation_test exact", reference_time,
                 abs(compare_two(a, b, method="exact").p_value - reference_p)))

    # 2. Exact tie-aware p at gauge resolution, 50 + 50 and 100 + 100 (targets 20 ms and 250 ms).
    for n, target in ((50, 0.020), (100, 0.250), (150, None)):
        a, b = gauge_readings(rng, n, 0.0, 1), gauge_readings(rng, n, 0.3, 1)
        ours = best_time(lambda: exact_p_only(a, b), 3)
        rows.append((f"exact p, {n}+{n} at 0.1 resolution", ours, "target" if target else "-", target, None))
    a, b = gauge_readings(rng, 100, 0.0, 1), gauge_readings(rng, 100, 0.3, 1)
    rows.append(("compare_two auto, 100+100 (all fields)", best_time(lambda: compare_two(a, b), 3), "-", None, None))

    # 3. Screening: normal method without the shift, against scipy's asymptotic Mann-Whitney.
    # 4. The whole comparison with shift and interval.
    sizes = (10**5,) if quick else (10**5, 10**6)
    for n in sizes:
        for decimals, label in ((2, "gauge 0.01"), (None, "continuous")):
            a = rng.normal(10.0, 1.0, n)
            b = rng.normal(10.01, 1.0, n)
            if decimals is not None:
                a, b = np.round(a, decimals), np.round(b, decimals)
            repeats = 3 if n <= 10**5 else 2
            reference_time = best_time(lambda: scipy.stats.mannwhitneyu(b, a, method="asymptotic"), repeats)
            reference_p = scipy.stats.mannwhitneyu(b, a, method="asymptotic").pvalue
            screen = best_time(lambda: compare_two(a, b, method="normal", estimate_shift=False), repeats)
            p = compare_two(a, b, method="normal", estimate_shift=False).p_value
            rows.append((f"normal, no shift, {n:.0e}+{n:.0e} {label}", screen, "scipy mannwhitneyu asymptotic",
                         reference_time, abs(p - reference_p)))
            per_reading = best_time(lambda: [FrozenFloats(x) for x in (a, b, a, b)], repeats)
            rows.append(("  of which the result's four per-reading runs", per_reading, "scipy mannwhitneyu asymptotic",
                         reference_time, None))
            whole = best_time(lambda: compare_two(a, b, method="normal"), 1)
            rows.append((f"whole with shift+CI, {n:.0e}+{n:.0e} {label}", whole,
                         "target" if n == 10**5 else "scipy mannwhitneyu asymptotic",
                         1.0 if n == 10**5 else reference_time, None))
        if n == 10**5:
            peak = peak_memory(lambda: compare_two(a, b, method="normal"))
            rows.append((f"peak memory, whole, {n:.0e}+{n:.0e}: {peak / 2**20:.0f} MiB = {peak / (2 * n):.0f} bytes/reading",
                         None, "-", None, None))

    print(f"{'case':58} {'ours s':>9} {'reference':>30} {'ref s':>9} {'ours/ref':>9} {'|dp|':>9}")
    for case, ours, reference, reference_time, dp in rows:
        ours_text = "" if ours is None else f"{ours:9.4f}"
        ref_text = "" if reference_time is None else f"{reference_time:9.4f}"
        ratio = "" if ours is None or reference_time is None else f"{ours / reference_time:9.2g}"
        dp_text = "" if dp is None else f"{dp:9.1e}"
        print(f"{case:58} {ours_text:>9} {reference:>30} {ref_text:>9} {ratio:>9} {dp_text:>9}")


if __name__ == "__main__":
    main()
