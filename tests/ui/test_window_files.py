"""Opening files through the open dialog, saving the readings as typed, recent files."""

from __future__ import annotations

import hashlib

import pytest

from window_support import (  # noqa: F401 - pytest fixtures
    DEMO_FILES, PATIENCE_MS, answers, reading_threads, screenshot, wait_for_verdict, window,
)

from rankwise.readings import open_readings
from rankwise.ui.open_dialog import OpenReadingsDialog
from rankwise.ui.recent_files import recent_files

DEMO_GROUPS = {
    "two_wheels_roughness.csv": ["Wheel A (current)", "Wheel B (new)"],
    "push_out_force_three_presses.xlsx": ["Press 1", "Press 2", "Press 3"],
    "coating_before_after_cure.csv": ["Before cure", "After cure"],
    "long_export.csv": ["Line 1", "Line 2"],
    "gauge_sheet_bore_diameter.xlsx": ["Before tool change", "After tool change"],
}


def _dialog_that_loads(qtbot, seen: dict, change=None):
    """An ``ask`` that shows the real dialog, lets the test look (and change a choice), then loads."""

    def ask(cls, parent, path):
        dialog = cls(parent, path, open_readings(path))
        qtbot.addWidget(dialog)
        dialog.show()
        qtbot.waitExposed(dialog)
        if change is not None:
            change(dialog)
        seen["groups"] = [dialog.groups_list.item(i).text() for i in range(dialog.groups_list.count())]
        seen["skipped"] = [dialog.skipped_list.item(i).text() for i in range(dialog.skipped_list.count())]
        seen["found"] = dialog.found.text()
        seen["preview_rows"] = dialog.preview.rowCount()
        screenshot(dialog, f"open-dialog-{path.stem}")
        dialog.accept()
        return dialog.reading_set

    return classmethod(ask)


@pytest.mark.parametrize("name", sorted(DEMO_GROUPS))
def test_open_each_demo_file_through_the_dialog(qtbot, window, answers, monkeypatch, name):
    """Each demo file shows a preview, its groups and skipped cells, then lands in the grid unchanged on disk."""
    path = DEMO_FILES / name
    before = hashlib.sha256(path.read_bytes()).hexdigest()
    seen: dict = {}
    monkeypatch.setattr(OpenReadingsDialog, "ask", _dialog_that_loads(qtbot, seen))
    answers.open_path = path
    window.ask_and_open()
    assert window.sheet.group_names == DEMO_GROUPS[name]
    assert len(seen["groups"]) == len(DEMO_GROUPS[name]) and seen["preview_rows"] > 0
    assert name in seen["found"]
    assert window.source_path == path and not window.sheet.is_modified
    assert path.resolve() in recent_files()
    assert hashlib.sha256(path.read_bytes()).hexdigest() == before
    assert answers.problems == []


def test_scrap_cell_is_listed_with_its_reason(qtbot, window, answers, monkeypatch):
    """The open dialog lists the 'scrap' cell of the press workbook with the reason it is skipped."""
    seen: dict = {}
    monkeypatch.setattr(OpenReadingsDialog, "ask", _dialog_that_loads(qtbot, seen))
    answers.open_path = DEMO_FILES / "push_out_force_three_presses.xlsx"
    window.ask_and_open()
    assert any("'scrap'" in line for line in seen["skipped"])
    assert window.question_panel.option.key == "several"


def test_changing_the_group_column_regroups_the_readings(qtbot, window, answers, monkeypatch):
    """In the long export, choosing the operator column as group labels gives the operators as groups."""
    seen: dict = {}

    def choose_operator(dialog):
        dialog.group_column.setCurrentIndex(dialog.group_column.findData("Operator"))

    monkeypatch.setattr(OpenReadingsDialog, "ask", _dialog_that_loads(qtbot, seen, choose_operator))
    answers.open_path = DEMO_FILES / "long_export.csv"
    window.ask_and_open()
    expected = [g.name for g in open_readings(DEMO_FILES / "long_export.csv", layout="stacked",
                                              value_column="Runout (mm)", group_column="Operator").groups]
    assert window.sheet.group_names == expected and "Line 1" not in expected


def test_a_file_that_is_not_readings_gives_a_plain_problem(qtbot, window, answers, tmp_path):
    """Opening binary junk says what is wrong in words and leaves the sheet as it was."""
    junk = tmp_path / "junk.csv"
    junk.write_bytes(bytes(range(256)) * 4)
    window.grid.paste_text("1\n2\n")
    answers.keep_changes = "discard"
    assert not window.open_path(junk)
    assert answers.problems and answers.problems[0][0] == "Cannot open the file"
    assert window.sheet.cell(0, 1).text == "2"


def test_save_readings_as_typed_and_open_again(qtbot, window, answers, tmp_path):
    """Saved readings keep the texts as typed (notes included) and open again to the same groups."""
    window.grid.paste_text("0,41\t0,47\nscrap\t0,52\n0,40\t\n")
    answers.save_path = tmp_path / "entry.csv"
    assert window.save_readings()
    assert not window.sheet.is_modified and window.source_path == answers.save_path
    reopened = open_readings(answers.save_path)
    assert [g.name for g in reopened.groups] == ["A", "B"]
    assert [c.text for c in reopened.groups[0].cells if c.text] == ["0,41", "scrap", "0,40"]


def test_recent_menu_lists_opened_files_and_can_be_cleared(qtbot, window, answers):
    """Opened files appear in File > Open recent; 'Clear this list' empties it."""
    window.open_demo()
    window._fill_recent_menu()
    texts = [action.text() for action in window.recent_menu.actions()]
    assert any(text.endswith("two_wheels_roughness.csv") for text in texts)
    next(action for action in window.recent_menu.actions() if action.text() == "Clear this list").trigger()
    assert recent_files() == []


def test_missing_demo_files_give_a_plain_message(qtbot, window, answers, monkeypatch, tmp_path):
    """Installed without the demo folder, the demo entry says where it looked and what to do instead."""
    from rankwise.ui import window_files

    monkeypatch.setattr(window_files, "demo_folder", lambda: tmp_path / "no-demo-here")
    assert not window.open_demo()
    title, text = answers.problems[-1]
    assert title == "Demo readings not found" and "no-demo-here" in text and "open any CSV or XLSX" in text


def test_a_large_file_opens_in_a_process_of_its_own(qtbot, window, reading_threads):
    """Past LARGE_FILE_BYTES the file is read in a child process: the window's process runs no reader,
    and the sheet is the one reading the file here gives."""
    path = DEMO_FILES / "two_wheels_roughness.csv"
    assert window.open_path(path)
    qtbot.waitUntil(lambda: window.opening is None and window.source_path == path, timeout=PATIENCE_MS)
    assert reading_threads.seen == []
    expected = reading_threads.real_open(path)
    assert [group.name for group in window.sheet.groups] == [group.name for group in expected.groups]
    assert [c.text for c in window.sheet.groups[0].cells] == [c.text for c in expected.groups[0].cells]
    wait_for_verdict(qtbot, window)


def test_closing_the_window_while_a_large_file_is_read_stops_the_reading(qtbot, window, monkeypatch):
    import sys

    import rankwise.readings.read_aside as read_aside
    import rankwise.ui.window_files as window_files

    monkeypatch.setattr(window_files, "LARGE_FILE_BYTES", 10)
    monkeypatch.setattr(read_aside, "child_command", lambda *args: [sys.executable, "-c", "import time; time.sleep(600)"])
    assert window.open_path(DEMO_FILES / "two_wheels_roughness.csv")
    reading = window.opening
    window.close()
    reading._thread.join(PATIENCE_MS / 1000)
    assert not reading._thread.is_alive() and reading._reading.cancelled


def test_a_large_file_that_cannot_be_read_is_reported_in_words(qtbot, window, tmp_path, monkeypatch, answers):
    import rankwise.ui.window_files as window_files

    monkeypatch.setattr(window_files, "LARGE_FILE_BYTES", 10)
    path = tmp_path / "binary.csv"
    path.write_bytes(bytes(range(256)) * 40)
    assert window.open_path(path)
    qtbot.waitUntil(lambda: window.opening is None, timeout=PATIENCE_MS)
    assert answers.problems and answers.problems[-1][0] == "Cannot open the file"
    assert window.sheet.group_names == ["A", "B"]


def test_a_large_file_of_many_characteristics_is_recognised_by_the_reading_process(qtbot, window, monkeypatch):
    """Past LARGE_FILE_BYTES the look for many characteristics runs in the reading process too; the
    window then offers their choice as for a small file (here the technician cancels it)."""
    import rankwise.ui.window_files as window_files
    from rankwise.ui.characteristics_dialog import CharacteristicsDialog

    asked = []
    monkeypatch.setattr(CharacteristicsDialog, "ask", classmethod(lambda cls, parent, table: asked.append(table)))
    monkeypatch.setattr(window_files, "LARGE_FILE_BYTES", 10)
    assert window.open_path(DEMO_FILES / "housing_two_dies.csv")
    qtbot.waitUntil(lambda: window.opening is None and bool(asked), timeout=PATIENCE_MS)
    assert len(asked[0].characteristics) >= 2
    assert window.sheet.group_names == ["A", "B"] and window.source_path is None


def _slow_reading(monkeypatch, seconds: float) -> None:
    """Every file counts as large, and its reading process starts ``seconds`` late (then reads it as usual)."""
    import sys

    import rankwise.readings.read_aside as read_aside
    import rankwise.ui.window_files as window_files

    real_command = read_aside.child_command
    late = f"import runpy, sys, time; time.sleep({seconds}); sys.argv = ['read_aside', *sys.argv[1:]]; " \
           "runpy.run_module('rankwise.readings.read_aside', run_name='__main__')"
    monkeypatch.setattr(window_files, "LARGE_FILE_BYTES", 10)
    monkeypatch.setattr(read_aside, "child_command",  # the real command's arguments after "-m module"
                        lambda *args: [sys.executable, "-c", late, *real_command(*args)[3:]])


def test_a_second_file_opened_while_a_large_one_is_read_is_the_one_shown(qtbot, window, monkeypatch, answers):
    """The first reading is stopped: the sheet, its name and its readings are the second file's."""
    _slow_reading(monkeypatch, 1.0)
    first, second = DEMO_FILES / "long_export.csv", DEMO_FILES / "two_wheels_roughness.csv"
    assert window.open_path(first)
    reading = window.opening
    assert window.open_path(second)
    qtbot.waitUntil(lambda: window.opening is None and window.source_path == second, timeout=PATIENCE_MS)
    reading._thread.join(PATIENCE_MS / 1000)
    qtbot.wait(50)  # anything the stopped reading had sent on its way is handled
    assert window.source_path == second and window.sheet.group_names[0].startswith("Wheel A")
    assert not answers.problems
    wait_for_verdict(qtbot, window)


def test_a_new_sheet_started_while_a_large_file_is_read_stays(qtbot, window, monkeypatch, answers):
    _slow_reading(monkeypatch, 0.5)
    assert window.open_path(DEMO_FILES / "long_export.csv")
    reading = window.opening
    window.new_sheet()
    assert window.opening is None
    reading._thread.join(PATIENCE_MS / 1000)
    qtbot.wait(50)
    assert window.sheet.group_names == ["A", "B"] and window.source_path is None and not answers.problems
