"""Where a chart's legend covers no data: the first corner of the plot whose legend-sized box meets
no line, marker, bar or label, all measured in the plot's pixels.

Plain geometry on numpy arrays (no Qt): a line segment meets a box when its clipped part is not
empty (Liang & Barsky 1984, "A new concept and method for line clipping", ACM TOG 3(1)).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

CORNERS = ("top-right", "top-left", "bottom-right", "bottom-left")

EDGE_GAP = 8.0
"""Pixels between the legend and the plot's edges."""

CLEARANCE = 3.0
"""Pixels the legend keeps away from any drawn thing."""


@dataclass
class Obstacles:
    """What a chart draws, in pixels of its plot (x to the right, y down from the top edge).

    ``segments`` rows are (x0, y0, x1, y1); ``boxes`` rows are (left, top, right, bottom); a marker
    is a box around its centre."""

    segments: list[np.ndarray] = field(default_factory=list)
    boxes: list[np.ndarray] = field(default_factory=list)

    def add_segments(self, rows) -> None:
        rows = np.asarray(rows, dtype=float).reshape(-1, 4)
        self.segments.append(rows[np.all(np.isfinite(rows), axis=1)])

    def add_boxes(self, rows) -> None:
        rows = np.asarray(rows, dtype=float).reshape(-1, 4)
        self.boxes.append(rows[np.all(np.isfinite(rows), axis=1)])

    def meet(self, box: tuple[float, float, float, float]) -> bool:
        """True when anything drawn touches ``box`` (left, top, right, bottom) or comes within CLEARANCE."""
        left, top, right, bottom = box[0] - CLEARANCE, box[1] - CLEARANCE, box[2] + CLEARANCE, box[3] + CLEARANCE
        for rows in self.boxes:
            if np.any((rows[:, 0] <= right) & (rows[:, 2] >= left) & (rows[:, 1] <= bottom) & (rows[:, 3] >= top)):
                return True
        for rows in self.segments:
            near = ((np.minimum(rows[:, 0], rows[:, 2]) <= right) & (np.maximum(rows[:, 0], rows[:, 2]) >= left)
                    & (np.minimum(rows[:, 1], rows[:, 3]) <= bottom) & (np.maximum(rows[:, 1], rows[:, 3]) >= top))
            if near.any() and _segments_meet(rows[near], (left, top, right, bottom)):
                return True
        return False


def _segments_meet(rows: np.ndarray, box: tuple[float, float, float, float]) -> bool:
    """Whether any segment crosses or lies in ``box`` (Liang-Barsky clipping, all segments at once)."""
    left, top, right, bottom = box
    x0, y0, x1, y1 = rows.T
    dx, dy = x1 - x0, y1 - y0
    enter = np.zeros(len(rows))
    leave = np.ones(len(rows))
    inside = np.ones(len(rows), dtype=bool)
    for p, q in ((-dx, x0 - left), (dx, right - x0), (-dy, y0 - top), (dy, bottom - y0)):
        parallel = p == 0
        inside &= ~(parallel & (q < 0))
        with np.errstate(divide="ignore", invalid="ignore"):
            t = np.where(parallel, 0.0, q / np.where(parallel, 1.0, p))
        enter = np.where(~parallel & (p < 0), np.maximum(enter, t), enter)
        leave = np.where(~parallel & (p > 0), np.minimum(leave, t), leave)
    return bool(np.any(inside & (enter <= leave)))


def corner_box(corner: str, plot_width: float, plot_height: float,
               legend_width: float, legend_height: float) -> tuple[float, float, float, float]:
    """The box (left, top, right, bottom) the legend takes in ``corner`` of the plot."""
    vertical, horizontal = corner.split("-")
    left = EDGE_GAP if horizontal == "left" else plot_width - EDGE_GAP - legend_width
    top = EDGE_GAP if vertical == "top" else plot_height - EDGE_GAP - legend_height
    return left, top, left + legend_width, top + legend_height


def free_corner(obstacles: Obstacles, plot_size: tuple[float, float], legend_size: tuple[float, float],
                preferred: str = "top-right") -> str | None:
    """The first corner (``preferred`` first) where the legend meets nothing drawn, or None."""
    if legend_size[0] + 2 * EDGE_GAP > plot_size[0] or legend_size[1] + 2 * EDGE_GAP > plot_size[1]:
        return None
    order = (preferred, *(corner for corner in CORNERS if corner != preferred))
    for corner in order:
        if not obstacles.meet(corner_box(corner, *plot_size, *legend_size)):
            return corner
    return None
