"""The one-page summary verdict of a many-characteristics comparison.

The same page as every verdict (masthead, verdict, notes, cautions, sign-off, fingerprint), with
the key numbers and chart replaced by one line per characteristic: up to ``PAGE_ROWS`` lines, and
beyond that a line saying how many more are in the signed workbook.
"""

from __future__ import annotations

from PySide6.QtCore import QRectF, Qt
from PySide6.QtGui import QPainter

from rankwise.ui.printing.page_content import PageContent
from rankwise.ui.printing.page_layout import MUTED_INK, PagePlan, _Composer, draw_verdict_page
from rankwise.ui.printing.page_text import line_height, page_font
from rankwise.wording import QUESTION_TITLES, describe, describe_question, key_numbers
from rankwise.wording.characteristics import (
    BEYOND_LIMIT_SHORT,
    COLUMNS,
    SHORT_OUTCOMES,
    SummaryLine,
    summary_lines,
)

PAGE_ROWS = 40
"""Characteristics listed on the page; the rest are named as kept in the workbook."""

_PAGE_COLUMNS = (  # (heading on the page, the summary's columns shown in it, share of the width, left-aligned)
    ("Characteristic", ("Characteristic",), 0.175, True),
    ("n A / B", ("Used A", "Used B"), 0.06, False),
    ("Med. A", ("Median A",), 0.07, False),
    ("Med. B", ("Median B",), 0.07, False),
    ("Shift", ("Shift B - A",), 0.065, False),
    ("Interval", ("Interval",), 0.125, False),
    ("of tol.", ("Shift / tolerance",), 0.06, False),
    ("p", ("p",), 0.075, False),
    ("adj. p", ("Adjusted p",), 0.075, False),
    ("Outcome", ("Outcome",), 0.145, True),
    ("Limit", ("Limit",), 0.06, True),
)
_AT = {name: index for index, name in enumerate(COLUMNS)}


def characteristics_content(record, fingerprint: str) -> PageContent:
    """The page's texts for a many-characteristics record (no chart, no groups table)."""
    analysis, result = record.analysis, record.result
    verdict = describe(result, analysis)
    notes = (verdict.method_note, *verdict.assumption_notes)
    return PageContent(
        title=QUESTION_TITLES[analysis.question],
        question=describe_question(analysis),
        measured=f"A (reference): {result.name_a} · B (changed): {result.name_b} · {len(result.rows)} characteristics",
        groups=(),
        ranks_heading="",
        verdict=verdict,
        numbers=key_numbers(result, analysis),
        view=None,
        plan=None,
        notes=tuple(note for note in notes if note),
        signoff=record.signoff,
        fingerprint=fingerprint,
        program_version=str(record.program_version),
        library_versions=tuple(record.library_versions),
        created_at=record.created_at,
    )


class _SummaryComposer(_Composer):
    """The verdict page with the characteristics table in place of the key numbers and chart."""

    def __init__(self, painter: QPainter, area: QRectF, content: PageContent, fit, lines) -> None:
        super().__init__(painter, area, content, fit)
        self.lines: tuple[SummaryLine, ...] = lines
        self.fonts["table"] = page_font(6.8 * self.s)
        self.fonts["table_bold"] = page_font(6.8 * self.s, bold=True)

    def numbers_and_chart(self, x: float, y: float) -> float:
        y = self.heading("Each characteristic: shift B − A with its interval, p adjusted for the number compared",
                         x, y, self.width)
        row = line_height(self.fonts["table"], self.device) * 1.12
        lefts, position = [], x
        for _, _, share, _ in _PAGE_COLUMNS:
            lefts.append(position)
            position += share * self.width
        for (heading, _, share, left_aligned), left in zip(_PAGE_COLUMNS, lefts):
            self.cell(heading, "table_bold", left, y, share, row, left_aligned, MUTED_INK)
        y += row
        for line in self.lines[:PAGE_ROWS]:
            for (_, picks, share, left_aligned), left in zip(_PAGE_COLUMNS, lefts):
                text = " / ".join(line.texts[_AT[name]] for name in picks)
                if picks == ("Limit",) and line.beyond_limit:
                    text = BEYOND_LIMIT_SHORT
                if picks == ("Outcome",):
                    text = SHORT_OUTCOMES.get(line.outcome, text)
                unit = line.texts[_AT["Unit"]]
                if picks == ("Characteristic",) and unit:
                    text = f"{text} ({unit})"
                font = "table_bold" if picks == ("Outcome",) and line.outcome.startswith("moved") else "table"
                self.cell(text, font, left, y, share, row, left_aligned)
            y += row
        if len(self.lines) > PAGE_ROWS:
            y = self.put(self.paragraph(f"… and {len(self.lines) - PAGE_ROWS} more characteristics, in the signed "
                                        "workbook's summary sheet.", "italic", self.width), x, y, MUTED_INK)
        numbers = " · ".join(f"{n.label}: {n.text}" for n in self.content.numbers)
        return self.put(self.paragraph(numbers, "small", self.width, max_lines=2), x, y + self.pt(3), MUTED_INK)

    def cell(self, text: str, font: str, left: float, y: float, share: float, row: float, left_aligned: bool,
             colour: str | None = None) -> None:
        align = Qt.AlignmentFlag.AlignLeft if left_aligned else Qt.AlignmentFlag.AlignRight
        rect = QRectF(left, y, share * self.width - self.pt(3), row)
        if colour is None:
            self.text_line(text, font, rect, align, elide=Qt.TextElideMode.ElideRight)
        else:
            self.text_line(text, font, rect, align, colour=colour, elide=Qt.TextElideMode.ElideRight)


def draw_characteristics_page(painter: QPainter, area: QRectF, record, fingerprint: str) -> PagePlan:
    """Draw the one-page summary verdict into ``area`` with the first arrangement that fits."""
    lines = summary_lines(record.result, record.analysis)
    return draw_verdict_page(painter, area, characteristics_content(record, fingerprint),
                             lambda *arguments: _SummaryComposer(*arguments, lines))
