"""The worker runs the statistics off the GUI thread: debounced, newest request wins, problems in words."""

from __future__ import annotations

import threading

from PySide6.QtCore import QCoreApplication

from rankwise.stats.analysis import Analysis, GroupReadings, Question, Settings
from rankwise.ui.worker import AnalysisRunner
from window_support import answers, wait_for_verdict, window  # noqa: F401 - pytest fixtures


def _paired(shift: float) -> Analysis:
    before = tuple(10.0 + 0.1 * i for i in range(12))
    after = tuple(value + shift + 0.01 * (i % 3) for i, value in enumerate(before))
    return Analysis(Question.PAIRED, (GroupReadings("before", before), GroupReadings("after", after)), Settings())


def test_only_the_newest_request_is_answered(qtbot):
    """Three quick requests within the typing pause give one answer, for the last of them."""
    runner = AnalysisRunner(debounce_ms=50)
    answered = []
    runner.result_ready.connect(lambda result, analysis: answered.append(analysis))
    newest = _paired(0.3)
    for analysis in (_paired(0.1), _paired(0.2), newest):
        runner.request(analysis)
    qtbot.waitUntil(lambda: bool(answered) and not runner.busy, timeout=60000)
    assert runner.wait_until_idle(60000)  # every job has ended: any stale answer is now queued
    QCoreApplication.processEvents()
    assert answered == [newest]


def test_computation_runs_off_the_gui_thread(qtbot, monkeypatch):
    """The statistics service is called on a worker thread, never on the GUI thread."""
    import rankwise.stats.service as service

    threads = []
    real_run = service.run

    def watched_run(analysis, monitor):
        threads.append(threading.current_thread())
        return real_run(analysis, monitor)

    monkeypatch.setattr(service, "run", watched_run)
    runner = AnalysisRunner()
    with qtbot.waitSignal(runner.result_ready, timeout=60000):
        runner.request_now(_paired(0.2))
    assert threads and threads[0] is not threading.main_thread()


def test_readings_the_statistics_refuse_come_back_as_a_problem_in_words(qtbot):
    """A paired question with unequal numbers of readings gives the service's plain message, not a crash."""
    runner = AnalysisRunner()
    uneven = Analysis(Question.PAIRED, (GroupReadings("before", (1.0, 2.0, 3.0)), GroupReadings("after", (1.0, 2.0))),
                      Settings())
    with qtbot.waitSignal(runner.problem, timeout=60000) as signal:
        runner.request_now(uneven)
    assert signal.args[0] and "Traceback" not in signal.args[0]
    assert not runner.busy


def test_a_large_sheet_is_read_into_its_analysis_on_the_worker(qtbot, window, monkeypatch):
    """Past LARGE_SHEET_CELLS the window hands the worker a copy of the sheet; the verdict is the
    same as when the window reads the sheet itself (the same readings, the same analysis)."""
    import rankwise.ui.window_analysis as window_analysis
    from rankwise.readings import ReadingSheet

    threads = []
    real_to_analysis = ReadingSheet.to_analysis

    def watched(sheet, *args, **kwargs):
        threads.append(threading.current_thread())
        return real_to_analysis(sheet, *args, **kwargs)

    window.grid.paste_text("".join(f"0,{40 + i % 9}\t0,{43 + i % 7}\n" for i in range(40)))
    wait_for_verdict(qtbot, window)
    small_path = window.last_result
    monkeypatch.setattr(ReadingSheet, "to_analysis", watched)
    monkeypatch.setattr(window_analysis, "LARGE_SHEET_CELLS", 10)
    window.last_result = None
    window.question_panel.select_option("b-higher")
    window.question_panel.select_option("differ")
    wait_for_verdict(qtbot, window)
    assert threads and all(thread is not threading.main_thread() for thread in threads)
    assert window.last_result.p_value == small_path.p_value and window.last_result.u == small_path.u
