"""Shared set-up for the window tests: a real window offscreen, dialogs answered by the test.

Only the functions in ``rankwise.ui.dialogs`` (and the dialogs' ``ask`` class methods) are
replaced; every Qt class is the real one.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

import pytest
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QAbstractItemView, QApplication, QLineEdit

from rankwise.ui import dialogs
from rankwise.ui.main_window import MainWindow
from rankwise.ui.recovery import RecoveryFile

PATIENCE_MS = 60_000
"""How long a test waits for a condition: generous, so that a machine busy with other work does
not fail a test; a passing condition ends the wait at once."""

SCREENSHOTS = Path(__file__).resolve().parents[1] / "screenshots"
DEMO_FILES = Path(__file__).resolve().parents[2] / "demo_files"


@dataclass
class Answers:
    """What the replaced dialogs answer, and what they were told."""

    confirm: bool = False
    restore: str = "restore"
    keep_changes: str = "discard"
    open_path: Path | None = None
    save_path: Path | None = None
    problems: list[tuple[str, str]] = field(default_factory=list)
    messages: list[tuple[str, str]] = field(default_factory=list)
    questions: list[str] = field(default_factory=list)


@pytest.fixture
def answers(monkeypatch) -> Answers:
    """Replace the window's dialogs with answers the test sets."""
    given = Answers()

    def confirm(parent, title, text, yes="Yes", no="No"):
        given.questions.append(text)
        return given.confirm

    def offer_restore(parent, text):
        given.questions.append(text)
        return given.restore

    monkeypatch.setattr(dialogs, "confirm", confirm)
    monkeypatch.setattr(dialogs, "offer_restore", offer_restore)
    monkeypatch.setattr(dialogs, "ask_keep_changes", lambda parent, text: given.keep_changes)
    monkeypatch.setattr(dialogs, "ask_open_path", lambda parent, title, file_filter=None: given.open_path)
    monkeypatch.setattr(dialogs, "ask_save_path", lambda parent, title, suggested, file_filter: given.save_path)
    monkeypatch.setattr(dialogs, "show_problem", lambda parent, title, text: given.problems.append((title, text)))
    monkeypatch.setattr(dialogs, "show_message", lambda parent, title, text: given.messages.append((title, text)))
    return given


@pytest.fixture
def window(qtbot, tmp_path, answers) -> MainWindow:
    """A real main window, shown offscreen, with its own recovery file."""
    shown = MainWindow(recovery=RecoveryFile.for_new_window(tmp_path))
    qtbot.addWidget(shown)
    shown.resize(1440, 900)  # the offscreen screen is small; pictures are taken at a desktop size
    shown.show()
    qtbot.waitExposed(shown)
    shown.activateWindow()
    return shown


def screenshot(widget, name: str) -> Path:
    """Save a picture of ``widget`` into tests/screenshots/ (git-ignored) for a person to look at."""
    SCREENSHOTS.mkdir(parents=True, exist_ok=True)
    path = SCREENSHOTS / f"{name}.png"
    QApplication.processEvents()
    assert widget.grab().save(str(path)), f"could not save {path}"
    return path


def type_column(qtbot, grid, column: int, texts: list[str], start_row: int = 0) -> None:
    """Type readings into one column with key presses: each text, then Enter (which moves down)."""
    grid.setFocus()
    grid.move_to(start_row, column)
    for row, text in enumerate(texts, start=start_row):
        assert grid.currentIndex().row() == row
        qtbot.keyClicks(grid, text[0])
        editor = QApplication.focusWidget()
        assert isinstance(editor, QLineEdit) and grid.state() == QAbstractItemView.State.EditingState
        qtbot.keyClicks(editor, text[1:])
        qtbot.keyClick(editor, Qt.Key.Key_Return)
        qtbot.waitUntil(lambda r=row: grid.currentIndex().row() == r + 1, timeout=PATIENCE_MS)


def wait_for_verdict(qtbot, window, timeout: int = PATIENCE_MS) -> None:
    """Wait until the newest entry has been analysed and its verdict is shown."""
    qtbot.waitUntil(lambda: not window.runner.busy and window.last_result is not None, timeout=timeout)


def press(qtbot, *keys) -> None:
    """Send keys as a person types them, each to whichever widget has the keyboard at that moment,
    letting the window handle each key (queued commits included) before the next one comes.

    Each item is a string (typed character by character), a ``Qt.Key``, or a ``(Qt.Key, modifiers)``
    pair. Nothing is sent to a chosen widget: a key lost because the focus went astray stays lost.
    """
    for key in keys:
        if isinstance(key, str):
            for character in key:
                focused = QApplication.focusWidget()
                assert focused is not None, f"no widget has the keyboard before {character!r}"
                qtbot.keyClicks(focused, character)
                QApplication.processEvents()
            continue
        code, modifiers = key if isinstance(key, tuple) else (key, Qt.KeyboardModifier.NoModifier)
        focused = QApplication.focusWidget()
        assert focused is not None, f"no widget has the keyboard before {code!r}"
        qtbot.keyClick(focused, code, modifiers)
        QApplication.processEvents()


@dataclass
class ReadingThreads:
    """The threads ``open_readings`` ran on, and the real ``open_readings`` (a reference that records nothing)."""

    seen: list
    real_open: object


@pytest.fixture
def reading_threads(monkeypatch) -> ReadingThreads:
    """Every file counts as large (read aside), and each reading of a file notes the thread it ran on."""
    import threading

    import rankwise.readings.open as opening
    import rankwise.ui.window_files as window_files

    watched = ReadingThreads(seen=[], real_open=opening.open_readings)

    def open_and_note(path, *args, **kwargs):
        watched.seen.append(threading.current_thread())
        return watched.real_open(path, *args, **kwargs)

    monkeypatch.setattr(opening, "open_readings", open_and_note)
    monkeypatch.setattr(window_files, "LARGE_FILE_BYTES", 10)
    return watched
