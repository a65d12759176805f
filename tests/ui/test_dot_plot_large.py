"""The dots of a large result are chosen and placed on a background thread: the same drawing, once
ready, and never the dots of a result that is no longer asked for."""

from __future__ import annotations

import numpy as np
import pytest

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


def test_dots_of_one_look_are_set_at_once_and_drawn_as_pyqtgraph_draws_them(qtbot):
    """``SameLookDots`` gives every dot the first dot's place in the symbol atlas in one step; the
    reference is pyqtgraph's own ``ScatterPlotItem``, which looks each dot up: same places, same picture."""
    import pyqtgraph as pg

    from rankwise.ui.charts import style
    from rankwise.ui.charts.same_look_dots import SameLookDots

    generator = np.random.default_rng(5)  # invented positions
    x, y = generator.random(3000), np.round(generator.random(3000), 2)
    drawn = []
    for kind in (pg.ScatterPlotItem, SameLookDots):
        plot = pg.PlotWidget()
        qtbot.addWidget(plot)
        plot.resize(400, 300)
        dots = kind(size=style.MARKER_SIZE, **style.group_marker(1), hoverable=True)
        plot.addItem(dots)
        dots.setData(x=x[:7], y=y[:7])
        dots.addPoints(x=x[7:], y=y[7:])
        plot.show()
        qtbot.waitExposed(plot)
        drawn.append((dots.data["sourceRect"].copy(), plot.grab().toImage()))
    (places, picture), (same_places, same_picture) = drawn
    assert np.array_equal(places, same_places) and np.all(same_places["w"] > 0)
    assert picture == same_picture


def test_the_dot_plot_sets_its_dots_at_once(qtbot):
    from rankwise.ui.charts.same_look_dots import SameLookDots

    chart = _chart(qtbot)
    chart.show_result(*several_case())
    assert chart._dots and all(isinstance(item, SameLookDots) for item in chart._dots)


def test_dots_and_ranks_are_worked_on_by_long_lived_background_threads(qtbot, monkeypatch):
    """Large results are handed to the same few background threads, never to the window's thread,
    and showing a result starts no thread (starting one made the window wait for it)."""
    import threading

    import rankwise.ui.rank_table as rank_table
    from rankwise.ui import background

    monkeypatch.setattr(dot_plot, "LARGE_VIEW_READINGS", 0)
    monkeypatch.setattr(rank_table, "LARGE_RESULT_READINGS", 0)
    worked_on = []
    place, contents = dot_plot._place_dots, rank_table._contents
    monkeypatch.setattr(dot_plot, "_place_dots", lambda view: (worked_on.append(threading.current_thread()), place(view))[1])
    monkeypatch.setattr(rank_table, "_contents",
                        lambda *case: (worked_on.append(threading.current_thread()), contents(*case))[1])
    chart, table = _chart(qtbot), rank_table.RankTable()
    qtbot.addWidget(table)
    chart.show_result(*several_case())  # the first hand-off may start the threads
    qtbot.waitUntil(lambda: chart.view is not None, timeout=PATIENCE_MS)
    started = threading.Thread.start
    monkeypatch.setattr(threading.Thread, "start", lambda thread: pytest.fail("a thread was started"))
    for number, case in enumerate((paired_case(), several_case(), paired_case())):
        chart.show_result(*case)
        table.show_result(*case)
        qtbot.waitUntil(lambda done=3 + 2 * number: len(worked_on) == done, timeout=PATIENCE_MS)
    monkeypatch.setattr(threading.Thread, "start", started)
    assert threading.main_thread() not in worked_on
    assert set(worked_on) <= set(background._threads) and len(background._threads) == background.THREADS
