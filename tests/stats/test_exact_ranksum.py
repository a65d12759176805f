"""The exact conditional distribution of U given the ties, against enumeration and published tables."""

import itertools
from collections import Counter
from fractions import Fraction

import numpy as np
import pytest
import scipy.stats

from rankwise.stats.exact_ranksum import no_ties_distribution, rank_sum_distribution
from rankwise.stats.progress import Cancelled, Monitor


def _enumerated(doubled_ranks, n_a):
    """Brute-force enumeration: every choice of n_a readings for A, each with chance 1 / C(N, n_a)."""
    counts = Counter()
    for chosen in itertools.combinations(range(len(doubled_ranks)), n_a):
        counts[int(sum(doubled_ranks[i] for i in chosen)) - n_a * (n_a + 1)] += 1
    total = sum(counts.values())
    support = sorted(counts)
    return np.array(support), np.array([counts[s] / total for s in support])


TIE_HEAVY = [1, 1, 2, 2, 2, 3, 4, 4, 5, 5, 5, 5, 6]


@pytest.mark.parametrize("n_a", [1, 4, 6, 9, 12])
def test_tie_heavy_distribution_equals_brute_force_enumeration(n_a):
    """Brute-force enumeration over all C(13, n_a) splits of tie-heavy readings (both tracked sides)."""
    doubled = (2 * scipy.stats.rankdata(TIE_HEAVY)).astype(int)
    support, probabilities = _enumerated(doubled, n_a)
    distribution = rank_sum_distribution(doubled, n_a)
    np.testing.assert_array_equal(distribution.twice_u, support)
    np.testing.assert_allclose(distribution.probabilities, probabilities, rtol=1e-12, atol=0)


def test_mann_whitney_1947_table_for_four_and_four():
    """Mann & Whitney (1947), Ann. Math. Statist. 18, 50-60, table of P(U <= u), n = m = 4, u = 0..8."""
    published = [0.014, 0.029, 0.057, 0.100, 0.171, 0.243, 0.343, 0.443, 0.557]
    distribution = no_ties_distribution(4, 4)
    cumulative = [distribution.at_most(2 * u) for u in range(9)]
    np.testing.assert_allclose(cumulative, published, atol=5e-4)


def test_no_ties_counts_equal_exact_fractions_by_enumeration():
    """Brute-force enumeration with exact fractions, 5 + 7 readings without ties."""
    distribution = no_ties_distribution(5, 7)
    counts = Counter(sum(c) - 15 for c in itertools.combinations(range(1, 13), 5))
    for twice_u, p in zip(distribution.twice_u, distribution.probabilities):
        assert p == pytest.approx(float(Fraction(counts[twice_u // 2], 792)), rel=1e-13)


def test_mean_and_tie_corrected_variance_of_the_exact_distribution():
    """E U = n_a n_b / 2 and var U = n_a n_b / 12 ((N+1) - sum(t^3 - t) / (N(N-1))) under the
    permutation null with ties (Lehmann 1975, Nonparametrics, sec. 1.4; from memory), 37 + 61 readings."""
    readings = np.round(np.random.default_rng(11).normal(20, 2, 98))
    n_a, n_b = 37, 61
    doubled = (2 * scipy.stats.rankdata(readings)).astype(int)
    distribution = rank_sum_distribution(doubled, n_a)
    u = distribution.twice_u / 2
    mean = float(np.sum(u * distribution.probabilities))
    variance = float(np.sum((u - mean) ** 2 * distribution.probabilities))
    _, t = np.unique(readings, return_counts=True)
    expected = n_a * n_b / 12 * (99 - np.sum(t**3 - t) / (98 * 97))
    assert mean == pytest.approx(n_a * n_b / 2, rel=1e-12)
    assert variance == pytest.approx(expected, rel=1e-10)


def test_large_sizes_stay_finite_and_normalised():
    """C(300, 150) is about 1e89 (and C(N, n) passes 1e308 beyond N of about 1030): probabilities
    are carried, not counts. Mean U = n_a n_b / 2 (common practice, no source)."""
    distribution = no_ties_distribution(150, 150)
    assert np.all(np.isfinite(distribution.probabilities))
    assert distribution.probabilities.sum() == pytest.approx(1.0, abs=1e-12)
    assert np.sum(distribution.twice_u / 2 * distribution.probabilities) == pytest.approx(150 * 150 / 2, rel=1e-12)


def test_progress_is_reported_up_to_one_and_a_stop_request_is_honoured():
    """The Monitor sees fractions rising to 1; a cancelled monitor stops the count."""
    seen = []
    no_ties_distribution(30, 30, Monitor(progress=seen.append))
    assert seen[-1] == 1.0 and seen == sorted(seen)
    with pytest.raises(Cancelled):
        no_ties_distribution(30, 30, Monitor(cancelled=lambda: True))


def test_wrong_arguments_are_refused_with_the_argument_named():
    with pytest.raises(ValueError, match="n_a"):
        rank_sum_distribution([2, 4, 6], 3)
    with pytest.raises(ValueError, match="whole numbers"):
        rank_sum_distribution([2.5, 4, 6], 1)
    with pytest.raises(ValueError, match="n_a and n_b"):
        no_ties_distribution(0, 3)


def test_an_exact_count_too_big_for_memory_is_refused_in_the_window_s_words(monkeypatch):
    """The refusal reaches the technician: it names the picker's choice ("by the normal
    approximation"), not an argument of the code."""
    import re

    import rankwise.stats.exact_ranksum as exact_ranksum
    from rankwise.stats import compare_two

    monkeypatch.setattr(exact_ranksum, "MAX_TABLE_CELLS", 10)
    with pytest.raises(ValueError, match="by the normal approximation") as refusal:
        compare_two([1.0, 2.0, 3.0, 4.0, 5.0, 6.0], [1.5, 2.5, 3.5, 4.5, 5.5, 6.5], method="exact")
    assert not re.search(r"method|=|'normal'", str(refusal.value))


def _random_tied_readings(rng, size):
    """Readings on a coarse grid, so that tie blocks of many sizes occur (test data, not readings of a part)."""
    return rng.integers(0, max(2, size // 2), size).astype(float)


@pytest.mark.parametrize("seed", range(6))
def test_reading_by_reading_and_block_counts_equal_brute_force_enumeration(seed):
    """Brute-force enumeration over all C(N, n) splits, N up to 14, for the count reading by
    reading and the count by tie blocks alike (each way, not only the one chosen as cheapest)."""
    from rankwise.stats.exact_ranksum import _block_sum_distribution, _tracked_sum_distribution
    from rankwise.stats.progress import SILENT

    rng = np.random.default_rng(seed)
    for size in range(2, 15):
        doubled = np.sort((2 * scipy.stats.rankdata(_random_tied_readings(rng, size))).astype(np.int64))
        for n_tracked in range(1, size // 2 + 1):
            support, probabilities = _enumerated(doubled, n_tracked)
            for count in (_tracked_sum_distribution, _block_sum_distribution):
                sums = count(doubled, n_tracked, SILENT)
                np.testing.assert_array_equal(sums.doubled_sums - n_tracked * (n_tracked + 1), support)
                np.testing.assert_allclose(sums.probabilities, probabilities, rtol=1e-12, atol=0)


def _samples_with_u(size_x, size_y, u):
    """Readings x and y without ties in which u of the pairs have x above y: y = 0, 2, 4, ... and
    each x just above as many y as still wanted (at most all of them)."""
    above, wanted = [], u
    for _ in range(size_x):
        above.append(min(size_y, wanted))
        wanted -= above[-1]
    x = 2.0 * np.array(above) - 1.0 + 1e-3 * np.arange(size_x)
    return x, 2.0 * np.arange(size_y)


@pytest.mark.parametrize("n_a, n_b", [(17, 23), (40, 40), (9, 70)])
def test_reading_by_reading_count_without_ties_matches_scipy_exact(n_a, n_b):
    """scipy.stats.mannwhitneyu(x, y, method="exact", alternative="less") gives P(U <= u) without
    ties; the count reading by reading (which widens its table as it goes) agrees at every u tried."""
    from rankwise.stats.exact_ranksum import _tracked_sum_distribution
    from rankwise.stats.progress import SILENT

    doubled = 2 * np.arange(1, n_a + n_b + 1, dtype=np.int64)
    n_tracked = min(n_a, n_b)
    sums = _tracked_sum_distribution(doubled, n_tracked, SILENT)
    u = (sums.doubled_sums - n_tracked * (n_tracked + 1)) // 2
    np.testing.assert_array_equal(u, np.arange(n_a * n_b + 1))
    cumulative = np.cumsum(sums.probabilities)
    for value in range(0, n_a * n_b + 1, max(1, n_a * n_b // 40)):
        x, y = _samples_with_u(n_tracked, n_a + n_b - n_tracked, value)
        assert scipy.stats.mannwhitneyu(x, y).statistic == value
        expected = scipy.stats.mannwhitneyu(x, y, method="exact", alternative="less").pvalue
        assert cumulative[value] == pytest.approx(expected, rel=1e-11)


def test_kept_working_tables_never_carry_an_earlier_count_into_the_next():
    """The thread keeps its working tables between counts; filled with garbage (as a stopped or
    larger earlier count may leave them), the next count still equals brute-force enumeration."""
    from rankwise.stats import exact_ranksum
    from rankwise.stats.progress import SILENT

    doubled = np.sort((2 * scipy.stats.rankdata(TIE_HEAVY)).astype(np.int64))
    exact_ranksum._tracked_sum_distribution(2 * np.arange(1, 41, dtype=np.int64), 20, SILENT)
    kept = exact_ranksum._WORKSPACE.tables
    assert kept is not None and kept[0].size > 5 * doubled.size
    for table in kept:
        table.fill(np.nan)
    for n_tracked in (3, 6):
        support, probabilities = _enumerated(doubled, n_tracked)
        sums = exact_ranksum._tracked_sum_distribution(doubled, n_tracked, SILENT)
        np.testing.assert_array_equal(sums.doubled_sums - n_tracked * (n_tracked + 1), support)
        np.testing.assert_allclose(sums.probabilities, probabilities, rtol=1e-12, atol=0)
    assert exact_ranksum._WORKSPACE.tables is kept
