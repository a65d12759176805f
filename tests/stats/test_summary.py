"""Group summaries and the quantiles of sorted readings, checked against numpy's own quantiles."""

import numpy as np

from rankwise.stats.summary import linear_quantile, sorted_median, summarize


def _seeded_groups():
    """Invented readings: gauge readings with ties, continuous draws of many magnitudes, whole
    numbers, and every size from 1 to 40 (odd and even, so each interpolation weight occurs)."""
    rng = np.random.default_rng(29)
    for n in range(1, 41):
        yield np.round(rng.normal(10.0, 0.02, n), 3)
        yield rng.normal(0.0, 10.0 ** rng.integers(-9, 10), n)
        yield rng.integers(-4, 5, n).astype(float)
        yield rng.integers(-1, 2, n) * 0.0  # +0.0 and -0.0 readings (equal; numpy orders them either way)


def test_quantiles_of_sorted_readings_are_numpys_floats():
    """numpy.percentile (default linear method) and numpy.median give the very same floats."""
    for values in _seeded_groups():
        ordered = np.sort(values)
        for fraction, percent in ((0.25, 25.0), (0.5, 50.0), (0.75, 75.0), (0.1, 10.0), (0.9, 90.0)):
            assert linear_quantile(ordered, fraction) == float(np.percentile(values, percent))
        assert sorted_median(ordered) == float(np.median(values))


def test_summary_holds_numpys_quartiles_and_extremes():
    """median, quartiles, minimum and maximum as numpy computes them from the readings."""
    for values in _seeded_groups():
        summary = summarize("A", values, 3)
        q1, median, q3 = np.percentile(values, [25.0, 50.0, 75.0])
        assert (summary.q1, summary.median, summary.q3) == (float(q1), float(median), float(q3))
        assert (summary.minimum, summary.maximum) == (float(values.min()), float(values.max()))
        assert (summary.n, summary.n_dropped) == (values.size, 3)


def test_quartiles_of_one_to_ten_worked_by_hand():
    """Hyndman & Fan (1996), definition 7, worked by hand on 1..10: position h = 9 p from the first
    reading, so Q1 = 3.25, the median 5.5 and Q3 = 7.75."""
    ordered = np.arange(1.0, 11.0)
    assert (linear_quantile(ordered, 0.25), sorted_median(ordered), linear_quantile(ordered, 0.75)) == (3.25, 5.5, 7.75)
