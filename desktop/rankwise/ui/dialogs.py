"""The questions the window asks the user: a path to open or save, a yes/no, a problem to read.

The window never builds these dialogs itself; it calls the functions below. Tests replace one
function (for example ``monkeypatch.setattr(dialogs, "ask_open_path", ...)``) instead of driving a
modal window.
"""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

from PySide6.QtGui import QAction
from PySide6.QtWidgets import QFileDialog, QMessageBox, QWidget

from rankwise.ui.recent_files import remember_written_folder
from rankwise.ui.screen_fit import fit_to_screen

READINGS_FILTER = "Readings (*.csv *.txt *.xlsx *.xlsm);;All files (*)"
"""Files the open dialog offers: spreadsheet exports and signed result workbooks."""

SAVE_READINGS_FILTER = "Readings as CSV (*.csv);;Readings as workbook (*.xlsx)"
RECORD_FILTER = "Signed result workbook (*.xlsx)"
PDF_FILTER = "One-page verdict (*.pdf)"


def ask_open_path(parent: QWidget | None, title: str, file_filter: str = READINGS_FILTER) -> Path | None:
    """Ask for an existing file to open; None when the user cancels."""
    chosen, _ = QFileDialog.getOpenFileName(parent, title, "", file_filter)
    return Path(chosen) if chosen else None


def ask_save_path(parent: QWidget | None, title: str, suggested: str, file_filter: str) -> Path | None:
    """Ask where to save; None when the user cancels. The platform dialog asks before overwriting.

    The folder is remembered, so that a later start can tidy up after a save cut short there."""
    chosen, _ = QFileDialog.getSaveFileName(parent, title, suggested, file_filter)
    if not chosen:
        return None
    remember_written_folder(Path(chosen))
    return Path(chosen)


def confirm(parent: QWidget | None, title: str, text: str, yes: str = "Yes", no: str = "No") -> bool:
    """Ask a yes/no question in plain words; True for yes."""
    box = QMessageBox(QMessageBox.Icon.Question, title, text, QMessageBox.StandardButton.NoButton, parent)
    yes_button = box.addButton(yes, QMessageBox.ButtonRole.AcceptRole)
    no_button = box.addButton(no, QMessageBox.ButtonRole.RejectRole)
    box.setDefaultButton(no_button)
    box.exec()
    return box.clickedButton() is yes_button


def restore_question(parent: QWidget | None, text: str) -> tuple[QMessageBox, object]:
    """The question that offers back a kept entry, with "Restore" as the default button."""
    box = QMessageBox(QMessageBox.Icon.Question, "Restore unsaved readings?", text,
                      QMessageBox.StandardButton.NoButton, parent)
    restore_button = box.addButton("&Restore them", QMessageBox.ButtonRole.AcceptRole)
    box.addButton("&Discard them", QMessageBox.ButtonRole.DestructiveRole)
    box.setDefaultButton(restore_button)
    return box, restore_button


def offer_restore(parent: QWidget | None, text: str) -> str:
    """Offer back a kept entry: "restore" (the default answer), "discard", or "later" when the
    question is closed without an answer (the entry is offered again at the next start)."""
    box, restore_button = restore_question(parent, text)
    box.exec()
    clicked = box.clickedButton()
    if clicked is None:
        return "later"
    return "restore" if clicked is restore_button else "discard"


def ask_keep_changes(parent: QWidget | None, text: str) -> str:
    """Ask what to do with unsaved readings: "save", "discard" or "cancel"."""
    box = QMessageBox(QMessageBox.Icon.Warning, "Unsaved readings", text, QMessageBox.StandardButton.NoButton, parent)
    save_button = box.addButton("Save the readings first", QMessageBox.ButtonRole.AcceptRole)
    discard_button = box.addButton("Close without saving", QMessageBox.ButtonRole.DestructiveRole)
    cancel_button = box.addButton("Keep working", QMessageBox.ButtonRole.RejectRole)
    box.setDefaultButton(cancel_button)
    box.exec()
    clicked = box.clickedButton()
    if clicked is save_button:
        return "save"
    if clicked is discard_button:
        return "discard"
    return "cancel"


def show_problem(parent: QWidget | None, title: str, text: str) -> None:
    """Tell the user, in plain words, what went wrong and what to do."""
    QMessageBox.warning(parent, title, text)


def show_message(parent: QWidget | None, title: str, text: str) -> None:
    """Tell the user something that went well (e.g. a record was checked and is intact)."""
    QMessageBox.information(parent, title, text)


def ask_printer(parent: QWidget | None, printer) -> bool:
    """Let the user choose and set up ``printer`` (a QPrinter); True to print."""
    from PySide6.QtPrintSupport import QPrintDialog

    chooser = QPrintDialog(printer, parent)
    return chooser.exec() == QPrintDialog.DialogCode.Accepted


PREVIEW_SIZE = (900, 1000)
"""The print preview's size where the screen has room for it: wide enough for its toolbar, tall for a page."""


def print_preview_dialog(parent: QWidget | None, printer, paint: Callable[[object], None]):
    """The print preview, not yet shown: the whole page in view (the "fit page" zoom, as its toolbar
    shows), as large as the screen allows yet never wider than it, and at least as wide as its toolbar
    wants when the screen has room, so that no tool hides behind the toolbar's overflow arrow."""
    from PySide6.QtPrintSupport import QPrintPreviewDialog, QPrintPreviewWidget
    from PySide6.QtWidgets import QToolBar

    preview = QPrintPreviewDialog(printer, parent)
    preview.setWindowTitle("The one-page verdict")
    preview.paintRequested.connect(paint)
    toolbar = preview.findChild(QToolBar)
    wanted = toolbar.sizeHint().width() + 2 * preview.layout().contentsMargins().left() if toolbar else 0
    fit_to_screen(preview, max(PREVIEW_SIZE[0], wanted), PREVIEW_SIZE[1])
    fit_page = next((action for action in preview.findChildren(QAction) if action.objectName() == "fitPageAction"), None)
    if fit_page is not None:
        fit_page.trigger()  # the dialog's own "fit page" button: the zoom and the toolbar agree
    page = preview.findChild(QPrintPreviewWidget)
    if page is not None:
        page.setZoomMode(QPrintPreviewWidget.ZoomMode.FitInView)
    return preview


def show_print_preview(parent: QWidget | None, printer, paint: Callable[[object], None]) -> None:
    """Show a print preview; ``paint(printer)`` draws the pages whenever the preview needs them."""
    print_preview_dialog(parent, printer, paint).exec()
