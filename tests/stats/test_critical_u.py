"""Critical values of U against a published table, scipy's exact distribution and enumeration."""

import itertools
from math import comb

import numpy as np
import pytest
import scipy.stats

from rankwise.stats import critical_u
from rankwise.stats import critical as critical_module
from rankwise.stats.critical import (
    critical_value,
    lower_tail_probabilities,
    smallest_equal_size,
    smallest_partner_size,
)
from rankwise.stats.exact_ranksum import no_ties_distribution

# Classic table of critical U (reject when U <= value), the cells transcribed in the project's list
# of outside checks; Milton (1964), JASA 59, 925-934, extends that table and agrees with exact
# enumeration in every cell checked. A dash in the table is None here.
TWO_TAILED_5_PERCENT = {
    (5, 5): 2, (6, 6): 5, (7, 7): 8, (8, 8): 13, (8, 10): 17, (9, 9): 17, (10, 10): 23,
    (12, 12): 37, (15, 15): 64, (20, 20): 127, (3, 3): None,
}


@pytest.mark.parametrize(("sizes", "published"), TWO_TAILED_5_PERCENT.items())
def test_two_tailed_five_percent_cells_of_the_classic_table(sizes, published):
    """Classic two-tailed 5 % table of critical U (see the note above for the source)."""
    assert critical_u(*sizes, alpha=0.05, alternative="two-sided") == published
    assert critical_u(*reversed(sizes), alpha=0.05, alternative="two-sided") == published


@pytest.mark.parametrize(
    ("sizes", "alpha", "alternative", "published"),
    [
        ((10, 10), 0.01, "two-sided", 16),  # classic two-tailed 1 % table
        ((20, 20), 0.01, "two-sided", 105),  # classic two-tailed 1 % table
        ((10, 10), 0.05, "b-greater", 27),  # classic one-tailed 5 % table (Milton 1964 range)
        ((20, 20), 0.05, "b-less", 138),  # classic one-tailed 5 % table (Milton 1964 range)
    ],
)
def test_other_levels_of_the_classic_tables(sizes, alpha, alternative, published):
    assert critical_u(*sizes, alpha=alpha, alternative=alternative) == published


def _scipy_lower_tail(n_a, n_b, u):
    """P(U <= u) from scipy.stats.mannwhitneyu(method="exact", alternative="less") on tie-free
    data arranged so that the first group's U is exactly u."""
    ranks_a = list(range(1, n_a + 1))
    extra = u
    for i in range(n_a - 1, -1, -1):  # raise the largest ranks of A first
        step = min(extra, n_b)
        ranks_a[i] += step
        extra -= step
    ranks_b = sorted(set(range(1, n_a + n_b + 1)) - set(ranks_a))
    assert sum(ranks_a) - n_a * (n_a + 1) // 2 == u
    return scipy.stats.mannwhitneyu(ranks_a, ranks_b, method="exact", alternative="less").pvalue


@pytest.mark.parametrize(
    ("sizes", "alpha"),
    # Cells misprinted in widely copied two-tailed tables: 5 %: (4, 20), (14, 17), (9, 10);
    # 1 %: (11, 20), (13, 19). The value here is checked with scipy's exact distribution instead.
    [((4, 20), 0.05), ((14, 17), 0.05), ((9, 10), 0.05), ((11, 20), 0.01), ((13, 19), 0.01)],
)
def test_cells_misprinted_in_widely_copied_tables_follow_the_exact_distribution(sizes, alpha):
    """Largest u with P(U <= u) <= alpha / 2 by scipy.stats.mannwhitneyu(method="exact")."""
    u = critical_u(*sizes, alpha=alpha)
    assert _scipy_lower_tail(*sizes, u) <= alpha / 2
    assert _scipy_lower_tail(*sizes, u + 1) > alpha / 2


def test_critical_values_by_brute_force_enumeration_for_small_sizes():
    """Brute-force enumeration of every split, sizes 1..7 by 1..7, both levels and one tail."""
    for n_a, n_b in itertools.product(range(1, 8), repeat=2):
        total = comb(n_a + n_b, n_a)
        u_values = sorted(sum(c) - n_a * (n_a + 1) // 2 for c in itertools.combinations(range(1, n_a + n_b + 1), n_a))
        for alpha, alternative, tail in ((0.05, "two-sided", 0.025), (0.10, "b-greater", 0.10), (0.01, "two-sided", 0.005)):
            qualifying = [u for u in set(u_values) if sum(v <= u for v in u_values) <= tail * total]
            expected = max(qualifying) if qualifying else None
            assert critical_u(n_a, n_b, alpha, alternative) == expected, (n_a, n_b, alpha)


def test_a_tail_exactly_at_the_level_qualifies():
    """(4, 4) one-tailed 10 %: P(U <= 3) = 7/70 is exactly the level, so 3 qualifies (enumeration)."""
    assert critical_u(4, 4, 0.10, "b-less") == 3


def test_attained_alpha_is_the_true_size_at_the_critical_value():
    """(8, 10) at 5 % two-tailed: 2 P(U <= 17) by scipy.stats.mannwhitneyu(method="exact")."""
    found = critical_value(8, 10, 0.05, "two-sided")
    assert found.exact
    assert found.attained_alpha == pytest.approx(2 * _scipy_lower_tail(8, 10, 17), rel=1e-10)
    assert found.attained_alpha <= 0.05


def test_truncated_tail_series_equals_the_full_dynamic_program():
    """Two independent counts agree: the Gaussian-binomial series and the rank-by-rank program."""
    for n_a, n_b in ((7, 13), (30, 45), (60, 60)):
        series = lower_tail_probabilities(n_a, n_b, n_a * n_b // 2)
        full = no_ties_distribution(n_a, n_b).probabilities[: n_a * n_b // 2 + 1]
        np.testing.assert_allclose(series, full, rtol=1e-11, atol=0)


def test_large_sizes_beyond_any_printed_table_match_scipy():
    """(60, 80) at 5 % two-tailed: scipy.stats.mannwhitneyu(method="exact") brackets the value."""
    u = critical_u(60, 80)
    assert _scipy_lower_tail(60, 80, u) <= 0.025 < _scipy_lower_tail(60, 80, u + 1)


@pytest.mark.parametrize("sizes", [(150, 200), (300, 300), (400, 100), (500, 500)])
def test_edgeworth_fallback_agrees_with_the_exact_count(monkeypatch, sizes):
    """Beyond the exact budget the Edgeworth value is used; here it equals the exact count."""
    exact = critical_value(*sizes, 0.05, "two-sided")
    monkeypatch.setattr(critical_module, "EXACT_WORK_LIMIT", 0)
    approximate = critical_value(*sizes, 0.05, "two-sided")
    assert exact.exact and not approximate.exact
    assert approximate.u == exact.u


def test_huge_sizes_answer_quickly_from_the_expansion():
    """10^6 + 10^6 readings: near n_a n_b / 2 - 0.5 - z sd, z = scipy.stats.norm.isf(0.025); the
    Edgeworth term moves it by about 50 of sd = 4e8 (common practice, no source)."""
    found = critical_value(10**6, 10**6)
    sd = np.sqrt(1e12 * (2e6 + 1) / 12)
    assert not found.exact
    assert abs(found.u - (5e11 - 0.5 - scipy.stats.norm.isf(0.025) * sd)) < 100


def test_smallest_sizes_that_can_reach_significance():
    """1 / C(8, 4) = 0.0143 <= 0.025 but 1 / C(6, 3) = 0.05 > 0.025 (enumeration of the extreme split)."""
    assert smallest_equal_size(0.05, "two-sided") == 4
    assert smallest_equal_size(0.01, "two-sided") == 5  # 1/C(10,5) = 0.004 <= 0.005; 1/C(8,4) > 0.005
    assert smallest_partner_size(3, 0.05, "two-sided") == 5  # 1/C(8,3) = 0.018; 1/C(7,3) = 0.029
    assert critical_u(3, 4) is None and critical_u(3, 5) == 0


def test_wrong_arguments_are_refused():
    with pytest.raises(ValueError, match="alternative"):
        critical_u(5, 5, 0.05, "greater")
    with pytest.raises(ValueError, match="alpha"):
        critical_u(5, 5, 1.5)
    with pytest.raises(ValueError, match="n_a and n_b"):
        critical_u(0, 5)
