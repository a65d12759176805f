"""The one-page verdict: drawn with QPainter, saved as PDF or printed, always exactly one page."""

from rankwise.ui.printing.page_layout import PagePlan, draw_verdict_page
from rankwise.ui.printing.pdf import PAGE_SIZES, render_pdf_for_cli, write_verdict_pdf
from rankwise.ui.printing.print import print_verdict

__all__ = ["PAGE_SIZES", "PagePlan", "draw_verdict_page", "print_verdict", "render_pdf_for_cli", "write_verdict_pdf"]
