"""Properties that hold for any readings (hypothesis), each a fact of the rank-sum test."""

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from rankwise.stats import compare_two

# Gauge-like readings: one decimal, a narrow range, so ties are frequent.
readings = st.lists(st.integers(min_value=0, max_value=30).map(lambda k: k / 10), min_size=1, max_size=14)
SETTINGS = settings(max_examples=40, deadline=None)


@SETTINGS
@given(readings, readings)
def test_u_values_add_up_and_ranks_sum_to_the_triangle_number(a, b):
    """u_a + u_b = n_a n_b; ranks sum to N(N+1)/2 (Mann & Whitney 1947; common practice)."""
    result = compare_two(a, b, estimate_shift=False)
    n_total = result.n_a + result.n_b
    assert result.u_a + result.u_b == result.n_a * result.n_b
    assert result.rank_sum_a + result.rank_sum_b == n_total * (n_total + 1) / 2
    assert sum(result.ranks_a) + sum(result.ranks_b) == n_total * (n_total + 1) / 2
    assert result.u == min(result.u_a, result.u_b)


@SETTINGS
@given(readings, readings, st.sampled_from(["two-sided", "b-greater", "b-less"]), st.sampled_from(["exact", "normal"]))
def test_p_values_lie_in_zero_one_and_significance_follows_p(a, b, alternative, method):
    result = compare_two(a, b, alternative=alternative, method=method, estimate_shift=False)
    for p in (result.p_value, result.p_normal, result.p_exact, result.mid_p):
        assert 0.0 <= p <= 1.0
    assert result.significant == (result.p_value <= result.alpha + 1e-12)  # rounding of exact sums
    assert result.mid_p <= result.p_exact


@SETTINGS
@given(readings, readings)
def test_swapping_the_groups_swaps_the_one_sided_p_values_and_negates_the_shift(a, b):
    """Renaming A and B mirrors every directional figure (symmetry of the test, no source needed)."""
    forward_greater = compare_two(a, b, alternative="b-greater")
    backward_less = compare_two(b, a, alternative="b-less")
    assert np.isclose(forward_greater.p_value, backward_less.p_value, rtol=1e-12, atol=1e-15)
    assert np.isclose(compare_two(a, b, alternative="b-less").p_value,
                      compare_two(b, a, alternative="b-greater").p_value, rtol=1e-12, atol=1e-15)
    assert forward_greater.shift == -backward_less.shift
    assert forward_greater.shift_ci.low == -backward_less.shift_ci.high
    assert np.isclose(forward_greater.prob_b_greater, 1.0 - backward_less.prob_b_greater)
    assert np.isclose(forward_greater.z, -backward_less.z)


@SETTINGS
@given(readings, readings, st.sampled_from([0.01, 0.05, 0.10]), st.sampled_from(["two-sided", "b-greater", "b-less"]))
def test_the_exact_test_never_exceeds_its_level(a, b, alpha, alternative):
    """The true size of the exact test is at most alpha, and a two-sided p is at least the
    smaller one-sided p (doubling convention)."""
    result = compare_two(a, b, alpha=alpha, alternative=alternative, estimate_shift=False)
    assert result.attained_alpha <= alpha + 1e-12
    if alternative == "two-sided":
        one_sided = min(compare_two(a, b, alternative=side, estimate_shift=False).p_value for side in ("b-greater", "b-less"))
        assert np.isclose(result.p_value, min(1.0, 2 * one_sided), rtol=1e-12)


@SETTINGS
@given(readings, readings)
def test_the_shift_lies_inside_its_interval_and_the_null_distribution_is_whole(a, b):
    result = compare_two(a, b)
    assert result.shift_ci.low <= result.shift <= result.shift_ci.high
    assert np.isclose(sum(result.null_distribution.probabilities), 1.0, atol=1e-12)
    assert result.u_a in result.null_distribution.support
