"""The window's record actions: sign and save the result workbook, countersign a signed record,
start a new revision, check a signed record, and print or save the one-page verdict.

After signing, the analysis is read-only (the sheet and the question are locked); "Start a new
revision" unlocks a copy whose next signature carries the next revision number.
"""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING

from PySide6.QtCore import QObject
from PySide6.QtGui import QAction, QKeySequence

from rankwise.stats.analysis import Question
from rankwise.ui import dialogs

if TYPE_CHECKING:
    from rankwise.records import ResultRecord
    from rankwise.ui.main_window import MainWindow


class RecordActions(QObject):
    """Owns the record and printing actions of one window and the signed (read-only) state."""

    def __init__(self, window: MainWindow) -> None:
        super().__init__(window)
        self.window = window
        self.signed_record: ResultRecord | None = None
        self.next_revision = 1
        make = window.make_action
        self.sign_action = make("&Sign and save the result…", self.sign_and_save, "Ctrl+Shift+S",
                                "Sign the verdict and save it as a result workbook with a fingerprint.")
        self.countersign_action = make("Co&untersign (review and approve)…", self.countersign, None,
                                       "Add the reviewer's signature to the signed record shown and save it.")
        self.revision_action = make("Start a &new revision", self.start_revision, None,
                                    "Unlock a copy of the signed analysis to change it; it gets the next revision number.")
        self.check_action = make("&Check a signed record…", self.check_record, None,
                                 "Check that a signed result workbook is unchanged since it was signed.")
        self.print_preview_action = make("Print pre&view…", self.print_preview, None, "See the one-page verdict before printing.")
        self.print_action = make("&Print the verdict…", self.print_verdict, QKeySequence.StandardKey.Print,
                                 "Print the one-page verdict.")
        self.pdf_action = make("Save the verdict as P&DF…", self.save_pdf, "Ctrl+Shift+P", "Save the one-page verdict as a PDF file.")
        self.update_enabled()

    def menu_actions(self) -> list[QAction | None]:
        """The Record menu, top to bottom; None is a separator."""
        return [self.sign_action, self.countersign_action, self.revision_action, None, self.check_action, None,
                self.print_preview_action, self.print_action, self.pdf_action]

    # -- state -----------------------------------------------------------------------------------
    @property
    def is_signed(self) -> bool:
        """True while the window shows a signed, read-only analysis."""
        return self.signed_record is not None

    def update_enabled(self) -> None:
        """Enable what makes sense now: signing and printing need a verdict."""
        has_result = self.window.last_result is not None or self.is_signed
        self.sign_action.setEnabled(self.window.last_result is not None and not self.is_signed)
        self.revision_action.setEnabled(self.is_signed)
        self.countersign_action.setEnabled(self.is_signed and self.signed_record.signoff.reviewed is None)
        for action in (self.print_preview_action, self.print_action, self.pdf_action):
            action.setEnabled(has_result)

    def _lock(self, record: ResultRecord) -> None:
        self.signed_record = record
        self.next_revision = record.signoff.revision + 1
        self.window.sheet_model.set_read_only(True)
        self.window.question_panel.set_read_only(True)
        self.window.update_title()
        self.window.update_undo_actions()
        self.update_enabled()

    def forget_signature(self) -> None:
        """Leave the signed state (a new sheet or another file was opened)."""
        self.signed_record = None
        self.next_revision = 1
        self.window.sheet_model.set_read_only(False)
        self.window.question_panel.set_read_only(False)
        self.update_enabled()
        self.window.update_title()

    def current_record(self) -> ResultRecord | None:
        """The signed record shown, or an unsigned draft of the current verdict; None without a verdict."""
        if self.signed_record is not None:
            return self.signed_record
        if self.window.last_result is None or self.window.last_analysis is None:
            return None
        from rankwise.records import ResultRecord

        return ResultRecord.now(self.window.last_analysis, self.window.sheet.snapshot(), self.window.last_result, None)

    # -- signing ---------------------------------------------------------------------------------
    def sign_and_save(self) -> bool:
        """Ask for the sign-off, then where to save the signed result workbook; True when saved."""
        if self.window.last_result is None or self.window.runner.busy:
            dialogs.show_problem(self.window, "Nothing to sign yet", "Wait for the verdict to appear, then sign it.")
            return False
        from rankwise.records import ResultRecord
        from rankwise.records.signoff import SignOff
        from rankwise.ui.signoff_dialog import SignOffDialog

        signature = SignOffDialog.ask(self.window)
        if signature is None:
            return False
        reviewed = None
        if dialogs.confirm(self.window, "Review signature", "Is a reviewer here to countersign now?",
                           "Yes, countersign now", "No, only my signature"):
            reviewed = SignOffDialog.ask(self.window, reviewing=True, prepared=signature)
        record = ResultRecord.now(self.window.last_analysis, self.window.sheet.snapshot(), self.window.last_result,
                                  SignOff(prepared=signature, reviewed=reviewed, revision=self.next_revision))
        stem = self.window.source_path.stem if self.window.source_path else "result"
        path = self._ask_target("Save the signed result", f"{stem}-signed-rev{self.next_revision}.xlsx",
                                dialogs.RECORD_FILTER, "the signed record", ".xlsx")
        if path is None:
            return False
        if not self._write_asking_before_replacing(path, record):
            return False
        self._lock(record)
        self.window.statusBar().showMessage(f"Signed and saved to {path}. The analysis is now read-only.", 10000)
        return True

    def countersign(self) -> bool:
        """Add a reviewer's signature to the signed record shown and save it; True when saved.

        The readings, the result and the first signature stay exactly as signed; the countersigned
        workbook is a new record (its fingerprint covers both signatures).
        """
        record = self.signed_record
        if record is None or record.signoff.reviewed is not None:
            return False
        import dataclasses
        from datetime import datetime

        from rankwise.ui.signoff_dialog import SignOffDialog

        reviewed = SignOffDialog.ask(self.window, reviewing=True, prepared=record.signoff.prepared)
        if reviewed is None:
            return False
        countersigned = dataclasses.replace(
            record, signoff=dataclasses.replace(record.signoff, reviewed=reviewed),
            created_at=datetime.now().astimezone(), signed_fingerprint=None)
        stem = self.window.source_path.stem if self.window.source_path else "result"
        path = self._ask_target("Save the countersigned result", f"{stem}-countersigned.xlsx",
                                dialogs.RECORD_FILTER, "the countersigned record", ".xlsx")
        if path is None:
            return False
        if not self._write_asking_before_replacing(path, countersigned):
            return False
        self._lock(countersigned)
        self.window.statusBar().showMessage(f"Countersigned and saved to {path}.", 10000)
        return True

    def _ask_target(self, title: str, suggested: str, file_filter: str, what: str, ending: str) -> Path | None:
        """Ask where to save ``what``; None when cancelled or refused (with the reason shown).

        The ending is added when missing (then a file of that name is replaced only when the user
        agrees, as the platform dialog asked only about the name typed). The file the window
        opened is never written over, and a PDF never over a record
        (``rankwise.records.targets.refusal``).
        """
        from rankwise.records.targets import Target, refusal

        chosen = dialogs.ask_save_path(self.window, title, suggested, file_filter)
        if chosen is None:
            return None
        path = chosen if chosen.suffix.lower() == ending else chosen.with_name(chosen.name + ending)
        refused = refusal(self.window.source_path, [Target(path, what, ending)], replace=True)
        if refused is not None:
            dialogs.show_problem(self.window, "Not saved", refused[0].upper() + refused[1:])
            return None
        if path != chosen and path.exists() and not dialogs.confirm(
                self.window, "Replace a file?", f"{path.name} already exists. Replace it?", "Replace it", "Keep it"):
            return None
        return path

    def _write_asking_before_replacing(self, path: Path, record: ResultRecord) -> bool:
        """Write ``record`` to ``path``; a signed record there is replaced only when the user agrees."""
        from rankwise.records import RecordError, write_record
        from rankwise.ui.worker import run_aside

        saving = f"Saving the signed record {path.name}…"
        try:
            run_aside(self.window, saving, lambda: write_record(path, record))
        except RecordError as error:
            if not (path.exists() and dialogs.confirm(
                self.window, "Replace a signed record?",
                f"{error}\n\nReplace the signed record {path.name} with this one?", "Replace it", "Keep it",
            )):
                return False
            try:
                run_aside(self.window, saving, lambda: write_record(path, record, overwrite_signed=True))
            except RecordError as second_error:
                dialogs.show_problem(self.window, "Cannot save the signed result", str(second_error))
                return False
        return True

    def start_revision(self) -> None:
        """Unlock a copy of the signed analysis; its next signature gets the next revision number."""
        if self.signed_record is None:
            return
        from rankwise.readings import ReadingSheet

        revision = self.next_revision
        snapshot = self.window.sheet.snapshot()
        self.window.set_sheet(ReadingSheet.from_snapshot(snapshot), None)
        self.next_revision = revision
        self.window.update_title()
        self.window.statusBar().showMessage(f"Revision {revision}: the readings and the question can be changed again.", 10000)

    # -- reopening and checking ------------------------------------------------------------------
    def try_reopen(self, path: Path) -> bool:
        """Reopen a result workbook (restoring its analysis); False when the file is not a record."""
        from rankwise.readings import ReadingSheet
        from rankwise.records import RecordError, read_record

        try:
            record = read_record(path)
        except RecordError:
            return False
        if record.analysis.question is Question.CHARACTERISTICS:
            self._point_to_the_workbook(Path(path), record)
            return True
        self.window.set_sheet(ReadingSheet.from_snapshot(record.snapshot), Path(path))
        self.window.question_panel.set_from_analysis(record.analysis)
        if record.signoff is not None:
            self._lock(record)
            who = record.signoff.prepared
            self.window.statusBar().showMessage(
                f"Signed record, revision {record.signoff.revision}, prepared by {who.name} ({who.role}). Read-only.", 15000)
        return True

    def _point_to_the_workbook(self, path: Path, record: ResultRecord) -> None:
        """A record of many characteristics is read in its own workbook: the sheet holds one question's
        groups, and showing it there would put one characteristic's verdict beside the signature."""
        result = record.result
        signed = ""
        if record.signoff is not None:
            who = record.signoff.prepared
            signed = f", revision {record.signoff.revision}, prepared by {who.name} ({who.role})"
        dialogs.show_message(
            self.window, "A record of many characteristics",
            f"{path.name} is a record of {len(result.rows)} characteristics compared at once ({result.name_b} "
            f"against {result.name_a}){signed}. Its summary, each characteristic's figures and the readings as "
            "entered are on its own sheets: open it in a spreadsheet program to read or print it, and use "
            "Record > Check a signed record to confirm that it is unchanged. To compare again, open the "
            "original readings file. The sheet here is left as it was.")

    def check_record(self) -> None:
        """Ask for a signed result workbook and say, in plain words, whether it is unchanged."""
        from rankwise.records.verify import verify_record
        from rankwise.ui.worker import run_aside

        path = dialogs.ask_open_path(self.window, "Check a signed record", dialogs.RECORD_FILTER)
        if path is None:
            return
        verification = run_aside(self.window, f"Checking {path.name}…", lambda: verify_record(path))
        if verification.status == "intact":
            notes = "".join(f"\n\n{note}" for note in verification.notes)
            dialogs.show_message(self.window, "Record unchanged",
                                 f"{path.name} is intact: its readings, results and sign-off are as they were "
                                 f"signed.{notes}")
            return
        if verification.status == "changed":
            listed = "\n".join(f"• {difference}" for difference in verification.differences[:20])
            more = len(verification.differences) - 20
            if more > 0:
                listed += f"\n• … and {more} more."
            dialogs.show_problem(self.window, "Record changed since signing",
                                 f"{path.name} was changed after it was signed:\n{listed}")
            return
        dialogs.show_problem(self.window, "Not a Rankwise record",
                             " ".join(verification.differences) or f"{path.name} is not a Rankwise result record.")

    # -- printing --------------------------------------------------------------------------------
    def _record_or_say_why(self) -> ResultRecord | None:
        record = self.current_record()
        if record is None:
            dialogs.show_problem(self.window, "No verdict to print", "Wait for the verdict to appear, then print it.")
        return record

    def print_preview(self) -> None:
        """Show the one-page verdict as it will print."""
        record = self._record_or_say_why()
        if record is None:
            return
        from PySide6.QtPrintSupport import QPrinter

        from rankwise.ui.printing import print_verdict

        printer = QPrinter(QPrinter.PrinterMode.HighResolution)
        dialogs.show_print_preview(self.window, printer, lambda target: print_verdict(target, record))

    def print_verdict(self) -> None:
        """Print the one-page verdict on a printer the user chooses."""
        record = self._record_or_say_why()
        if record is None:
            return
        from PySide6.QtPrintSupport import QPrinter

        from rankwise.ui.printing import print_verdict

        printer = QPrinter(QPrinter.PrinterMode.HighResolution)
        if dialogs.ask_printer(self.window, printer):
            print_verdict(printer, record)

    def save_pdf(self) -> Path | None:
        """Save the one-page verdict as a PDF (US Letter where the locale measures in US units, else A4)."""
        record = self._record_or_say_why()
        if record is None:
            return None
        from rankwise.ui.printing import write_verdict_pdf

        stem = self.window.source_path.stem if self.window.source_path else "verdict"
        path = self._ask_target("Save the verdict as PDF", f"{stem}-verdict.pdf", dialogs.PDF_FILTER, "the PDF", ".pdf")
        if path is None:
            return None
        from PySide6.QtCore import QLocale

        page_size = "Letter" if QLocale().measurementSystem() == QLocale.MeasurementSystem.ImperialUSSystem else "A4"
        try:
            write_verdict_pdf(path, record, page_size=page_size)
        except (OSError, ValueError) as error:
            dialogs.show_problem(self.window, "Cannot save the PDF", str(error))
            return None
        self.window.statusBar().showMessage(f"Verdict saved to {path}.", 10000)
        return path
