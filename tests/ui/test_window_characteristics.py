"""A file of many characteristics in the window: choose the processes and characteristics, read the
summary, open one characteristic, save the signed record; 1,000 characteristics with progress and Stop."""

from __future__ import annotations

import hashlib
import threading

import numpy as np
from PySide6.QtCore import Qt

from window_support import DEMO_FILES, PATIENCE_MS, answers, screenshot, wait_for_verdict, window  # noqa: F401

from rankwise.records import read_record, verify_record
from rankwise.records.signoff import Signature
from rankwise.stats import CharacteristicsResult, Question
from rankwise.ui import characteristics_window
from rankwise.ui.characteristics_dialog import CharacteristicsDialog
from rankwise.ui.characteristics_window import CharacteristicsWindow
from rankwise.ui.signoff_dialog import SignOffDialog, local_now
from rankwise.wording.characteristics import COLUMNS

HOUSING = DEMO_FILES / "housing_two_dies.csv"


def _dialog_that_chooses(qtbot, seen: dict, drop=()):
    """An ``ask`` that shows the real dialog, unticks ``drop``, looks at it, then compares."""

    def ask(cls, parent, table):
        dialog = cls(parent, table)
        qtbot.addWidget(dialog)
        dialog.show()
        qtbot.waitExposed(dialog)
        for row in range(dialog.list.count()):
            if dialog.list.item(row).data(Qt.ItemDataRole.UserRole) in drop:
                dialog.list.item(row).setCheckState(Qt.CheckState.Unchecked)
        seen["a"], seen["b"] = dialog.group_a.currentText(), dialog.group_b.currentText()
        seen["items"] = [dialog.list.item(row).text() for row in range(dialog.list.count())]
        screenshot(dialog, "characteristics-open-dialog")
        dialog.accept()
        return dialog.choice

    return classmethod(ask)


def _summary(window) -> CharacteristicsWindow:
    return window.characteristics_summaries[-1]


def test_the_demo_housing_opens_as_many_characteristics(qtbot, window, answers, monkeypatch, tmp_path):
    before = hashlib.sha256(HOUSING.read_bytes()).hexdigest()
    seen: dict = {}
    monkeypatch.setattr(CharacteristicsDialog, "ask", _dialog_that_chooses(qtbot, seen, drop=("Runout",)))
    answers.open_path = HOUSING
    window.ask_and_open()
    assert (seen["a"], seen["b"]) == ("old die", "new die")
    assert seen["items"][4] == "Face flatness (mm) · LSL 0.000, USL 0.050 · missing 1 / 1"
    summary = _summary(window)
    qtbot.waitUntil(lambda: summary.result is not None, timeout=PATIENCE_MS)
    assert summary.model.rowCount() == 11
    assert summary.headline.text().startswith("4 of 11 characteristics were shown to move")
    assert "Please note:" in summary.caution.text() and summary.caution.isVisible()
    outcomes = {summary.model.item(r, 0).text(): summary.model.item(r, 11).text() for r in range(11)}
    assert outcomes["Hardness"] == "moved down" and outcomes["Bore depth"] == "moved up"
    assert outcomes["Mass"] == "no change shown"
    screenshot(summary, "characteristics-summary-as-in-file")
    summary.resize(1000, 650)  # a 1024 x 700 screen: the outcome and the limit mark show without scrolling
    header, width = summary.view.horizontalHeader(), summary.view.viewport().width()
    for column in (0, COLUMNS.index("Outcome"), COLUMNS.index("Limit"), COLUMNS.index("Adjusted p")):
        assert 0 <= header.sectionViewportPosition(column) and \
            header.sectionViewportPosition(column) + header.sectionSize(column) <= width, COLUMNS[column]

    summary.sort.setCurrentIndex(1)  # by shift relative to the tolerance: bore depth moved 30 % of its width
    assert [summary.model.item(r, 0).text() for r in range(3)] == ["Bore depth", "Hardness", "Face flatness"]
    screenshot(summary, "characteristics-summary-by-tolerance")

    hardness = next(r for r in range(11) if summary.model.item(r, 0).text() == "Hardness")
    summary.view.doubleClicked.emit(summary.model.index(hardness, 0))
    assert window.sheet.group_names == ["old die", "new die"]
    wait_for_verdict(qtbot, window)
    assert window.last_result.n_a == 25 and window.last_result.shift == -5.0
    assert hashlib.sha256(HOUSING.read_bytes()).hexdigest() == before

    out = tmp_path / "housing.xlsx"
    answers.save_path = out
    signature = Signature("Ann Lee", "quality engineer", "accept the change", "", local_now())
    monkeypatch.setattr(SignOffDialog, "ask", classmethod(lambda cls, parent, **kw: signature))
    writing_threads = []
    real_write = characteristics_window.write_record
    monkeypatch.setattr(characteristics_window, "write_record",
                        lambda *args, **kwargs: (writing_threads.append(threading.current_thread()),
                                                 real_write(*args, **kwargs))[1])
    assert summary.save_record() == out
    assert writing_threads and threading.main_thread() not in writing_threads  # the window kept answering
    record = read_record(out)
    assert record.analysis.question is Question.CHARACTERISTICS and isinstance(record.result, CharacteristicsResult)
    assert verify_record(out).intact
    answers.save_path = tmp_path / "housing.pdf"
    assert summary.save_pdf() == tmp_path / "housing.pdf"
    assert answers.problems == []


def test_a_thousand_characteristics_show_progress_and_stop(qtbot, window, answers, monkeypatch, tmp_path):
    """Columns built here for the test (not real readings): 1,000 characteristics of 12 + 12 parts."""
    rng = np.random.default_rng(5)
    names = [f"Dimension {k + 1} [mm]" for k in range(1000)]
    lines = ["Part,Process," + ",".join(names)]
    for part in range(24):
        values = np.round(rng.normal(10.0, 0.05, 1000), 2)
        lines.append(f"P{part + 1},{'current' if part < 12 else 'trial'}," + ",".join(f"{v:.2f}" for v in values))
    path = tmp_path / "wide.csv"
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    monkeypatch.setattr(CharacteristicsDialog, "ask", _dialog_that_chooses(qtbot, {}))
    answers.open_path = path
    window.ask_and_open()
    summary = _summary(window)
    assert len(summary.analysis.characteristics) == 1000
    qtbot.waitUntil(lambda: summary.progress.value() > 0, timeout=PATIENCE_MS)
    assert summary.stop_button.isEnabled()
    screenshot(summary, "characteristics-summary-in-progress")
    summary.stop()
    qtbot.waitUntil(lambda: summary.headline.text().startswith("Stopped on request"), timeout=PATIENCE_MS)
    assert summary.result is None and summary.again_button.isEnabled() and summary.model.rowCount() == 0
    summary.close()


def test_a_record_of_many_characteristics_is_not_shown_as_one_characteristics_verdict(qtbot, window, answers, tmp_path):
    """Reopened in the window, a signed many-characteristics record is not turned into a two-group
    verdict on its first characteristic beside the signature: the window says where to read it and
    leaves the sheet as it was."""
    from rankwise.records import write_record
    from rankwise.records.record import ResultRecord
    from rankwise.records.signoff import SignOff
    from rankwise.readings import open_characteristics
    from rankwise.stats import Settings, run

    table = open_characteristics(HOUSING)
    analysis = table.to_analysis("old die", "new die", settings=Settings())
    signature = Signature("Ann Lee", "quality engineer", "accept the change", "", local_now())
    record = ResultRecord.now(analysis, table.snapshot("old die", "new die"), run(analysis), SignOff(prepared=signature))
    path = tmp_path / "housing-record.xlsx"
    write_record(path, record)
    before = window.sheet.group_names
    assert window.open_path(path)
    title, text = answers.messages[-1]
    assert title == "A record of many characteristics"
    assert "12 characteristics compared at once (new die against old die), revision 1, prepared by Ann Lee" in text
    assert "open it in a spreadsheet program" in text and "Check a signed record" in text
    assert window.sheet.group_names == before
    assert window.last_result is None and window.source_path != path
