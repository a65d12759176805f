"""What a pyqtgraph plot draws, read from its items as shapes in the plot's pixels: line segments
(curves, filled areas, reference lines) and boxes (markers, bars, reference line labels)."""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt

from rankwise.ui.charts.legend_room import Obstacles


def obstacles_of(items, view_range, plot_size) -> Obstacles:
    """The shapes the visible ``items`` draw, in pixels of a plot of ``plot_size`` (width, height)
    showing ``view_range`` (left, right, bottom, top); y grows downwards from the plot's top."""
    left, right, bottom, top = view_range
    width, height = plot_size

    def to_x(x):
        return (np.asarray(x, dtype=float) - left) * width / (right - left)

    def to_y(y):
        return (top - np.asarray(y, dtype=float)) * height / (top - bottom)

    found = Obstacles()
    for item in items:
        if not item.isVisible():
            continue
        parts = (item.curve, item.scatter) if isinstance(item, pg.PlotDataItem) else (item,)
        for part in parts:
            if part.isVisible():
                _add_obstacles(found, part, to_x, to_y, width, height)
    return found


def _add_obstacles(found: Obstacles, part, to_x, to_y, width: float, height: float) -> None:
    """Add what one plot item draws (curve, markers, bars, reference line and its label) to ``found``."""
    if isinstance(part, pg.PlotCurveItem):
        x, y = part.getData()
        if x is None or len(x) == 0:
            return
        x, y = to_x(x), to_y(y)
        if part.opts["pen"] is not None and pg.mkPen(part.opts["pen"]).style() != Qt.PenStyle.NoPen:
            connect = part.opts.get("connect", "all")
            if isinstance(connect, str) and connect == "pairs":
                ends = len(x) // 2 * 2
                found.add_segments(np.column_stack((x[0:ends:2], y[0:ends:2], x[1:ends:2], y[1:ends:2])))
            else:
                rows = np.column_stack((x[:-1], y[:-1], x[1:], y[1:]))
                found.add_segments(rows[np.asarray(connect)[:-1].astype(bool)] if not isinstance(connect, str) else rows)
        if part.opts.get("fillLevel") is not None:  # the area down to the fill level is drawn too
            level = float(to_y(part.opts["fillLevel"]))
            found.add_segments(np.column_stack((x, y, x, np.full(len(x), level))))
    elif isinstance(part, pg.ScatterPlotItem):
        x, y = part.getData()
        if x is None or len(x) == 0:
            return
        sizes = np.asarray(part.data["size"], dtype=float)
        half = np.maximum(np.where(sizes < 0, part.opts["size"], sizes), part.opts["size"]) / 2 + 1
        x, y = to_x(x), to_y(y)
        found.add_boxes(np.column_stack((x - half, y - half, x + half, y + half)))
    elif isinstance(part, pg.BarGraphItem):
        opts = part.opts
        if opts.get("x") is None or len(opts["x"]) == 0:
            return
        x = np.asarray(opts["x"], dtype=float)
        given_width, given_base = opts.get("width"), opts.get("y0")
        half = np.broadcast_to(np.asarray(0.0 if given_width is None else given_width, dtype=float), x.shape) / 2
        base = np.broadcast_to(np.asarray(0.0 if given_base is None else given_base, dtype=float), x.shape)
        tops = base + np.asarray(opts["height"], dtype=float)
        found.add_boxes(np.column_stack((to_x(x - half), to_y(np.maximum(base, tops)),
                                         to_x(x + half), to_y(np.minimum(base, tops)))))
    elif isinstance(part, pg.InfiniteLine):
        _add_reference_line(found, part, to_x, to_y, width, height)


def _add_reference_line(found: Obstacles, line: pg.InfiniteLine, to_x, to_y, width: float, height: float) -> None:
    """A horizontal or vertical reference line across the plot, and its label's box."""
    upright = round(line.angle) % 180 == 90
    where = float(to_x(line.value()) if upright else to_y(line.value()))
    found.add_segments([where, 0.0, where, height] if upright else [0.0, where, width, where])
    label = getattr(line, "label", None)
    if label is None or not label.isVisible() or not label.toPlainText():
        return
    box = label.boundingRect()
    along = label.orthoPos
    x, y = (where, height * (1 - along)) if upright else (width * along, where)
    anchor_x, anchor_y = label.anchor
    left, top = x - anchor_x * box.width(), y - anchor_y * box.height()
    found.add_boxes([left, top, left + box.width(), top + box.height()])
