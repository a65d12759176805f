"""Each chart's legend covers none of what the chart draws (curves, markers, bars, reference lines and
their labels), on the window's own charts at 1024 x 700 and on charts from the smallest size up; the
axis titles show whole; the room made for a legend has no tick labels above the chart's own top; the
numbers keep the sheet's decimal mark; the note of an empty chart shows whole.

What is drawn is read back from the plot items and placed in the scene with pyqtgraph's own mapping,
independently of the way the chart chooses the legend's place.
"""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
import pytest
from PySide6.QtCore import QPointF, QRectF
from PySide6.QtWidgets import QApplication

from test_charts import paired_case, plan_case, several_case
from window_support import PATIENCE_MS, answers, screenshot, wait_for_verdict, window  # noqa: F401

from rankwise.stats import Analysis, GroupReadings, Question, Settings
from rankwise.stats.two_groups import compare_two
from rankwise.ui.charts import CumulativeSharePlot, NullDistributionPlot, PowerCurvePlot, ReadingsDotPlot

SAMPLES_PER_SEGMENT = 24
"""Points read along each drawn line segment (the test looks at the line, not only at its corners)."""

WHEEL_A = (0.38, 0.40, 0.47, 0.43, 0.31, 0.51, 0.41, 0.43, 0.54, 0.44, 0.42, 0.37, 0.47, 0.31, 0.44, 0.42, 0.43, 0.47)
WHEEL_B = (0.36, 0.33, 0.31, 0.36, 0.32, 0.32, 0.34, 0.32, 0.34, 0.42, 0.36, 0.35, 0.33, 0.30, 0.31, 0.32)
"""Invented roughness readings (µm) shaped like the two-wheel demo: one group reads clearly lower."""


def two_wheels_case(decimal_mark: str = ","):
    groups = (GroupReadings("Wheel A (current)", WHEEL_A, "µm"), GroupReadings("Wheel B (new)", WHEEL_B, "µm"))
    analysis = Analysis(Question.TWO_GROUPS, groups, Settings(characteristic="Roughness Ra"), decimal_mark=decimal_mark)
    return compare_two(WHEEL_A, WHEEL_B, name_a=groups[0].name, name_b=groups[1].name, method="exact"), analysis


def _scene_points(view, x, y) -> np.ndarray:
    points = [view.mapViewToScene(QPointF(float(a), float(b))) for a, b in zip(x, y) if np.isfinite(a) and np.isfinite(b)]
    return np.array([(p.x(), p.y()) for p in points]).reshape(-1, 2)


def _along(points: np.ndarray, pairs: bool = False) -> np.ndarray:
    """Points along the polyline (or the separate segments, for ``pairs``) through ``points``."""
    if len(points) < 2:
        return points
    starts, ends = (points[0::2], points[1::2]) if pairs else (points[:-1], points[1:])
    ends = ends[: len(starts)]
    starts = starts[: len(ends)]
    steps = np.linspace(0.0, 1.0, SAMPLES_PER_SEGMENT)[:, None, None]
    return (starts[None] + steps * (ends - starts)[None]).reshape(-1, 2)


def drawn_in_scene(chart) -> tuple[np.ndarray, list[QRectF]]:
    """What the chart draws, in scene coordinates: points (on lines, markers, reference lines) and
    boxes (bars, markers' extent, reference line labels)."""
    view = chart.plot_item.getViewBox()
    points, boxes = [np.empty((0, 2))], []
    for item in chart.plot_item.items:
        if not item.isVisible() or isinstance(item, pg.TextItem):
            continue
        parts = (item.curve, item.scatter) if isinstance(item, pg.PlotDataItem) else (item,)
        for part in (p for p in parts if p.isVisible()):
            if isinstance(part, pg.PlotCurveItem):
                x, y = part.getData()
                if x is not None and len(x):
                    corners = _scene_points(view, x, y)
                    points.append(_along(corners, pairs=part.opts.get("connect") == "pairs"))
                    if part.opts.get("fillLevel") is not None:
                        floor = _scene_points(view, x, np.full(len(x), part.opts["fillLevel"]))
                        points.append(_along(np.column_stack((corners, floor)).reshape(-1, 2), pairs=True))
            elif isinstance(part, pg.ScatterPlotItem):
                x, y = part.getData()
                for centre in _scene_points(view, x, y):
                    half = part.opts["size"] / 2
                    boxes.append(QRectF(centre[0] - half, centre[1] - half, 2 * half, 2 * half))
            elif isinstance(part, pg.BarGraphItem) and len(part.opts["x"]):
                width = np.broadcast_to(part.opts["width"], np.shape(part.opts["x"]))
                for middle, height, w in zip(part.opts["x"], part.opts["height"], width):
                    top_left = view.mapViewToScene(QPointF(middle - w / 2, height))
                    bottom_right = view.mapViewToScene(QPointF(middle + w / 2, 0.0))
                    boxes.append(QRectF(top_left, bottom_right).normalized())
            elif isinstance(part, pg.InfiniteLine):
                (left, right), (bottom, top) = view.viewRange()
                value = part.value()
                ends = ([value, value], [bottom, top]) if round(part.angle) % 180 == 90 else ([left, right], [value, value])
                points.append(_along(_scene_points(view, *ends)))
                label = getattr(part, "label", None)  # a line written about beside the plot has none
                if label is not None and label.isVisible() and label.toPlainText():
                    boxes.append(label.sceneBoundingRect())
    return np.vstack(points), boxes


def legend_covers(chart) -> list[str]:
    """What of the drawing lies under the legend (empty when nothing does)."""
    legend = chart.legend.sceneBoundingRect()
    points, boxes = drawn_in_scene(chart)
    inside = [(x, y) for x, y in points if legend.contains(QPointF(x, y))]
    covered = [f"{len(inside)} points on lines, first at {inside[0]}"] if inside else []
    return covered + [f"box {box.getRect()}" for box in boxes if legend.intersects(box)]


def settle(qtbot, chart) -> None:
    """Let the legend reach its place (it is placed again once its entries have their size)."""
    for _ in range(3):
        QApplication.processEvents()
    qtbot.waitUntil(lambda: chart.legend.isVisible(), timeout=PATIENCE_MS)
    QApplication.processEvents()


def titles_cut_off(chart) -> list[str]:
    """Axis titles that do not show whole inside the chart."""
    shown = QRectF(chart.viewport().rect()).adjusted(-2, -2, 2, 2)
    cut = []
    for side in ("bottom", "left"):
        label = chart.plot_item.getAxis(side).label
        margin = label.document().documentMargin()  # the text item's empty border around its text
        box = QRectF(chart.mapFromScene(label.sceneBoundingRect()).boundingRect()).adjusted(margin, margin, -margin, -margin)
        text = label.document().documentLayout().documentSize()
        if not shown.contains(box) or label.boundingRect().width() + 1 < text.width():
            cut.append(f"{side}: {label.toPlainText()!r}")
    return cut


CASES = {
    "two wheels": two_wheels_case,
    "paired exact": lambda: paired_case("exact"),
    "paired normal": lambda: paired_case("normal"),
    "four presses": lambda: several_case(4, 20),
    "eight presses": lambda: several_case(8, 28),
    "plan": plan_case,
}
CHARTS = {CumulativeSharePlot: ("two wheels", "paired exact", "four presses", "eight presses"),
          NullDistributionPlot: ("two wheels", "paired exact", "paired normal", "four presses"),
          ReadingsDotPlot: ("two wheels", "paired exact", "four presses", "eight presses"),
          PowerCurvePlot: ("plan",)}


@pytest.mark.parametrize("size", [(320, 240), (540, 250), (720, 460), (1100, 620)])
@pytest.mark.parametrize("chart_class", list(CHARTS), ids=lambda cls: cls.__name__)
def test_the_legend_covers_nothing_drawn_and_the_axis_titles_show_whole(qtbot, chart_class, size):
    chart = chart_class()
    qtbot.addWidget(chart)
    chart.resize(*size)
    chart.show()
    qtbot.waitExposed(chart)
    for name in CHARTS[chart_class]:
        if name == "eight presses" and size[0] < 540:
            continue  # eight long group names need more than the smallest chart (the legend is taller than it)
        result, analysis = CASES[name]()
        chart.use_decimal_mark(analysis.decimal_mark)
        chart.show_result(result, analysis)
        settle(qtbot, chart)
        assert legend_covers(chart) == [], (name, chart.legend_corner)
        assert titles_cut_off(chart) == [], name
        whole = QRectF(chart.viewport().rect())
        assert whole.contains(chart.mapFromScene(chart.legend.sceneBoundingRect()).boundingRect().toRectF()), name


def test_the_legend_moves_when_the_chart_is_resized(qtbot):
    """A chart made smaller (a pane folded, a window narrowed) places its legend again."""
    chart = NullDistributionPlot()
    qtbot.addWidget(chart)
    chart.resize(900, 500)
    chart.show()
    qtbot.waitExposed(chart)
    chart.show_result(*two_wheels_case())
    settle(qtbot, chart)
    for size in ((420, 260), (330, 240), (900, 500)):
        chart.resize(*size)
        qtbot.waitUntil(lambda s=size: chart.width() == s[0], timeout=PATIENCE_MS)
        settle(qtbot, chart)
        assert legend_covers(chart) == [], size


def test_room_for_the_legend_has_no_tick_labels_and_numbers_keep_the_decimal_comma(qtbot):
    """When the value axis is raised to clear a corner, its labelled ticks stop at the chart's own
    top (a share never reads above 100 %); the tick numbers are written with the sheet's comma."""
    chart = CumulativeSharePlot()
    qtbot.addWidget(chart)
    chart.resize(540, 250)
    chart.show()
    qtbot.waitExposed(chart)
    result, analysis = several_case(4, 20)
    chart.use_decimal_mark(",")
    chart.show_result(result, analysis)
    settle(qtbot, chart)
    left = chart.plot_item.getAxis("left")
    (_, _), (_, top) = chart.plot_item.viewRange()
    labelled = [value for _, values in left.tickValues(0.0, top, 250) for value in values]
    assert top > 104 and max(labelled) <= 100  # the room was needed here, and left bare
    assert legend_covers(chart) == []
    chart.show_result(*two_wheels_case(","))
    settle(qtbot, chart)
    bottom = chart.plot_item.getAxis("bottom")
    strings = bottom.tickStrings([0.3, 0.35], 1.0, 0.05)
    assert strings == ["0,30", "0,35"]


@pytest.mark.parametrize("tab", ["cumulative_plot", "null_plot", "dot_plot"])
def test_the_windows_charts_at_1024_x_700_keep_their_legends_off_the_data(qtbot, window, tab):
    """The demo's charts in the window at 1024 x 700: the legend covers nothing drawn, the titles show."""
    window.resize(1024, 700)
    window.open_demo()
    wait_for_verdict(qtbot, window)
    holder = getattr(window, tab)
    window.tabs.setCurrentWidget(holder)
    qtbot.waitUntil(lambda: holder.chart is not None and holder.chart.legend.isVisible(), timeout=PATIENCE_MS)
    chart = holder.chart
    settle(qtbot, chart)
    assert legend_covers(chart) == [], chart.legend_corner
    assert titles_cut_off(chart) == []
    assert chart.plot_item.getAxis("left").decimal_mark == window.last_analysis.decimal_mark == ","
    screenshot(window, f"window-1024x700-{tab.replace('_', '-')}")


@pytest.mark.parametrize("chart_class", list(CHARTS), ids=lambda cls: cls.__name__)
def test_the_note_of_an_empty_chart_shows_whole_on_a_narrow_chart(qtbot, chart_class):
    """The plain-words note of a chart with nothing to show breaks into lines inside the plot."""
    chart = chart_class()
    qtbot.addWidget(chart)
    chart.resize(330, 240)
    chart.show()
    qtbot.waitExposed(chart)
    chart.clear()
    QApplication.processEvents()
    view = chart.plot_item.getViewBox()
    note = chart._note
    assert note.isVisible() and note.toPlainText()
    assert view.sceneBoundingRect().contains(note.sceneBoundingRect()), (note.sceneBoundingRect(), view.sceneBoundingRect())
