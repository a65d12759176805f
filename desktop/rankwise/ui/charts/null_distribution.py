"""Where the observed statistic falls among the results the tests expect if the change did nothing."""

from __future__ import annotations

from statistics import NormalDist

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt
from scipy import stats as scipy_stats

from rankwise.stats import Analysis, PairedResult, SeveralGroupsResult, TwoGroupResult
from rankwise.ui.charts import style
from rankwise.ui.charts.chart_frame import ChartFrame
from rankwise.wording.numbers import format_level, with_mark

TOOLTIP = (
    "If the change did nothing, the test statistic would still vary from sample to sample: the "
    "bars (or the curve) show how likely each value would be. The hatched part is where a result "
    "would count as a change at the chosen significance level; the vertical line is what these "
    "readings gave."
)

CURVE_POINTS = 400


def critical_mask(probabilities, alpha: float, tail: str) -> np.ndarray:
    """Which values of a discrete statistic would count as a change at ``alpha``.

    ``tail`` is "lower", "upper" or "both". A value counts when its exact p-value is <= alpha:
    its own tail's cumulative probability, or for "both" twice the smaller tail (the doubling
    convention that the statistics service uses for two-sided exact p-values).
    """
    if tail not in ("lower", "upper", "both"):
        raise ValueError(f"tail must be 'lower', 'upper' or 'both', not {tail!r}")
    p = np.asarray(probabilities, dtype=float)
    lower = np.cumsum(p)
    upper = np.cumsum(p[::-1])[::-1]
    tolerance = 1e-12
    if tail == "lower":
        return lower <= alpha + tolerance
    if tail == "upper":
        return upper <= alpha + tolerance
    return np.minimum(1.0, 2.0 * np.minimum(lower, upper)) <= alpha + tolerance


def tail_of(result, statistic: str) -> str:
    """Which tail of ``statistic`` speaks for the result's alternative.

    U of A counts pairs where A reads higher, so "B reads higher" is its lower tail; W+ and z grow
    when B (the second reading) reads higher, so that is their upper tail.
    """
    if result.alternative == "two-sided":
        return "both"
    b_higher_is_upper = not statistic.strip().upper().startswith("U")
    upper = (result.alternative == "b-greater") == b_higher_is_upper
    return "upper" if upper else "lower"


class NullDistributionPlot(ChartFrame):
    """Exact distribution as bars (or the normal / chi-square curve), region shaded, result marked."""

    def __init__(self, parent=None) -> None:
        super().__init__(
            parent,
            accessible_name="Where the result falls if the change did nothing",
            tooltip=TOOLTIP,
            idle_note="Where the result falls among those expected if the change did nothing appears here.",
            bottom="Test statistic",
            left="Chance",
        )
        region_brush = pg.mkBrush(style.REGION_COLOUR)
        region_brush.setStyle(Qt.BrushStyle.BDiagPattern)
        self._bars = pg.BarGraphItem(x=[], height=[], width=0.8, brush=pg.mkBrush("#A9C4DA"),
                                     pen=pg.mkPen("#5A7A94", width=0.8))
        self._region_bars = pg.BarGraphItem(x=[], height=[], width=0.8, brush=region_brush,
                                            pen=pg.mkPen(style.REGION_COLOUR, width=1.2))
        self._curve = pg.PlotDataItem(pen=pg.mkPen("#3B5B75", width=2.5))
        self._tails = [pg.PlotDataItem(pen=pg.mkPen(style.REGION_COLOUR, width=1.5),
                                       fillLevel=0.0, fillBrush=region_brush) for _ in range(2)]
        for item in (self._bars, self._region_bars, self._curve, *self._tails):
            self.plot_item.addItem(item)
        self._observed = pg.InfiniteLine(angle=90, movable=False,
                                         pen=pg.mkPen(style.OBSERVED_COLOUR, width=3),
                                         label="", labelOpts={"position": 0.7, "color": style.INK,
                                                              "anchors": [(0, 0.5), (0, 0.5)],
                                                              "fill": pg.mkBrush(255, 255, 255, 220)})
        self._observed.setZValue(20)
        self.plot_item.addItem(self._observed, ignoreBounds=True)
        self.shown: str = ""
        """What is drawn: "exact", "normal", "chi-square" or "" (nothing)."""
        self._mark = "."
        self.clear()

    def clear(self) -> None:
        """Remove the distribution and show the idle note."""
        self.shown = ""
        for item in (self._bars, self._region_bars):
            item.setOpts(x=[], height=[])
        for item in (self._curve, *self._tails):
            item.setData([], [])
        self._observed.setVisible(False)
        self._label_axes(bottom="Test statistic", left="Chance")
        self.idle()

    def show_result(self, result, analysis: Analysis) -> None:
        """Draw the distribution behind ``result``'s p-value with its observed value."""
        self._mark = analysis.decimal_mark
        if isinstance(result, (TwoGroupResult, PairedResult)):
            distribution = result.null_distribution
            if result.method == "exact" and distribution is not None:
                self._show_exact(result, distribution)
            else:
                self._show_normal(result)
        elif isinstance(result, SeveralGroupsResult):
            self._show_chi_square(result)
        else:
            self.clear()
            self._show_note("A planning question has no observed result to place.")

    def _show_exact(self, result, distribution) -> None:
        """Bars of the exact permutation distribution; the region that would count, hatched."""
        self.clear()
        self._hide_note()
        self.shown = "exact"
        x = np.asarray(distribution.support, dtype=float)
        p = np.asarray(distribution.probabilities, dtype=float)
        mask = critical_mask(p, result.alpha, tail_of(result, distribution.statistic))
        width = 0.8 * (float(np.min(np.diff(x))) if x.size > 1 else 1.0)
        self._bars.setOpts(x=x[~mask], height=100 * p[~mask], width=width)
        self._region_bars.setOpts(x=x[mask], height=100 * p[mask], width=width)
        self._mark_observed(distribution.observed, f"{distribution.statistic} = {distribution.observed:g}",
                            float(x.min()), float(x.max()))
        self._label_axes(bottom=f"{distribution.statistic} (exact distribution if the change did nothing)",
                         left="Chance (%)")
        self._set_legend([(self._bars, "if the change did nothing"),
                          (self._region_bars, self._counts_as_change(result.alpha))])
        self.plot_item.setRange(xRange=(x.min() - width, x.max() + width), yRange=(0, 100 * p.max() * 1.15),
                                padding=0)

    def _show_curve(self, grid, density, region, observed: float, label: str, axis: str,
                    alpha: float) -> None:
        """A continuous reference curve with up to two shaded tails and the observed value."""
        self.clear()
        self._hide_note()
        self._curve.setData(grid, density)
        for item, (low, high) in zip(self._tails, region):
            inside = (grid >= low) & (grid <= high)
            item.setData(grid[inside], density[inside])
        self._mark_observed(observed, label, float(grid.min()), float(grid.max()))
        self._label_axes(bottom=axis, left="Density")
        self._set_legend([(self._curve, "if the change did nothing"),
                          (self._tails[0], self._counts_as_change(alpha))])
        self.plot_item.setRange(xRange=(grid.min(), grid.max()), yRange=(0, density.max() * 1.15), padding=0)

    def _show_normal(self, result) -> None:
        """The standard normal curve with the observed z (normal approximation was used)."""
        normal = NormalDist()
        z = float(result.z)
        reach = max(4.0, abs(z) + 0.8)
        grid = np.linspace(-reach, reach, CURVE_POINTS)
        density = np.array([normal.pdf(value) for value in grid])
        tail = tail_of(result, "z")
        cut = normal.inv_cdf(1 - result.alpha / 2 if tail == "both" else 1 - result.alpha)
        region = {"both": [(-np.inf, -cut), (cut, np.inf)], "upper": [(cut, np.inf)],
                  "lower": [(-np.inf, -cut)]}[tail]
        self._show_curve(grid, density, region, z, f"z = {z:.2f}",
                         "z (normal approximation if the change did nothing)", result.alpha)
        self.shown = "normal"

    def _show_chi_square(self, result: SeveralGroupsResult) -> None:
        """The chi-square curve with the observed Kruskal-Wallis H (upper tail counts)."""
        cut = float(scipy_stats.chi2.ppf(1 - result.alpha, result.df))
        reach = max(cut * 1.6, result.h * 1.15, 1.0)
        grid = np.linspace(0.0, reach, CURVE_POINTS)
        density = scipy_stats.chi2.pdf(grid, result.df)
        density = np.where(np.isfinite(density), density, 0.0)
        if result.df <= 2:
            density = np.minimum(density, float(scipy_stats.chi2.pdf(reach / 40.0, result.df)))
        self._show_curve(grid, density, [(cut, np.inf)], result.h, f"H = {result.h:.2f}",
                         f"Kruskal-Wallis H (chi-square, {result.df} degrees of freedom)", result.alpha)
        self.shown = "chi-square"

    def _mark_observed(self, value: float, label: str, low: float, high: float) -> None:
        """The vertical line at the observed statistic, labelled on the side with more room."""
        self._observed.setVisible(True)
        self._observed.setValue(value)
        self._label_toward_middle(self._observed, low, high)
        shown = with_mark(f"observed: {label}", self._mark)
        self._observed.label.setFormat(shown.replace("{", "{{").replace("}", "}}"))

    def _counts_as_change(self, alpha: float) -> str:
        """The legend entry of the shaded region, with the significance level."""
        return with_mark(f"would count as a change at {format_level(alpha)}", self._mark)
