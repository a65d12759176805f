"""The frame every chart shares: a styled plot, a note for "nothing to show", accessible names."""

from __future__ import annotations

import pyqtgraph as pg
from rankwise.ui.charts import style
from rankwise.ui.charts.readings_view import ReadingsView, readings_view


class MarkedAxis(pg.AxisItem):
    """An axis whose tick numbers use the sheet's decimal mark (0,30 where the sheet writes 0,30)."""

    decimal_mark = "."

    def tickStrings(self, values, scale, spacing):  # noqa: N802 - pyqtgraph API
        strings = super().tickStrings(values, scale, spacing)
        return strings if self.decimal_mark == "." else [text.replace(".", self.decimal_mark) for text in strings]


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
        self.plot_item.addItem(self._note, ignoreBounds=True)
        offset = {"top-right": (-8, 8), "top-left": (8, 8), "bottom-right": (-8, -8)}[legend_corner]
        self.legend = self.plot_item.addLegend(offset=offset, labelTextColor=style.INK,
                                               brush=pg.mkBrush(255, 255, 255, 220),
                                               pen=pg.mkPen("#BBBBBB"))
        self.legend.setVisible(False)

    def note(self) -> str:
        """The note now shown over the plot ("" when the chart shows a result)."""
        return self._note.toPlainText() if self._note.isVisible() else ""

    def _show_note(self, text: str) -> None:
        """Hide the data and show ``text`` in the middle of the plot."""
        self._note.setText(text)
        self._note.setPos(0.5, 0.5)
        self._note.setVisible(True)
        self.plot_item.setRange(xRange=(0, 1), yRange=(0, 1), padding=0)
        self.legend.setVisible(False)

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

    def _label_axes(self, *, bottom: str, left: str) -> None:
        """Set the axis titles (they carry the unit)."""
        self.plot_item.setLabel("bottom", bottom, color=style.INK, **{"font-size": "11pt"})
        self.plot_item.setLabel("left", left, color=style.INK, **{"font-size": "11pt"})

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
