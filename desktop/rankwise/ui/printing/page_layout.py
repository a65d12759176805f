"""The one-page verdict, drawn with QPainter, that always fits on one page.

The page is composed top to bottom. Before anything is painted the whole page is measured; when
it would not fit, the next, more compact arrangement is tried (smaller type, fewer key numbers,
shorter comments and notes, a lower chart), down to the most compact one. Content that the page
leaves out is named on the page as kept in the signed workbook.
"""

from __future__ import annotations

from dataclasses import dataclass

from PySide6.QtCore import QLineF, QPointF, QRectF, Qt
from PySide6.QtGui import QColor, QPainter, QPen

from rankwise.records.signoff import Signature
from rankwise.ui.charts import style
from rankwise.ui.printing.page_chart import draw_marker, draw_power_curve, draw_readings
from rankwise.ui.printing.page_content import PageContent
from rankwise.ui.printing.page_text import Paragraph, line_height, one_line, page_font
from rankwise.wording.entries import READINGS_USED
from rankwise.wording.moments import written_moment

RULE_COLOUR = "#8C8C8C"
ACCENT_COLOUR = "#0072B2"
MUTED_INK = "#555555"


@dataclass(frozen=True)
class Fit:
    """One arrangement of the page, from roomy to compact.

    Attributes:
        scale: factor on every type size and gap.
        key_rows: most key numbers listed.
        comment_lines: most lines of a sign-off comment.
        note_count, note_lines: most method/assumption notes, and lines per note.
        chart_height: the chart's height in points (before ``scale``).
        group_rows: most rows of the groups table.
        sentences: most verdict sentences under the headline.
    """

    scale: float
    key_rows: int
    comment_lines: int
    note_count: int
    note_lines: int
    chart_height: float
    group_rows: int
    sentences: int


FITS = (
    Fit(1.00, 24, 5, 8, 4, 210, 12, 8),
    Fit(0.93, 20, 4, 6, 3, 190, 12, 6),
    Fit(0.86, 16, 3, 5, 3, 170, 10, 5),
    Fit(0.80, 14, 3, 4, 2, 150, 10, 4),
    Fit(0.74, 12, 2, 3, 2, 135, 8, 4),
    Fit(0.68, 10, 2, 3, 2, 120, 8, 3),
    Fit(0.62, 8, 1, 2, 1, 110, 6, 3),
)
"""Arrangements tried in order; the first that fits is printed."""


@dataclass(frozen=True)
class PagePlan:
    """How the page was arranged: the chosen ``fit``, and whether everything fitted."""

    fit: Fit
    fits: bool
    used_height: float
    available_height: float


class _Composer:
    """Measures (and, when ``drawing``, paints) the page for one arrangement."""

    def __init__(self, painter: QPainter, area: QRectF, content: PageContent, fit: Fit) -> None:
        self.painter = painter
        self.device = painter.device()
        self.area = area
        self.content = content
        self.fit = fit
        self.k = self.device.logicalDpiY() / 72.0
        self.s = fit.scale
        self.drawing = False
        self.width = area.width()
        body = 8.6 * self.s
        self.fonts = {
            "title": page_font(15.5 * self.s, bold=True),
            "heading": page_font(9.6 * self.s, bold=True),
            "headline": page_font(11.0 * self.s, bold=True),
            "body": page_font(body),
            "bold": page_font(body, bold=True),
            "small": page_font(7.4 * self.s),
            "small_bold": page_font(7.4 * self.s, bold=True),
            "italic": page_font(7.8 * self.s, italic=True),
            "mono": page_font(6.6 * self.s, mono=True),
            "band": page_font(7.2 * self.s, bold=True),
        }

    # ---- small helpers -------------------------------------------------------------------
    def pt(self, points: float) -> float:
        """Points (scaled with the arrangement) in device pixels."""
        return points * self.s * self.k

    def paragraph(self, text: str, font: str, width: float, *, max_lines: int | None = None,
                  align=Qt.AlignmentFlag.AlignLeft) -> Paragraph:
        return Paragraph(text, self.fonts[font], width, self.device, max_lines=max_lines, align=align)

    def put(self, paragraph: Paragraph, x: float, y: float, colour: str = style.INK) -> float:
        """Draw ``paragraph`` at (x, y) when drawing; return the y below it."""
        if self.drawing:
            self.painter.setPen(QPen(QColor(colour)))
            paragraph.draw(self.painter, x, y)
        return y + paragraph.height

    def text_line(self, text: str, font: str, rect: QRectF, align=Qt.AlignmentFlag.AlignLeft,
                  colour: str = style.INK, elide=Qt.TextElideMode.ElideMiddle) -> None:
        """One line of text in ``rect``, shortened with an ellipsis if it is too long."""
        if not self.drawing:
            return
        shown = one_line(text, self.fonts[font], rect.width(), self.device, elide)
        self.painter.setFont(self.fonts[font])
        self.painter.setPen(QPen(QColor(colour)))
        self.painter.drawText(rect, align | Qt.AlignmentFlag.AlignVCenter, shown)

    def rule(self, y: float, width_points: float = 0.6, colour: str = RULE_COLOUR) -> None:
        if self.drawing:
            self.painter.setPen(QPen(QColor(colour), width_points * self.k))
            self.painter.drawLine(QLineF(self.area.left(), y, self.area.right(), y))

    def heading(self, text: str, x: float, y: float, width: float) -> float:
        """A section heading with a thin line under it; returns the y below."""
        height = line_height(self.fonts["heading"], self.device)
        self.text_line(text, "heading", QRectF(x, y, width, height))
        if self.drawing:
            self.painter.setPen(QPen(QColor(RULE_COLOUR), 0.5 * self.k))
            self.painter.drawLine(QLineF(x, y + height + self.pt(1), x + width, y + height + self.pt(1)))
        return y + height + self.pt(4)

    # ---- the page ------------------------------------------------------------------------
    def compose(self, drawing: bool) -> tuple[float, float]:
        """Lay out (and paint) the page; returns the body's bottom and the footer's top."""
        self.drawing = drawing
        footer_top = self.footer()
        x, y = self.area.left(), self.area.top()
        y = self.masthead(x, y)
        y = self.compared(x, y + self.pt(7))
        y = self.verdict(x, y + self.pt(8))
        y = self.numbers_and_chart(x, y + self.pt(9))
        y = self.notes(x, y + self.pt(7))
        y = self.caution(x, y + self.pt(7))
        y = self.signatures(x, y + self.pt(9))
        return y, footer_top

    def masthead(self, x: float, y: float) -> float:
        c = self.content
        band = line_height(self.fonts["band"], self.device)
        signed = c.signoff is not None
        state = (f"Signed record · revision {c.signoff.revision}" if signed
                 else "DRAFT · not signed")
        self.text_line("RANKWISE  ·  ONE-PAGE VERDICT", "band", QRectF(x, y, self.width * 0.6, band),
                       colour=MUTED_INK)
        self.text_line(state, "band", QRectF(x + self.width * 0.4, y, self.width * 0.6, band),
                       Qt.AlignmentFlag.AlignRight, colour=style.INK if signed else "#A33A00")
        y += band + self.pt(2)
        self.rule(y, 1.2, style.INK)
        y += self.pt(6)
        y = self.put(self.paragraph(c.title, "title", self.width, max_lines=2), x, y)
        y += self.pt(2)
        return self.put(self.paragraph(c.question, "body", self.width, max_lines=3), x, y, MUTED_INK)

    def compared(self, x: float, y: float) -> float:
        c = self.content
        y = self.put(self.paragraph(c.measured, "body", self.width, max_lines=2), x, y)
        if not c.groups:
            return y
        y += self.pt(4)
        row_height = line_height(self.fonts["small"], self.device) * 1.18
        columns = (("Group", 0.30), (READINGS_USED.lower(), 0.28), ("median", 0.12), ("quartiles", 0.16),
                   (c.ranks_heading, 0.14))
        lefts, position = [], x
        for _, share in columns:
            lefts.append(position)
            position += share * self.width
        for (title, share), left in zip(columns, lefts):
            align = Qt.AlignmentFlag.AlignLeft if title == "Group" else Qt.AlignmentFlag.AlignRight
            self.text_line(title, "small_bold", QRectF(left, y, share * self.width - self.pt(4), row_height), align,
                           colour=MUTED_INK)
        y += row_height
        shown = c.groups if len(c.groups) <= self.fit.group_rows else c.groups[: self.fit.group_rows - 1]
        for row in shown:
            marker = self.pt(5.5)
            if self.drawing:
                draw_marker(self.painter, row.index, QPointF(x + marker * 0.7, y + row_height / 2), marker)
            cells = (f"{row.index + 1}  {row.name}", row.n, row.median, row.quartiles, row.ranks)
            for (title, share), left, text in zip(columns, lefts, cells):
                if title == "Group":
                    rect = QRectF(left + marker * 1.8, y, share * self.width - marker * 1.8 - self.pt(4), row_height)
                    self.text_line(text, "small", rect)
                else:
                    self.text_line(text, "small", QRectF(left, y, share * self.width - self.pt(4), row_height),
                                   Qt.AlignmentFlag.AlignRight)
            y += row_height
        if len(shown) < len(c.groups):
            y = self.put(self.paragraph(f"… and {len(c.groups) - len(shown)} more groups, numbered in the chart "
                                        "below; every group is in the signed workbook.", "italic", self.width),
                         x, y, MUTED_INK)
        return y

    def verdict(self, x: float, y: float) -> float:
        v = self.content.verdict
        indent = self.pt(10)
        width = self.width - indent
        top = y
        y = self.put(self.paragraph(v.headline, "headline", width, max_lines=3), x + indent, y)
        y += self.pt(3)
        for sentence in v.sentences[: self.fit.sentences]:
            y = self.put(self.paragraph(sentence, "body", width, max_lines=5), x + indent, y)
            y += self.pt(1.5)
        if len(v.sentences) > self.fit.sentences:
            y = self.put(self.paragraph(f"{len(v.sentences) - self.fit.sentences} more findings are in the "
                                        "signed workbook.", "italic", width), x + indent, y, MUTED_INK)
        if self.drawing:
            self.painter.setPen(QPen(QColor(ACCENT_COLOUR), 3.2 * self.k))
            self.painter.drawLine(QLineF(x + self.pt(2), top, x + self.pt(2), y))
        return y

    def numbers_and_chart(self, x: float, y: float) -> float:
        c = self.content
        left_width = self.width * 0.46
        gap = self.pt(14)
        right_x = x + left_width + gap
        right_width = self.width - left_width - gap
        left_y = self.heading("Key numbers", x, y, left_width)
        shown = c.numbers[: self.fit.key_rows]
        left_out = len(c.numbers) - len(shown)
        order = {number.key: position for position, number in enumerate(c.numbers)}
        label_width, value_width = left_width * 0.58, left_width * 0.40
        for number in sorted(shown, key=lambda n: order[n.key]):
            label = self.paragraph(number.label, "small", label_width, max_lines=2)
            value = self.paragraph(number.text, "small_bold", value_width, max_lines=3,
                                   align=Qt.AlignmentFlag.AlignRight)
            self.put(label, x, left_y)
            self.put(value, x + left_width - value_width, left_y)
            left_y += max(label.height, value.height) + self.pt(1.2)
        if left_out:
            left_y += self.pt(2)
            left_y = self.put(self.paragraph(f"{left_out} more numbers are in the signed workbook.",
                                             "italic", left_width), x, left_y, MUTED_INK)
        chart_title = ("Chance of detecting the shift" if c.plan is not None
                       else "Readings per group (bar: median)")
        right_y = self.heading(chart_title, right_x, y, right_width)
        chart_height = max(self.pt(self.fit.chart_height), left_y - right_y - self.pt(12))
        chart = QRectF(right_x, right_y, right_width, chart_height)
        if self.drawing:
            self.painter.save()
            if c.plan is not None and c.plan.power_curve:
                draw_power_curve(self.painter, chart, c.plan, self.fonts["small"], self.k)
            elif c.view is not None and any(c.view.values):
                draw_readings(self.painter, chart, c.view, self.fonts["small"], self.k)
            self.painter.restore()
        right_y = chart.bottom()
        if c.view is not None and c.view.unit:
            right_y = self.put(self.paragraph(f"Readings in {c.view.unit}.", "italic", right_width),
                               right_x, right_y + self.pt(2), MUTED_INK)
        return max(left_y, right_y)

    def notes(self, x: float, y: float) -> float:
        notes = self.content.notes
        if not notes:
            return y
        y = self.heading("How this was worked out", x, y, self.width)
        shown = notes[: self.fit.note_count]
        for note in shown:
            y = self.put(self.paragraph("•  " + note, "small", self.width, max_lines=self.fit.note_lines), x, y)
            y += self.pt(1)
        if len(notes) > len(shown):
            y = self.put(self.paragraph(f"{len(notes) - len(shown)} more notes are in the signed workbook.",
                                        "italic", self.width), x, y, MUTED_INK)
        return y

    def caution(self, x: float, y: float) -> float:
        padding = self.pt(5)
        text = self.paragraph("Please note: " + self.content.verdict.caution, "small",
                              self.width - 2 * padding - self.pt(4))
        height = text.height + 2 * padding
        if self.drawing:
            self.painter.setPen(QPen(QColor(style.INK), 0.8 * self.k))
            self.painter.setBrush(QColor("#F4F4F4"))
            self.painter.drawRect(QRectF(x, y, self.width, height))
            self.painter.setBrush(Qt.BrushStyle.NoBrush)
        self.put(text, x + padding + self.pt(4), y + padding)
        return y + height

    def signatures(self, x: float, y: float) -> float:
        signoff = self.content.signoff
        y = self.heading("Sign-off", x, y, self.width)
        gap = self.pt(16)
        width = (self.width - gap) / 2
        prepared = signoff.prepared if signoff is not None else None
        reviewed = signoff.reviewed if signoff is not None else None
        bottom_left = self.signature_block("Prepared by", prepared, x, y, width)
        bottom_right = self.signature_block("Reviewed and approved by", reviewed, x + width + gap, y, width)
        return max(bottom_left, bottom_right)

    def signature_block(self, title: str, signature: Signature | None, x: float, y: float, width: float) -> float:
        row = line_height(self.fonts["small"], self.device) * 1.25
        self.text_line(title, "bold", QRectF(x, y, width, line_height(self.fonts["bold"], self.device)))
        y += line_height(self.fonts["bold"], self.device) + self.pt(2)
        label_width = width * 0.30
        fields = (
            ("Printed name", signature.name if signature else ""),
            ("Role", signature.role if signature else ""),
            ("Date and time", written_moment(signature.signed_at) if signature else ""),
            ("Decision", signature.decision if signature else ""),
        )
        for label, value in fields:
            self.text_line(label, "small", QRectF(x, y, label_width, row), colour=MUTED_INK)
            if value:
                self.text_line(value, "small_bold", QRectF(x + label_width, y, width - label_width, row),
                               elide=Qt.TextElideMode.ElideRight)
            else:
                self.fill_in_line(x + label_width, y + row - self.pt(2), width - label_width)
            y += row
        if signature is not None and signature.comment:
            self.text_line("Comment", "small", QRectF(x, y, label_width, row), colour=MUTED_INK)
            comment = self.paragraph(signature.comment, "small", width - label_width,
                                     max_lines=self.fit.comment_lines)
            y = self.put(comment, x + label_width, y + (row - line_height(self.fonts["small"], self.device)) / 2)
            if comment.truncated:
                y = self.put(self.paragraph("(full comment in the signed workbook)", "italic", width - label_width),
                             x + label_width, y, MUTED_INK)
            y += self.pt(1)
        y += self.pt(22)
        self.fill_in_line(x + label_width, y, width - label_width)
        self.text_line("Signature", "small", QRectF(x, y - row + self.pt(2), label_width, row), colour=MUTED_INK)
        return y + self.pt(3)

    def fill_in_line(self, x: float, y: float, width: float) -> None:
        """A line to write on by hand."""
        if self.drawing:
            self.painter.setPen(QPen(QColor("#6E6E6E"), 0.6 * self.k, Qt.PenStyle.DotLine))
            self.painter.drawLine(QLineF(x, y, x + width, y))

    def footer(self) -> float:
        """The fingerprint and versions at the page's foot; returns the footer's top."""
        c = self.content
        x = self.area.left()
        versions = " · ".join(f"{name} {version}" for name, version in c.library_versions
                              if name in ("numpy", "scipy"))
        written = written_moment(c.created_at, seconds=False) if c.created_at is not None else "not recorded"
        lines = [
            self.paragraph("Fingerprint (SHA-256 of the readings, settings, results and sign-off):", "small",
                           self.width),
            self.paragraph(c.fingerprint, "mono", self.width),
            self.paragraph(f"Rankwise {c.program_version}" + (f" · {versions}" if versions else "")
                           + f" · record written {written} · page 1 of 1", "small", self.width),
        ]
        height = sum(line.height for line in lines) + self.pt(5)
        top = self.area.bottom() - height
        self.rule(top, 0.6)
        y = top + self.pt(4)
        for line in lines:
            y = self.put(line, x, y, MUTED_INK)
        return top


def draw_verdict_page(painter: QPainter, area: QRectF, content: PageContent, composer_class=None) -> PagePlan:
    """Draw the one-page verdict into ``area`` (device pixels) with the first arrangement that fits.

    When even the most compact arrangement is too tall (not seen with the content Rankwise
    produces, but guarded), it is drawn clipped to ``area``: the page never spills onto a second one.
    ``composer_class`` (painter, area, content, fit) lays out a page of another kind (the summary of
    many characteristics); by default the verdict page.
    """
    for fit in FITS:
        composer = (composer_class or _Composer)(painter, area, content, fit)
        bottom, footer_top = composer.compose(drawing=False)
        room = footer_top - composer.pt(6)
        if bottom <= room:
            break
    painter.save()
    painter.setClipRect(area)
    composer.compose(drawing=True)
    painter.restore()
    return PagePlan(fit=fit, fits=bottom <= room, used_height=bottom - area.top(),
                    available_height=room - area.top())
