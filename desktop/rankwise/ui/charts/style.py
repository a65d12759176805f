"""The charts' shared look: one palette, one symbol per group, pens and fonts, set in one place.

Group colours follow the Okabe-Ito palette (Okabe & Ito 2008, "Color Universal Design"), which
stays distinguishable for the common forms of colour blindness. Colour is never the only carrier:
each group also has its own marker shape, and reference lines carry written labels. The same
shapes are used on the printed page (``marker_path``), so paper and screen agree.
"""

from __future__ import annotations

import pyqtgraph as pg
from pyqtgraph.graphicsItems.ScatterPlotItem import Symbols
from PySide6.QtCore import Qt
from PySide6.QtGui import QColor, QFont, QPainterPath, QPen

GROUP_COLOURS = ("#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#000000")
"""Okabe-Ito colours in the order groups receive them (their yellow is left out: too pale on white)."""

GROUP_SYMBOLS = ("o", "s", "t1", "d", "t", "p", "h", "star", "x", "+")
"""Marker shapes in the order groups receive them: circle, square, triangles, diamond, pentagon..."""

BACKGROUND = "#FFFFFF"
INK = "#222222"
"""Text and axis colour."""
GRID_ALPHA = 0.18
MEDIAN_COLOUR = "#222222"
LIMIT_COLOUR = "#7A1F1F"
"""Specification limits: a dark red-brown, dashed, always labelled "LSL" / "USL"."""
NOMINAL_COLOUR = "#4D4D4D"
REGION_COLOUR = "#D55E00"
"""Shading of the region where a result would count as a change (hatched as well as coloured)."""
OBSERVED_COLOUR = "#0072B2"
TARGET_COLOUR = "#009E73"

MARKER_SIZE = 11
"""Marker size on screen, in pixels."""


def group_colour(index: int) -> QColor:
    """The colour of the group at ``index`` (cycles past the palette's end)."""
    return QColor(GROUP_COLOURS[index % len(GROUP_COLOURS)])


def group_marker(index: int) -> dict:
    """The marker of group ``index``: its shape, outline and fill, as keyword arguments of a scatter item."""
    return {"symbol": group_symbol(index), "pen": pg.mkPen(INK, width=0.8), "brush": pg.mkBrush(group_colour(index))}


def group_symbol(index: int) -> str:
    """The pyqtgraph marker code of the group at ``index`` (cycles past the last shape)."""
    return GROUP_SYMBOLS[index % len(GROUP_SYMBOLS)]


def marker_path(index: int) -> QPainterPath:
    """The group's marker as a path one unit wide centred on the origin (for QPainter drawing)."""
    return QPainterPath(Symbols[group_symbol(index)])


def limit_pen(width: float = 2.0) -> QPen:
    """Dashed pen of specification limit lines."""
    pen = QPen(QColor(LIMIT_COLOUR), width)
    pen.setStyle(Qt.PenStyle.DashLine)
    pen.setCosmetic(True)
    return pen


def nominal_pen(width: float = 1.5) -> QPen:
    """Dotted pen of the nominal line."""
    pen = QPen(QColor(NOMINAL_COLOUR), width)
    pen.setStyle(Qt.PenStyle.DotLine)
    pen.setCosmetic(True)
    return pen


def median_pen(width: float = 3.0) -> QPen:
    """Solid, heavy pen of median bars."""
    pen = QPen(QColor(MEDIAN_COLOUR), width)
    pen.setCosmetic(True)
    pen.setCapStyle(Qt.PenCapStyle.FlatCap)
    return pen


def chart_font(point_size: float = 10.0) -> QFont:
    """The font of axis labels and notes (large enough to read at arm's length)."""
    font = QFont()
    font.setPointSizeF(point_size)
    return font


def style_plot(plot: pg.PlotItem, *, bottom: str, left: str) -> None:
    """Give a plot our look: white ground, dark ink, faint grid, readable labelled axes."""
    plot.showGrid(x=True, y=True, alpha=GRID_ALPHA)
    for side, label in (("bottom", bottom), ("left", left)):
        axis = plot.getAxis(side)
        axis.setPen(pg.mkPen(INK))
        axis.setTextPen(pg.mkPen(INK))
        axis.setTickFont(chart_font(10.0))
        axis.setLabel(label, color=INK, **{"font-size": "11pt"})
    plot.setMenuEnabled(False)
    plot.hideButtons()
