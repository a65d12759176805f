"""Predicted power against parts per group, for planning how many parts to measure."""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg

from rankwise.stats import Analysis, PlanResult
from rankwise.ui.charts import style
from rankwise.ui.charts.chart_frame import ChartFrame

TOOLTIP = (
    "How likely the test is to detect the shift you entered, for each number of parts per group. "
    "The dashed level line is the chance you asked for; the vertical line is the planned number "
    "of parts."
)


class PowerCurvePlot(ChartFrame):
    """Power (in %) against parts per group, with the target power and the planned size marked."""

    def __init__(self, parent=None) -> None:
        super().__init__(
            parent,
            accessible_name="Chance of detecting the shift against parts per group",
            tooltip=TOOLTIP,
            idle_note="For a planning question, the chance of detecting the shift appears here.",
            bottom="Parts per group",
            left="Chance to detect it (%)",
            legend_corner="bottom-right",
        )
        self._curve = pg.PlotDataItem(pen=pg.mkPen(style.OBSERVED_COLOUR, width=2.5), symbol="o",
                                      symbolSize=7, symbolBrush=pg.mkBrush(style.OBSERVED_COLOUR),
                                      symbolPen=pg.mkPen(style.INK, width=0.6))
        self._simulated = pg.ScatterPlotItem(size=style.MARKER_SIZE + 3, symbol="d",
                                             brush=pg.mkBrush(style.TARGET_COLOUR),
                                             pen=pg.mkPen(style.INK, width=1))
        self._simulated.setZValue(15)
        self.plot_item.addItem(self._curve)
        self.plot_item.addItem(self._simulated)
        label_options = {"color": style.INK, "fill": pg.mkBrush(255, 255, 255, 220)}
        target_pen = pg.mkPen(style.TARGET_COLOUR, width=2, style=pg.QtCore.Qt.PenStyle.DashLine)
        self._target = pg.InfiniteLine(angle=0, movable=False, pen=target_pen, label="",
                                       labelOpts={**label_options, "position": 0.05,
                                                  "anchors": [(0, 1), (0, 1)]})
        self._planned = pg.InfiniteLine(angle=90, movable=False, pen=pg.mkPen(style.INK, width=2),
                                        label="", labelOpts={**label_options, "position": 0.55})
        for line in (self._target, self._planned):
            self.plot_item.addItem(line, ignoreBounds=True)
        self.clear()

    def clear(self) -> None:
        """Remove the curve and show the idle note."""
        self._curve.setData([], [])
        self._simulated.setData([], [])
        self._target.setVisible(False)
        self._planned.setVisible(False)
        self.idle()

    def show_result(self, result, analysis: Analysis) -> None:
        """Draw the power curve of a planning result (other results: a note says there is none)."""
        if not isinstance(result, PlanResult):
            self.clear()
            self._show_note("The power curve belongs to the question \"how many parts?\".")
            return
        if not result.power_curve:
            self.clear()
            self._show_note("This plan has no power curve to show.")
            return
        self._hide_note()
        sizes = np.array([point.n_a for point in result.power_curve], dtype=float)
        power = np.array([100.0 * point.power for point in result.power_curve])
        self._curve.setData(sizes, power)
        self._target.setVisible(True)
        self._target.setValue(100.0 * result.power)
        self._target.label.setFormat(f"chance asked for: {100.0 * result.power:g} %")
        self._planned.setVisible(True)
        self._planned.setValue(result.n_a)
        per_group = (f"{result.n_a} pairs" if result.paired else
                     f"{result.n_a} in each of {result.groups} groups" if result.groups >= 3 else
                     f"{result.n_a} per group" if result.n_a == result.n_b else
                     f"{result.n_a} in A, {result.n_b} in B")
        self._planned.label.setFormat(f"planned: {per_group}")
        self._label_toward_middle(self._planned, max(0.0, sizes.min() - 1), max(sizes.max(), result.n_a) + 1)
        entries = [(self._curve, "predicted (Kruskal-Wallis approximation)" if result.groups >= 3 else "predicted (Noether)")]
        if result.simulated_power is not None:
            self._simulated.setData([result.n_a], [100.0 * result.simulated_power])
            entries.append((self._simulated, f"checked by simulation: {100.0 * result.simulated_power:.0f} %"))
        else:
            self._simulated.setData([], [])
        self._set_legend(entries)
        self._label_axes(bottom="Pairs of readings" if result.paired else
                         "Parts in each group" if result.groups >= 3 else "Parts in group A",
                         left="Chance to detect it (%)")
        self.plot_item.setRange(xRange=(max(0.0, sizes.min() - 1), max(sizes.max(), result.n_a) + 1),
                                yRange=(0, 104), padding=0)
