"""Share of each group's readings at or below each value, as step curves."""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt

from rankwise.stats import Analysis
from rankwise.ui.charts import style
from rankwise.ui.charts.chart_frame import ChartFrame
from rankwise.ui.charts.dot_plot import shorten

TOOLTIP = (
    "For each reading value, the share of the group's readings at or below it. "
    "A curve lying further right belongs to a group that tends to read higher; "
    "curves that cross suggest the groups differ in spread or shape, not just in level."
)

LINE_STYLES = (Qt.PenStyle.SolidLine, Qt.PenStyle.DashLine, Qt.PenStyle.DotLine,
               Qt.PenStyle.DashDotLine, Qt.PenStyle.DashDotDotLine)
"""Each group's curve also differs in line style, so colour is not the only carrier."""


def share_steps(values) -> tuple[np.ndarray, np.ndarray]:
    """Corner points of the step curve of the share of readings at or below each value.

    The curve is 0 left of the smallest reading and jumps at each distinct value by the share of
    readings equal to it, reaching 1 at the largest.
    """
    ordered = np.sort(np.asarray(values, dtype=float))
    if ordered.size == 0:
        return np.empty(0), np.empty(0)
    distinct, counts = np.unique(ordered, return_counts=True)
    shares = np.cumsum(counts) / ordered.size
    x = np.repeat(distinct, 2)
    y = np.column_stack((np.concatenate(([0.0], shares[:-1])), shares)).ravel()
    return x, y


class CumulativeSharePlot(ChartFrame):
    """One step curve per group with the group's marker at each step's top."""

    def __init__(self, parent=None) -> None:
        super().__init__(
            parent,
            accessible_name="Share of readings at or below each value",
            tooltip=TOOLTIP,
            idle_note="The share of readings at or below each value appears here, one curve per group.",
            bottom="Reading",
            left="Share at or below (%)",
            legend_corner="bottom-right",
        )
        self._curves: list[pg.PlotDataItem] = []
        self._tops: list[pg.ScatterPlotItem] = []
        self._samples: list[pg.PlotDataItem] = []
        """Legend samples showing line style and marker together (not drawn in the plot)."""
        self.clear()

    def _items_for(self, index: int) -> tuple[pg.PlotDataItem, pg.ScatterPlotItem]:
        """The curve and markers of group ``index`` (made the first time a group needs them)."""
        while len(self._curves) <= index:
            number = len(self._curves)
            pen = pg.mkPen(style.group_colour(number), width=2.5,
                           style=LINE_STYLES[number % len(LINE_STYLES)])
            curve = pg.PlotDataItem(pen=pen)
            marker = style.group_marker(number)
            sample = pg.PlotDataItem(pen=pen, symbol=marker["symbol"], symbolBrush=marker["brush"],
                                     symbolPen=marker["pen"], symbolSize=style.MARKER_SIZE - 2)
            tops = pg.ScatterPlotItem(size=style.MARKER_SIZE - 2, **marker)
            self.plot_item.addItem(curve)
            self.plot_item.addItem(tops)
            self._curves.append(curve)
            self._tops.append(tops)
            self._samples.append(sample)
        return self._curves[index], self._tops[index]

    def clear(self) -> None:
        """Remove all curves and show the idle note."""
        for curve, tops in zip(self._curves, self._tops):
            curve.setData([], [])
            tops.setData([], [])
        self._label_axes(bottom="Reading", left="Share at or below (%)")
        self.idle()

    def show_result(self, result, analysis: Analysis) -> None:
        """Draw each group's curve for the readings behind ``result``."""
        view = self._readings_to_draw(result, analysis)
        if view is None:
            return
        entries = []
        for index, (name, values) in enumerate(zip(view.names, view.values)):
            curve, tops = self._items_for(index)
            x, y = share_steps(values)
            curve.setData(x, 100.0 * y)
            tops.setData(x[1::2], 100.0 * y[1::2])
            entries.append((self._samples[index], shorten(name, 28)))
        for curve, tops in zip(self._curves[len(view.names):], self._tops[len(view.names):]):
            curve.setData([], [])
            tops.setData([], [])
        self._set_legend(entries)
        unit = f" ({view.unit})" if view.unit else ""
        self._label_axes(bottom=(view.characteristic or "Reading") + unit,
                         left="Share at or below (%)")
        numbers = [v for group in view.values for v in group]
        low, high = min(numbers), max(numbers)
        pad = (high - low) * 0.06 or max(abs(high) * 0.05, 1e-6)
        self.plot_item.setRange(xRange=(low - pad, high + pad), yRange=(0, 104), padding=0)
