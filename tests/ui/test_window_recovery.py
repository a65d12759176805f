"""Nothing lost: the entry is kept while typing, offered back after a crash, and closing asks first."""

from __future__ import annotations

from window_support import answers, window  # noqa: F401 - pytest fixtures

from rankwise.ui.main_window import MainWindow
from rankwise.ui.recovery import RecoveryFile


def test_recovery_file_restores_after_a_simulated_crash(qtbot, tmp_path, answers):
    """A window that never closes normally leaves its entry behind; the next start offers it back."""
    path = tmp_path / "recovery.json"
    crashed = MainWindow(recovery=RecoveryFile(path))
    qtbot.addWidget(crashed)
    crashed.grid.paste_text("0,41\t0,47\nscrap\t0,52\n")
    crashed.question_panel.select_option("b-higher")
    qtbot.waitUntil(path.exists, timeout=60000)
    qtbot.waitUntil(lambda: RecoveryFile(path).load()["question"]["option"] == "b-higher", timeout=60000)

    answers.confirm = True
    restarted = MainWindow(recovery=RecoveryFile(path))
    qtbot.addWidget(restarted)
    assert restarted.offer_recovery()
    assert "closed without saving" in answers.questions[-1]
    assert [restarted.sheet.cell(0, r).text for r in range(2)] == ["0,41", "scrap"]
    assert restarted.sheet.cell(1, 1).text == "0,52"
    assert restarted.question_panel.option.key == "b-higher"
    assert restarted.has_unsaved_readings()


def test_declined_recovery_removes_the_file(qtbot, tmp_path, answers):
    """Saying no to the offer discards the kept entry, so it is not offered again."""
    path = tmp_path / "recovery.json"
    RecoveryFile(path).save({"format": 1, "decimal": "auto", "groups": []}, {})
    answers.confirm = False
    restarted = MainWindow(recovery=RecoveryFile(path))
    qtbot.addWidget(restarted)
    assert not restarted.offer_recovery()
    assert not path.exists()


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


def test_damaged_recovery_data_are_reported_not_crashed_on(qtbot, tmp_path, answers):
    """A recovery file whose readings cannot be rebuilt is reported in words; the empty sheet stays."""
    path = tmp_path / "recovery.json"
    RecoveryFile(path).save({"format": 99, "groups": "not a list"}, {})
    answers.confirm = True
    restarted = MainWindow(recovery=RecoveryFile(path))
    qtbot.addWidget(restarted)
    assert not restarted.offer_recovery()
    assert answers.problems and answers.problems[-1][0] == "Cannot restore"
    assert restarted.sheet.group_names == ["A", "B"]
