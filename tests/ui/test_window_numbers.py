"""Numbers in the window follow the decimal mark the readings were typed with, and read whole."""

from __future__ import annotations

import re

from window_support import answers, screenshot, wait_for_verdict, window  # noqa: F401

from rankwise.stats.results import PlanResult

POINT_BETWEEN_DIGITS = re.compile(r"\d\.\d")


def _shown_texts(window) -> list[str]:
    panel = window.results_panel
    texts = [panel.headline.text(), panel.sentences.text(), window.rank_table.sums.text()]
    texts += [label.text() for label in panel._number_labels.values()]
    model = window.rank_table.model
    texts += [str(model.index(row, column).data() or "") for row in range(model.rowCount())
              for column in range(model.columnCount())]
    return texts


def test_readings_typed_with_commas_are_shown_with_commas_everywhere(qtbot, window):
    """The roughness demo (invented data) is typed with decimal commas: no number turns into a point."""
    window.open_demo()
    wait_for_verdict(qtbot, window)
    assert window.last_analysis.decimal_mark == ","
    texts = _shown_texts(window)
    assert "0,30" in texts and window.results_panel.number_text("median_a") == "0,43 µm"
    offending = [text for text in texts if POINT_BETWEEN_DIGITS.search(text)]
    assert offending == []


def test_readings_typed_with_points_keep_points(qtbot, window):
    window.grid.paste_text("0.38\t0.36\n0.40\t0.33\n0.47\t0.31\n0.43\t0.36\n0.51\t0.32\n")
    wait_for_verdict(qtbot, window)
    assert window.last_analysis.decimal_mark == "."
    assert window.results_panel.number_text("median_a") == "0.43"
    assert not any("," in text and re.search(r"\d,\d", text) for text in _shown_texts(window))


def test_every_key_number_value_is_shown_whole(qtbot, window):
    """Each value label gets at least the width and height its text needs (nothing wrapped away or cut)."""
    window.open_demo()
    wait_for_verdict(qtbot, window)
    labels = window.results_panel._number_labels
    assert labels
    qtbot.waitUntil(lambda: all(label.width() >= label.fontMetrics().boundingRect(label.text()).width()
                                and label.height() >= label.fontMetrics().height()
                                for label in labels.values()), timeout=60000)  # laid out
    for key, label in labels.items():
        needed = label.fontMetrics().boundingRect(label.text())
        assert label.width() >= needed.width(), key
        assert label.height() >= label.fontMetrics().height(), key
    screenshot(window, "window-key-numbers")


def test_a_plan_for_the_same_parts_measured_twice(qtbot, window):
    """The plan question offers the same parts measured twice; its spread is labelled as the differences'."""
    window.open_demo()
    wait_for_verdict(qtbot, window)
    panel = window.question_panel
    panel.select_option("plan")
    panel.planned_shift.setValue(0.03)
    panel.planned_spread.setValue(0.04)
    panel.plan_design.setCurrentIndex(panel.plan_design.findData(True))
    qtbot.waitUntil(lambda: isinstance(window.last_result, PlanResult) and window.last_result.paired
                    and not window.runner.busy, timeout=60000)
    assert window.last_analysis.settings.plan_paired is True
    assert panel._rows["spread"][0].text() == "Spread of the differences (SD)"
    assert "each part twice" in window.results_panel.headline.text()
    assert window.results_panel.number_text("spread") == "0,04 µm"
    restored = panel.to_dict()
    assert restored["plan_paired"] is True
    screenshot(window, "window-question-plan-paired")


def test_the_number_boxes_of_the_question_follow_the_readings_mark(qtbot, window):
    window.open_demo()
    wait_for_verdict(qtbot, window)
    window.question_panel.select_option("plan")
    window.question_panel.planned_shift.setValue(0.03)
    qtbot.waitUntil(lambda: isinstance(window.last_result, PlanResult) and not window.runner.busy, timeout=60000)
    assert window.question_panel.planned_shift.text() == "0,030"
    assert window.question_panel.planned_shift.value() == 0.03
