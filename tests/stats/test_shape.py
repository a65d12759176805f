"""The same-shape check and its companion tests, checked against scipy and published values."""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import stats

from rankwise.stats.shape import brunner_munzel, check_shape, mood_median

# Pain scores, Lumley (1996); used by Brunner & Munzel (2000) and Neubert & Brunner (2007).
PAIN_A = [1, 2, 1, 1, 1, 1, 1, 1, 1, 1, 2, 4, 1, 1]
PAIN_B = [3, 3, 4, 3, 1, 2, 3, 1, 1, 5, 4]


def test_brunner_munzel_matches_the_published_pain_score_example():
    """Neubert & Brunner (2007) form: statistic 3.1375, df 17.683, p = 0.005786 (checks.md)."""
    result = brunner_munzel(np.array(PAIN_A, float), np.array(PAIN_B, float), "two-sided")
    assert result.statistic == pytest.approx(3.1375, abs=5e-5)
    assert result.df == pytest.approx(17.683, abs=5e-4)
    assert result.p_value == pytest.approx(0.005786, abs=5e-7)


@pytest.mark.parametrize("ours, scipy_alternative", [
    ("two-sided", "two-sided"), ("b-greater", "less"), ("b-less", "greater"),
])
def test_brunner_munzel_agrees_with_scipy_for_each_direction(ours, scipy_alternative):
    """scipy.stats.brunnermunzel(a, b, alternative=...): its 'less' means the first group (A)
    tends to read lower, i.e. B tends to read higher."""
    rng = np.random.default_rng(7)
    a = np.round(rng.gamma(2.0, 1.0, 17), 1)
    b = np.round(rng.gamma(2.0, 1.6, 12) + 0.4, 1)
    result = brunner_munzel(a, b, ours)
    reference = stats.brunnermunzel(a, b, alternative=scipy_alternative)
    assert result.statistic == pytest.approx(reference.statistic, abs=1e-9)
    assert result.p_value == pytest.approx(reference.pvalue, abs=1e-9)


def test_brunner_munzel_is_not_defined_when_every_reading_is_equal():
    """All readings equal: the rank variance is zero, so the test has no result."""
    assert brunner_munzel(np.full(6, 2.5), np.full(5, 2.5), "two-sided") is None
    assert brunner_munzel(np.array([1.0]), np.array([1.0, 2.0]), "two-sided") is None


def test_brunner_munzel_rejects_an_unknown_direction():
    with pytest.raises(ValueError, match="alternative"):
        brunner_munzel(np.arange(5.0), np.arange(5.0), "greater")


@pytest.mark.parametrize("sizes", [(9, 12), (10, 10), (7, 8, 11)])
def test_mood_median_agrees_with_scipy_median_test(sizes):
    """scipy.stats.median_test(*groups) with its defaults ties="below", correction=True."""
    rng = np.random.default_rng(sum(sizes))
    groups = [np.round(rng.normal(10 + i * 0.3, 1.0, n), 1) for i, n in enumerate(sizes)]
    result = mood_median(groups)
    statistic, p, grand_median, table = stats.median_test(*groups)
    assert result.statistic == pytest.approx(statistic, abs=1e-9)
    assert result.p_value == pytest.approx(p, abs=1e-9)
    assert result.grand_median == pytest.approx(grand_median, abs=1e-12)
    assert result.table == tuple(tuple(int(v) for v in row) for row in table)


def test_mood_median_counts_a_reading_on_the_grand_median_as_not_above():
    """ties="below" in scipy.stats.median_test: the grand median here is 0.3, held by two readings."""
    result = mood_median([np.array([0.1, 0.3, 0.5]), np.array([0.2, 0.3, 0.4, 0.6])])
    statistic, p, grand_median, table = stats.median_test([0.1, 0.3, 0.5], [0.2, 0.3, 0.4, 0.6])
    assert result.grand_median == pytest.approx(0.3)
    assert result.table == ((1, 2), (2, 2)) == tuple(tuple(int(v) for v in r) for r in table)
    assert result.p_value == pytest.approx(p, abs=1e-12)


def test_mood_median_has_no_result_when_nothing_lies_above_the_grand_median():
    assert mood_median([np.full(4, 1.0), np.full(3, 1.0)]) is None


def test_shape_check_needs_five_readings_per_group():
    assert check_shape(np.arange(4.0), np.arange(9.0)) is None


def test_dispersion_check_agrees_with_scipy_fligner_on_gauge_readings():
    """scipy.stats.fligner(a, b, center="median"), tied readings at 0.01 resolution.

    scipy is given the readings in whole hundredths: on the raw floats, deviations such as
    |1.23 - 1.20| and |1.17 - 1.20| differ in the last bits and scipy would split their tie.
    """
    rng = np.random.default_rng(3)
    a = np.round(rng.normal(1.20, 0.05, 14), 2)
    b = np.round(rng.normal(1.31, 0.11, 16), 2)
    result = check_shape(a, b)
    reference = stats.fligner(np.rint(a * 100), np.rint(b * 100), center="median")
    assert result.dispersion_p == pytest.approx(reference.pvalue, abs=1e-9)


def test_shape_check_agrees_with_scipy_exact_ks_on_median_aligned_readings():
    """scipy.stats.ks_2samp(a - median(a), b - median(b), method="exact"), no ties."""
    rng = np.random.default_rng(11)
    a = rng.normal(0.0, 1.0, 13)
    b = rng.exponential(1.0, 17)
    result = check_shape(a, b)
    reference = stats.ks_2samp(a - np.median(a), b - np.median(b), method="exact")
    assert result.shape_p == pytest.approx(reference.pvalue, abs=1e-9)


def test_shape_check_agrees_with_scipy_on_large_groups():
    """Beyond 10 000 lattice points: scipy.stats.ks_2samp(method="asymp"), two-sided (Smirnov's
    approximation by the one-sample Kolmogorov distribution at the effective size)."""
    rng = np.random.default_rng(12)
    a = rng.normal(0.0, 1.0, 120)
    b = rng.normal(0.0, 1.3, 110)
    result = check_shape(a, b)
    reference = stats.ks_2samp(a - np.median(a), b - np.median(b), method="asymp")
    assert result.shape_p == pytest.approx(reference.pvalue, rel=1e-6, abs=1e-9)


def test_shape_check_flags_a_wider_group_and_passes_a_pure_shift():
    """A spread three times wider is clearly flagged; a pure shift of the same readings is not."""
    rng = np.random.default_rng(5)
    base = np.round(rng.normal(5.0, 0.2, 40), 2)
    wider = np.round(5.0 + 3.0 * (rng.normal(5.0, 0.2, 40) - 5.0), 2)
    flagged = check_shape(base, wider)
    assert flagged.differ and flagged.dispersion_p < 0.01
    assert flagged.spread_ratio > 2.0
    shifted = check_shape(base, base + 0.5)
    assert not shifted.differ
    assert shifted.shape_p == 1.0 and shifted.spread_ratio == pytest.approx(1.0)


@settings(max_examples=40, deadline=None)
@given(st.lists(st.integers(0, 6), min_size=2, max_size=12), st.lists(st.integers(0, 6), min_size=2, max_size=12))
def test_brunner_munzel_p_is_a_probability_and_swapping_groups_swaps_directions(a, b):
    a, b = np.array(a, float), np.array(b, float)
    forward = brunner_munzel(a, b, "b-greater")
    backward = brunner_munzel(b, a, "b-less")
    if forward is None:
        assert backward is None
        return
    assert 0.0 <= forward.p_value <= 1.0
    assert forward.p_value == pytest.approx(backward.p_value, abs=1e-12)
    assert forward.statistic == pytest.approx(-backward.statistic, abs=1e-12)


@settings(max_examples=40, deadline=None)
@given(st.lists(st.lists(st.integers(0, 9), min_size=1, max_size=9), min_size=2, max_size=4))
def test_mood_median_matches_scipy_on_any_small_integer_groups(raw_groups):
    """scipy.stats.median_test(*groups) (defaults), whenever its table has no empty row."""
    groups = [np.array(g, float) for g in raw_groups]
    result = mood_median(groups)
    if result is None:
        with pytest.raises(ValueError):
            stats.median_test(*groups)
        return
    statistic, p, grand_median, _ = stats.median_test(*groups)
    assert result.p_value == pytest.approx(p, abs=1e-9)
    assert result.grand_median == grand_median


@settings(max_examples=40, deadline=None)
@given(st.lists(st.integers(0, 9), min_size=5, max_size=12), st.lists(st.integers(0, 9), min_size=5, max_size=12))
def test_dispersion_check_matches_scipy_fligner_on_any_integer_groups(a, b):
    """scipy.stats.fligner(a, b, center="median") on whole numbers (no floating-point noise)."""
    a, b = np.array(a, float), np.array(b, float)
    result = check_shape(a, b)
    with np.errstate(all="ignore"):
        reference = stats.fligner(a, b, center="median").pvalue
    if np.isnan(reference):  # every distance from the median equal: no information about spread
        assert result.dispersion_p == 1.0
    else:
        assert result.dispersion_p == pytest.approx(reference, abs=1e-9)
