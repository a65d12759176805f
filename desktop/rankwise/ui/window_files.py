"""Opening readings (CSV/XLSX or a signed record), the demo, saving readings as typed, new sheets."""

from __future__ import annotations

import threading
from pathlib import Path

from PySide6.QtCore import QObject, Signal

import rankwise
from rankwise.readings import GroupColumn, ReadingSheet, ReadingsError
from rankwise.readings.read_aside import sheet_of
from rankwise.ui import dialogs
from rankwise.ui.question_panel import OPTION_OF_QUESTION
from rankwise.ui.recent_files import remember_file
from rankwise.ui.worker import run_aside
from rankwise.wording.pairing import CHOSEN_WHEN_OPENING, question_suggested, suggestion_reason

DEMO_FILE_NAME = "two_wheels_roughness.csv"
"""The demo readings opened by ``rankwise --demo`` and the Help menu (invented data)."""


def demo_folder() -> Path:
    """The repository's demo_files folder (the package is installed editable from desktop/)."""
    return Path(rankwise.__file__).resolve().parents[2] / "demo_files"


def empty_sheet() -> ReadingSheet:
    """A new entry: two empty groups, A (the reference) and B (the changed process)."""
    return ReadingSheet([GroupColumn("A"), GroupColumn("B")])


LARGE_FILE_BYTES = 2_000_000
"""A file larger than this opens in a process of its own (the window keeps answering meanwhile)."""


class FileOpening(QObject):
    """Reads a large file in a process of its own (``read_aside``), waited for on a thread of the window's:
    the window's process only unpacks the outcome.

    Signals:
        opened(object, object, object): the ``ReadingSet`` read, the ``ReadingSheet`` built from it, and
            the sheet's lines for the recovery file (``WrittenPieces``, in ``pieces_to``), or None.
        failed(str): the plain-words reason the file cannot be opened.
        many_characteristics(): the file holds many characteristics (one row per part); nothing was read.
    """

    opened = Signal(object, object, object)
    failed = Signal(str)
    many_characteristics = Signal()

    def __init__(self, path: Path, pieces_to: Path | None = None, parent: QObject | None = None) -> None:
        super().__init__(parent)
        self.path = path
        self._pieces_to = pieces_to
        self._reading = None
        self._thread = threading.Thread(target=self._read, name="rankwise-open", daemon=True)

    def start(self) -> None:
        """Begin reading; one of the signals follows (none after ``cancel``)."""
        from rankwise.readings.read_aside import ChildReading

        self._reading = ChildReading(self.path, self._pieces_to)
        self._thread.start()

    def cancel(self) -> None:
        """Stop reading (the window shows another sheet, or closes): nothing is sent after this, though
        a signal already on its way can still arrive."""
        if self._reading is not None:
            self._reading.cancel()

    def _read(self) -> None:
        outcome = self._reading.outcome()
        if self._reading.cancelled:
            return
        if outcome.kind == "many characteristics":
            self.many_characteristics.emit()
        elif outcome.kind == "opened":
            self.opened.emit(outcome.reading_set, outcome.sheet, outcome.pieces)
        else:
            self.failed.emit(outcome.message)


class WindowFiles:
    """Mixin of ``MainWindow``: files in and out, asking before unsaved readings are replaced."""

    opening_message = ""
    """What the status line said about the file just opened; the first edit clears it, so the
    counts beneath it show the readings as they are now."""

    def _may_replace_sheet(self) -> bool:
        """True when the current entry may be replaced (saved, empty, or the user agreed)."""
        if not self.has_unsaved_readings():
            return True
        answer = dialogs.ask_keep_changes(self, "The readings in the sheet are not saved. Save them before going on?")
        if answer == "save":
            return self.save_readings()
        return answer == "discard"

    def has_unsaved_readings(self) -> bool:
        """True when the sheet holds typed text that is not saved (a restored entry counts as unsaved)."""
        has_text = any(cell.text for group in self.sheet.groups for cell in group.cells)
        return has_text and (self.sheet.is_modified or self.restored_unsaved)

    def new_sheet(self) -> None:
        """Start an empty sheet (after asking about unsaved readings)."""
        if self._may_replace_sheet():
            self.set_sheet(empty_sheet())

    def ask_and_open(self) -> None:
        """File > Open: ask for a file, then show the open dialog (or reopen a signed record)."""
        path = dialogs.ask_open_path(self, "Open readings or a signed result")
        if path is not None:
            self.open_path(path, show_dialog=True)

    def open_path(self, path: Path, show_dialog: bool = False) -> bool:
        """Open readings (CSV/XLSX) or a signed result workbook; True when something was loaded.

        With ``show_dialog`` the open dialog shows the preview and the layout found and lets the
        user change them; without it the dialog's automatic choices are used.
        """
        path = Path(path)
        if not path.is_file():
            dialogs.show_problem(self, "Cannot open the file", f"There is no file {path}. Check the name and the folder.")
            return False
        if not self._may_replace_sheet():
            return False
        if path.suffix.lower() in (".xlsx", ".xlsm") and self.records.try_reopen(path):
            remember_file(path)
            return True
        if not show_dialog and path.stat().st_size > LARGE_FILE_BYTES:
            self.stop_opening()
            # The reading process looks for many characteristics first.
            self.opening = FileOpening(path, self.keeper.pieces_file(), self)
            self.opening.opened.connect(self._on_file_opened)
            self.opening.failed.connect(self._on_file_failed)
            self.opening.many_characteristics.connect(self._on_many_characteristics)
            self.statusBar().showMessage(f"Opening {path.name}…")
            self.opening.start()
            return True
        many = self._offer_characteristics(path)
        if many is not None:
            return many

        from rankwise.readings import open_readings
        from rankwise.ui.open_dialog import OpenReadingsDialog

        try:
            reading_set = OpenReadingsDialog.ask(self, path) if show_dialog else open_readings(path)
        except ReadingsError as error:
            dialogs.show_problem(self, "Cannot open the file", str(error))
            return False
        if reading_set is None:
            return False
        self.load_reading_set(reading_set, path)
        remember_file(path)
        return True

    def stop_opening(self) -> None:
        """Stop reading a large file that is still being read (another sheet is shown, or the window closes)."""
        if self.opening is not None:
            self.opening.cancel()
            self.opening = None

    def _is_stale(self) -> bool:
        """True for a notice of a reading stopped meanwhile (it was on its way when the reading stopped)."""
        return self.opening is None or self.sender() is not self.opening

    def _on_file_opened(self, reading_set, sheet: ReadingSheet, pieces) -> None:
        if self._is_stale():
            if pieces is not None:
                pieces.path.unlink(missing_ok=True)
            return
        path, self.opening = self.opening.path, None
        self.load_reading_set(reading_set, path, sheet)
        if pieces is not None:
            self.keeper.use_pieces(sheet, pieces)
        remember_file(path)

    def _offer_characteristics(self, path: Path) -> bool | None:
        """When the file holds many characteristics, their choice and summary (see ``offer_characteristics``)."""
        from rankwise.ui.characteristics_window import offer_characteristics

        many = offer_characteristics(self, path)
        if many:
            remember_file(path)
        return many

    def _on_many_characteristics(self) -> None:
        if self._is_stale():
            return
        path, self.opening = self.opening.path, None
        self.statusBar().clearMessage()
        self._offer_characteristics(path)

    def _on_file_failed(self, message: str) -> None:
        if self._is_stale():
            return
        self.opening = None
        self.statusBar().clearMessage()
        dialogs.show_problem(self, "Cannot open the file", message)

    def load_reading_set(self, reading_set, path: Path, sheet: ReadingSheet | None = None) -> None:
        """Put opened readings into the sheet (``sheet``: already built from them) and analyse them."""
        if sheet is None:
            large = path.is_file() and path.stat().st_size > LARGE_FILE_BYTES
            sheet = (run_aside(self, f"Opening {path.name}…", lambda: sheet_of(reading_set)) if large
                     else sheet_of(reading_set))
        from rankwise.readings.same_parts import suggest

        natural = suggest(reading_set.groups, reading_set.pairing).question
        question = reading_set.suggested_question
        if question not in OPTION_OF_QUESTION:  # a question the picker does not ask: the groups' own
            question = natural
        self.question_panel.set_same_parts_unavailable(sheet.parts.not_parts)
        changed = self.question_panel.select_question(question)
        self.set_sheet(sheet, path)
        used = sum(len(group.values) for group in reading_set.groups)
        skipped = sum(len(group.skipped) for group in reading_set.groups)
        message = (f"Opened {path.name}: {used} readings in {len(reading_set.groups)} groups"
                   + (f", {skipped} cell{'s' if skipped != 1 else ''} skipped (hover over them in the sheet to see why)."
                      if skipped else "."))
        if changed:
            reason = (suggestion_reason(question.value, len(reading_set.groups), reading_set.found)
                      if question is natural else CHOSEN_WHEN_OPENING)
            message += " " + question_suggested(self.question_panel.option.text, reason)
        self.opening_message = message
        self.statusBar().showMessage(message, 30000)

    def open_demo(self) -> bool:
        """Open the demo readings (surface roughness from two grinding wheels; invented data)."""
        path = demo_folder() / DEMO_FILE_NAME
        if not path.is_file():
            dialogs.show_problem(
                self, "Demo readings not found",
                f"The demo readings ({DEMO_FILE_NAME}) are not next to this installation (looked in {path.parent}). "
                "They come with the Rankwise source folder; open any CSV or XLSX export instead.",
            )
            return False
        return self.open_path(path)

    def save_readings(self) -> bool:
        """Save the readings exactly as typed (CSV or XLSX); True when saved."""
        from rankwise.readings import save_sheet

        suggested = (self.source_path.stem if self.source_path else "readings") + ".csv"
        path = dialogs.ask_save_path(self, "Save readings as typed", suggested, dialogs.SAVE_READINGS_FILTER)
        if path is None:
            return False
        if path.suffix.lower() not in (".csv", ".xlsx"):
            path = path.with_suffix(".csv")
        try:
            save_sheet(self.sheet, path)
        except (ReadingsError, OSError) as error:
            dialogs.show_problem(self, "Cannot save the readings", str(error))
            return False
        self.sheet.mark_saved()
        self.restored_unsaved = False
        self.source_path = path
        remember_file(path)
        self.keeper.settle()
        self.update_title()
        return True
