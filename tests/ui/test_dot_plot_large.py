"""The dots of a large result are chosen and placed on a thread of their own: the same drawing, once
ready, and never the dots of a result that is no longer asked for."""

from __future__ import annotations

import numpy as np

from window_support import PATIENCE_MS

import rankwise.ui.charts.dot_plot as dot_plot
from rankwise.ui.charts import ReadingsDotPlot

from test_charts import paired_case, several_case


def _drawing(chart) -> list:
    dots = [tuple(np.asarray(part).tolist() for part in item.getData()) for item in chart._dots]
    lines = {key: (line.isVisible(), line.value()) for key, line in chart._lines.items()}
    return [dots, chart._medians.getData()[1].tolist(), len(chart._pair_lines.getData()[0]), lines,
            chart.plot_item.getViewBox().viewRange()[1], chart.plot_item.getAxis("bottom").labelText]


def _chart(qtbot):
    chart = ReadingsDotPlot()
    qtbot.addWidget(chart)
    return chart


def test_dots_placed_on_their_own_thread_are_drawn_the_same(qtbot, monkeypatch):
    for case in (paired_case(), several_case()):
        at_once = _chart(qtbot)
        at_once.show_result(*case)
        monkeypatch.setattr(dot_plot, "LARGE_VIEW_READINGS", 0)
        aside = _chart(qtbot)
        aside.show_result(*case)
        qtbot.waitUntil(lambda chart=aside: chart.view is not None, timeout=PATIENCE_MS)
        assert _drawing(aside) == _drawing(at_once)
        monkeypatch.undo()


def test_dots_placed_too_late_are_not_drawn(qtbot, monkeypatch):
    monkeypatch.setattr(dot_plot, "LARGE_VIEW_READINGS", 0)
    chart = _chart(qtbot)
    with qtbot.waitSignal(chart._dots_placed, timeout=PATIENCE_MS):
        chart.show_result(*paired_case())
        chart.clear()
    assert chart.view is None and all(len(item.getData()[0]) == 0 for item in chart._dots)
