"""Kruskal-Wallis with Dunn's pairs and Holm's adjustment, checked against outside sources."""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import stats

import rankwise.stats.several as several
from rankwise.stats.several import compare_several, holm_adjust

# Hollander & Wolfe (1973), Nonparametric Statistical Methods, p. 116.
HW_GROUPS = {"1": [2.9, 3.0, 2.5, 2.6, 3.2], "2": [3.8, 2.7, 4.0, 2.4], "3": [2.8, 3.4, 3.7, 2.2, 2.0]}
# Zar (2010), Biostatistical Analysis, 5th ed.: pH of four ponds.
ZAR_PONDS = {
    "1": [7.68, 7.69, 7.70, 7.70, 7.72, 7.73, 7.73, 7.76],
    "2": [7.71, 7.73, 7.74, 7.74, 7.78, 7.78, 7.80, 7.81],
    "3": [7.74, 7.75, 7.77, 7.78, 7.80, 7.81, 7.84],
    "4": [7.71, 7.71, 7.74, 7.79, 7.81, 7.85, 7.87, 7.91],
}


def test_hollander_wolfe_kruskal_wallis_example():
    """H&W (1973) p. 116: H = 0.77143, df 2, chi-square p = 0.68."""
    result = compare_several(HW_GROUPS, method="normal")
    assert result.h == pytest.approx(0.77143, abs=5e-6)
    assert result.df == 2
    assert result.p_chi_square == pytest.approx(0.68, abs=0.005)
    assert result.method == "chi-square" and not result.significant


def test_zar_ponds_kruskal_wallis_and_dunn():
    """Zar (2010): tie-corrected H = 11.94 (checks.md: from memory, recomputes to 11.9435); Dunn
    with Bonferroni-adjusted p for pairs 2-1, 3-1, 3-2, 4-1, 4-2, 4-3 = 0.1956, 0.0191, 1,
    0.0166, 1, 1. Bonferroni is min(1, 6 p) over the same two-sided p."""
    result = compare_several(ZAR_PONDS)
    assert result.h == pytest.approx(11.9435, abs=5e-5)
    assert result.method == "chi-square" and result.significant
    bonferroni = {(p.group_a, p.group_b): min(1.0, 6 * p.p_value) for p in result.pairs}
    published = {("1", "2"): 0.1956, ("1", "3"): 0.0191, ("2", "3"): 1.0, ("1", "4"): 0.0166, ("2", "4"): 1.0, ("3", "4"): 1.0}
    for pair, value in published.items():
        assert bonferroni[pair] == pytest.approx(value, abs=5e-5)
    pond_4_higher = next(p for p in result.pairs if (p.group_a, p.group_b) == ("1", "4"))
    assert pond_4_higher.z > 0 and pond_4_higher.mean_rank_b > pond_4_higher.mean_rank_a


def holm_by_definition(p):
    """Holm (1979): at level a, sort p ascending and reject while p_(j) <= a / (m - j + 1). The
    adjusted p of a hypothesis is the smallest a at which it is rejected; the candidates for a
    are the values min(1, (m - j + 1) p_(j)). Brute computation over those candidates."""
    m = len(p)
    order = np.argsort(p, kind="mergesort")
    candidates = sorted({min(1.0, (m - j) * p[order[j]]) for j in range(m)})

    def rejected(level):
        out = set()
        for j, i in enumerate(order):
            if p[i] <= level / (m - j) * (1 + 1e-12):
                out.add(i)
            else:
                break
        return out

    return np.array([next((a for a in candidates if i in rejected(a)), 1.0) for i in range(m)])


def test_holm_on_the_zar_pairs_matches_holms_definition():
    """Holm's adjusted p from the same Dunn z, checked against Holm (1979) by brute computation
    (statsmodels is not installed)."""
    result = compare_several(ZAR_PONDS)
    raw = np.array([p.p_value for p in result.pairs])
    assert [p.p_adjusted for p in result.pairs] == pytest.approx(holm_by_definition(raw), abs=1e-12)
    assert sum(p.significant for p in result.pairs) == 2


@given(st.lists(st.floats(0.0, 1.0), min_size=1, max_size=10))
def test_holm_adjusted_p_are_monotone_and_not_below_raw(p):
    p = np.array(p)
    adjusted = holm_adjust(p)
    order = np.argsort(p, kind="mergesort")
    assert np.all(np.diff(adjusted[order]) >= 0)
    assert np.all(adjusted >= p) and np.all(adjusted <= 1.0)
    assert adjusted == pytest.approx(holm_by_definition(p), abs=1e-12)


def test_kruskal_wallis_matches_scipy_on_gauge_readings():
    """scipy.stats.kruskal on the readings in whole hundredths (on raw floats noise could split ties)."""
    rng = np.random.default_rng(8)
    groups = {f"cavity {i}": np.round(rng.normal(3.0 + 0.02 * i, 0.05, n), 2) for i, n in enumerate((12, 9, 15, 11))}
    result = compare_several(groups, method="normal")
    reference = stats.kruskal(*[np.rint(v * 100) for v in groups.values()])
    assert result.h == pytest.approx(reference.statistic, abs=1e-9)
    assert result.p_value == pytest.approx(reference.pvalue, abs=1e-9)
    assert result.epsilon_squared == pytest.approx(reference.statistic / (sum(v.size for v in groups.values()) - 1))
    statistic, p, *_ = stats.median_test(*groups.values())
    assert result.mood_median.p_value == pytest.approx(p, abs=1e-9)


@pytest.mark.parametrize("groups", [
    {"a": [1.1, 1.3, 1.2], "b": [1.5, 1.3, 1.6], "c": [1.2, 1.1, 1.0]},
    {"a": [2, 2, 3], "b": [3, 4], "c": [2, 4, 4, 5]},
])
def test_exact_permutation_p_matches_scipy_permutation_test(groups):
    """scipy.stats.permutation_test(..., permutation_type="independent", n_resamples=np.inf,
    alternative="greater") with scipy.stats.kruskal's H as the statistic: exact enumeration."""
    result = compare_several(groups)
    assert result.method == "exact permutation"
    samples = [np.array(v, float) for v in groups.values()]
    reference = stats.permutation_test(
        samples, lambda *s: stats.kruskal(*s).statistic, permutation_type="independent",
        n_resamples=np.inf, alternative="greater",
    )
    assert result.p_value == pytest.approx(reference.pvalue, abs=1e-12)


def test_monte_carlo_p_is_repeatable_and_close_to_the_exact_count(monkeypatch):
    """Forced to reshuffle, the estimate lies within 4 standard errors of the exact enumeration."""
    exact = compare_several(HW_GROUPS, method="exact")
    assert exact.method == "exact permutation"
    monkeypatch.setattr(several, "EXACT_ASSIGNMENT_LIMIT", 0)
    first = compare_several(HW_GROUPS, method="exact")
    second = compare_several(HW_GROUPS, method="exact")
    assert first.method == "Monte Carlo permutation" and first.p_value == second.p_value
    error = np.sqrt(exact.p_value * (1 - exact.p_value) / several.MONTE_CARLO_RESHUFFLES)
    assert abs(first.p_value - exact.p_value) < 4 * error
    assert any("standard error" in w for w in first.warnings)


def test_each_group_against_a_reference():
    result = compare_several(ZAR_PONDS, comparison="against-reference", reference="2")
    assert [(p.group_a, p.group_b) for p in result.pairs] == [("2", "1"), ("2", "3"), ("2", "4")]
    raw = np.array([p.p_value for p in result.pairs])
    assert [p.p_adjusted for p in result.pairs] == pytest.approx(holm_by_definition(raw), abs=1e-12)
    all_pairs = {(p.group_a, p.group_b): p for p in compare_several(ZAR_PONDS).pairs}
    assert result.pairs[0].z == pytest.approx(-all_pairs[("1", "2")].z)
    assert compare_several(ZAR_PONDS, comparison="against-reference").reference == "1"


def test_all_equal_readings_give_a_result_with_a_warning():
    result = compare_several({"a": [1.0, 1.0, 1.0], "b": [1.0, 1.0], "c": [1.0, 1.0]})
    assert result.h == 0.0 and result.p_value == 1.0 and not result.significant
    assert any("All readings are equal" in w for w in result.warnings)
    assert all(p.p_adjusted == 1.0 for p in result.pairs)


def test_blanks_are_dropped_and_counted():
    result = compare_several({"a": [1.0, None, 2.0, 3.0], "b": [2.0, 3.0, float("nan"), 4.0, 5.0]})
    assert [s.n_dropped for s in result.summaries] == [1, 1]
    assert [s.n for s in result.summaries] == [3, 4]


@pytest.mark.parametrize("call, name", [
    (lambda: compare_several({"a": [1, 2]}), "groups"),
    (lambda: compare_several({"a": [1, 2], "b": []}), "Group b"),
    (lambda: compare_several({"a": [1, 2], "b": ["x"]}), "Group b"),
    (lambda: compare_several(HW_GROUPS, comparison="pairs"), "comparison"),
    (lambda: compare_several(HW_GROUPS, comparison="against-reference", reference="9"), "reference"),
    (lambda: compare_several(HW_GROUPS, method="chi"), "method"),
    (lambda: compare_several(HW_GROUPS, alpha=5), "alpha"),
])
def test_bad_input_gets_a_plain_message(call, name):
    with pytest.raises(ValueError, match=name):
        call()


@settings(max_examples=30, deadline=None)
@given(st.lists(st.lists(st.integers(0, 5), min_size=1, max_size=4), min_size=2, max_size=3))
def test_p_values_are_probabilities_and_h_matches_scipy(raw_groups):
    groups = {f"g{i}": [v / 10 for v in g] for i, g in enumerate(raw_groups)}
    result = compare_several(groups)
    assert 0.0 <= result.p_value <= 1.0 and 0.0 <= result.p_chi_square <= 1.0
    for pair in result.pairs:
        assert 0.0 <= pair.p_value <= pair.p_adjusted <= 1.0
    if result.tie_correction > 0:
        assert result.h == pytest.approx(stats.kruskal(*[np.array(g, float) for g in raw_groups]).statistic, abs=1e-9)


def test_the_window_front_door_answers_the_several_groups_question():
    """run(analysis) on Zar's ponds: H = 11.9435 (checks.md), each pond against pond 1."""
    from rankwise.stats.analysis import Analysis, GroupReadings, Question, Settings
    from rankwise.stats.service import run

    analysis = Analysis(
        question=Question.SEVERAL,
        groups=tuple(GroupReadings(f"Pond {name}", tuple(values)) for name, values in ZAR_PONDS.items()),
        settings=Settings(comparison="against-reference", reference="Pond 1"),
    )
    result = run(analysis)
    assert result.h == pytest.approx(11.9435, abs=5e-5)
    assert [p.group_b for p in result.pairs] == ["Pond 2", "Pond 3", "Pond 4"]
    twins = Analysis(question=Question.SEVERAL, groups=(GroupReadings("A", (1.0, 2.0)), GroupReadings("A", (3.0, 4.0))))
    with pytest.raises(ValueError, match="own name"):
        run(twins)


@settings(max_examples=25, deadline=None)
@given(st.lists(st.lists(st.integers(0, 6), min_size=2, max_size=5), min_size=3, max_size=3), st.permutations([0, 1, 2]))
def test_the_order_of_the_groups_does_not_change_the_answer(raw_groups, order):
    """H, its permutation p and the set of Dunn p-values do not depend on the order of the groups."""
    groups = {f"g{i}": [v / 10 for v in g] for i, g in enumerate(raw_groups)}
    reordered = {f"g{i}": groups[f"g{i}"] for i in order}
    first, second = compare_several(groups), compare_several(reordered)
    assert first.h == pytest.approx(second.h, abs=1e-9)
    assert first.p_value == pytest.approx(second.p_value, abs=1e-12)
    assert sorted(p.p_adjusted for p in first.pairs) == pytest.approx(sorted(p.p_adjusted for p in second.pairs), abs=1e-12)
