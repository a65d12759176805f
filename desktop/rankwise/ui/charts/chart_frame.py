"""The frame every chart shares: a styled plot, a note for "nothing to show", accessible names, and a
legend kept where it covers no data."""

from __future__ import annotations

import pyqtgraph as pg
from PySide6.QtCore import Qt, QTimer
from PySide6.QtGui import QTextOption

from rankwise.ui.charts import style
from rankwise.ui.charts.drawn_shapes import obstacles_of
from rankwise.ui.charts.legend_room import EDGE_GAP, Obstacles, free_corner
from rankwise.ui.charts.readings_view import ReadingsView, readings_view


class MarkedAxis(pg.AxisItem):
    """An axis whose tick numbers use the sheet's decimal mark (0,30 where the sheet writes 0,30)."""

    decimal_mark = "."
    highest_label: float | None = None
    """No tick is labelled above this value (the room a chart makes for its legend is left bare)."""

    def tickValues(self, minVal, maxVal, size):  # noqa: N802, N803 - pyqtgraph API
        levels = super().tickValues(minVal, maxVal, size)
        if self.highest_label is None:
            return levels
        return [(spacing, [value for value in values if value <= self.highest_label + 1e-9 * spacing])
                for spacing, values in levels]

    def tickStrings(self, values, scale, spacing):  # noqa: N802 - pyqtgraph API
        strings = super().tickStrings(values, scale, spacing)
        return strings if self.decimal_mark == "." else [text.replace(".", self.decimal_mark) for text in strings]

    def fit_label(self) -> None:
        """Wrap the axis title onto more lines, centred, when it is longer than the axis (a narrow
        chart), so that none of it is cut off; the axis grows to hold the lines."""
        label = self.label
        if label is None:
            return
        room = (self.width() if self.orientation in ("bottom", "top") else self.height()) - 4
        label.setTextWidth(-1)
        if 0 < room < label.boundingRect().width():
            label.document().setDefaultTextOption(QTextOption(Qt.AlignmentFlag.AlignHCenter))
            label.setTextWidth(room)
        if self.orientation in ("bottom", "top"):
            self._updateHeight()
        else:
            self._updateWidth()
        super().resizeEvent()

    def resizeEvent(self, ev=None):  # noqa: N802 - Qt API
        self.fit_label()


HEADROOM_STEPS = (1.0, 1.15, 1.3, 1.45)
"""How far a chart may raise the top of its value axis, in its own heights, to clear a corner for the legend."""


class ChartFrame(pg.PlotWidget):
    """A plot with our look and a centred plain-words note shown when there is nothing to draw.

    Subclasses create their plot items once in ``__init__`` and fill them with ``setData`` in
    ``show_result``; ``clear`` empties them and shows the idle note again.
    """

    def __init__(self, parent=None, *, accessible_name: str, tooltip: str, idle_note: str,
                 bottom: str, left: str, legend_corner: str = "top-right") -> None:
        super().__init__(parent, background=style.BACKGROUND,
                         axisItems={"bottom": MarkedAxis("bottom"), "left": MarkedAxis("left")})
        # PlotWidget copies the plot's own clear() (which removes every item) onto the instance;
        # drop that copy so that our clear(), which keeps the items and empties them, is the one used.
        self.__dict__.pop("clear", None)
        self.setAccessibleName(accessible_name)
        self.setAccessibleDescription(tooltip)
        self.setToolTip(tooltip)
        self.setMinimumSize(320, 240)
        self._idle_note = idle_note
        self.plot_item: pg.PlotItem = self.getPlotItem()
        style.style_plot(self.plot_item, bottom=bottom, left=left)
        for side in ("bottom", "left"):
            self.plot_item.getAxis(side).enableAutoSIPrefix(False)
        self.plot_item.setMouseEnabled(x=False, y=False)
        self._note = pg.TextItem(color=style.INK, anchor=(0.5, 0.5))
        self._note.setFont(style.chart_font(11.0))
        self._note.setZValue(50)
        self._note.textItem.document().setDefaultTextOption(QTextOption(Qt.AlignmentFlag.AlignHCenter))
        self.plot_item.addItem(self._note, ignoreBounds=True)
        self._preferred_corner = legend_corner
        self.legend_corner = legend_corner
        """Where the legend sits now: a corner of the plot, or "above" it."""
        self.legend = self.plot_item.addLegend(labelTextColor=style.INK, brush=pg.mkBrush(255, 255, 255, 220),
                                               pen=pg.mkPen("#BBBBBB"))
        self.legend.setVisible(False)
        self._asked_range: list[list[float]] | None = None
        """The range the chart asked for; room for the legend may be added above it."""
        self._making_room = False
        self._placing = False
        self._room_above = 0.0
        """Height kept free above the plot for a legend that fits in no corner."""
        view = self.plot_item.getViewBox()
        view.sigRangeChanged.connect(self._range_asked)
        view.sigResized.connect(self.place_legend)
        view.sigResized.connect(self._wrap_note)

    def note(self) -> str:
        """The note now shown over the plot ("" when the chart shows a result)."""
        return self._note.toPlainText() if self._note.isVisible() else ""

    def _wrap_note(self, *_) -> None:
        """Break the note into lines no wider than the plot (a narrow chart shows all of it)."""
        width = self.plot_item.getViewBox().width() - 2 * EDGE_GAP
        if width > 0:
            self._note.setTextWidth(width)

    def _show_note(self, text: str) -> None:
        """Hide the data and show ``text`` in the middle of the plot, on as many lines as it needs."""
        self._note.setText(text)
        self._wrap_note()
        self._note.setPos(0.5, 0.5)
        self._note.setVisible(True)
        self.legend.setVisible(False)
        self._put_legend(self.plot_item.getViewBox(), self._preferred_corner, room_above=0.0)
        self._show_range(0.0, 1.0, 0.0, 1.0, 1.0)

    def _hide_note(self) -> None:
        """Take the note away before data are drawn."""
        self._note.setVisible(False)

    def _readings_to_draw(self, result, analysis) -> ReadingsView | None:
        """The readings behind ``result`` with the note taken away, or None after saying that a
        planning result has no readings (for the charts that draw readings)."""
        view = readings_view(result, analysis)
        if view is None:
            self.clear()
            self._show_note("A planning question has no readings to show yet.")
            return None
        self._hide_note()
        return view

    def _set_legend(self, entries) -> None:
        """Rebuild the legend from (item, label) pairs (the items themselves stay)."""
        self.legend.clear()
        for item, label in entries:
            self.legend.addItem(item, label)
        self.legend.setVisible(bool(entries))
        QTimer.singleShot(0, self, self.place_legend)  # again once the new entries have their size

    def _range_asked(self, *_) -> None:
        if not self._making_room:
            self._asked_range = self.plot_item.viewRange()
            self.place_legend()

    def place_legend(self, *_) -> None:
        """Put the legend where it covers no line, marker, bar or label: in the preferred corner of
        the plot when that is free, else in another; when none is, after raising the top of the value
        axis a little (its ticks stop at the chart's own top); else above the plot, outside it."""
        if not self.legend.isVisible() or self._asked_range is None or self._placing:
            return
        self._placing = True
        try:
            self._place_legend()
        finally:
            self._placing = False

    def _place_legend(self) -> None:
        (left, right), (bottom, top) = self._asked_range
        self.plot_item.layout.activate()  # the plot's size as it is laid out now, not as it was
        view = self.plot_item.getViewBox()
        plot_size = (view.width(), view.height() + self._room_above)  # the plot with the legend inside it
        if min(plot_size) <= 0:
            return
        self.legend.setColumnCount(1)
        legend_size = self._legend_size()
        for step in HEADROOM_STEPS:
            raised = bottom + (top - bottom) * step
            corner = free_corner(self.drawn_obstacles((left, right, bottom, raised), plot_size), plot_size,
                                 legend_size, self._preferred_corner)
            if corner is not None:
                self._show_range(left, right, bottom, raised, top)
                self._put_legend(view, corner, room_above=0.0)
                return
        self._show_range(left, right, bottom, top, top)
        columns = len(self.legend.items)
        self.legend.setColumnCount(columns)
        while columns > 1 and self._legend_size()[0] > plot_size[0]:
            columns -= 1
            self.legend.setColumnCount(columns)
        self._put_legend(self.plot_item, "above", room_above=self._legend_size()[1] + EDGE_GAP / 2)

    def _legend_size(self) -> tuple[float, float]:
        hint = self.legend.layout.effectiveSizeHint(Qt.SizeHint.PreferredSize)
        return hint.width(), hint.height()

    def _show_range(self, left: float, right: float, bottom: float, top: float, labelled_top: float) -> None:
        """Show this range without taking it for the chart's own; no tick labelled above ``labelled_top``."""
        self._making_room = True
        try:
            self.plot_item.setRange(xRange=(left, right), yRange=(bottom, top), padding=0)
        finally:
            self._making_room = False
        axis = self.plot_item.getAxis("left")
        limit = labelled_top if top > labelled_top else None
        if isinstance(axis, MarkedAxis) and axis.highest_label != limit:
            axis.highest_label = limit
            axis.picture = None
            axis.update()

    def _put_legend(self, holder, corner: str, room_above: float) -> None:
        """Anchor the legend in ``corner`` of ``holder`` (the plot, or the whole chart for "above",
        which keeps ``room_above`` free over the plot for it)."""
        if room_above != self._room_above:
            self._room_above = room_above
            self.plot_item.layout.setContentsMargins(1, 1 + room_above, 1, 1)
            self.plot_item.layout.activate()
        if self.legend.parentItem() is not holder:
            self.legend.setParentItem(holder)
        if corner == "above":
            self.legend.anchor(itemPos=(1, 0), parentPos=(1, 0), offset=(-2, 1))
        else:
            vertical, horizontal = corner.split("-")
            anchor = (1 if horizontal == "right" else 0, 0 if vertical == "top" else 1)
            self.legend.anchor(itemPos=anchor, parentPos=anchor,
                               offset=(EDGE_GAP * (1 - 2 * anchor[0]), EDGE_GAP * (1 - 2 * anchor[1])))
        self.legend_corner = corner

    def drawn_obstacles(self, view_range, plot_size) -> Obstacles:
        """Every line, marker, bar and line label the plot shows (not the note), in the plot's pixels
        for ``view_range`` (left, right, bottom, top) on a plot of ``plot_size`` (width, height)."""
        items = [item for item in self.plot_item.items if item is not self._note]
        return obstacles_of(items, view_range, plot_size)

    @staticmethod
    def _label_toward_middle(line: pg.InfiniteLine, low: float, high: float) -> None:
        """Write an upright line's label on its side with more of the plot (``low`` to ``high``), so
        that the label is not cut off at the plot's edge."""
        side = (1, 0.5) if line.value() > (low + high) / 2 else (0, 0.5)
        line.label.anchors = [side, side]
        line.label.updatePosition()

    def _label_axes(self, *, bottom: str, left: str) -> None:
        """Set the axis titles (they carry the unit)."""
        self.plot_item.setLabel("bottom", bottom, color=style.INK, **{"font-size": "11pt"})
        self.plot_item.setLabel("left", left, color=style.INK, **{"font-size": "11pt"})
        for side in ("bottom", "left"):
            axis = self.plot_item.getAxis(side)
            if isinstance(axis, MarkedAxis):
                axis.fit_label()

    def use_decimal_mark(self, mark: str) -> None:
        """Write the axes' numbers with ``mark`` ("." or ","), as the sheet does."""
        for side in ("bottom", "left"):
            axis = self.plot_item.getAxis(side)
            if isinstance(axis, MarkedAxis) and axis.decimal_mark != mark:
                axis.decimal_mark = mark
                axis.picture = None
                axis.update()

    def idle(self) -> None:
        """Show the idle note (used by ``clear``)."""
        self._show_note(self._idle_note)
