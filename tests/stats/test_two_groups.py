"""compare_two against published examples, scipy and brute-force enumeration."""

import itertools
from fractions import Fraction

import numpy as np
import pytest
import scipy.stats

from rankwise.stats import Cancelled, Monitor, compare_two, critical_u
from rankwise.stats.two_groups import AUTO_EXACT_READINGS

TIE_HEAVY_A = [2.1, 2.3, 2.3, 2.2, 2.1, 2.4, 2.3]
TIE_HEAVY_B = [2.3, 2.4, 2.4, 2.2, 2.5, 2.4]


# --- published worked examples -------------------------------------------------------------

def test_hollander_wolfe_example_4_1():
    """Hollander & Wolfe (1999), 2nd ed., Example 4.1, p. 110: U_weeks = 15, exact two-sided
    p = 0.2544, Hodges-Lehmann (weeks - term) = -0.305, exact 95 % CI (-0.76, 0.15)."""
    term = [0.80, 0.83, 1.89, 1.04, 1.45, 1.38, 1.91, 1.64, 0.73, 1.46]
    weeks = [1.15, 0.88, 0.90, 0.74, 1.21]
    result = compare_two(term, weeks, name_a="term", name_b="weeks")
    assert result.u_b == 15 and result.method == "exact"
    assert result.p_value == pytest.approx(0.2544, abs=5e-5)
    assert result.shift == pytest.approx(-0.305, abs=1e-12)
    assert tuple(result.shift_ci) == pytest.approx((-0.76, 0.15), abs=1e-12)


def test_hollander_wolfe_example_4_2():
    """Hollander & Wolfe (1999), Example 4.2, p. 112: exact two-sided p = 0.00186, shift
    (control - treated) = 410, 95 % CI [168, 690]."""
    control = [1042, 1617, 1180, 973, 1552, 1251, 1151, 728, 1079, 951, 1319]
    treated = [874, 389, 612, 798, 1152, 893, 541, 741, 1064, 862, 213]
    result = compare_two(treated, control)
    assert result.p_value == pytest.approx(0.00186, abs=5e-6)
    assert result.shift == 410
    assert tuple(result.shift_ci) == (168.0, 690.0)


def test_shier_2004():
    """Shier (2004), "The Mann-Whitney U test", Mathematics Learning Support Centre: U = 17 and 3,
    exact two-sided p = 14/126 = 0.111."""
    result = compare_two([19, 22, 16, 29, 24], [20, 11, 17, 12])
    assert (result.u_a, result.u_b, result.u) == (17, 3, 3)
    assert result.p_value == pytest.approx(14 / 126, rel=1e-12)


def test_bergmann_ludbrook_spooren_2000_rotarod_ties():
    """Bergmann, Ludbrook & Spooren (2000), Am. Statist. 54, 72-77, rotarod data (heavy ties):
    exact conditional p one-sided 3/161 = 0.0186, two-sided 6/161 = 0.0373."""
    control = [300] * 12
    treated = [22, 300, 75, 271, 300, 18, 300, 300, 163, 300, 300, 300]
    assert compare_two(control, treated).p_value == pytest.approx(6 / 161, rel=1e-12)
    assert compare_two(control, treated, alternative="b-less").p_value == pytest.approx(3 / 161, rel=1e-12)
    assert compare_two(control, treated, alternative="b-greater").p_value == pytest.approx(1.0, rel=1e-12)


# --- scipy as the reference library --------------------------------------------------------

@pytest.mark.parametrize("alternative, scipy_alternative", [("two-sided", "two-sided"), ("b-greater", "greater"), ("b-less", "less")])
@pytest.mark.parametrize("sizes, decimals", [((7, 9), 1), ((30, 41), 1), ((120, 95), 0), ((300, 280), 2)])
def test_normal_approximation_matches_scipy(alternative, scipy_alternative, sizes, decimals):
    """scipy.stats.mannwhitneyu(b, a, method="asymptotic", use_continuity=True): U of B and p to 1e-9."""
    rng = np.random.default_rng(sizes[0])
    a = np.round(rng.normal(10, 1, sizes[0]), decimals)
    b = np.round(rng.normal(10.3, 1.2, sizes[1]), decimals)
    result = compare_two(a, b, alternative=alternative, method="normal", estimate_shift=False)
    reference = scipy.stats.mannwhitneyu(b, a, alternative=scipy_alternative, method="asymptotic", use_continuity=True)
    assert result.method == "normal"
    assert result.u_b == reference.statistic
    assert result.p_value == pytest.approx(reference.pvalue, abs=1e-9)
    assert result.p_normal == pytest.approx(reference.pvalue, abs=1e-9)


@pytest.mark.parametrize("alternative, scipy_alternative", [("two-sided", "two-sided"), ("b-greater", "greater"), ("b-less", "less")])
def test_exact_p_without_ties_matches_scipy(alternative, scipy_alternative):
    """scipy.stats.mannwhitneyu(b, a, method="exact") on tie-free data."""
    rng = np.random.default_rng(3)
    for n_a, n_b in ((4, 6), (11, 9), (25, 30)):
        a = rng.permutation(200)[:n_a] / 10
        b = rng.permutation(200)[:n_b] / 10 + 0.05  # off the tenths of A: no ties
        result = compare_two(a, b, alternative=alternative, method="exact")
        reference = scipy.stats.mannwhitneyu(b, a, alternative=scipy_alternative, method="exact")
        assert result.p_value == pytest.approx(reference.pvalue, rel=1e-12, abs=1e-15)


@pytest.mark.parametrize("alternative, scipy_alternative", [("two-sided", "two-sided"), ("b-greater", "greater"), ("b-less", "less")])
def test_exact_p_with_ties_matches_scipy_permutation_test(alternative, scipy_alternative):
    """scipy.stats.permutation_test(permutation_type="independent", n_resamples=np.inf), statistic
    the rank sum of B; scipy doubles the smaller one-sided p for two-sided, as we do."""
    def rank_sum_of_b(b, a):
        return scipy.stats.rankdata(np.concatenate([b, a]))[: len(b)].sum()

    reference = scipy.stats.permutation_test(
        (TIE_HEAVY_B, TIE_HEAVY_A), rank_sum_of_b, permutation_type="independent",
        alternative=scipy_alternative, n_resamples=np.inf,
    )
    result = compare_two(TIE_HEAVY_A, TIE_HEAVY_B, alternative=alternative)
    assert result.method == "exact"
    assert result.p_value == pytest.approx(reference.pvalue, abs=1e-12)


# --- brute-force enumeration ---------------------------------------------------------------

def _enumerate(a, b):
    """Brute-force enumeration: U of A for every way of choosing len(a) readings as A."""
    readings = np.concatenate([a, b])
    ranks = scipy.stats.rankdata(readings)
    n_a = len(a)
    return [Fraction(int(round(2 * sum(ranks[list(c)]))), 2) - Fraction(n_a * (n_a + 1), 2)
            for c in itertools.combinations(range(len(readings)), n_a)]


@pytest.mark.parametrize("alternative", ["two-sided", "b-greater", "b-less"])
def test_p_mid_p_and_size_by_brute_force_enumeration(alternative):
    """Brute-force enumeration of all C(13, 7) splits of the tie-heavy readings: p (doubling), mid-p,
    and the true size of the test at 10 % (share of splits whose p is at most 0.10)."""
    all_u = _enumerate(TIE_HEAVY_A, TIE_HEAVY_B)
    total = len(all_u)
    tally = {u: all_u.count(u) for u in set(all_u)}

    def p_and_mid(u):
        low = sum(k for v, k in tally.items() if v <= u) / total
        high = sum(k for v, k in tally.items() if v >= u) / total
        equal = tally.get(u, 0) / total
        if alternative == "b-greater":  # B higher means U of A small
            return low, low - equal / 2
        if alternative == "b-less":
            return high, high - equal / 2
        return min(1.0, 2 * min(low, high)), min(1.0, 2 * min(low - equal / 2, high - equal / 2))

    result = compare_two(TIE_HEAVY_A, TIE_HEAVY_B, alternative=alternative, alpha=0.10)
    p, mid = p_and_mid(Fraction(result.u_a))
    assert result.p_value == pytest.approx(p, abs=1e-12)
    assert result.mid_p == pytest.approx(mid, abs=1e-12)
    size = sum(k for u, k in tally.items() if p_and_mid(u)[0] <= 0.10) / total
    assert result.attained_alpha == pytest.approx(size, abs=1e-12)
    assert result.attained_alpha <= 0.10


def test_null_distribution_by_brute_force_enumeration():
    """The chart's distribution of U of A equals the enumerated one."""
    all_u = _enumerate(TIE_HEAVY_A, TIE_HEAVY_B)
    support = sorted(set(all_u))
    result = compare_two(TIE_HEAVY_A, TIE_HEAVY_B)
    null = result.null_distribution
    assert null.exact and null.statistic == "U of A" and null.observed == result.u_a
    assert list(null.support) == [float(u) for u in support]
    np.testing.assert_allclose(null.probabilities, [all_u.count(u) / len(all_u) for u in support], atol=1e-14)


def test_effect_sizes_by_counting_all_pairs():
    """Brute force over all pairs: P(B > A) + P(B = A) / 2; rank-biserial = favourable minus
    unfavourable share of pairs (Kerby 2014, Comprehensive Psychology 3)."""
    a, b = np.array(TIE_HEAVY_A), np.array(TIE_HEAVY_B)
    greater = np.sum(b[None, :] > a[:, None]) / (a.size * b.size)
    less = np.sum(b[None, :] < a[:, None]) / (a.size * b.size)
    equal = 1 - greater - less
    result = compare_two(a, b)
    assert result.prob_b_greater == pytest.approx(greater + equal / 2, abs=1e-12)
    assert result.rank_biserial == pytest.approx(greater - less, abs=1e-12)


def _enumerated_two_sided_p(a, b):
    """Exact two-sided p by brute-force enumeration of every split of the combined readings into
    len(a) + len(b), mid-ranks by scipy.stats.rankdata, doubling the smaller tail."""
    combined = np.concatenate([a, b])
    ranks = scipy.stats.rankdata(combined)
    observed = ranks[: len(a)].sum()
    sums = np.array([ranks[list(chosen)].sum() for chosen in itertools.combinations(range(len(combined)), len(a))])
    return min(1.0, 2 * min(np.mean(sums <= observed + 1e-9), np.mean(sums >= observed - 1e-9)))


def test_with_ties_the_interval_inverts_the_exact_test_as_enumeration_does():
    """Brute-force inversion: every shift on a quarter-step grid of the gauge (which holds every
    pairwise difference and points inside every gap between them) is tested by enumerating all
    C(13, 7) splits; the interval is the closed hull of the shifts with p > 0.10. Narrower than the no-ties
    Moses order statistics D_(C+1), D_(mn-C), which it lies inside."""
    a, b = np.array(TIE_HEAVY_A), np.array(TIE_HEAVY_B)
    shifts = np.arange(-0.6, 0.8001, 0.025)
    kept = [d for d in shifts if _enumerated_two_sided_p(np.round(a * 40), np.round((b - d) * 40)) > 0.10]
    # The closed hull: a kept shift inside a gap brings in the differences (tenths) on either side.
    hull = (np.floor(min(kept) * 10 + 1e-6) / 10, np.ceil(max(kept) * 10 - 1e-6) / 10)
    result = compare_two(a, b, confidence=0.90)
    assert tuple(result.shift_ci) == pytest.approx(hull, abs=1e-9)
    assert "test inversion" in result.shift_ci.method
    every = np.sort((b[None, :] - a[:, None]).ravel())
    c = critical_u(7, 6, 0.10)
    moses = (every[c], every[every.size - 1 - c])
    assert moses[0] - 1e-9 <= result.shift_ci.low and result.shift_ci.high <= moses[1] + 1e-9
    assert result.shift_ci.high - result.shift_ci.low < moses[1] - moses[0]


def test_with_ties_and_no_room_for_the_inversion_the_moses_order_statistics_stay(monkeypatch):
    """Where the inversion is not affordable the interval uses the no-ties order statistics D_(C+1)
    and D_(mn-C) of all sorted differences (brute force), C = critical_u at 1 - confidence, and says so."""
    import rankwise.stats.shift_inversion as shift_inversion

    monkeypatch.setattr(shift_inversion, "INVERSION_SECONDS", 0.0)
    a, b = np.array(TIE_HEAVY_A), np.array(TIE_HEAVY_B)
    every = np.sort((b[None, :] - a[:, None]).ravel())
    c = critical_u(7, 6, 0.10)
    result = compare_two(a, b, confidence=0.90)
    assert result.shift == pytest.approx(np.median(every), abs=1e-12)
    assert tuple(result.shift_ci) == pytest.approx((every[c], every[every.size - 1 - c]), abs=1e-12)
    assert "readings tie" in result.shift_ci.method and "conservative" in result.shift_ci.method
    assert "approximate" in result.shift_ci.method


# --- equivalence within a margin -----------------------------------------------------------

def test_equivalence_uses_the_one_minus_two_alpha_interval():
    """The (1 - 2 alpha) Moses interval by brute force (order statistics at critical_u(.., 2 alpha));
    equivalent only when it lies strictly inside (-margin, +margin)."""
    rng = np.random.default_rng(21)
    a = np.round(rng.normal(5.0, 0.1, 25), 2)
    b = np.round(rng.normal(5.01, 0.1, 25), 2)
    every = np.sort((b[None, :] - a[:, None]).ravel())
    c = critical_u(25, 25, 0.10)
    inside = compare_two(a, b, margin=0.2)
    assert tuple(inside.equivalence_ci) == pytest.approx((every[c], every[every.size - 1 - c]), abs=1e-9)
    assert inside.equivalence_ci.level == pytest.approx(0.90)
    assert inside.equivalent is True
    assert compare_two(a, b, margin=0.01).equivalent is False
    assert compare_two(a, b).equivalent is None and compare_two(a, b).equivalence_ci is None


# --- methods, fields, warnings, refusals ---------------------------------------------------

def test_auto_is_exact_up_to_one_hundred_readings_and_normal_far_beyond():
    rng = np.random.default_rng(2)
    small = compare_two(np.round(rng.normal(size=50), 1), np.round(rng.normal(size=AUTO_EXACT_READINGS - 50), 1))
    assert small.method == "exact" and small.p_value == small.p_exact and small.null_distribution is not None
    large = compare_two(np.round(rng.normal(size=900), 1), np.round(rng.normal(size=900), 1), estimate_shift=False)
    assert large.method == "normal" and large.p_exact is None and large.null_distribution is None
    assert large.mid_p is None and large.p_value == large.p_normal


def test_normal_method_still_reports_the_exact_figures_when_affordable():
    result = compare_two(TIE_HEAVY_A, TIE_HEAVY_B, method="normal")
    assert result.method == "normal" and result.p_value == result.p_normal
    assert result.p_exact == compare_two(TIE_HEAVY_A, TIE_HEAVY_B).p_value


def test_fields_keep_entry_order_and_blanks_are_counted():
    """Ranks of 1, nan, 3 against 2, 2: scipy.stats.rankdata([1, 3, 2, 2]) = 1, 4, 2.5, 2.5."""
    result = compare_two([1.0, np.nan, 3.0], [2.0, None, 2.0], name_a="Old die", name_b="New die")
    assert result.values_a == (1.0, 3.0) and result.ranks_a == (1.0, 4.0) and result.ranks_b == (2.5, 2.5)
    assert (result.n_dropped_a, result.n_dropped_b) == (1, 1)
    assert result.rank_sum_a + result.rank_sum_b == 10
    assert [(t.value, t.count, t.counts_by_group) for t in result.tie_blocks] == [(2.0, 2, (0, 2))]
    assert not any("blank" in w for w in result.warnings), "the wording layer says how many were left out"
    assert result.median_a == 2.0 and result.quartiles_b == (2.0, 2.0)


def test_float_noise_never_splits_a_tie():
    """0.1 + 0.2 and 0.3 are one reading at the gauge's resolution (common practice, no source)."""
    result = compare_two([0.1 + 0.2, 0.5], [0.3, 0.1])
    assert result.tie_blocks[0].count == 2 and result.u_a == 3.5  # ranks 2.5 and 4 for A


def test_too_few_parts_says_so_with_the_parts_needed():
    """3 + 3 two-sided at 5 %: 1/C(6, 3) = 0.05 > 0.025, no critical U (enumeration of the extreme
    split); 4 + 4 would do (1/70 <= 0.025)."""
    result = compare_two([1.0, 2.0, 3.0], [4.0, 5.0, 6.0], name_a="Wheel A", name_b="Wheel B")
    assert result.critical_u is None and result.min_parts_needed == 4 and not result.significant
    message = next(w for w in result.warnings if "no result can reach significance" in w)
    assert "Wheel A" in message and "Wheel B" in message and "at least 4 parts" in message
    assert result.shift_ci.attained_level == pytest.approx(1 - 2 / 20)


def test_all_readings_equal_gives_p_one_and_a_plain_warning():
    result = compare_two([4.2] * 6, [4.2] * 5)
    assert result.p_value == 1.0 and result.p_normal == 1.0 and result.z == 0.0 and result.shift == 0.0
    assert any("same value" in w for w in result.warnings)
    assert any("even the most extreme split" in w for w in result.warnings)


def test_unequal_spreads_switch_the_wording_warning_on():
    """Spreads differing tenfold: the same-shape check flags it and the warning points to Brunner-Munzel."""
    rng = np.random.default_rng(4)
    result = compare_two(np.round(rng.normal(10, 0.1, 40), 2), np.round(rng.normal(10, 1.0, 40), 2),
                         name_a="Line 1", name_b="Line 2")
    assert result.shape is not None and result.shape.differ
    assert result.brunner_munzel is not None and result.mood_median is not None
    assert any("Brunner-Munzel" in w and "Line 2 tends to" in w for w in result.warnings)


def test_direction_of_z_and_one_sided_p():
    """B reading clearly higher: z > 0, b-greater p small, b-less p large (common practice, no source)."""
    a, b = [1.0, 2.0, 3.0, 4.0, 5.0], [6.0, 7.0, 8.0, 9.0, 10.0]
    higher = compare_two(a, b, alternative="b-greater")
    assert higher.z > 0 and higher.p_value == pytest.approx(1 / 252) and higher.shift == 5.0
    assert compare_two(a, b, alternative="b-less").p_value == pytest.approx(1.0)


def test_skipping_the_shift():
    result = compare_two(TIE_HEAVY_A, TIE_HEAVY_B, estimate_shift=False)
    assert result.shift is None and result.shift_ci is None


def test_a_stop_request_reaches_the_exact_count():
    with pytest.raises(Cancelled):
        compare_two(TIE_HEAVY_A, TIE_HEAVY_B, monitor=Monitor(cancelled=lambda: True))


@pytest.mark.parametrize(
    ("kwargs", "message"),
    [
        ({"a": [], "b": [1.0]}, "Group A has no readings"),
        ({"a": [1.0, "x"], "b": [1.0]}, "not a number"),
        ({"a": [1.0], "b": [np.inf]}, "infinite"),
        ({"a": [1.0], "b": [2.0], "alternative": "greater"}, "alternative"),
        ({"a": [1.0], "b": [2.0], "method": "fast"}, "method"),
        ({"a": [1.0], "b": [2.0], "alpha": 0}, "alpha"),
        ({"a": [1.0], "b": [2.0], "confidence": 1.0}, "confidence"),
        ({"a": [1.0], "b": [2.0], "margin": -1.0}, "margin"),
    ],
)
def test_wrong_input_is_refused_in_plain_words(kwargs, message):
    a, b = kwargs.pop("a"), kwargs.pop("b")
    with pytest.raises(ValueError, match=message):
        compare_two(a, b, **kwargs)


def test_auto_is_exact_for_a_tiny_group_against_a_huge_one():
    """3 readings all below 100,000 others: the most extreme split, one of C(100003, 3) equally
    likely splits in each tail, so the exact two-sided p is 2 / C(100003, 3) (Mann & Whitney 1947:
    every split equally likely; counted by hand). Auto counts it exactly and names the method."""
    import math

    result = compare_two(np.arange(3.0), 10.0 + np.arange(100_000.0), estimate_shift=False)
    assert result.method == "exact"
    assert result.p_value == pytest.approx(2 / math.comb(100_003, 3), rel=1e-9)
    assert result.p_normal > 1e-4  # the normal approximation is off by orders of magnitude here


def test_auto_is_exact_for_a_coarse_gauge_at_hundreds_of_readings():
    """200 + 200 readings on a 3-value gauge: auto counts exactly; the exact distribution's mean
    and variance are n_a n_b / 2 and the tie-corrected n_a n_b / 12 (N + 1 - sum(t^3 - t) / (N (N - 1)))
    (Lehmann 1975, Nonparametrics, section 1.4, from memory)."""
    rng = np.random.default_rng(400)
    a = rng.integers(0, 3, 200).astype(float)
    b = rng.integers(0, 3, 200).astype(float)
    result = compare_two(a, b, estimate_shift=False)
    assert result.method == "exact"
    u = np.array(result.null_distribution.support)
    probabilities = np.array(result.null_distribution.probabilities)
    _, t = np.unique(np.concatenate([a, b]), return_counts=True)
    mean = float(np.sum(u * probabilities))
    assert mean == pytest.approx(200 * 200 / 2, rel=1e-12)
    expected = 200 * 200 / 12 * (401 - np.sum(t**3 - t) / (400 * 399))
    assert float(np.sum((u - mean) ** 2 * probabilities)) == pytest.approx(expected, rel=1e-9)
