"""Nothing lost: each window keeps its entry in its own recovery file while the user types, the
entries of gone windows are offered back (Restore is the default), a running window's file is
never offered or removed by another, and closing asks first.

The kill tests run a real window in a child process (offscreen), type readings into it with key
events at 10 ms a key, kill it with SIGKILL, and check that a new window gets every reading back.
"""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import pytest
from window_support import PATIENCE_MS, answers, type_column, window  # noqa: F401 - pytest fixtures

from rankwise.ui import dialogs
from rankwise.ui.main_window import MainWindow
from rankwise.ui.recovery import ENTRY_SUFFIX, RecoveryFile

CHILD_LIMIT_S = 120
"""A child window that has not done its part by then has hung: the test fails instead of waiting."""


def kept_texts(path: Path, group: int) -> list[str]:
    """The texts of one group as the recovery file holds them ([] when there is no file yet)."""
    if not path.exists():
        return []
    cells = RecoveryFile(path).load().snapshot.groups[group].cells
    return [cell.text for cell in cells]


def sheet_texts(shown: MainWindow, group: int) -> list[str]:
    return [cell.text for cell in shown.sheet.groups[group].cells]


def new_window(qtbot, folder: Path) -> MainWindow:
    started = MainWindow(recovery=RecoveryFile.for_new_window(folder))
    qtbot.addWidget(started)
    return started


def gone(shown: MainWindow) -> None:
    """What a kill leaves: the window's writes are done, its lock is no longer held, nothing removed."""
    assert shown.keeper.wait_until_written()
    shown.keeper._writer.stop()
    shown.recovery.release()


def test_each_typed_reading_is_in_the_recovery_file_when_its_key_press_ends(qtbot, window):
    readings = ["0,41", "0,47", "scrap", "0,52"]
    window.grid.setFocus()
    for row, text in enumerate(readings):
        type_column(qtbot, window.grid, 0, [text], start_row=row)
        assert kept_texts(window.recovery.path, 0) == readings[:row + 1]  # no waiting: already written


def test_the_entry_of_a_gone_window_is_offered_back_and_restored(qtbot, tmp_path, answers):
    crashed = new_window(qtbot, tmp_path)
    crashed.grid.paste_text("0,41\t0,47\nscrap\t0,52\n")
    crashed.question_panel.select_option("b-higher")
    gone(crashed)

    restarted = new_window(qtbot, tmp_path)
    assert restarted.offer_recovery()
    assert "closed without saving" in answers.questions[-1] and "4 cells" in answers.questions[-1]
    assert sheet_texts(restarted, 0) == ["0,41", "scrap"] and sheet_texts(restarted, 1) == ["0,47", "0,52"]
    assert restarted.question_panel.option.key == "b-higher"
    assert restarted.has_unsaved_readings()
    assert not crashed.recovery.exists() and restarted.recovery.exists()  # the file became the new window's
    restarted.sheet.set_text(0, 0, "0,44")
    assert restarted.keeper.wait_until_written()
    assert kept_texts(restarted.recovery.path, 0) == ["0,44", "scrap"]


def test_restore_is_the_default_answer():
    box, restore_button = dialogs.restore_question(None, "A Rankwise window was closed without saving.")
    assert box.defaultButton() is restore_button and "Restore" in restore_button.text()


def test_a_running_windows_file_is_never_offered_or_removed(qtbot, tmp_path, answers):
    first = new_window(qtbot, tmp_path)
    first.grid.paste_text("1,0\t2,0\n")
    assert first.keeper.wait_until_written()
    second = new_window(qtbot, tmp_path)
    assert not second.offer_recovery()
    assert answers.questions == []
    second.grid.paste_text("3,0\n")
    assert second.keeper.wait_until_written() and second.recovery.exists()
    answers.keep_changes = "discard"
    assert second.close()
    assert not second.recovery.exists()  # its own file goes with it
    assert kept_texts(first.recovery.path, 0) == ["1,0"]  # the running window's file stays


def test_two_gone_windows_each_come_back_in_a_window_of_their_own(qtbot, tmp_path, answers):
    for texts in ("1,1\n1,2\n", "2,1\n2,2\n2,3\n"):
        gone_window = new_window(qtbot, tmp_path)
        gone_window.grid.paste_text(texts)
        gone(gone_window)
    restarted = new_window(qtbot, tmp_path)
    assert restarted.offer_recovery()
    assert len(answers.questions) == 2
    for extra in restarted.restored_windows:
        qtbot.addWidget(extra)
    entries = sorted([sheet_texts(restarted, 0)] + [sheet_texts(w, 0) for w in restarted.restored_windows])
    assert entries == [["1,1", "1,2"], ["2,1", "2,2", "2,3"]]
    assert all(w.recovery.exists() for w in [restarted, *restarted.restored_windows])


def test_a_declined_entry_is_removed_and_one_left_unanswered_is_offered_again(qtbot, tmp_path, answers):
    crashed = new_window(qtbot, tmp_path)
    crashed.grid.paste_text("5,0\n")
    gone(crashed)
    answers.restore = "later"
    assert not new_window(qtbot, tmp_path).offer_recovery()
    assert crashed.recovery.exists()
    answers.restore = "discard"
    assert not new_window(qtbot, tmp_path).offer_recovery()
    assert not crashed.recovery.exists() and len(answers.questions) == 2
    assert not new_window(qtbot, tmp_path).offer_recovery() and len(answers.questions) == 2


def test_a_damaged_entry_is_put_aside_and_reported_in_words(qtbot, tmp_path, answers):
    damaged = tmp_path / f"window-1-1{ENTRY_SUFFIX}"
    damaged.write_text(json.dumps({"format": "rankwise-entry-journal-1", "sheet": "not a sheet"}) + "\n")
    restarted = new_window(qtbot, tmp_path)
    assert not restarted.offer_recovery()
    assert answers.problems and answers.problems[-1][0] == "Cannot restore"
    assert (tmp_path / (damaged.name + ".damaged")).exists() and not damaged.exists()
    assert restarted.sheet.group_names == ["A", "B"]


@pytest.mark.parametrize("what", ["abcd1234", "opened-3"])  # a copy cut short; the lines a reading process wrote
def test_temporary_copies_and_locks_of_gone_windows_are_cleaned_up(qtbot, tmp_path, answers, what):
    leftover = tmp_path / f".window-1-7{ENTRY_SUFFIX}.{what}.tmp"
    leftover.write_text("{}")
    restarted = new_window(qtbot, tmp_path)
    assert not restarted.offer_recovery()
    assert not leftover.exists() and not (tmp_path / f"window-1-7{ENTRY_SUFFIX}.lock").exists()


def test_saving_the_readings_removes_the_file_and_a_new_edit_writes_it_again(qtbot, window, answers, tmp_path):
    window.grid.paste_text("1,5\t1,6\n")
    assert window.keeper.wait_until_written() and window.recovery.exists()
    answers.save_path = tmp_path / "typed.csv"
    assert window.save_readings()
    assert window.keeper.wait_until_written() and not window.recovery.exists()
    window.grid.paste_text("1,7\n")
    assert window.keeper.wait_until_written()
    assert kept_texts(window.recovery.path, 0) == ["1,7"]


def test_closing_with_unsaved_readings_asks_and_can_keep_working(qtbot, window, answers):
    """Close with unsaved readings: 'keep working' leaves the window open with everything in it."""
    window.grid.paste_text("1.0\t2.0\n")
    answers.keep_changes = "cancel"
    assert not window.close()
    assert window.isVisible() and window.sheet.cell(1, 0).text == "2.0"
    answers.keep_changes = "discard"
    assert window.close()
    assert not window.recovery.exists()


def test_a_normal_close_without_readings_asks_nothing(qtbot, window, answers):
    """An empty sheet closes at once; nothing is kept for recovery."""
    answers.keep_changes = "cancel"
    assert window.close()
    assert not window.recovery.exists()


# -- kill tests: a real window in a child process ---------------------------------------------------

_TYPIST = """
    import json, sys
    from pathlib import Path
    from PySide6.QtCore import Qt, QTimer
    from PySide6.QtTest import QTest
    from PySide6.QtWidgets import QApplication
    from rankwise.ui.main_window import MainWindow
    from rankwise.ui.recovery import RecoveryFile

    folder, plan = Path(sys.argv[1]), json.loads(sys.argv[2])
    application = QApplication(sys.argv[:1])
    window = MainWindow(recovery=RecoveryFile.for_new_window(folder))
    window.show()
    if plan["background"]:
        window.question_panel.method.setCurrentIndex(window.question_panel.method.findData("exact"))
        window.grid.paste_text(plan["background"])
    keys = []
    for column, texts in enumerate(plan["columns"]):
        keys.append(("move", column))
        for text in texts:
            keys += [("key", character) for character in text] + [("key", "\\n")]

    def press():
        if not keys:  # with a background calculation asked for, the last key is followed by its start
            if not plan["background"] or window.runner._running is not None:
                timer.stop()
                print("TYPED", "calculating" if window.runner._running is not None else "idle", flush=True)
            return
        kind, value = keys.pop(0)
        if kind == "move":
            window.grid.setFocus()
            window.grid.move_to(len(plan["background"].splitlines()) if plan["background"] else 0, value)
            return
        target = QApplication.focusWidget() or window.grid
        if value == "\\n":
            QTest.keyClick(target, Qt.Key.Key_Return)
        else:
            QTest.keyClick(target, value)

    timer = QTimer(interval=10)  # a gauge typing like a keyboard: one key every 10 ms
    timer.timeout.connect(press)
    timer.start()
    application.exec()
"""


def _environment(tmp_path: Path) -> dict[str, str]:
    environment = dict(os.environ, QT_QPA_PLATFORM="offscreen",
                       PYTHONPATH=os.pathsep.join([str(Path(__file__).resolve().parents[2] / "desktop"),
                                                   os.environ.get("PYTHONPATH", "")]))
    for variable in ("XDG_CONFIG_HOME", "XDG_DATA_HOME", "XDG_STATE_HOME", "XDG_CACHE_HOME"):
        environment[variable] = str(tmp_path / variable.lower())
    return environment


def type_and_kill(tmp_path: Path, folder: Path, columns: list[list[str]], delay_ms: int,
                  background: str = "") -> str:
    """Start a window in a child, type ``columns`` at 10 ms a key, kill it ``delay_ms`` after the last
    key (a scenario of the test, not a wait for a result); return what the child said at the end."""
    plan = json.dumps({"columns": columns, "background": background})
    child = subprocess.Popen([sys.executable, "-c", textwrap.dedent(_TYPIST), str(folder), plan],
                             env=_environment(tmp_path), stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    try:
        said = _read_until(child, "TYPED")
        time.sleep(delay_ms / 1000)
        child.send_signal(signal.SIGKILL)
        child.wait(CHILD_LIMIT_S)
    finally:
        if child.poll() is None:
            child.kill()
            child.wait()
    assert child.returncode == -signal.SIGKILL, child.stderr.read()
    return said


def _read_until(child: subprocess.Popen, word: str) -> str:
    import selectors

    selector = selectors.DefaultSelector()
    selector.register(child.stdout, selectors.EVENT_READ)
    while True:
        if not selector.select(timeout=CHILD_LIMIT_S):
            child.kill()
            pytest.fail(f"the child window did not finish typing within {CHILD_LIMIT_S} s")
        line = child.stdout.readline()
        if not line:
            pytest.fail("the child window ended early: " + child.stderr.read())
        if line.startswith(word):
            return line.strip()


READINGS = [f"0,{40 + (i * 7) % 19:02d}" for i in range(20)]
"""Twenty readings at 0,01 resolution, typed as from a gauge sheet (common practice, no source)."""


@pytest.mark.parametrize("delay_ms", [0, 30, 100, 300])
def test_readings_typed_at_10_ms_a_key_all_come_back_after_a_kill(qtbot, tmp_path, answers, delay_ms):
    folder = tmp_path / "recovery"
    type_and_kill(tmp_path, folder, [READINGS[:10], READINGS[10:]], delay_ms)
    restarted = new_window(qtbot, folder)
    assert restarted.offer_recovery()
    assert sheet_texts(restarted, 0) == READINGS[:10] and sheet_texts(restarted, 1) == READINGS[10:]


def test_readings_typed_during_a_calculation_all_come_back_after_a_kill(qtbot, tmp_path, answers):
    folder = tmp_path / "recovery"
    background = "\n".join(f"{50 + (i * 37) % 23},{i % 10}\t{51 + (i * 29) % 23},{i % 7}" for i in range(300))
    said = type_and_kill(tmp_path, folder, [READINGS[:5]], 0, background=background)
    assert said == "TYPED calculating"  # killed while the exact calculation ran in the background
    restarted = new_window(qtbot, folder)
    assert restarted.offer_recovery()
    assert sheet_texts(restarted, 0)[300:] == READINGS[:5]
    assert len(sheet_texts(restarted, 1)) == 300


def test_two_killed_windows_each_get_their_own_readings_back(qtbot, tmp_path, answers):
    folder = tmp_path / "recovery"
    type_and_kill(tmp_path, folder, [READINGS[:6]], 0)
    type_and_kill(tmp_path, folder, [READINGS[6:9], READINGS[9:12]], 50)
    restarted = new_window(qtbot, folder)
    assert restarted.offer_recovery()
    for extra in restarted.restored_windows:
        qtbot.addWidget(extra)
    shown = sorted(([sheet_texts(w, 0), sheet_texts(w, 1)] for w in [restarted, *restarted.restored_windows]))
    assert shown == sorted([[READINGS[:6], []], [READINGS[6:9], READINGS[9:12]]])


def test_a_start_tidies_up_saves_cut_short_in_the_folders_rankwise_saved_into(tmp_path):
    from rankwise.ui.recent_files import remember_written_folder, remove_interrupted_saves_in_the_background

    remember_written_folder(tmp_path / "result.xlsx")
    left = tmp_path / ".result.xlsx.q1w2e3r4.tmp"
    left.write_text("half a workbook")
    then = time.time() - 600
    os.utime(left, (then, then))
    remove_interrupted_saves_in_the_background().join(CHILD_LIMIT_S)
    assert not left.exists()


def test_a_large_files_first_edit_is_kept_from_the_lines_its_reader_wrote(qtbot, window, monkeypatch):
    """The process that read a large file also wrote its sheet's lines for the recovery file: the first
    edit's copy takes them (nothing is encoded again in the window's process, and their file then
    goes) and reads back as the sheet stands after the edit."""
    import rankwise.ui.recovery as recovery
    import rankwise.ui.window_files as window_files

    encoded_here = []
    real_base_lines = recovery.base_lines
    monkeypatch.setattr(recovery, "base_lines", lambda *args: (encoded_here.append(args), real_base_lines(*args))[1])
    monkeypatch.setattr(window_files, "LARGE_FILE_BYTES", 10)
    assert window.open_path(Path(__file__).resolve().parents[2] / "demo_files" / "long_export.csv")
    qtbot.waitUntil(lambda: window.opening is None, timeout=PATIENCE_MS)
    folder, name = window.keeper.file.folder, window.keeper.file.path.name
    assert len(list(folder.glob(f".{name}.opened-*.tmp"))) == 1 and not window.keeper.file.exists()
    model = window.sheet_model
    model.setData(model.index(2, 1), window.sheet.groups[1].cells[7].text)
    assert window.keeper.wait_until_written()
    assert encoded_here == [] and list(folder.glob(f".{name}.opened-*.tmp")) == []
    kept = window.keeper.file.load()
    assert kept.changes == 1 and kept.source == str(window.source_path)
    assert [(g.name, g.cells) for g in kept.snapshot.groups] == [(g.name, tuple(g.cells)) for g in window.sheet.groups]
