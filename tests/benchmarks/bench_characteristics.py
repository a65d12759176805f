"""Speed of many characteristics compared at once, with references timed in the same run.

Run:  .venv/bin/python tests/benchmarks/bench_characteristics.py [--count 200]

200 characteristics x (50 + 50) gauge readings (invented: normal draws rounded to the gauge's
resolution, every fifth characteristic moved, existing only for timing). Prints one table: our
comparison (exact p given the ties, as "auto" chooses at 50 + 50, and with the normal
approximation), 200 separate ``compare_two`` calls, and scipy.stats.mannwhitneyu on each column
(p only, no shift, no interval, no shape check), with the ratio to the separate calls and the
target of 2 s.
"""

from __future__ import annotations

import argparse
import time

import numpy as np
import scipy.stats

from rankwise.stats import compare_characteristics, compare_two

TARGET_SECONDS = 2.0


def invented_columns(count: int, n: int, seed: int = 13) -> list[tuple[str, np.ndarray, np.ndarray]]:
    """Invented gauge readings: nominal 10 mm, spread 0.02 mm, 0.001 mm resolution."""
    rng = np.random.default_rng(seed)
    return [
        (f"characteristic {index + 1}",
         np.round(rng.normal(10.0, 0.02, n), 3),
         np.round(rng.normal(10.0 + (0.015 if index % 5 == 0 else 0.0), 0.02, n), 3))
        for index in range(count)
    ]


def timed(function) -> tuple[float, object]:
    start = time.perf_counter()
    value = function()
    return time.perf_counter() - start, value


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--count", type=int, default=200)
    parser.add_argument("--per-group", type=int, default=50)
    arguments = parser.parse_args()
    columns = invented_columns(arguments.count, arguments.per_group)
    compare_two(columns[0][1], columns[0][2])  # load scipy and numpy paths once

    separate, _ = timed(lambda: [compare_two(a, b) for _, a, b in columns])
    together, result = timed(lambda: compare_characteristics(columns))
    normal, _ = timed(lambda: compare_characteristics(columns, method="normal"))
    reference, scipy_p = timed(lambda: [scipy.stats.mannwhitneyu(b, a, method="asymptotic").pvalue for _, a, b in columns])
    ours_normal = [row.result.p_normal for row in result.rows]
    agreement = max(abs(p - q) for p, q in zip(ours_normal, scipy_p))

    print(f"{arguments.count} characteristics x ({arguments.per_group} + {arguments.per_group}) readings")
    print(f"{'case':58} {'seconds':>8} {'vs separate':>12} {'vs 2 s':>8}")
    for label, seconds in (
        ("compare_characteristics (auto: exact p given the ties)", together),
        ("compare_characteristics (method='normal')", normal),
        (f"{arguments.count} separate compare_two calls (auto)", separate),
        ("scipy.stats.mannwhitneyu (asymptotic, p only)", reference),
    ):
        print(f"{label:58} {seconds:8.3f} {seconds / separate:12.2f} {seconds / TARGET_SECONDS:8.2f}")
    print(f"largest |p_normal - scipy asymptotic p|: {agreement:.2e}; characteristics significant after Holm: "
          f"{result.n_significant}")


if __name__ == "__main__":
    main()
