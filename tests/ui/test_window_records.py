"""Records from the window: sign and save, read-only after signing, a new revision, checking a
record, reopening it, and the one-page verdict as PDF."""

from __future__ import annotations

import threading
from datetime import datetime, timezone

import openpyxl
from pypdf import PdfReader

from window_support import answers, wait_for_verdict, window  # noqa: F401 - pytest fixtures

import rankwise.records
import rankwise.records.verify
from rankwise.records import Signature, read_record
from rankwise.ui.main_window import MainWindow
from rankwise.ui.recovery import RecoveryFile
from rankwise.ui.signoff_dialog import SignOffDialog

SIGNATURE = Signature("T. Example", "process technician", "accept the change", "", datetime(2026, 3, 2, 9, 30, tzinfo=timezone.utc))


def _sign_with(monkeypatch, signature=SIGNATURE):
    monkeypatch.setattr(SignOffDialog, "ask", classmethod(lambda cls, parent=None, **kw: signature))


def _signed_demo(qtbot, window, answers, monkeypatch, tmp_path):
    window.open_demo()
    wait_for_verdict(qtbot, window)
    _sign_with(monkeypatch)
    answers.save_path = tmp_path / "wheels-signed.xlsx"
    answers.confirm = False
    assert window.records.sign_and_save()
    return answers.save_path


def test_sign_and_save_locks_the_analysis(qtbot, window, answers, monkeypatch, tmp_path):
    """After signing, the workbook exists with the signature, and the sheet and question are read-only."""
    path = _signed_demo(qtbot, window, answers, monkeypatch, tmp_path)
    record = read_record(path)
    assert record.signoff.prepared.name == "T. Example" and record.signoff.revision == 1
    assert record.result.p_value == window.last_result.p_value
    assert window.records.is_signed and window.sheet_model.read_only
    assert not window.question_panel.level.isEnabled()
    window.grid.paste_text("5,00\n")
    assert window.sheet.cell(0, 0).text != "5,00"
    assert "read-only" in window.windowTitle()
    assert window.records.revision_action.isEnabled() and not window.records.sign_action.isEnabled()
    assert window.status_state.text() == "Signed record, revision 1: read-only"
    window.choose_question("plan")
    assert window.question_panel.option.key == "differ"


def test_the_record_is_written_while_the_window_keeps_answering(qtbot, window, answers, monkeypatch, tmp_path):
    """Writing a record (seconds for many readings or characteristics) runs aside, not on the window's thread."""
    writing_threads = []
    real_write = rankwise.records.write_record
    monkeypatch.setattr(rankwise.records, "write_record",
                        lambda *args, **kwargs: (writing_threads.append(threading.current_thread()),
                                                 real_write(*args, **kwargs))[1])
    path = _signed_demo(qtbot, window, answers, monkeypatch, tmp_path)
    assert read_record(path).signoff.revision == 1
    assert writing_threads and threading.main_thread() not in writing_threads


def test_new_revision_unlocks_a_copy_with_the_next_number(qtbot, window, answers, monkeypatch, tmp_path):
    """'Start a new revision' unlocks the readings; the next signature is revision 2."""
    _signed_demo(qtbot, window, answers, monkeypatch, tmp_path)
    window.records.start_revision()
    assert not window.sheet_model.read_only and window.question_panel.level.isEnabled()
    window.grid.move_to(0, 0)
    window.grid.paste_text("0,39\n")
    wait_for_verdict(qtbot, window)
    answers.save_path = tmp_path / "wheels-rev2.xlsx"
    assert window.records.sign_and_save()
    assert read_record(answers.save_path).signoff.revision == 2


def test_a_signed_record_is_not_replaced_without_asking(qtbot, window, answers, monkeypatch, tmp_path):
    """Saving over a signed record asks; saying no keeps the old file byte for byte."""
    path = _signed_demo(qtbot, window, answers, monkeypatch, tmp_path)
    before = path.read_bytes()
    window.records.start_revision()
    wait_for_verdict(qtbot, window)
    answers.confirm = False
    assert not window.records.sign_and_save()
    assert path.read_bytes() == before


def test_check_a_record_intact_then_changed(qtbot, window, answers, monkeypatch, tmp_path):
    """Checking an untouched record (aside: seconds for a large one) says intact; after one reading is
    edited it lists the change."""
    path = _signed_demo(qtbot, window, answers, monkeypatch, tmp_path)
    answers.open_path = path
    checking_threads = []
    real_verify = rankwise.records.verify.verify_record
    monkeypatch.setattr(rankwise.records.verify, "verify_record",
                        lambda *args: (checking_threads.append(threading.current_thread()), real_verify(*args))[1])
    window.records.check_record()
    assert answers.messages and answers.messages[-1][0] == "Record unchanged"
    assert checking_threads and threading.main_thread() not in checking_threads  # the window kept answering
    book = openpyxl.load_workbook(path)
    readings = book[[name for name in book.sheetnames if "eading" in name][0]]
    changed = next(cell for row in readings.iter_rows() for cell in row if isinstance(cell.value, (int, float)))
    changed.value = changed.value + 1
    tampered = tmp_path / "tampered.xlsx"
    book.save(tampered)
    answers.open_path = tampered
    window.records.check_record()
    assert answers.problems and answers.problems[-1][0] == "Record changed since signing"


def test_reopening_a_signed_record_restores_the_analysis(qtbot, window, answers, monkeypatch, tmp_path):
    """Opening the signed workbook restores the readings, the question and the signed, read-only state."""
    path = _signed_demo(qtbot, window, answers, monkeypatch, tmp_path)
    other = MainWindow(recovery=RecoveryFile(tmp_path / "other-recovery.json"))
    qtbot.addWidget(other)
    assert other.open_path(path)
    assert other.sheet.group_names == window.sheet.group_names
    assert other.records.is_signed and other.sheet_model.read_only
    wait_for_verdict(qtbot, other)
    assert other.last_result.p_value == window.last_result.p_value


def test_verdict_saved_as_one_page_pdf(qtbot, window, answers, tmp_path):
    """The one-page verdict of the current result is saved as a PDF of exactly one page."""
    window.open_demo()
    wait_for_verdict(qtbot, window)
    answers.save_path = tmp_path / "verdict.pdf"
    assert window.records.save_pdf() == answers.save_path
    assert len(PdfReader(str(answers.save_path)).pages) == 1


def test_a_signed_plan_checks_as_intact(qtbot, window, answers, monkeypatch, tmp_path):
    """The planning question, signed from the window, is a record that checks as unchanged."""
    window.open_demo()
    window.question_panel.select_option("plan")
    window.question_panel.planned_shift.setValue(0.03)
    window.question_panel.planned_spread.setValue(0.04)
    qtbot.waitUntil(lambda: window.last_result is not None and window.last_analysis.question.value == "plan"
                    and not window.runner.busy, timeout=60000)
    _sign_with(monkeypatch)
    answers.save_path = tmp_path / "plan-signed.xlsx"
    assert window.records.sign_and_save()
    answers.open_path = answers.save_path
    window.records.check_record()
    assert answers.messages and answers.messages[-1][0] == "Record unchanged", answers.problems


def _printer_to_pdf(path):
    """Point a chosen printer at a PDF file, as a user might in the print dialog."""

    def choose(parent, printer):
        printer.setOutputFormat(printer.OutputFormat.PdfFormat)
        printer.setOutputFileName(str(path))
        return True

    return choose


def test_print_sends_one_page_to_the_chosen_printer(qtbot, window, answers, monkeypatch, tmp_path):
    """Print (after the printer is chosen) puts the verdict on exactly one page."""
    from rankwise.ui import dialogs

    window.open_demo()
    wait_for_verdict(qtbot, window)
    printed = tmp_path / "printed.pdf"
    monkeypatch.setattr(dialogs, "ask_printer", _printer_to_pdf(printed))
    window.records.print_verdict()
    assert len(PdfReader(str(printed)).pages) == 1


def test_print_preview_draws_the_page(qtbot, window, answers, monkeypatch, tmp_path):
    """The preview asks the printing module to draw the verdict onto the preview's printer."""
    from rankwise.ui import dialogs

    window.open_demo()
    wait_for_verdict(qtbot, window)
    drawn = tmp_path / "preview.pdf"

    def preview(parent, printer, paint):
        _printer_to_pdf(drawn)(parent, printer)
        paint(printer)

    monkeypatch.setattr(dialogs, "show_print_preview", preview)
    window.records.print_preview()
    assert len(PdfReader(str(drawn)).pages) == 1


REVIEW = Signature("R. Reviewer", "quality engineer", "accept the change", "Checked against the control plan.",
                   datetime(2026, 3, 3, 14, 0, tzinfo=timezone.utc))


def test_a_reopened_record_is_countersigned_later_and_checks_as_intact(qtbot, window, answers, monkeypatch, tmp_path):
    """A quality engineer opens the technician's signed record, countersigns it, and the new record is intact."""
    from rankwise.records.verify import verify_record

    path = _signed_demo(qtbot, window, answers, monkeypatch, tmp_path)
    reviewer = MainWindow(recovery=RecoveryFile(tmp_path / "reviewer-recovery.json"))
    qtbot.addWidget(reviewer)
    assert reviewer.open_path(path)
    assert reviewer.records.countersign_action.isEnabled()
    _sign_with(monkeypatch, REVIEW)
    answers.save_path = tmp_path / "wheels-countersigned.xlsx"
    assert reviewer.records.countersign()
    countersigned = read_record(answers.save_path)
    original = read_record(path)
    assert countersigned.signoff.prepared == original.signoff.prepared
    assert countersigned.signoff.reviewed == REVIEW
    assert countersigned.result == original.result and countersigned.snapshot == original.snapshot
    assert verify_record(answers.save_path).intact
    assert not reviewer.records.countersign_action.isEnabled()
    assert verify_record(path).intact  # the technician's record is untouched


def test_a_signed_analysis_says_so_over_the_readings_and_typing_offers_a_revision(qtbot, window, answers, monkeypatch,
                                                                                  tmp_path):
    """Over the sheet: who signed, when (with the offset, not ISO 'T'), which revision. A key typed into the
    signed sheet explains and asks; "no" keeps it signed; "yes" starts revision 2 and the typing lands."""
    from PySide6.QtCore import Qt

    from window_support import press, screenshot

    _signed_demo(qtbot, window, answers, monkeypatch, tmp_path)
    strip = window.signed_strip
    assert strip.isVisible()
    words = strip.words.text()
    assert "revision 1" in words and "T. Example (process technician)" in words
    assert "2 Mar 2026, 09:30 (UTC+00:00)" in words and "T09" not in words
    assert strip.button.text() == "Start rev&ision 2"
    screenshot(window, "window-signed")
    window.grid.setFocus()
    window.grid.move_to(0, 0)
    answers.confirm = False
    press(qtbot, "7")
    assert answers.questions and "Start revision 2" in answers.questions[-1]
    assert window.sheet_model.read_only and window.sheet.cell(0, 0).text == "0,38"
    answers.confirm = True
    press(qtbot, "0", ",", "3", "9", Qt.Key.Key_Return)
    assert not window.sheet_model.read_only and not strip.isVisible()
    assert window.sheet.cell(0, 0).text == "0,39"
    assert window.status_state.text() == "Revision 2, not signed yet"
