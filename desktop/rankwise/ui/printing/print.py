"""Print the one-page verdict on paper (the window supplies a configured QPrinter)."""

from __future__ import annotations

from PySide6.QtPrintSupport import QPrinter

from rankwise.ui.printing.page_layout import PagePlan
from rankwise.ui.printing.pdf import paint_record


def print_verdict(printer: QPrinter, record) -> PagePlan:
    """Print ``record``'s verdict on one sheet of ``printer``'s paper (A4, Letter or other)."""
    if not isinstance(printer, QPrinter):
        raise ValueError(f"printer must be a QPrinter; got {type(printer).__name__}.")
    printer.setFullPage(False)
    printer.setPageOrientation(printer.pageLayout().Orientation.Portrait)
    return paint_record(printer, record)
