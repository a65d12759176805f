"""The shift's confidence set agrees with the test: open and closed ends, one-sided bounds, same parts.

Every expected value comes from brute-force enumeration (every split of the readings into the
two groups, or every sign flip of the changes), computed here with scipy.stats.rankdata.
"""

import itertools
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import stats

from rankwise.stats import compare_paired, compare_two

SETTINGS = settings(max_examples=40, deadline=None)


def enumerated_p(a, b, alternative):
    """Exact p of A against B given the ties, by every split of the combined readings (brute force)."""
    combined = np.concatenate([a, b])
    ranks = stats.rankdata(combined)
    observed = ranks[: len(a)].sum()
    sums = np.array([ranks[list(c)].sum() for c in itertools.combinations(range(combined.size), len(a))])
    at_most, at_least = np.mean(sums <= observed + 1e-9), np.mean(sums >= observed - 1e-9)
    return {"b-greater": at_most, "b-less": at_least, "two-sided": min(1.0, 2 * min(at_most, at_least))}[alternative]


def enumerated_signed_p(d, zero_method, alternative):
    """Exact signed-rank p given ties and zeros, by every sign flip of the ranked changes (brute force)."""
    d = np.asarray(d, float)
    ranked = d != 0 if zero_method == "wilcox" else np.ones(d.size, bool)
    ranks = np.zeros(d.size)
    if ranked.any():
        ranks[ranked] = stats.rankdata(np.abs(d[ranked]))
    flip = ranks[d != 0]
    observed = ranks[d > 0].sum()
    sums = np.array([np.dot(flip, signs) for signs in itertools.product((0, 1), repeat=flip.size)])
    lower, upper = np.mean(sums <= observed + 1e-9), np.mean(sums >= observed - 1e-9)
    return {"b-greater": upper, "b-less": lower, "two-sided": min(1.0, 2 * min(lower, upper))}[alternative]


def candidate_shifts(points):
    """Every point where the test can change, a shift inside every gap between them, and one beyond each end."""
    points = np.unique(np.round(points, 9))
    gaps = (points[:-1] + points[1:]) / 2
    return np.sort(np.concatenate([points, gaps, [points[0] - 0.5, points[-1] + 0.5]]))


# --- two groups ------------------------------------------------------------------------------

def test_the_significant_tied_example_excludes_zero_with_an_open_end():
    """A = 1.0 1.1 1.1 1.2 1.2, B = 1.2 1.3 1.4 1.5: enumeration of all C(9, 5) = 126 splits gives
    two-sided p = 6/126 = 0.0476; the test rejects the shift 0 and accepts every shift in (0, 0.4]."""
    a, b = [1.0, 1.1, 1.1, 1.2, 1.2], [1.2, 1.3, 1.4, 1.5]
    result = compare_two(a, b)
    assert result.p_value == pytest.approx(enumerated_p(np.array(a) * 10, np.array(b) * 10, "two-sided"), abs=1e-12)
    assert result.p_value == pytest.approx(6 / 126, abs=1e-12)
    ci = result.shift_ci
    assert (ci.low, ci.high, ci.low_included, ci.high_included) == pytest.approx((0.0, 0.4, False, True))
    assert result.significant and not ci.contains(0.0)
    counts_a, counts_b = np.rint(np.array(a) * 10), np.rint(np.array(b) * 10)
    for shift in candidate_shifts(np.subtract.outer(counts_b, counts_a).ravel()):
        accepted = enumerated_p(counts_a, counts_b - shift, "two-sided") > 0.05
        assert accepted == ci.contains(shift / 10), shift


readings = st.lists(st.integers(min_value=0, max_value=6), min_size=2, max_size=6)


@SETTINGS
@given(readings, readings, st.sampled_from(["two-sided", "b-greater", "b-less"]), st.sampled_from([0.05, 0.10]))
def test_two_groups_the_reported_set_is_exactly_what_the_test_accepts(a, b, alternative, alpha):
    """Random tied gauge readings (whole steps): significant at alpha implies 0 outside the
    (1 - alpha) set, and at every difference, inside every gap and beyond the ends, a shift is in
    the reported set exactly when the enumerated exact test (same sidedness) accepts it."""
    result = compare_two(a, b, alternative=alternative, alpha=alpha, confidence=1 - alpha, method="exact")
    ci = result.shift_ci
    if result.significant:
        assert not ci.contains(0.0)
    if "test inversion" not in ci.method:
        return
    counts_a, counts_b = np.array(a, float), np.array(b, float)
    for shift in candidate_shifts(np.subtract.outer(counts_b, counts_a).ravel()):
        accepted = enumerated_p(counts_a, counts_b - shift, alternative) > alpha + 1e-12
        assert accepted == ci.contains(shift), (shift, ci)
    if alternative == "b-greater":
        assert ci.high == math.inf and not ci.high_included
    if alternative == "b-less":
        assert ci.low == -math.inf and not ci.low_included


def enumerated_critical_u(n_a, n_b, tail):
    """Largest c with P(U <= c) <= tail without ties, by enumerating every split of ranks 1..N."""
    n = n_a + n_b
    u = np.array([sum(c) - n_a * (n_a + 1) / 2 for c in itertools.combinations(range(1, n + 1), n_a)])
    qualifying = [c for c in range(n_a * n_b + 1) if np.mean(u <= c) <= tail + 1e-12]
    return max(qualifying) if qualifying else None


@pytest.mark.parametrize("n_a, n_b", [(6, 7), (8, 5), (9, 9)])
def test_one_sided_bounds_are_moses_order_statistics_without_ties(n_a, n_b):
    """Continuous (untied) readings: "B reads higher" gives the lower bound D_(C+1) of the sorted
    differences B - A with high = +inf, "B reads lower" the upper bound D_(mn - C) with low = -inf,
    C the one-sided critical U at 5 % from enumeration of every split (Moses 1953; Hollander &
    Wolfe 1999, section 4.3)."""
    rng = np.random.default_rng(n_a * 100 + n_b)
    a = np.round(rng.normal(10.0, 1.0, n_a), 4)
    b = np.round(rng.normal(10.8, 1.0, n_b), 4)
    differences = np.sort(np.subtract.outer(b, a).ravel())
    c = enumerated_critical_u(n_a, n_b, 0.05)
    higher = compare_two(a, b, alternative="b-greater").shift_ci
    lower = compare_two(a, b, alternative="b-less").shift_ci
    assert (higher.low, higher.high) == pytest.approx((differences[c], math.inf), abs=1e-9)
    assert (lower.low, lower.high) == pytest.approx((-math.inf, differences[differences.size - 1 - c]), abs=1e-9)
    assert higher.low_included and lower.high_included
    two_sided = compare_two(a, b).shift_ci
    assert two_sided.low <= higher.low and lower.high <= two_sided.high


# --- same parts ----------------------------------------------------------------------------

changes = st.lists(st.tuples(st.integers(0, 5), st.integers(0, 5)), min_size=3, max_size=9)


@SETTINGS
@given(changes, st.sampled_from(["wilcox", "pratt"]), st.sampled_from(["two-sided", "b-greater", "b-less"]),
       st.sampled_from([0.05, 0.10]))
def test_same_parts_the_reported_set_is_exactly_what_the_test_accepts(pairs, zero_method, alternative, alpha):
    """Random tied changes with zeros: significant at alpha implies 0 outside the (1 - alpha) set;
    at every Walsh average, inside every gap and beyond the ends, a shift is in the set exactly when
    the signed-rank test of d - shift (same zero convention, enumerated sign flips) accepts it."""
    before = [p[0] for p in pairs]
    after = [p[1] for p in pairs]
    result = compare_paired(before, after, alternative=alternative, alpha=alpha, confidence=1 - alpha,
                            method="exact", zero_method=zero_method)
    ci = result.shift_ci
    if result.significant:
        assert ci is not None and not ci.contains(0.0)
    if ci is None or "test inversion" not in ci.method:
        return
    d = np.array(after, float) - np.array(before, float)
    i, j = np.triu_indices(d.size)
    for shift in candidate_shifts((d[i] + d[j]) / 2):
        accepted = enumerated_signed_p(d - shift, zero_method, alternative) > alpha + 1e-12
        assert accepted == ci.contains(shift), (shift, ci)


def enumerated_critical_t(n, tail):
    """Largest t with P(W+ <= t) <= tail for ranks 1..n without ties, by every sign flip."""
    sums = np.array([np.dot(range(1, n + 1), s) for s in itertools.product((0, 1), repeat=n)])
    qualifying = [t for t in range(n * (n + 1) // 2 + 1) if np.mean(sums <= t) <= tail + 1e-12]
    return max(qualifying) if qualifying else None


@pytest.mark.parametrize("n", [8, 11, 13])
def test_one_sided_bounds_of_the_same_parts_are_walsh_order_statistics_without_ties(n):
    """Untied changes: "after reads higher" gives the lower bound W_(C+1) of the sorted Walsh
    averages, "after reads lower" the upper bound W_(M-C), C the one-sided critical T at 5 % from
    enumeration of every sign flip (Hollander & Wolfe 1999, section 3.2)."""
    rng = np.random.default_rng(n)
    before = np.round(rng.normal(20.0, 1.0, n), 4)
    after = np.round(before + rng.normal(0.6, 1.0, n), 4)
    d = after - before
    i, j = np.triu_indices(n)
    walsh = np.sort((d[i] + d[j]) / 2)
    c = enumerated_critical_t(n, 0.05)
    higher = compare_paired(before, after, alternative="b-greater").shift_ci
    lower = compare_paired(before, after, alternative="b-less").shift_ci
    assert (higher.low, higher.high) == pytest.approx((walsh[c], math.inf), abs=1e-9)
    assert (lower.low, lower.high) == pytest.approx((-math.inf, walsh[walsh.size - 1 - c]), abs=1e-9)


def test_one_zero_convention_for_test_and_interval_is_stated():
    """The interval of tied changes with zeros names the test's own zero convention."""
    before = [5, 5, 5, 6, 6, 7, 7, 8, 8, 9]
    after = [5, 6, 6, 7, 7, 8, 9, 9, 10, 9]
    wilcox = compare_paired(before, after).shift_ci
    pratt = compare_paired(before, after, zero_method="pratt").shift_ci
    assert "test inversion" in wilcox.method and "left out" in wilcox.method
    assert "Pratt" in pratt.method


def test_when_the_test_accepts_no_shift_at_all_the_interval_says_so():
    """320 + 320 readings on a two-step gauge (300 and 260 at the lower step): the exact test
    rejects every shift (at 0 p is about 2e-6, inside the gap about 7e-62, checked here by the
    hypergeometric tail of the count of A's readings at the upper step, scipy.stats.hypergeom,
    for the shift 0), so no single shift describes the change; the order statistics stay, and
    their method text says why."""
    a = [0.0] * 300 + [0.01] * 20
    b = [0.0] * 260 + [0.01] * 60
    result = compare_two(a, b)
    # With two values the rank-sum test is the two-sided Fisher-type test on A's upper-step count.
    lower_tail = stats.hypergeom.cdf(20, 640, 80, 320)
    assert result.p_value == pytest.approx(min(1.0, 2 * lower_tail), rel=1e-9)
    assert "accepts no single shift" in result.shift_ci.method
    assert "approximate" in result.shift_ci.method
