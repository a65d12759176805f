"""Readings per group as dots, with each group's median and the specification limits."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Signal

from rankwise.stats import Analysis
from rankwise.ui.background import hand_off
from rankwise.ui.charts import style
from rankwise.ui.charts.chart_frame import ChartFrame
from rankwise.ui.charts.readings_view import ReadingsView, stacked_offsets
from rankwise.ui.charts.same_look_dots import SameLookDots

MEDIAN_HALF_WIDTH = 0.38
"""Half the width of a median bar, in group slots."""
TIE_SPACING = 0.07
"""Sideways distance between equal readings, in group slots."""
NAME_CHARACTERS = 22
"""Group names longer than this are shortened under the axis (the full name is in the tooltip)."""
PIXELS_PER_CHARACTER = 7.5
"""Rough width of one character of the axis font, to decide how much of a name fits under a column."""
DOT_LIMIT = 4000
"""A group with more readings shows this many dots: an even sample of its readings in order of size
(for the same parts measured twice, every k-th part), so that a 10^6-reading export draws at once.
The median bars, the limits and the rank table still use every reading."""
LARGE_VIEW_READINGS = 50_000
"""With more readings than this the dots are chosen and placed on a background thread; the chart
shows them when that is done."""

TOOLTIP = (
    "Each dot is one reading; equal readings sit side by side so that every reading shows. "
    "The heavy bar across a group is its median. Dashed lines are the specification limits "
    "(LSL, USL), the dotted line the nominal value; their values stand on the right-hand edge."
)


def shorten(name: str, characters: int = NAME_CHARACTERS) -> str:
    """``name`` cut to ``characters`` with an ellipsis when longer."""
    return name if len(name) <= characters else name[: characters - 1].rstrip() + "…"


def dots_to_draw(values: tuple[tuple[float, ...], ...], paired: bool) -> list[np.ndarray]:
    """The readings drawn as dots per group: all of them, or ``DOT_LIMIT`` of a larger group, taken
    evenly from its readings in order of size (its smallest and largest included); for the same
    parts measured twice, the same parts from both groups, evenly in entry order."""
    return _sample([np.asarray(group, dtype=float) for group in values], paired)


def _sample(arrays: list[np.ndarray], paired: bool) -> list[np.ndarray]:
    """``dots_to_draw`` of readings already in arrays."""
    if paired:
        count = min((array.size for array in arrays), default=0)
        if count > DOT_LIMIT:
            picks = np.linspace(0, count - 1, DOT_LIMIT).round().astype(int)
            return [array[picks] for array in arrays]
        return arrays
    return [np.sort(array)[np.linspace(0, array.size - 1, DOT_LIMIT).round().astype(int)]
            if array.size > DOT_LIMIT else array for array in arrays]


@dataclass(frozen=True)
class _Dots:
    """Where the dots of a view go: the readings drawn per group, their places across the axis, and
    the lowest and highest of all readings."""

    drawn: list[np.ndarray]
    positions: list[np.ndarray]
    low: float | None
    high: float | None


def _place_dots(view: ReadingsView) -> _Dots:
    """The dots of ``view`` placed (numpy only: it may run on a background thread)."""
    arrays = [np.asarray(group, dtype=float) for group in view.values]
    drawn = _sample(arrays, view.paired)
    positions = [index + stacked_offsets(values, spacing=TIE_SPACING, half_width=MEDIAN_HALF_WIDTH - 0.04)
                 for index, values in enumerate(drawn)]
    filled = [array for array in arrays if array.size]
    return _Dots(drawn, positions, min((float(np.min(a)) for a in filled), default=None),
                 max((float(np.max(a)) for a in filled), default=None))


class ReadingsDotPlot(ChartFrame):
    """Dots per group (stacked where readings are equal), medians, LSL/USL and nominal lines.

    For the same parts measured twice, a thin line joins each part's first and second reading.
    """

    _dots_placed = Signal(int, object, object)

    def __init__(self, parent=None) -> None:
        super().__init__(
            parent,
            accessible_name="Readings per group",
            tooltip=TOOLTIP,
            idle_note="The readings appear here as dots, one column per group.",
            bottom="Group",
            left="Reading",
        )
        self._pair_lines = pg.PlotCurveItem(pen=pg.mkPen("#9A9A9A", width=1), connect="pairs")
        self._medians = pg.PlotCurveItem(pen=style.median_pen(), connect="pairs")
        self._medians.setZValue(8)
        self.plot_item.addItem(self._pair_lines)
        self.plot_item.addItem(self._medians)
        self._dots: list[pg.ScatterPlotItem] = []
        self._lines = {
            "lsl": self._reference_line(style.limit_pen()),
            "usl": self._reference_line(style.limit_pen()),
            "nominal": self._reference_line(style.nominal_pen()),
        }
        self._limit_labels: dict[str, str] = {}
        limits_axis = self.plot_item.getAxis("right")
        limits_axis.setPen(pg.mkPen(style.INK))
        limits_axis.setTextPen(pg.mkPen(style.INK))
        limits_axis.setTickFont(style.chart_font(10.0))
        self.view: ReadingsView | None = None
        self._asked = 0
        """Counts the results asked for, so that dots placed meanwhile on a thread are drawn only if still wanted."""
        self._dots_placed.connect(self._draw)
        self.clear()

    def _reference_line(self, pen) -> pg.InfiniteLine:
        """A horizontal line, created once and moved as limits change; its name and value are
        written beside the plot, on the right-hand axis, where no dot can cover them."""
        line = pg.InfiniteLine(angle=0, movable=False, pen=pen)
        line.setZValue(5)
        self.plot_item.addItem(line, ignoreBounds=True)
        return line

    def limit_labels(self) -> dict[str, str]:
        """The labels of the limit lines shown ("LSL 11,5"), by "lsl", "usl" and "nominal"."""
        return dict(self._limit_labels)

    def _dots_for(self, index: int) -> pg.ScatterPlotItem:
        """The scatter item of group ``index`` (made the first time a group needs it)."""
        while len(self._dots) <= index:
            number = len(self._dots)
            dots = SameLookDots(
                size=style.MARKER_SIZE,
                **style.group_marker(number),
                hoverable=True,
                tip=lambda x, y, data: self.dot_tip(x, y),
            )
            dots.setZValue(10)
            self.plot_item.addItem(dots)
            self._dots.append(dots)
        return self._dots[index]

    def clear(self) -> None:
        """Remove all readings and show the idle note."""
        self._asked = getattr(self, "_asked", 0) + 1
        self.view = None
        for dots in self._dots:
            dots.setData([], [])
        self._medians.setData([], [])
        self._pair_lines.setData([], [])
        for line in self._lines.values():
            line.setVisible(False)
        self._limit_labels = {}
        self.plot_item.hideAxis("right")
        self.plot_item.getAxis("bottom").setTicks(None)
        self._label_axes(bottom="Group", left="Reading")
        self.idle()

    def show_result(self, result, analysis: Analysis) -> None:
        """Draw the readings behind ``result`` (a planning result has none: a note says so)."""
        view = self._readings_to_draw(result, analysis)
        if view is None:
            return
        self._asked += 1
        if sum(len(values) for values in view.values) <= LARGE_VIEW_READINGS:
            self._draw(self._asked, view, _place_dots(view))
            return
        asked = self._asked

        def place() -> None:
            dots = _place_dots(view)
            try:
                self._dots_placed.emit(asked, view, dots)
            except RuntimeError:  # the window closed meanwhile
                pass

        hand_off(place)

    def _draw(self, asked: int, view: ReadingsView, dots: _Dots) -> None:
        if asked != self._asked:
            return  # a newer result (or none) is asked for by now
        self.view = view
        for index, (x, values) in enumerate(zip(dots.positions, dots.drawn)):
            self._dots_for(index).setData(x=x, y=values)
        for item in self._dots[len(view.names):]:
            item.setData([], [])
        self._draw_medians(view)
        self._draw_pairs(dots.drawn, view.paired, dots.positions)
        self._draw_limits(view)
        self._update_ticks()
        sampled = any(len(values) > DOT_LIMIT for values in view.values)
        self._label_axes(bottom=f"Group (dots: an even sample of {DOT_LIMIT:,} readings per large group)"
                         if sampled else "Group", left=view.axis_label())
        self._set_legend([(self._medians, "median")])
        self._fit_range(view, dots)

    def dot_tip(self, x: float, y: float) -> str:
        """The words shown when the pointer rests on a dot: its group and its reading."""
        if self.view is None:
            return ""
        name = self.view.names[min(max(int(round(x)), 0), len(self.view.names) - 1)]
        return f"{name}: {self.view.format(y)}" + (f" {self.view.unit}" if self.view.unit else "")

    def tick_labels(self) -> list[str]:
        """The labels under the columns: number and name, shortened to the room each column has."""
        if self.view is None:
            return []
        column = self.plot_item.getViewBox().width() / max(len(self.view.names), 1)
        characters = min(NAME_CHARACTERS, int(column / PIXELS_PER_CHARACTER) - 3)
        return [f"{index + 1} " + shorten(name, characters) if characters >= 5 else f"{index + 1}"
                for index, name in enumerate(self.view.names)]

    def _update_ticks(self) -> None:
        """Put the column labels under the axis (again after a resize)."""
        self.plot_item.getAxis("bottom").setTicks([list(enumerate(self.tick_labels())), []])
        self.plot_item.getAxis("bottom").setToolTip(
            "\n".join(f"{index + 1}: {name}" for index, name in enumerate(self.view.names)) if self.view else "")

    def resizeEvent(self, event) -> None:  # noqa: N802 (Qt's name)
        """Fit the column labels to the new width."""
        super().resizeEvent(event)
        # Resizes also come while the widget is being built and after pyqtgraph's close() let go of the plot.
        if getattr(self, "view", None) is not None and getattr(self, "plotItem", None) is not None:
            self._update_ticks()

    def _draw_medians(self, view: ReadingsView) -> None:
        """One heavy horizontal bar per group at its median."""
        x, y = [], []
        for index, median in enumerate(view.medians):
            x += [index - MEDIAN_HALF_WIDTH, index + MEDIAN_HALF_WIDTH]
            y += [median, median]
        self._medians.setData(np.asarray(x), np.asarray(y))

    def _draw_pairs(self, drawn: list[np.ndarray], paired: bool, positions) -> None:
        """Thin lines joining each part's two readings (same parts measured twice only)."""
        if not paired:
            self._pair_lines.setData([], [])
            return
        x = np.column_stack((positions[0], positions[1])).ravel()
        y = np.column_stack((drawn[0], drawn[1])).ravel()
        self._pair_lines.setData(x, y)

    def _draw_limits(self, view: ReadingsView) -> None:
        """Place and label the LSL, USL and nominal lines that are set; hide the others."""
        ticks = []
        self._limit_labels = {}
        for key, title in (("lsl", "LSL"), ("usl", "USL"), ("nominal", "nominal")):
            line, value = self._lines[key], getattr(view, key)
            line.setVisible(value is not None)
            if value is not None:
                line.setValue(value)
                self._limit_labels[key] = f"{title} {view.format(value)}"
                ticks.append((value, self._limit_labels[key]))
        if ticks:
            self.plot_item.showAxis("right")
            self.plot_item.getAxis("right").setTicks([ticks, []])
        else:
            self.plot_item.hideAxis("right")

    def _fit_range(self, view: ReadingsView, dots: _Dots) -> None:
        """Show every reading and every limit that is set, with a margin."""
        ends = [end for end in (dots.low, dots.high) if end is not None]
        numbers = ends + [v for v in (view.lsl, view.usl, view.nominal) if v is not None]
        low, high = min(numbers), max(numbers)
        pad = (high - low) * 0.08 or max(abs(high) * 0.05, 1e-6)
        self.plot_item.setRange(xRange=(-0.6, len(view.names) - 0.4),
                                yRange=(low - pad, high + pad), padding=0)
