"""Sample-size planning by Noether's formulas, checked against the paper and by simulation."""

import math

import numpy as np
import pytest
from scipy import stats

from rankwise.stats.paired import compare_paired
from rankwise.stats.planning import plan_group_size, plan_paired_size, simulate_paired_power, simulate_power

# Shift (in spreads) for which P(B > A) = 0.7 under the normal shift model: sqrt(2) Phi^-1(0.7).
SHIFT_FOR_P07 = math.sqrt(2.0) * stats.norm.ppf(0.7)


def test_noether_example_gives_44_per_group():
    """Noether (1987), JASA 82, 645-647 (checks.md): alpha 0.05 two-sided, power 0.90, P(B > A) = 0.7,
    equal groups: N = 87.6, i.e. 44 per group."""
    result = plan_group_size(prob_b_greater=0.7, power=0.90)
    assert (result.n_a, result.n_b) == (44, 44)
    assert not result.paired and result.method.startswith("Noether (1987)")
    from_shift = plan_group_size(SHIFT_FOR_P07, 1.0, power=0.90)
    assert (from_shift.n_a, from_shift.n_b) == (44, 44)
    assert from_shift.prob_b_greater == pytest.approx(0.7, abs=1e-12)


def test_unequal_groups_follow_the_share_in_noethers_formula():
    """Noether's N with c = 1/3 (ratio 2): 10.5074 / (12 (1/3)(2/3) 0.04) = 98.5, so 33 and 66
    (the same formula evaluated by hand with z from scipy.stats.norm)."""
    z = stats.norm.isf(0.025) + stats.norm.ppf(0.9)
    total = z**2 / (12 * (1 / 3) * (2 / 3) * 0.2**2)
    assert total == pytest.approx(98.5, abs=0.05)
    result = plan_group_size(prob_b_greater=0.7, power=0.90, ratio=2.0)
    assert (result.n_a, result.n_b) == (math.ceil(total / 3), math.ceil(2 * total / 3)) == (33, 66)


def test_simulated_power_of_the_noether_plan_is_close_to_the_requested_power():
    """The exact rank-sum test at 44 + 44, shift giving P(B > A) = 0.7: simulated power within four
    Monte Carlo standard errors of the requested 0.90 (n_sim = 2000, standard error about 0.0067)."""
    simulated = simulate_power(44, 44, SHIFT_FOR_P07, 1.0, n_sim=2000)
    error = math.sqrt(0.9 * 0.1 / 2000)
    assert abs(simulated - 0.90) < 4 * error
    plan = plan_group_size(SHIFT_FOR_P07, 1.0, power=0.90, n_sim=2000)
    assert plan.simulated_power == simulated


def test_simulated_power_under_no_change_is_the_tests_size():
    """With no shift, the exact test rejects as often as its attained size: critical U 23 at 10 + 10
    (published two-tailed 5 % table, checks.md), size 2 P(U <= 23) from scipy.stats.mannwhitneyu
    (method="exact", alternative="less") on readings whose U is 23; within 4 standard errors."""
    a = np.arange(10.0)
    b = np.array([4.51, 4.52, 4.53, 4.54, 6.55, 9.56, 9.57, 9.58, 9.59, 9.60])
    reference = stats.mannwhitneyu(a, b, method="exact", alternative="less")
    assert reference.statistic == 23
    size = 2 * reference.pvalue
    rejected = simulate_power(10, 10, 0.0, 1.0, n_sim=4000, seed=3)
    assert abs(rejected - size) < 4 * math.sqrt(size * (1 - size) / 4000)


def test_simulation_counts_rejections_as_compare_paired_would():
    """Brute check of the vectorised signed-rank simulation: for one seeded set of differences the
    same rejections come out of compare_paired (exact p <= alpha, no ties) one study at a time."""
    n, shift = 12, 0.6
    rng = np.random.default_rng(99)
    studies = rng.normal(shift, 1.0, (200, n))
    by_compare = np.mean([compare_paired(np.zeros(n), d).p_value <= 0.05 for d in studies])
    assert simulate_paired_power(n, shift, 1.0, n_sim=200, seed=99) == pytest.approx(by_compare)


def test_paired_plan_by_noethers_signed_rank_formula_and_its_simulation():
    """n = (z_0.975 + z_0.8)^2 / (3 (p' - 1/2)^2), p' = Phi(sqrt 2 * 0.3) (Noether 1987, signed-rank
    form, from memory; the derivation from the null variance n^3/12 of W+ gives the same); the
    exact test at that n reaches 0.80 within four Monte Carlo standard errors."""
    p_pair = stats.norm.cdf(math.sqrt(2) * 0.3)
    expected = math.ceil((stats.norm.isf(0.025) + stats.norm.ppf(0.8)) ** 2 / (3 * (p_pair - 0.5) ** 2))
    result = plan_paired_size(0.3, 1.0, power=0.8, n_sim=2000)
    assert result.paired and result.n_a == result.n_b == expected
    assert abs(result.simulated_power - 0.80) < 4 * math.sqrt(0.8 * 0.2 / 2000)


def test_power_curve_rises_and_crosses_the_target_at_the_plan():
    result = plan_group_size(0.5, 1.0, power=0.8)
    powers = [p.power for p in result.power_curve]
    assert all(b >= a for a, b in zip(powers, powers[1:]))
    below = [p for p in result.power_curve if p.n_a < result.n_a]
    above = [p for p in result.power_curve if p.n_a >= result.n_a]
    assert all(p.power < 0.8 for p in below) and all(p.power >= 0.8 - 1e-9 for p in above)


def test_a_very_large_shift_is_raised_to_the_fewest_parts_that_can_show_significance():
    """Significance at 5 % two-sided needs at least 4 + 4 parts (1 / C(8, 4) = 0.0143 <= 0.025,
    enumeration by hand); the paired test needs 6 (2 / 2^6 <= 0.05)."""
    result = plan_group_size(10.0, 1.0, power=0.3)  # the formula alone gives 2 + 2
    assert (result.n_a, result.n_b) == (4, 4) and any("fewest" in w for w in result.warnings)
    paired = plan_paired_size(10.0, 1.0, power=0.3)  # the formula alone gives 3
    assert paired.n_a == 6 and any("fewest" in w for w in paired.warnings)


@pytest.mark.parametrize("call, name", [
    (lambda: plan_group_size(), "shift"),
    (lambda: plan_group_size(1.0, 0.0), "spread"),
    (lambda: plan_group_size(0.0, 1.0), "shift"),
    (lambda: plan_group_size(1.0, 1.0, prob_b_greater=0.7), "not both"),
    (lambda: plan_group_size(prob_b_greater=0.5), "prob_b_greater"),
    (lambda: plan_group_size(-1.0, 1.0, alternative="b-greater"), r"other way from the chosen direction \(a rise only\)"),
    (lambda: plan_group_size(1.0, 1.0, ratio=0), "ratio"),
    (lambda: plan_group_size(1.0, 1.0, power=1.0), "power"),
    (lambda: plan_paired_size(prob_sum_positive=1.2), "prob_sum_positive"),
    (lambda: simulate_power(0, 5, 1.0, 1.0), "n_a"),
])
def test_bad_arguments_get_a_plain_message(call, name):
    with pytest.raises(ValueError, match=name):
        call()


def test_the_plan_lists_its_assumptions():
    result = plan_group_size(0.5, 1.0)
    assert any("same bell-like shape" in a for a in result.assumptions)
    assert any("independently" in a for a in result.assumptions)


def test_the_window_front_door_answers_the_planning_question():
    """run(analysis) with Noether's (1987) example settings: 44 per group, checked by simulation."""
    from rankwise.stats.analysis import Analysis, Question, Settings
    from rankwise.stats.service import PLAN_SIMULATIONS, run

    result = run(Analysis(question=Question.PLAN, groups=(), settings=Settings(planned_prob_b_greater=0.7, power=0.9)))
    assert (result.n_a, result.n_b) == (44, 44)
    assert abs(result.simulated_power - 0.90) < 4 * math.sqrt(0.9 * 0.1 / PLAN_SIMULATIONS)


def test_the_window_front_door_plans_for_the_same_parts_measured_twice():
    """Settings.plan_paired: run(analysis) gives the signed-rank plan of plan_paired_size with the same
    settings (n by Noether's signed-rank form, as in the test above), whose assumptions say that the
    spread is that of the differences."""
    from rankwise.stats.analysis import Analysis, Question, Settings
    from rankwise.stats.service import PLAN_SIMULATIONS, run

    settings = Settings(planned_shift=0.3, planned_spread=1.0, power=0.8, ratio=2.0, plan_paired=True)
    result = run(Analysis(question=Question.PLAN, groups=(), settings=settings))
    p_pair = stats.norm.cdf(math.sqrt(2) * 0.3)
    expected = math.ceil((stats.norm.isf(0.025) + stats.norm.ppf(0.8)) ** 2 / (3 * (p_pair - 0.5) ** 2))
    assert result.paired and result.n_a == result.n_b == expected and result.ratio == 1.0
    assert result == plan_paired_size(0.3, 1.0, power=0.8, n_sim=PLAN_SIMULATIONS)
    assert any("standard deviation of the differences" in a for a in result.assumptions)


def test_a_paired_plan_refuses_a_two_group_chance_in_plain_words():
    from rankwise.stats.analysis import Analysis, Question, Settings
    from rankwise.stats.service import run

    settings = Settings(planned_prob_b_greater=0.7, plan_paired=True)
    with pytest.raises(ValueError, match="two separate groups only"):
        run(Analysis(question=Question.PLAN, groups=(), settings=settings))


def test_one_sided_plan_by_noethers_formula_worked_by_hand():
    """Noether (1987) with z_(1-alpha) for a one-sided test, worked by hand with scipy.stats.norm:
    alpha 0.05 one-sided, power 0.90, P(B > A) = 0.7, equal groups:
    N = (1.6449 + 1.2816)^2 / (12 * 0.25 * 0.04) = 71.37, i.e. 36 per group."""
    by_hand = (stats.norm.isf(0.05) + stats.norm.ppf(0.9)) ** 2 / (12 * 0.25 * (0.7 - 0.5) ** 2)
    assert by_hand == pytest.approx(71.37, abs=0.01)
    result = plan_group_size(prob_b_greater=0.7, power=0.9, alternative="b-greater")
    assert (result.n_a, result.n_b) == (math.ceil(by_hand / 2), math.ceil(by_hand / 2)) == (36, 36)
    with pytest.raises(ValueError, match="other way"):
        plan_group_size(prob_b_greater=0.3, power=0.9, alternative="b-greater")


def test_one_sided_plan_checked_by_simulating_the_exact_one_sided_test():
    """The exact one-sided rank-sum test at the planned 36 + 36 (P(B > A) = 0.7): simulated power
    within four binomial standard errors of the 0.90 asked for (Noether's formula is approximate)."""
    simulated = simulate_power(36, 36, SHIFT_FOR_P07, 1.0, alternative="b-greater", n_sim=4000)
    assert abs(simulated - 0.90) < 4 * math.sqrt(0.9 * 0.1 / 4000) + 0.01


def test_several_groups_power_reduces_to_noethers_formula_for_two_groups():
    """For two groups the non-central chi-square power with lambda = 6 n (p - 1/2)^2 is Noether's
    two-sided power, worked by hand with scipy.stats.norm: Phi(sqrt(lambda) - z) + Phi(-sqrt(lambda) - z)."""
    from rankwise.stats.planning import _kruskal_wallis_power

    for n in (10, 44, 80):
        shift = SHIFT_FOR_P07
        root = math.sqrt(6 * n) * (0.7 - 0.5)
        z = stats.norm.isf(0.025)
        by_hand = stats.norm.cdf(root - z) + stats.norm.cdf(-root - z)
        assert _kruskal_wallis_power(n, (0.0, shift), 0.05) == pytest.approx(by_hand, rel=1e-9)
    # Noether's example: 44 per group reach the 0.90 asked for, 43 do not (N = 87.6).
    assert _kruskal_wallis_power(44, (0.0, SHIFT_FOR_P07), 0.05) >= 0.90 > _kruskal_wallis_power(43, (0.0, SHIFT_FOR_P07), 0.05)


def test_several_groups_plan_checked_by_simulating_the_kruskal_wallis_test():
    """Three groups, shift 1 spread 1 (hardest pattern: 0, 0.5, 1 spreads): the planned size is the
    smallest whose approximate power reaches 0.80, and the simulated chi-square Kruskal-Wallis test
    at that size finds the shift within 0.05 of 0.80 (approximation), below it with two parts fewer."""
    from rankwise.stats.planning import _kruskal_wallis_power, least_favourable_means, plan_several_size

    result = plan_several_size(1.0, 1.0, groups=3, power=0.8, n_sim=4000)
    means = least_favourable_means(1.0, 3)
    assert result.groups == 3 and result.n_a == result.n_b
    assert _kruskal_wallis_power(result.n_a, means, 0.05) >= 0.8 > _kruskal_wallis_power(result.n_a - 1, means, 0.05)
    assert abs(result.simulated_power - 0.8) < 0.05
    from rankwise.stats.planning import simulate_several_power

    assert simulate_several_power(result.n_a - 2, means, 1.0, n_sim=4000) < result.simulated_power


def test_several_groups_simulation_rejects_as_scipy_kruskal_does():
    """Under no change the simulated test rejects about alpha of the time; with a shift it agrees with
    scipy.stats.kruskal (chi-square p-value) run on 600 studies of its own, within four binomial
    standard errors."""
    from rankwise.stats.planning import simulate_several_power

    null = simulate_several_power(12, (0.0, 0.0, 0.0), 1.0, n_sim=8000)
    assert abs(null - 0.05) < 4 * math.sqrt(0.05 * 0.95 / 8000) + 0.005
    means = (-0.4, 0.4, 0.0)
    ours = simulate_several_power(12, means, 1.0, n_sim=8000)
    rng = np.random.default_rng(7)
    studies = [[rng.normal(m, 1.0, 12) for m in means] for _ in range(600)]
    reference = np.mean([stats.kruskal(*groups).pvalue <= 0.05 for groups in studies])
    assert abs(ours - reference) < 4 * math.sqrt(reference * (1 - reference) / 600)


def test_the_window_front_door_plans_for_several_groups():
    from rankwise.stats.analysis import Analysis, Question, Settings
    from rankwise.stats.planning import plan_several_size
    from rankwise.stats.service import PLAN_SIMULATIONS, run

    settings = Settings(planned_shift=1.0, planned_spread=1.0, power=0.8, plan_groups=4)
    result = run(Analysis(question=Question.PLAN, groups=(), settings=settings))
    assert result == plan_several_size(1.0, 1.0, groups=4, power=0.8, n_sim=PLAN_SIMULATIONS)
    with pytest.raises(ValueError, match="any direction"):
        run(Analysis(question=Question.PLAN, groups=(), settings=Settings(
            planned_shift=1.0, planned_spread=1.0, plan_groups=3, alternative="b-greater")))
