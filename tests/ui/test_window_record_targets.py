"""The window's save dialogs for records and PDFs never destroy a file: not the readings file the
window opened, never a record with a PDF; a name typed without its ending replaces a file only when
the user agrees."""

from __future__ import annotations

import hashlib
from datetime import datetime, timezone

from openpyxl import Workbook

from window_support import answers, wait_for_verdict, window  # noqa: F401 - pytest fixtures

from rankwise.records import Signature, read_record
from rankwise.ui.signoff_dialog import SignOffDialog

SIGNATURE = Signature("T. Example", "process technician", "accept the change", "",
                      datetime(2026, 3, 2, 9, 30, tzinfo=timezone.utc))


def digest(path):
    return hashlib.sha256(path.read_bytes()).hexdigest()  # hashlib, FIPS 180-4 SHA-256


def opened_export(qtbot, window, tmp_path):
    """A readings export (invented values) opened in the window, with its verdict shown."""
    path = tmp_path / "export.xlsx"
    book = Workbook()
    book.active.append(["Wheel A", "Wheel B"])
    for a, b in ((0.42, 0.45), (0.40, 0.47), (0.43, 0.44), (0.41, 0.48), (0.42, 0.46)):
        book.active.append([a, b])
    book.save(path)
    assert window.open_path(path)
    wait_for_verdict(qtbot, window, timeout=60000)
    return path


def test_the_opened_readings_file_is_never_written_over(qtbot, window, answers, monkeypatch, tmp_path):
    export = opened_export(qtbot, window, tmp_path)
    before = digest(export)
    monkeypatch.setattr(SignOffDialog, "ask", classmethod(lambda cls, parent=None, **kw: SIGNATURE))
    answers.save_path = export
    answers.confirm = True  # even a user who would agree to anything keeps the readings file
    assert not window.records.sign_and_save()
    assert digest(export) == before
    assert answers.problems and "readings file being read" in answers.problems[-1][1]
    answers.save_path = tmp_path / "export"  # typed without the ending: the same file once ".xlsx" is added
    assert not window.records.sign_and_save()
    assert digest(export) == before


def test_a_pdf_is_never_saved_over_a_record_and_a_completed_name_asks_first(qtbot, window, answers, monkeypatch,
                                                                            tmp_path):
    opened_export(qtbot, window, tmp_path)
    monkeypatch.setattr(SignOffDialog, "ask", classmethod(lambda cls, parent=None, **kw: SIGNATURE))
    answers.save_path = tmp_path / "signed.xlsx"
    assert window.records.sign_and_save()
    assert read_record(tmp_path / "signed.xlsx").signoff.prepared.name == "T. Example"
    record_bytes = digest(tmp_path / "signed.xlsx")
    renamed = tmp_path / "record-kept-as.pdf"
    renamed.write_bytes((tmp_path / "signed.xlsx").read_bytes())  # a record that was given a .pdf name
    answers.save_path = renamed
    answers.confirm = True
    assert window.records.save_pdf() is None
    assert "never written over a record" in answers.problems[-1][1]
    assert digest(renamed) == record_bytes and digest(tmp_path / "signed.xlsx") == record_bytes

    earlier = tmp_path / "verdict.pdf"
    earlier.write_bytes(b"%PDF-1.4 an earlier verdict")
    answers.save_path = tmp_path / "verdict"  # the dialog asked about "verdict", not "verdict.pdf"
    answers.confirm = False
    answers.questions.clear()
    assert window.records.save_pdf() is None
    assert any("verdict.pdf already exists" in question for question in answers.questions)
    assert earlier.read_bytes() == b"%PDF-1.4 an earlier verdict"
    answers.confirm = True
    assert window.records.save_pdf() == earlier
    assert earlier.read_bytes().startswith(b"%PDF") and b"an earlier verdict" not in earlier.read_bytes()


def test_checking_a_record_resaved_by_another_program_says_so(qtbot, window, answers, monkeypatch, tmp_path):
    from openpyxl import load_workbook

    opened_export(qtbot, window, tmp_path)
    monkeypatch.setattr(SignOffDialog, "ask", classmethod(lambda cls, parent=None, **kw: SIGNATURE))
    answers.save_path = tmp_path / "signed.xlsx"
    assert window.records.sign_and_save()
    load_workbook(tmp_path / "signed.xlsx").save(tmp_path / "resaved.xlsx")
    answers.open_path = tmp_path / "resaved.xlsx"
    window.records.check_record()
    title, text = answers.messages[-1]
    assert title == "Record unchanged" and "resaved.xlsx is intact" in text
    assert "saved again by another program" in text
