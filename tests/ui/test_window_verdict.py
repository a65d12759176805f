"""The verdict follows the readings and the question, with the cautions note always in view."""

from __future__ import annotations

import numpy as np
import pytest
from PySide6.QtCore import Qt

from window_support import DEMO_FILES, answers, screenshot, type_column, wait_for_verdict, window  # noqa: F401

from rankwise.stats.results import PairedResult, PlanResult, SeveralGroupsResult, TwoGroupResult
from rankwise.ui.question_panel import QUESTION_OPTIONS
from rankwise.wording import CAUTION_SHORT


def _caution_in_view(window) -> bool:
    caution = window.results_panel.caution
    return caution.isVisible() and CAUTION_SHORT in caution.text() and caution.visibleRegion().boundingRect().height() > 20


def test_typed_readings_give_a_verdict_that_changes_as_typing_goes_on(qtbot, window):
    """Readings typed with the keyboard give a verdict; typing clearly higher B readings changes it."""
    screenshot(window, "window-empty")
    type_column(qtbot, window.grid, 0, ["0.40", "0.41", "0.42", "0.41", "0.40", "0.42", "0.43", "0.41"])
    type_column(qtbot, window.grid, 1, ["0.41", "0.42", "0.40"])
    wait_for_verdict(qtbot, window)
    first = window.results_panel.headline.text()
    first_p = window.results_panel.number_text("p_value")
    assert isinstance(window.last_result, TwoGroupResult) and window.last_result.n_b == 3
    assert window.rank_table.model.rowCount() == 11
    type_column(qtbot, window.grid, 1, ["0.55", "0.56", "0.57", "0.58", "0.55", "0.59"], start_row=3)
    qtbot.waitUntil(lambda: window.last_result is not None and window.last_result.n_b == 9, timeout=60000)
    assert window.last_result.significant and window.last_result.p_value < 0.05
    assert window.results_panel.headline.text() != first
    assert window.results_panel.number_text("p_value") != first_p
    assert window.rank_table.model.rowCount() == 17
    assert _caution_in_view(window)
    screenshot(window, "window-typed")


def test_every_key_number_has_a_plain_words_tooltip(qtbot, window):
    """Each key number shown carries a tooltip explaining it."""
    window.open_demo()
    wait_for_verdict(qtbot, window)
    panel = window.results_panel
    for key in ("n_a", "median_b", "rank_sum_a", "u_a", "u_b", "u", "critical_u", "p_value", "shift",
                "prob_b_greater", "brunner_munzel_p", "mood_median_p"):
        tooltip = panel.number_tooltip(key)
        assert tooltip is not None and len(tooltip.split()) >= 5, f"{key}: {tooltip!r}"
    assert "no difference" in panel.number_tooltip("p_value").lower() or "did nothing" in panel.number_tooltip("p_value")


def test_opened_demo_shows_verdict_ranks_and_charts(qtbot, window, answers):
    """The demo opens to a verdict, a rank table of all 34 readings with tie blocks, and the charts."""
    assert window.open_demo()
    wait_for_verdict(qtbot, window)
    result = window.last_result
    assert isinstance(result, TwoGroupResult) and (result.n_a, result.n_b) == (18, 16)
    assert window.rank_table.model.rowCount() == 34
    tie_column = window.rank_table.model.columnCount() - 1
    tie_texts = [window.rank_table.model.index(r, tie_column).data() for r in range(34)]
    assert any(text.startswith("┌ ") and " tied: ranks " in text for text in tie_texts)
    assert "Rank sums:" in window.rank_table.sums.text()
    assert "Wheel A (current): 18 readings" in window.status_counts.text()
    assert _caution_in_view(window) and answers.problems == []
    screenshot(window, "window-opened-demo")
    for position in range(1, window.tabs.count()):
        if window.tabs.isTabVisible(position):
            window.tabs.setCurrentIndex(position)
            screenshot(window, f"window-demo-tab-{position}")


def _load_for(window, key: str) -> None:
    if key == "paired":
        window.open_path(DEMO_FILES / "coating_before_after_cure.csv")
    elif key == "several":
        window.open_path(DEMO_FILES / "push_out_force_three_presses.xlsx")
    else:
        window.open_demo()


@pytest.mark.parametrize("option", [o.key for o in QUESTION_OPTIONS])
def test_each_question_gives_its_own_verdict(qtbot, window, answers, option):
    """Switching the question re-asks the statistics and shows a verdict of that kind, cautions note in view."""
    _load_for(window, option)
    window.question_panel.select_option(option)
    if option == "margin":
        window.question_panel.margin.setValue(0.05)
    if option == "plan":
        window.question_panel.planned_shift.setValue(0.03)
        window.question_panel.planned_spread.setValue(0.04)
    expected = {"paired": PairedResult, "several": SeveralGroupsResult, "plan": PlanResult}.get(option, TwoGroupResult)
    qtbot.waitUntil(lambda: isinstance(window.last_result, expected) and not window.runner.busy, timeout=60000)
    analysis = window.last_analysis
    if option == "b-higher":
        assert analysis.settings.alternative == "b-greater"
    if option == "b-lower":
        assert analysis.settings.alternative == "b-less"
    if option == "margin":
        assert analysis.settings.margin == pytest.approx(0.05) and window.last_result.equivalent is not None
    assert window.results_panel.headline.text() and window.results_panel.sentences.text()
    if option == "plan":
        assert "Wheel A (current)" in window.results_panel.headline.text()
    assert _caution_in_view(window) and answers.problems == []
    screenshot(window, f"window-question-{option}")


def test_level_change_is_used(qtbot, window):
    """Choosing the 1 % level reaches the statistics."""
    window.open_demo()
    wait_for_verdict(qtbot, window)
    window.question_panel.set_level(0.01)
    qtbot.waitUntil(lambda: window.last_result is not None and window.last_result.alpha == 0.01, timeout=60000)


def test_undo_brings_the_verdict_back(qtbot, window):
    """Undoing an edit restores the readings and, after recomputing, the earlier verdict."""
    window.open_demo()
    wait_for_verdict(qtbot, window)
    before = (window.last_result.p_value, window.results_panel.headline.text())
    window.grid.move_to(0, 1)
    window.grid.paste_text("\n".join(["9,99"] * 8))
    qtbot.waitUntil(lambda: window.last_result is not None and window.last_result.p_value != before[0], timeout=60000)
    qtbot.keyClick(window.grid, Qt.Key.Key_Z, Qt.KeyboardModifier.ControlModifier)
    qtbot.waitUntil(lambda: window.last_result is not None and window.last_result.p_value == before[0], timeout=60000)
    assert window.results_panel.headline.text() == before[1]


def test_a_group_without_readings_says_what_to_do(qtbot, window):
    """With readings in A only, the panel says B needs readings instead of showing a verdict."""
    window.grid.paste_text("1.0\n1.1\n")
    qtbot.waitUntil(lambda: "B has no readings yet" in window.results_panel.sentences.text(), timeout=60000)
    assert window.last_result is None and _caution_in_view(window)


def test_long_computation_shows_progress_and_can_be_stopped(qtbot, window):
    """An exact p-value on large tied groups runs off the GUI thread with progress; Stop ends it.

    245 + 245 readings on a 0.1 gauge: near the largest the exact count takes within its memory
    limit, a few seconds of work, so Stop is pressed while it runs."""
    generator = np.random.default_rng(3)
    rows = [f"{a:.1f}\t{b:.1f}" for a, b in zip(np.round(generator.normal(50, 8, 245), 1),
                                               np.round(generator.normal(51, 8, 245), 1))]
    window.question_panel.method.setCurrentIndex(window.question_panel.method.findData("exact"))
    window.grid.paste_text("\n".join(rows))
    qtbot.waitUntil(lambda: window.results_panel.busy_strip.isVisible(), timeout=60000)
    window.grid.move_to(2, 0)
    assert window.grid.currentIndex().row() == 2  # the window keeps answering while it computes
    qtbot.waitUntil(lambda: window.results_panel.progress.value() > 0, timeout=60000)
    assert window.results_panel.headline.text() == "Working out the verdict…"
    screenshot(window, "window-long-computation")
    qtbot.mouseClick(window.results_panel.stop_button, Qt.MouseButton.LeftButton)
    qtbot.waitUntil(lambda: window.results_panel.headline.text() == "Calculation stopped", timeout=60000)
    assert not window.results_panel.busy_strip.isVisible() and window.last_result is None
    assert window.sheet.counts(0).used == 245


def test_verdict_first_then_the_few_key_numbers_the_rest_folded(qtbot, window):
    """Under the verdict: the shift with its interval, the p-value and how it was found, and the
    readings used; every other number waits behind "More numbers", which the keyboard unfolds."""
    from window_support import press

    window.open_demo()
    wait_for_verdict(qtbot, window)
    panel = window.results_panel
    def place(label):
        corner = label.mapTo(panel, label.rect().topLeft())
        return corner.y(), corner.x()

    shown = sorted((key for key, label in panel._number_labels.items() if label.isVisible()),
                   key=lambda key: place(panel._number_labels[key]))
    assert shown[:4] == ["shift", "shift_ci_low", "shift_ci_high", "p_value"]
    assert set(shown) == {"shift", "shift_ci_low", "shift_ci_high", "p_value", "method", "n_a", "n_b"}
    assert panel.number_text("method").startswith("exact")
    assert panel.more_button.isVisible() and not panel.number_tooltip("u_a") is None
    assert not panel._number_labels["u_a"].isVisible()
    panel.more_button.setFocus()
    press(qtbot, Qt.Key.Key_Space)
    assert panel._number_labels["u_a"].isVisible()
    screenshot(window, "window-more-numbers")


def test_charts_write_numbers_with_the_sheets_decimal_mark_and_whole_axis_titles(qtbot, window):
    """The demo is typed with a decimal comma: the charts' axes write 0,30, not 0.30, and each axis
    title fits beside its axis (none cut off) at a shop-floor window size."""
    window.resize(1024, 700)
    window.open_demo()
    wait_for_verdict(qtbot, window)
    for tab in (window.dot_plot, window.cumulative_plot, window.null_plot):
        window.tabs.setCurrentWidget(tab)
        qtbot.waitUntil(lambda tab=tab: tab.chart is not None and tab.chart.isVisible(), timeout=60000)
        for side in ("bottom", "left"):
            axis = tab.chart.plot_item.getAxis(side)
            assert axis.tickStrings([0.3, 0.35], 1.0, 0.05) == ["0,30", "0,35"]
            title = axis.label.boundingRect().width()  # the text's own length, before any turning
            room = axis.height() if side == "left" else axis.width()
            assert title <= room, f"{tab.chart_name} {side} axis title needs {title:.0f} px, has {room}"
        screenshot(window, f"window-1024-chart-{tab.chart_name}")
