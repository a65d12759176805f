"""Wilcoxon signed-rank for the same parts measured twice, checked against outside sources."""

import itertools

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import stats

from rankwise.stats.hodges_lehmann import select_walsh_sums
from rankwise.stats.paired import compare_paired, critical_t
from rankwise.stats.progress import Cancelled, Monitor

# Hollander & Wolfe (1999), Nonparametric Statistical Methods, 2nd ed., p. 39 (n = 9).
HW_X = [1.83, 0.50, 1.62, 2.48, 1.68, 1.88, 1.55, 3.06, 1.30]
HW_Y = [0.878, 0.647, 0.598, 2.05, 1.06, 1.29, 1.06, 3.14, 1.29]
# Wilcoxon (1945), Biometrics Bulletin 1, 80-83: Darwin's paired plants, differences.
DARWIN = [6, 8, 14, 16, 23, 24, 28, 29, 41, -48, 49, 56, 60, -67, 75]


def brute_force_p(d, zero_method, alternative):
    """All 2^n sign flips of the non-zero differences' mid-ranks (scipy.stats.rankdata)."""
    d = np.asarray(d, float)
    ranked = d != 0 if zero_method == "wilcox" else np.ones(d.size, bool)
    ranks = np.zeros(d.size)
    ranks[ranked] = stats.rankdata(np.abs(d[ranked]))
    flip = ranks[d != 0]
    observed = ranks[d > 0].sum()
    sums = np.array([sum(r for r, s in zip(flip, signs) if s) for signs in itertools.product((0, 1), repeat=flip.size)])
    lower = np.mean(sums <= observed + 1e-9)
    upper = np.mean(sums >= observed - 1e-9)
    return {"b-greater": upper, "b-less": lower, "two-sided": min(1.0, 2 * min(lower, upper))}[alternative]


def test_hollander_wolfe_paired_example():
    """H&W (1999) p. 39, d = y - x: T+ = 5, exact two-sided p = 0.0390625, pseudo-median -0.46,
    exact 95 % interval (-0.786, -0.010)."""
    result = compare_paired(HW_X, HW_Y)
    assert result.w_plus == 5
    assert result.method == "exact"
    assert result.p_value == pytest.approx(0.0390625, abs=1e-12)
    assert result.shift == pytest.approx(-0.46, abs=1e-12)
    assert (result.shift_ci.low, result.shift_ci.high) == pytest.approx((-0.786, -0.010), abs=1e-12)
    assert result.significant


def test_darwin_plants_from_wilcoxon_1945():
    """Wilcoxon (1945): T = 24 (negative ranks), exact two-sided p = 0.041259765625."""
    result = compare_paired([0] * 15, DARWIN)
    assert result.w_minus == 24
    assert result.w_plus + result.w_minus == 15 * 16 / 2
    assert result.p_value == pytest.approx(0.041259765625, abs=1e-15)


@pytest.mark.parametrize("n, expected", [(6, 0), (7, 2), (8, 3), (9, 5), (10, 8), (12, 13), (15, 25), (20, 52), (25, 89), (30, 137)])
def test_critical_t_matches_the_published_table(n, expected):
    """Signed-rank critical T, two-tailed 5 % (table in checks.md; exact enumeration agrees)."""
    assert critical_t(n, 0.05, "two-sided") == expected


def test_critical_t_is_none_when_significance_is_impossible():
    """n = 5: the most extreme result has two-sided p = 2/32 > 0.05 (enumeration by hand)."""
    assert critical_t(5, 0.05, "two-sided") is None
    assert critical_t(5, 0.05, "b-greater") == 0  # 1/32 <= 0.05
    result = compare_paired([1, 2, 3, 4, 5], [2, 3, 4, 5, 6])
    assert result.critical_t is None
    assert any("at least 6 parts" in w for w in result.warnings)


@pytest.mark.parametrize("zero_method", ["wilcox", "pratt"])
@pytest.mark.parametrize("alternative", ["two-sided", "b-greater", "b-less"])
def test_exact_p_with_ties_and_zeros_matches_brute_force_enumeration(zero_method, alternative):
    """Brute-force enumeration of all 2^n sign flips, tied |d| and two zeros."""
    a = [5.1, 5.3, 4.8, 5.0, 5.2, 5.1, 4.9, 5.4, 5.0, 5.2, 5.3]
    b = [5.3, 5.3, 5.0, 5.1, 5.2, 5.4, 4.8, 5.6, 5.2, 5.5, 5.6]
    result = compare_paired(a, b, alternative=alternative, zero_method=zero_method, method="exact")
    d = np.rint(np.array(b) * 10) - np.rint(np.array(a) * 10)
    assert result.n_zero == 2
    assert result.p_value == pytest.approx(brute_force_p(d, zero_method, alternative), abs=1e-12)


@pytest.mark.parametrize("zero_method", ["wilcox", "pratt"])
@pytest.mark.parametrize("ours, theirs", [("two-sided", "two-sided"), ("b-greater", "greater"), ("b-less", "less")])
def test_normal_approximation_matches_scipy(zero_method, ours, theirs):
    """scipy.stats.wilcoxon(d, method="asymptotic", correction=True, zero_method=...), given the
    differences in whole tenths (on raw floats scipy would split ties such as 5.3-5.1 vs 4.2-4.0)."""
    rng = np.random.default_rng(1)
    a = np.round(rng.normal(5, 1, 40), 1)
    b = np.round(a + rng.normal(0.2, 0.5, 40), 1)
    result = compare_paired(a, b, alternative=ours, zero_method=zero_method, method="normal")
    d = np.rint(b * 10) - np.rint(a * 10)
    reference = stats.wilcoxon(d, alternative=theirs, method="asymptotic", correction=True, zero_method=zero_method)
    assert result.n_zero > 0 and result.method == "normal"
    assert result.p_value == pytest.approx(reference.pvalue, abs=1e-9)
    assert abs(result.z) == pytest.approx(abs(reference.zstatistic), abs=1e-9)


def test_exact_p_without_ties_matches_scipy_exact():
    """scipy.stats.wilcoxon(d, method="exact") is exact when there are no ties and no zeros."""
    d = np.array([0.7, -1.3, 2.2, 3.1, -0.4, 1.9, 2.6, 4.0, -0.9, 1.1, 3.5, 0.2])
    for ours, theirs in [("two-sided", "two-sided"), ("b-greater", "greater"), ("b-less", "less")]:
        result = compare_paired(np.zeros(12), d, alternative=ours)
        assert result.p_value == pytest.approx(stats.wilcoxon(d, alternative=theirs, method="exact").pvalue, abs=1e-12)


def test_differences_are_formed_at_the_readings_resolution():
    """0.3 - 0.1, 0.4 - 0.2 and 0.5 - 0.3 differ in binary floating point but are the same 0.2."""
    result = compare_paired([0.1, 0.2, 0.3, 1.0], [0.3, 0.4, 0.5, 1.5])
    assert result.differences[:3] == (0.2, 0.2, 0.2)
    assert result.signed_ranks == (2.0, 2.0, 2.0, 4.0)
    (block,) = result.tie_blocks
    assert block.count == 3 and block.mid_rank == 2.0 and block.counts_by_group == (0, 0, 3)


def test_equivalence_uses_the_ninety_percent_interval():
    """(1 - 2 alpha) interval: critical T at two-tailed 10 % for n = 9 is 8 (published one-tailed
    5 % table, from memory; confirmed by critical_t's exact count), so [W_(9), W_(37)] over the
    45 Walsh averages, formed here by brute force."""
    assert critical_t(9, 0.10, "two-sided") == 8
    d = np.array(HW_Y) - np.array(HW_X)
    walsh = np.sort([(d[i] + d[j]) / 2 for i in range(9) for j in range(i, 9)])
    inside = compare_paired(HW_X, HW_Y, margin=1.0)
    assert (inside.equivalence_ci.low, inside.equivalence_ci.high) == pytest.approx((walsh[8], walsh[36]), abs=1e-12)
    assert inside.equivalent is True
    outside = compare_paired(HW_X, HW_Y, margin=0.5)
    assert outside.equivalent is False  # the interval reaches below -0.5
    assert compare_paired(HW_X, HW_Y).equivalent is None


@pytest.mark.parametrize("decimals", [2, 1])
def test_walsh_selection_beyond_the_brute_force_limit_matches_enumeration(decimals):
    """The pseudo-median relies on selecting Walsh sums: n = 1200 (720 600 sums, past the direct
    limit) compared with all sums sorted (brute-force enumeration). One decimal makes long runs of
    equal sums, where the selection must still end."""
    x = np.sort(np.round(np.random.default_rng(4).normal(0, 1, 1200), decimals))
    i, j = np.triu_indices(x.size)
    every = np.sort(x[i] + x[j])
    wanted = [1, 2, 5000, 360300, 360301, 720600]
    assert list(select_walsh_sums(x, wanted)) == [every[k - 1] for k in wanted]


def test_half_blank_rows_are_dropped_and_named():
    result = compare_paired([1.0, None, 2.0, 3.0, float("nan")], [1.5, 2.0, None, 3.5, float("nan")])
    assert result.n_pairs == 2 and result.n_dropped == 2
    assert any("Row(s) 2, 3" in w for w in result.warnings)


@pytest.mark.parametrize("a, b, message", [
    ([1, 2, 3], [1, 2], "pairs"),
    ([1, "x"], [1, 2], "not a number"),
    ([None, 1], [2, None], "No part has both"),
    ([1, float("inf")], [1, 2], "row 2"),
])
def test_bad_input_gets_a_plain_message(a, b, message):
    with pytest.raises(ValueError, match=message):
        compare_paired(a, b)


@pytest.mark.parametrize("argument", [{"alternative": "greater"}, {"method": "fast"}, {"zero_method": "zsplit"}, {"alpha": 0.6}, {"margin": -1.0}, {"confidence": 1.0}])
def test_wrong_arguments_name_themselves(argument):
    name = next(iter(argument))
    with pytest.raises(ValueError, match=name):
        compare_paired(HW_X, HW_Y, **argument)


def test_all_zero_differences_give_a_result_with_a_warning():
    result = compare_paired([1.0, 2.0, 3.0], [1.0, 2.0, 3.0])
    assert result.p_value == 1.0 and result.n == 0 and result.n_zero == 3
    assert any("no difference to test" in w for w in result.warnings)


def test_the_exact_count_can_be_cancelled():
    stop = Monitor(cancelled=lambda: True)
    with pytest.raises(Cancelled):
        compare_paired(HW_X, HW_Y, monitor=stop)


@settings(max_examples=60, deadline=None)
@given(st.lists(st.tuples(st.integers(0, 8), st.integers(0, 8)), min_size=1, max_size=14), st.sampled_from(["wilcox", "pratt"]))
def test_properties_of_the_signed_rank_result(pairs, zero_method):
    """Rank sums add up, p is a probability, swapping a and b swaps directions and negates the shift."""
    a = [p[0] / 10 for p in pairs]
    b = [p[1] / 10 for p in pairs]
    forward = compare_paired(a, b, alternative="b-greater", zero_method=zero_method)
    backward = compare_paired(b, a, alternative="b-less", zero_method=zero_method)
    ranked, zeros = forward.n, forward.n_zero if zero_method == "pratt" else 0
    assert forward.w_plus + forward.w_minus == pytest.approx(ranked * (ranked + 1) / 2 - zeros * (zeros + 1) / 2)
    assert 0.0 <= forward.p_value <= 1.0 and 0.0 <= forward.p_normal <= 1.0
    assert forward.p_value == pytest.approx(backward.p_value, abs=1e-12)
    assert forward.shift == pytest.approx(-backward.shift, abs=1e-12)
    d = np.rint(np.array(b) * 10) - np.rint(np.array(a) * 10)
    if np.count_nonzero(d) <= 10:
        assert forward.p_exact == pytest.approx(brute_force_p(d, zero_method, "b-greater"), abs=1e-12)


def test_pseudo_median_and_interval_of_many_pairs_match_all_walsh_averages():
    """1100 pairs (past the limit where all Walsh averages are formed): the pseudo-median is the
    median, and the 95 % interval the (C+1)-th and (M-C)-th, of all 605 550 Walsh averages
    sorted by brute force; C from the normal approximation, as ``critical_t`` states beyond n = 400."""
    rng = np.random.default_rng(21)
    a = np.round(rng.normal(20.0, 1.0, 1100), 2)
    b = np.round(a + rng.normal(0.05, 0.3, 1100), 2)
    result = compare_paired(a, b)
    d = (np.rint(b * 100) - np.rint(a * 100)) / 100
    i, j = np.triu_indices(d.size)
    walsh = np.sort((d[i] + d[j]) / 2)
    assert result.shift == pytest.approx(np.median(walsh), abs=1e-12)
    n = d.size
    c = int(np.floor(n * (n + 1) / 4 - 0.5 - stats.norm.isf(0.025) * np.sqrt(n * (n + 1) * (2 * n + 1) / 24)))
    assert critical_t(n, 0.05) == c
    assert (result.shift_ci.low, result.shift_ci.high) == pytest.approx((walsh[c], walsh[walsh.size - c - 1]), abs=1e-12)


def test_the_window_front_door_answers_the_paired_question():
    """run(analysis) on the H&W (1999) p. 39 pairs, padded with a blank row as the sheet pads a
    shorter column: exact two-sided p = 0.0390625, the blank row dropped and named."""
    from rankwise.stats.analysis import Analysis, GroupReadings, Question, Settings
    from rankwise.stats.service import run

    analysis = Analysis(
        question=Question.PAIRED,
        groups=(
            GroupReadings("Before cure", tuple(HW_X) + (1.5,)),
            GroupReadings("After cure", tuple(HW_Y) + (float("nan"),)),
        ),
        settings=Settings(zero_method="pratt"),
    )
    result = run(analysis)
    assert result.p_value == pytest.approx(0.0390625, abs=1e-12)
    assert (result.name_a, result.name_b, result.zero_method, result.n_dropped) == ("Before cure", "After cure", "pratt", 1)
    assert any("Row(s) 10" in w for w in result.warnings)
