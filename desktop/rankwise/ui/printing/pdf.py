"""Save the one-page verdict as a PDF/A-1b file (atomic write), also from the command line."""

from __future__ import annotations

import os
from pathlib import Path

from PySide6.QtCore import QMarginsF, QRectF
from PySide6.QtGui import QGuiApplication, QPageLayout, QPagedPaintDevice, QPageSize, QPainter, QPdfWriter

from rankwise.records import fingerprint
from rankwise.records.atomic import write_atomically
from rankwise.stats.results import CharacteristicsResult
from rankwise.ui.printing.characteristics_page import draw_characteristics_page
from rankwise.ui.printing.page_content import gather
from rankwise.ui.printing.page_layout import PagePlan, draw_verdict_page

PAGE_SIZES = {"A4": QPageSize.PageSizeId.A4, "Letter": QPageSize.PageSizeId.Letter}
"""Paper sizes offered for the printout."""
MARGIN_MM = 14.0
_cli_application: QGuiApplication | None = None
"""The Qt application started for the command line (Qt needs one for fonts), kept for the run."""
PDF_RESOLUTION = 600
"""Dots per inch of the PDF's drawing grid (vector output; only positions are rounded to it)."""


def page_layout(page_size: str) -> QPageLayout:
    """Portrait ``page_size`` ("A4" or "Letter") with our margins."""
    if page_size not in PAGE_SIZES:
        raise ValueError(f"page_size must be one of {', '.join(PAGE_SIZES)}; got {page_size!r}.")
    return QPageLayout(QPageSize(PAGE_SIZES[page_size]), QPageLayout.Orientation.Portrait,
                       QMarginsF(MARGIN_MM, MARGIN_MM, MARGIN_MM, MARGIN_MM), QPageLayout.Unit.Millimeter)


def paint_record(device, record) -> PagePlan:
    """Paint ``record``'s verdict page on ``device`` (a PDF writer, printer or image)."""
    many = isinstance(record.result, CharacteristicsResult)
    content = None if many else gather(record, fingerprint(record))
    painter = QPainter()
    if not painter.begin(device):
        raise OSError("The page could not be opened for drawing (is the printer or file available?).")
    try:
        area = QRectF(0, 0, device.width(), device.height())
        if many:
            return draw_characteristics_page(painter, area, record, fingerprint(record))
        return draw_verdict_page(painter, area, content)
    finally:
        painter.end()


def write_verdict_pdf(path, record, page_size: str = "A4") -> PagePlan:
    """Write the one-page verdict of ``record`` to ``path`` as PDF/A-1b, atomically.

    The page is written to a temporary file beside ``path`` and moved over it only when complete,
    so an existing file is never left half-written; a new file follows the user's umask, a replaced
    one keeps its permissions (``rankwise.records.atomic``). Needs a running QGuiApplication (see
    ``render_pdf_for_cli``). Returns how the page was arranged.
    """
    target = Path(path)
    layout = page_layout(page_size)
    if not target.parent.is_dir():
        raise ValueError(f"path must be in an existing folder; {target.parent} does not exist.")
    plans = []

    def draw(temporary: Path) -> None:
        writer = QPdfWriter(str(temporary))
        writer.setPdfVersion(QPagedPaintDevice.PdfVersion.PdfVersion_A1b)
        writer.setResolution(PDF_RESOLUTION)
        writer.setPageLayout(layout)
        writer.setTitle(f"Verdict: {record.analysis.settings.characteristic or 'readings comparison'}")
        writer.setCreator(f"Rankwise {record.program_version}")
        plans.append(paint_record(writer, record))
        del writer  # the PDF is finished when its writer goes

    try:
        write_atomically(target, draw)
    except OSError as error:
        raise OSError(f"The PDF could not be written to {target}: {error.strerror or error}.") from error
    return plans[0]


def render_pdf_for_cli(path, record, page_size: str = "A4") -> PagePlan:
    """``write_verdict_pdf`` for the command line: starts Qt without a screen when none is running."""
    global _cli_application
    if QGuiApplication.instance() is None:
        os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
        _cli_application = QGuiApplication([])
    return write_verdict_pdf(path, record, page_size)
