"""Large files opened through File > Open are read, and their sheet built, on a thread of their own
while the window keeps answering; the readings are the same as read on the window's thread."""

from __future__ import annotations

import threading

import pytest
from PySide6.QtCore import QTimer

from window_support import DEMO_FILES, answers, reading_threads, wait_for_verdict, window  # noqa: F401 - pytest fixtures

import rankwise.readings.open as opening
import rankwise.ui.window_files as window_files
from rankwise.readings import ReadingsError, ReadingSheet
from rankwise.ui.open_dialog import read_readings
from rankwise.ui.worker import run_aside

PATH = DEMO_FILES / "long_export.csv"


def test_work_run_aside_gives_its_result_while_the_event_loop_turns(qtbot):
    beats, started = [], threading.Event()
    timer = QTimer(interval=5)
    timer.timeout.connect(lambda: beats.append(started.is_set()))
    timer.start()

    def work():
        started.set()
        while sum(beats) < 3:  # done only once the window's loop has turned meanwhile
            threading.Event().wait(0.005)
        return threading.current_thread()

    assert run_aside(None, "Working…", work) is not threading.main_thread()
    timer.stop()
    with pytest.raises(ReadingsError, match="plain words"):
        run_aside(None, "Working…", lambda: (_ for _ in ()).throw(ReadingsError("plain words")))


def test_a_large_file_from_the_open_dialog_is_read_aside(reading_threads):
    aside = read_readings(None, PATH, {"decimal": "."})
    assert reading_threads.seen[-1] is not threading.main_thread()
    at_once = reading_threads.real_open(PATH, decimal=".")
    assert [(g.name, g.cells) for g in aside.groups] == [(g.name, g.cells) for g in at_once.groups]


def test_the_sheet_of_a_large_file_from_the_open_dialog_is_built_aside(qtbot, window, monkeypatch):
    built_on = []
    real_build = ReadingSheet.from_reading_set.__func__

    def watched(cls, reading_set):
        built_on.append(threading.current_thread())
        return real_build(cls, reading_set)

    monkeypatch.setattr(ReadingSheet, "from_reading_set", classmethod(watched))
    monkeypatch.setattr(window_files, "LARGE_FILE_BYTES", 10)
    reading_set = opening.open_readings(PATH)
    window.load_reading_set(reading_set, PATH)
    assert built_on and built_on[-1] is not threading.main_thread()
    expected = real_build(ReadingSheet, reading_set)
    assert [(g.name, g.cells) for g in window.sheet.groups] == [(g.name, g.cells) for g in expected.groups]
    wait_for_verdict(qtbot, window)
