"""The charts draw what the results hold: every reading, the medians, the limits, the region.

Results come from the statistics service itself; the readings are invented for these tests
(gauge-like, with ties). Expected values name their outside source.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from rankwise.stats import Analysis, GroupReadings, Question, Settings
from rankwise.stats.paired import compare_paired
from rankwise.stats.planning import plan_group_size
from rankwise.stats.several import compare_several
from rankwise.stats.two_groups import compare_two
from rankwise.ui.charts import CumulativeSharePlot, NullDistributionPlot, PowerCurvePlot, ReadingsDotPlot
from rankwise.ui.charts.cumulative_share import share_steps
from rankwise.ui.charts.null_distribution import critical_mask, tail_of
from rankwise.ui.charts.readings_view import stacked_offsets

SCREENSHOTS = Path(__file__).resolve().parents[1] / "screenshots"
BEFORE = (12.4, 12.9, 13.1, 12.2, 12.8, 13.0, 12.6, 12.9, 13.3, 12.5)
AFTER = (12.9, 13.1, 13.4, 12.6, 12.8, 13.5, 12.9, 13.4, 13.6, 12.7)
"""Invented coating thickness before and after a cure (µm), with ties."""


def paired_case(method="auto", before=BEFORE, after=AFTER):
    groups = (GroupReadings("before cure", before, "µm", 11.5, 14.5, 13.0, 1),
              GroupReadings("after cure", after, "µm", 11.5, 14.5, 13.0, 1))
    analysis = Analysis(Question.PAIRED, groups, Settings(characteristic="Coating thickness"))
    return compare_paired(before, after, name_a="before cure", name_b="after cure", method=method), analysis


def several_case(count=8, name_length=80):
    groups = []
    for g in range(count):
        name = (f"Press {g + 1} with the reworked ejector and nozzle set from lot {g + 7} " + "x" * 80)[:name_length]
        groups.append(GroupReadings(name, tuple(float(212 + (3 * g + 7 * r) % 19 + g) for r in range(9)), "N",
                                    180.0, 260.0, None, 0))
    analysis = Analysis(Question.SEVERAL, tuple(groups), Settings(characteristic="Push-out force"))
    return compare_several({group.name: group.values for group in groups}), analysis


def plan_case():
    settings = Settings(characteristic="Roughness Ra", planned_shift=0.05, planned_spread=0.08, power=0.9)
    analysis = Analysis(Question.PLAN, (GroupReadings("current wheel", ()), GroupReadings("new wheel", ())), settings)
    return plan_group_size(0.05, 0.08, power=0.9), analysis


def save(widget, name: str) -> None:
    """Keep a picture of the chart to look at (tests/screenshots is git-ignored)."""
    SCREENSHOTS.mkdir(exist_ok=True)
    widget.resize(720, 460)
    widget.show()
    assert widget.grab().save(str(SCREENSHOTS / f"chart-{name}.png"))


@pytest.fixture
def chart(qtbot, request):
    widget = request.param()
    qtbot.addWidget(widget)
    return widget


# ---- pure helpers ------------------------------------------------------------------------------

def test_equal_readings_sit_side_by_side_within_their_slot():
    values = [1.0, 1.0, 1.0, 2.0] + [3.0] * 20
    offsets = stacked_offsets(values, spacing=0.1, half_width=0.3)
    ones = offsets[:3]
    assert len(set(np.round(ones, 9))) == 3 and abs(ones.sum()) < 1e-12
    assert offsets[3] == 0.0
    threes = offsets[4:]
    assert len(set(np.round(threes, 9))) == 20
    assert np.max(np.abs(threes)) <= 0.3 + 1e-12


def test_share_curve_matches_counting_readings_at_or_below_each_value():
    values = [2.1, 2.3, 2.3, 2.0, 2.5, 2.3, 2.1]
    x, y = share_steps(values)
    tops = dict(zip(x[1::2], y[1::2]))
    for value in set(values):  # brute-force counting, the definition of the empirical share
        assert tops[value] == pytest.approx(np.mean(np.array(values) <= value))
    assert y[0] == 0.0 and y[-1] == 1.0


def test_region_of_signed_rank_test_matches_the_published_critical_value():
    # Ten distinct |d| without zeros: the exact W+ distribution has no ties. Signed-rank
    # critical T, two-tailed 5 %, n = 10: 8 (table in checks.md; exact enumeration agrees).
    before = tuple(10.0 for _ in range(10))
    after = tuple(round(10.0 + d, 1) for d in (0.1, -0.2, 0.3, 0.4, -0.5, 0.6, 0.7, -0.8, 0.9, 1.0))
    result, _ = paired_case("exact", before, after)
    distribution = result.null_distribution
    support = np.asarray(distribution.support)
    mask = critical_mask(distribution.probabilities, 0.05, "both")
    assert list(support[mask]) == [0, 1, 2, 3, 4, 5, 6, 7, 8, 47, 48, 49, 50, 51, 52, 53, 54, 55]
    assert result.critical_t == 8


def test_region_agrees_with_the_results_own_exact_p_value():
    for alternative in ("two-sided", "b-greater", "b-less"):
        groups = (GroupReadings("before", BEFORE), GroupReadings("after", AFTER))
        result = compare_paired(BEFORE, AFTER, alternative=alternative, method="exact", alpha=0.05)
        distribution = result.null_distribution
        mask = critical_mask(distribution.probabilities, result.alpha, tail_of(result, distribution.statistic))
        observed = list(np.asarray(distribution.support)).index(distribution.observed)
        assert bool(mask[observed]) == (result.p_exact <= result.alpha), (alternative, groups)


def test_tails_follow_the_direction_of_each_statistic():
    class Asked:
        def __init__(self, alternative):
            self.alternative = alternative

    assert tail_of(Asked("b-greater"), "U of A") == "lower"
    assert tail_of(Asked("b-less"), "U of A") == "upper"
    assert tail_of(Asked("b-greater"), "W+") == "upper"
    assert tail_of(Asked("b-less"), "z") == "lower"
    assert tail_of(Asked("two-sided"), "W+") == "both"
    with pytest.raises(ValueError, match="tail must be"):
        critical_mask([0.5, 0.5], 0.05, "left")


def test_region_of_rank_sum_test_matches_the_published_critical_u():
    # Two groups of five without ties. Two-tailed 5 % critical U for (5, 5): 2 (classic table,
    # checks.md; exact enumeration agrees), so U of A in {0, 1, 2} or {23, 24, 25} counts.
    a, b = (1.1, 1.4, 1.9, 2.2, 2.8), (1.6, 2.5, 3.0, 3.3, 3.7)
    result = compare_two(a, b, method="exact")
    distribution = result.null_distribution
    support = np.asarray(distribution.support)
    mask = critical_mask(distribution.probabilities, 0.05, tail_of(result, distribution.statistic))
    assert list(support[mask]) == [0, 1, 2, 23, 24, 25]
    assert result.critical_u == 2


def test_rank_sum_region_direction_agrees_with_the_results_own_exact_p_value():
    a, b = (0.82, 0.85, 0.85, 0.88, 0.90, 0.91, 0.91, 0.93), (0.88, 0.92, 0.95, 0.95, 0.97, 0.99, 1.02)
    for alternative in ("two-sided", "b-greater", "b-less"):
        result = compare_two(a, b, alternative=alternative, method="exact")
        distribution = result.null_distribution
        mask = critical_mask(distribution.probabilities, result.alpha, tail_of(result, distribution.statistic))
        observed = list(np.asarray(distribution.support)).index(distribution.observed)
        assert bool(mask[observed]) == (result.p_exact <= result.alpha), alternative
    assert compare_two(a, b, alternative="b-greater").significant  # the region test above is not vacuous


# ---- widgets -----------------------------------------------------------------------------------

@pytest.mark.parametrize("chart", [ReadingsDotPlot, CumulativeSharePlot, NullDistributionPlot, PowerCurvePlot],
                         indirect=True)
def test_every_chart_has_a_name_a_plain_tooltip_and_an_idle_note(chart):
    assert chart.accessibleName()
    assert len(chart.toolTip()) > 40
    assert chart.note()


@pytest.mark.parametrize("chart", [ReadingsDotPlot], indirect=True)
def test_dot_plot_shows_every_reading_the_medians_the_pairs_and_the_limits(chart):
    result, analysis = paired_case()
    chart.show_result(result, analysis)
    save(chart, "dots-paired")
    assert chart.note() == ""
    for index, values in enumerate((BEFORE, AFTER)):
        x, y = chart._dots[index].getData()
        assert list(y) == list(values)
        assert np.all(np.abs(x - index) < 0.4)
        assert len(set(zip(np.round(x, 9), y))) == len(values)  # no reading hides another
    _, median_y = chart._medians.getData()
    assert list(median_y) == [result.summary_a.median] * 2 + [result.summary_b.median] * 2
    assert len(chart._pair_lines.getData()[0]) == 2 * len(BEFORE)
    assert chart.limit_labels() == {"lsl": "LSL 11.5", "usl": "USL 14.5", "nominal": "nominal 13.0"}
    assert {key for key, line in chart._lines.items() if line.isVisible()} == {"lsl", "usl", "nominal"}
    right = chart.plot_item.getAxis("right")
    assert right.isVisible() and sorted(text for _, text in right._tickLevels[0]) == sorted(chart.limit_labels().values())
    # written beside the plot, not over it, so no dot can cover a limit's value
    assert right.geometry().left() >= chart.plot_item.getViewBox().geometry().right() - 1
    chart.clear()
    assert chart.note() and all(len(dots.getData()[0]) == 0 for dots in chart._dots)


@pytest.mark.parametrize("chart", [ReadingsDotPlot], indirect=True)
def test_dot_plot_takes_eight_groups_with_long_names(chart):
    result, analysis = several_case()
    chart.show_result(result, analysis)
    save(chart, "dots-8-groups")
    labels = chart.tick_labels()
    assert [label.split()[0] for label in labels] == [str(i) for i in range(1, 9)]
    room = chart.plot_item.getViewBox().width() / 8
    assert all(len(label) * 7.5 <= room for label in labels)
    chart.resize(1800, 500)
    assert all(label.endswith("…") and len(label) > 5 for label in chart.tick_labels())
    assert [len(chart._dots[i].getData()[0]) for i in range(8)] == [9] * 8
    assert len(chart._pair_lines.getData()[0]) == 0


@pytest.mark.parametrize("chart", [CumulativeSharePlot], indirect=True)
def test_share_curves_rise_to_all_readings_for_each_group(chart):
    result, analysis = several_case(4, 20)
    chart.show_result(result, analysis)
    save(chart, "share-4-groups")
    for index, values in enumerate(result.values):
        x, y = chart._curves[index].getData()
        assert y[-1] == pytest.approx(100.0) and x[-1] == max(values) and x[0] == min(values)
    result, analysis = plan_case()
    chart.show_result(result, analysis)
    assert "planning" in chart.note()


@pytest.mark.parametrize("chart", [NullDistributionPlot], indirect=True)
def test_null_distribution_shows_exact_bars_or_the_curve_the_p_value_came_from(chart):
    result, analysis = paired_case("exact")
    chart.show_result(result, analysis)
    save(chart, "null-exact-paired")
    assert chart.shown == "exact"
    assert chart._observed.value() == result.w_plus
    region_x = chart._region_bars.opts["x"]
    outside_x = chart._bars.opts["x"]
    assert len(region_x) + len(outside_x) == len(result.null_distribution.support)

    result, analysis = paired_case("normal")
    chart.show_result(result, analysis)
    save(chart, "null-normal-paired")
    assert chart.shown == "normal" and chart._observed.value() == pytest.approx(result.z)
    assert all(len(tail.getData()[0]) > 0 for tail in chart._tails)  # two-sided: both tails shaded

    result, analysis = several_case(4, 20)
    chart.show_result(result, analysis)
    save(chart, "null-chi-square")
    assert chart.shown == "chi-square" and chart._observed.value() == pytest.approx(result.h)

    result, analysis = plan_case()
    chart.show_result(result, analysis)
    assert chart.shown == "" and chart.note()


@pytest.mark.parametrize("chart", [NullDistributionPlot], indirect=True)
def test_observed_u_is_marked_where_the_published_example_puts_it(chart):
    # Shier (2004), "The Mann-Whitney U test": [19, 22, 16, 29, 24] vs [20, 11, 17, 12]; U = 17 and 3.
    a, b = (19.0, 22.0, 16.0, 29.0, 24.0), (20.0, 11.0, 17.0, 12.0)
    analysis = Analysis(Question.TWO_GROUPS, (GroupReadings("A", a), GroupReadings("B", b)))
    result = compare_two(a, b, method="exact")
    chart.show_result(result, analysis)
    save(chart, "null-exact-two-groups")
    assert chart.shown == "exact" and chart._observed.value() == 17.0
    assert "U of A = 17" in chart._observed.label.toPlainText()


@pytest.mark.parametrize("chart", [ReadingsDotPlot], indirect=True)
def test_dot_plot_of_two_groups_shows_both_groups_at_the_gauge_resolution(chart):
    a, b = (0.82, 0.85, 0.85, 0.88, 0.90, 0.91, 0.91, 0.93), (0.88, 0.92, 0.95, 0.95, 0.97, 0.99, 1.02)
    analysis = Analysis(Question.TWO_GROUPS, (GroupReadings("Wheel A", a, "µm", 0.6, 1.2, None, 2),
                                              GroupReadings("Wheel B", b, "µm", 0.6, 1.2, None, 2)),
                        Settings(characteristic="Roughness Ra"))
    chart.show_result(compare_two(a, b, name_a="Wheel A", name_b="Wheel B"), analysis)
    save(chart, "dots-two-groups")
    assert [len(chart._dots[i].getData()[0]) for i in range(2)] == [8, 7]
    assert chart.limit_labels()["lsl"] == "LSL 0.60"
    assert chart.tick_labels() == ["1 Wheel A", "2 Wheel B"]


@pytest.mark.parametrize("chart", [PowerCurvePlot], indirect=True)
def test_power_curve_marks_the_target_and_the_planned_size(chart):
    result, analysis = plan_case()
    chart.show_result(result, analysis)
    save(chart, "power-curve")
    x, y = chart._curve.getData()
    assert list(x) == [point.n_a for point in result.power_curve]
    assert list(y) == pytest.approx([100 * point.power for point in result.power_curve])
    assert chart._target.value() == pytest.approx(90.0)
    assert chart._planned.value() == result.n_a
    result, analysis = paired_case()
    chart.show_result(result, analysis)
    assert "how many parts" in chart.note()


@pytest.mark.parametrize("chart", [ReadingsDotPlot], indirect=True)
def test_a_large_group_shows_an_even_sample_of_its_readings_and_says_so(chart, qtbot):
    from window_support import PATIENCE_MS

    from rankwise.ui.charts.dot_plot import DOT_LIMIT

    generator = np.random.default_rng(5)
    large = tuple(np.round(generator.normal(12.5, 0.4, 50 * DOT_LIMIT), 2))
    small = tuple(np.round(generator.normal(12.6, 0.4, 30), 2))
    groups = (GroupReadings("Press 1", large, "kN", None, None, None, 2),
              GroupReadings("Press 2", small, "kN", None, None, None, 2))
    analysis = Analysis(Question.TWO_GROUPS, groups, Settings())
    chart.show_result(compare_two(large, small, name_a="Press 1", name_b="Press 2", method="normal"), analysis)
    qtbot.waitUntil(lambda: chart.view is not None, timeout=PATIENCE_MS)  # placed on a thread of its own
    save(chart, "dots-large-group")
    _, drawn = chart._dots[0].getData()
    assert len(drawn) == DOT_LIMIT and len(chart._dots[1].getData()[1]) == 30
    assert drawn.min() == min(large) and drawn.max() == max(large)  # the ends are always drawn
    # An even sample in order of size: its median is the group's median (common practice, no source).
    assert np.median(drawn) == pytest.approx(np.median(large), abs=0.01)
    assert "even sample" in chart.plot_item.getAxis("bottom").labelText
    assert chart.dot_tip(0.02, 12.5) == "Press 1: 12.50 kN"
