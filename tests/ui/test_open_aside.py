"""Large files are read, and their sheet built, away from the window's thread (File > Open with its
dialog: on a thread of their own; opened directly: in a process of their own) while the window keeps
answering; the readings are the same as read on the window's thread."""

from __future__ import annotations

import threading

import pytest
from PySide6.QtCore import QTimer

from window_support import DEMO_FILES, PATIENCE_MS, answers, reading_threads, wait_for_verdict, window  # noqa: F401 - pytest fixtures

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


def test_what_the_window_first_asks_of_a_large_files_sheet_is_worked_out_aside(qtbot, window, monkeypatch):
    """The flags, counts and planner's values of a large file's sheet are worked out in the process
    that reads it; showing it asks them again of the kept answers, not of every reading."""
    import rankwise.readings.column_arrays as column_arrays

    worked_on = []
    real_flags, real_count = column_arrays.flag_rows, column_arrays.ColumnArrays._count
    monkeypatch.setattr(column_arrays, "flag_rows",
                        lambda *args, **kwargs: (worked_on.append(threading.current_thread()), real_flags(*args, **kwargs))[1])
    monkeypatch.setattr(column_arrays.ColumnArrays, "_count",
                        lambda arrays: (worked_on.append(threading.current_thread()), real_count(arrays))[1])
    monkeypatch.setattr(window_files, "LARGE_FILE_BYTES", 10)
    assert window.open_path(PATH)
    qtbot.waitUntil(lambda: window.opening is None, timeout=PATIENCE_MS)
    wait_for_verdict(qtbot, window)
    window.grid.viewport().repaint()
    assert worked_on == []  # nothing worked out again in the window's process
    assert window.sheet.flags(0) == real_flags(*_measured(window.sheet.groups[0]), lambda row: window.sheet.cell(0, row).text)


def _measured(column):
    arrays = column.arrays()
    return arrays.reading_rows(), arrays.measured()
