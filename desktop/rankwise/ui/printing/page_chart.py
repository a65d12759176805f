"""Charts drawn straight onto the printed page with QPainter (vector lines, not screenshots)."""

from __future__ import annotations

import math

import numpy as np
from PySide6.QtCore import QLineF, QPointF, QRectF, Qt
from PySide6.QtGui import QBrush, QColor, QFont, QPainter, QPainterPath, QPen, QTransform

from rankwise.stats import PlanResult
from rankwise.ui.charts import style
from rankwise.ui.charts.readings_view import ReadingsView, stacked_offsets
from rankwise.ui.printing.page_text import line_height, one_line, text_width
from rankwise.wording.numbers import with_mark

FRAME_COLOUR = "#9A9A9A"
GRID_COLOUR = "#E3E3E3"


def nice_ticks(low: float, high: float, count: int = 5) -> list[float]:
    """About ``count`` round tick values covering [low, high] (steps of 1, 2, 2.5 or 5 times 10^k)."""
    if not (math.isfinite(low) and math.isfinite(high)) or high <= low:
        return [low]
    raw = (high - low) / max(count, 1)
    power = 10.0 ** math.floor(math.log10(raw))
    step = next(m * power for m in (1.0, 2.0, 2.5, 5.0, 10.0) if m * power >= raw)
    first = math.ceil(low / step - 1e-9) * step
    ticks = []
    value = first
    while value <= high + step * 1e-9:
        ticks.append(round(value, 12))
        value += step
    return ticks


def tick_text(value: float, ticks: list[float], mark: str = ".") -> str:
    """A tick label with just enough decimals to show the step between ticks exactly, written
    with the decimal ``mark`` of the readings."""
    step = abs(ticks[1] - ticks[0]) if len(ticks) > 1 else 1.0
    decimals = next(d for d in range(0, 10) if abs(round(step, d) - step) <= step * 1e-9 or d == 9)
    return with_mark(f"{value:.{decimals}f}", mark)


def draw_marker(painter: QPainter, index: int, centre: QPointF, size: float) -> None:
    """The group's marker (same shape as on screen) of width ``size`` at ``centre``."""
    path: QPainterPath = QTransform().translate(centre.x(), centre.y()).scale(size, size).map(style.marker_path(index))
    painter.setPen(QPen(QColor(style.INK), max(size * 0.08, 0.5)))
    painter.setBrush(QBrush(style.group_colour(index)))
    painter.drawPath(path)


class _Axes:
    """A plot frame inside a rectangle: value axis on the left, ticks, faint grid."""

    def __init__(self, painter: QPainter, rect: QRectF, font: QFont, y_low: float, y_high: float,
                 right_space: float, bottom_space: float, k: float, mark: str = ".") -> None:
        self.painter, self.font, self.k = painter, font, k
        device = painter.device()
        self.ticks = [t for t in nice_ticks(y_low, y_high) if y_low <= t <= y_high]
        labels = [tick_text(t, self.ticks, mark) for t in self.ticks]
        left_space = max((text_width(text, font, device) for text in labels), default=0.0) + 5 * k
        top = rect.top() + line_height(font, device) * 0.6
        self.plot = QRectF(rect.left() + left_space, top, rect.width() - left_space - right_space,
                           rect.bottom() - bottom_space - top)
        self.y_low, self.y_high = y_low, y_high
        self.labels = labels

    def y(self, value: float) -> float:
        """Device y of a value."""
        share = (value - self.y_low) / (self.y_high - self.y_low)
        return self.plot.bottom() - share * self.plot.height()

    def draw_frame(self) -> None:
        """Grid lines, tick labels and the frame."""
        painter, device = self.painter, self.painter.device()
        painter.setFont(self.font)
        half = line_height(self.font, device) / 2
        for value, text in zip(self.ticks, self.labels):
            y = self.y(value)
            painter.setPen(QPen(QColor(GRID_COLOUR), 0.6 * self.k))
            painter.drawLine(QLineF(self.plot.left(), y, self.plot.right(), y))
            painter.setPen(QPen(QColor(style.INK)))
            painter.drawText(QRectF(self.plot.left() - 60 * self.k, y - half, 56 * self.k, 2 * half),
                             Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter, text)
        painter.setPen(QPen(QColor(FRAME_COLOUR), 0.8 * self.k))
        painter.setBrush(Qt.BrushStyle.NoBrush)
        painter.drawRect(self.plot)


def _limit_labels(view: ReadingsView) -> list[tuple[str, float, QPen]]:
    """The specification lines that are set: (label, value, pen)."""
    lines = []
    for key, title, pen in (("lsl", "LSL", style.limit_pen(1.0)), ("usl", "USL", style.limit_pen(1.0)),
                            ("nominal", "nominal", style.nominal_pen(1.0))):
        value = getattr(view, key)
        if value is not None:
            lines.append((f"{title} {view.format(value)}", float(value), pen))
    return lines


DENSE_GROUP = 60
"""Above this many readings in a group, dots shrink with the group's size and medians go on top."""


def _draw_medians(painter: QPainter, plot: QRectF, view: ReadingsView, axes: _Axes, slot: float, k: float) -> None:
    """A bar at each group's median."""
    median_pen = QPen(QColor(style.MEDIAN_COLOUR), 2.2 * k)
    median_pen.setCapStyle(Qt.PenCapStyle.FlatCap)
    painter.setPen(median_pen)
    for index, median in enumerate(view.medians):
        centre_x = plot.left() + (index + 0.5) * slot
        painter.drawLine(QLineF(centre_x - 0.4 * slot, axes.y(median), centre_x + 0.4 * slot, axes.y(median)))


def draw_readings(painter: QPainter, rect: QRectF, view: ReadingsView, font: QFont, k: float) -> None:
    """Dots per group (equal readings side by side), median bars, LSL/USL/nominal lines."""
    device = painter.device()
    limits = _limit_labels(view)
    numbers = [v for group in view.values for v in group] + [value for _, value, _ in limits]
    low, high = min(numbers), max(numbers)
    pad = (high - low) * 0.07 or max(abs(high) * 0.05, 1e-6)
    right_space = max((text_width(label, font, device) for label, _, _ in limits), default=0.0) + 4 * k
    axes = _Axes(painter, rect, font, low - pad, high + pad, right_space,
                 line_height(font, device) * 1.5, k, view.decimal_mark)
    axes.draw_frame()
    plot = axes.plot
    groups = len(view.names)
    slot = plot.width() / groups
    largest = max((len(values) for values in view.values), default=1)
    marker = max(1.2 * k, min(6.0 * k, slot * 0.22, 6.0 * k * math.sqrt(DENSE_GROUP / max(largest, 1))))
    dense = largest > DENSE_GROUP
    painter.save()
    painter.setClipRect(plot.adjusted(-marker, -marker, marker, marker))
    for label, value, pen in limits:
        pen.setCosmetic(False)
        pen.setWidthF(1.1 * k)
        painter.setPen(pen)
        painter.drawLine(QLineF(plot.left(), axes.y(value), plot.right(), axes.y(value)))
    centres = []
    for index, values in enumerate(view.values):
        offsets = stacked_offsets(values, spacing=marker * 1.1 / slot, half_width=0.36)
        centres.append([QPointF(plot.left() + (index + 0.5 + dx) * slot, axes.y(v)) for dx, v in zip(offsets, values)])
    if view.paired and len(centres) == 2:
        painter.setPen(QPen(QColor("#A0A0A0"), 0.5 * k))
        for first, second in zip(centres[0], centres[1]):
            painter.drawLine(QLineF(first, second))
    if not dense:
        _draw_medians(painter, plot, view, axes, slot, k)
    for index, points in enumerate(centres):
        for point in points:
            draw_marker(painter, index, point, marker)
    if dense:
        _draw_medians(painter, plot, view, axes, slot, k)
    painter.restore()
    painter.setFont(font)
    half = line_height(font, device) / 2
    painter.setPen(QPen(QColor(style.INK)))
    for label, value, _ in limits:
        painter.drawText(QRectF(plot.right() + 3 * k, axes.y(value) - half, right_space, 2 * half),
                         Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter, label)
    label_y = plot.bottom() + 2 * k
    for index, name in enumerate(view.names):
        left = plot.left() + index * slot
        draw_marker(painter, index, QPointF(left + 5 * k, label_y + half), min(6.0 * k, slot * 0.2))
        painter.setPen(QPen(QColor(style.INK)))
        text = one_line(f"{index + 1} {name}", font, slot - 12 * k, device, Qt.TextElideMode.ElideRight)
        painter.drawText(QRectF(left + 10 * k, label_y, slot - 11 * k, 2 * half),
                         Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter, text)


def draw_power_curve(painter: QPainter, rect: QRectF, result: PlanResult, font: QFont, k: float) -> None:
    """Predicted power (%) against parts per group, the target power and the planned size."""
    device = painter.device()
    sizes = np.array([p.n_a for p in result.power_curve], dtype=float)
    power = np.array([100.0 * p.power for p in result.power_curve])
    axes = _Axes(painter, rect, font, 0.0, 100.0, 4 * k, line_height(font, device) * 2.4, k)
    axes.draw_frame()
    plot = axes.plot
    x_low = float(min(sizes.min(), result.n_a)) - 1 if sizes.size else result.n_a - 1.0
    x_high = float(max(sizes.max(), result.n_a)) + 1 if sizes.size else result.n_a + 1.0

    def x_of(value: float) -> float:
        return plot.left() + (value - x_low) / (x_high - x_low) * plot.width()

    painter.setFont(font)
    half = line_height(font, device) / 2
    painter.setPen(QPen(QColor(style.INK)))
    for tick in [t for t in nice_ticks(x_low, x_high) if x_low <= t <= x_high]:
        painter.drawText(QRectF(x_of(tick) - 20 * k, plot.bottom() + 2 * k, 40 * k, 2 * half),
                         Qt.AlignmentFlag.AlignCenter, f"{tick:g}")
    painter.drawText(QRectF(plot.left(), plot.bottom() + 2 * half + 2 * k, plot.width(), 2 * half),
                     Qt.AlignmentFlag.AlignCenter, "pairs of readings" if result.paired else
                     "parts in each group" if result.groups >= 3 else "parts per group (A)")
    target_pen = QPen(QColor(style.TARGET_COLOUR), 1.2 * k, Qt.PenStyle.DashLine)
    painter.setPen(target_pen)
    painter.drawLine(QLineF(plot.left(), axes.y(100 * result.power), plot.right(), axes.y(100 * result.power)))
    painter.setPen(QPen(QColor(style.INK), 1.2 * k))
    painter.drawLine(QLineF(x_of(result.n_a), plot.top(), x_of(result.n_a), plot.bottom()))
    painter.setPen(QPen(QColor(style.OBSERVED_COLOUR), 1.6 * k))
    points = [QPointF(x_of(x), axes.y(y)) for x, y in zip(sizes, power)]
    for first, second in zip(points, points[1:]):
        painter.drawLine(QLineF(first, second))
    painter.setBrush(QBrush(QColor(style.OBSERVED_COLOUR)))
    for point in points:
        painter.drawEllipse(point, 1.6 * k, 1.6 * k)
    painter.setPen(QPen(QColor(style.INK)))
    painter.drawText(QRectF(plot.left() + 3 * k, axes.y(100 * result.power) + 1 * k, plot.width() / 2, 2 * half),
                     Qt.AlignmentFlag.AlignLeft, f"chance asked for {100 * result.power:g} %")
    painter.drawText(QRectF(x_of(result.n_a) + 3 * k, plot.bottom() - 2.2 * half, plot.width() / 2, 2 * half),
                     Qt.AlignmentFlag.AlignLeft, f"planned: {result.n_a}")
