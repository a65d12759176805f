"""Runs the statistics off the GUI thread: debounced, cancellable, with progress; stale results dropped.

Only signals cross threads. The window hands an ``Analysis`` to ``AnalysisRunner.request`` on every
edit; ~150 ms after the last edit the runner starts ``rankwise.stats.service.run`` on a thread pool
with a ``Monitor`` whose ``cancelled`` reads a flag. A newer request cancels the running job; a
result that arrives for an older request is discarded, so the screen always shows the latest entry.
``run_aside`` runs other long work (reading a large file) on a thread of its own while the caller
waits with the window still answering.
"""

from __future__ import annotations

import threading
import time

from collections.abc import Callable
from typing import TypeVar

from PySide6.QtCore import QEventLoop, QObject, QRunnable, QThreadPool, Qt, QTimer, Signal

DEBOUNCE_MS = 150
"""Quiet time after the last edit before the statistics run."""

_PROGRESS_INTERVAL_S = 0.05


class _JobSignals(QObject):
    """Signals a job emits from its worker thread; they arrive queued on the GUI thread."""

    progress = Signal(int, float)
    finished = Signal(int, object, object)
    failed = Signal(int, str)
    cancelled = Signal(int)


class _AnalysisJob(QRunnable):
    """One run of the statistics service for one numbered request."""

    def __init__(self, generation: int, analysis: object, signals: _JobSignals) -> None:
        super().__init__()
        self.setAutoDelete(True)
        self.generation = generation
        self.analysis = analysis
        self.signals = signals
        self.stop_requested = threading.Event()
        self._last_report = 0.0

    def _report(self, fraction: float) -> None:
        now = time.monotonic()
        if fraction >= 1.0 or now - self._last_report >= _PROGRESS_INTERVAL_S:
            self._last_report = now
            self.signals.progress.emit(self.generation, fraction)

    def run(self) -> None:
        """Compute on the worker thread; report only through signals."""
        from rankwise.stats.progress import Cancelled, Monitor

        from rankwise.readings import ReadingsError

        monitor = Monitor(progress=self._report, cancelled=self.stop_requested.is_set)
        try:
            from rankwise.stats.service import run

            if callable(self.analysis):  # a large sheet's copy, read into an analysis here
                self.analysis = self.analysis()
            result = run(self.analysis, monitor)
        except Cancelled:
            self.signals.cancelled.emit(self.generation)
        except (ValueError, ReadingsError) as error:
            self.signals.failed.emit(self.generation, str(error))
        except Exception as error:  # noqa: BLE001 - any failure must reach the screen, not kill the thread
            self.signals.failed.emit(
                self.generation,
                f"The calculation stopped with an unexpected error ({type(error).__name__}: {error}). "
                "Your readings are kept; please report this with the readings saved to a file.",
            )
        else:
            self.signals.finished.emit(self.generation, result, self.analysis)


class AnalysisRunner(QObject):
    """Debounces analysis requests and runs the newest one off the GUI thread.

    Signals:
        started(): a computation began (the window may show progress if it takes a while).
        progress(float): fraction done of the current computation.
        result_ready(object, object): the result and the analysis it answers.
        problem(str): the readings or settings cannot be analysed, in plain words.
        stopped(): the current computation was cancelled on request.
    """

    started = Signal()
    progress = Signal(float)
    result_ready = Signal(object, object)
    problem = Signal(str)
    stopped = Signal()

    def __init__(self, parent: QObject | None = None, debounce_ms: int = DEBOUNCE_MS) -> None:
        super().__init__(parent)
        self._pool = QThreadPool(self)
        self._pool.setMaxThreadCount(2)
        self._signals = _JobSignals(self)
        self._signals.progress.connect(self._on_job_progress)
        self._signals.finished.connect(self._on_job_finished)
        self._signals.failed.connect(self._on_job_failed)
        self._signals.cancelled.connect(self._on_job_cancelled)
        self._timer = QTimer(self)
        self._timer.setSingleShot(True)
        self._timer.setInterval(debounce_ms)
        self._timer.timeout.connect(self._start_pending)
        self._generation = 0
        self._pending: object | None = None
        self._running: _AnalysisJob | None = None

    @property
    def busy(self) -> bool:
        """True while a computation for the newest request is running or waiting to start."""
        return self._running is not None or self._timer.isActive()

    def request(self, analysis: object) -> None:
        """Analyse ``analysis`` after the debounce delay; a newer request replaces it. ``analysis``
        may also be a function that makes the analysis: it is then called on the worker thread."""
        self._pending = analysis
        self._timer.start()

    def request_now(self, analysis: object) -> None:
        """Analyse ``analysis`` at once (after opening a file or switching the question)."""
        self._pending = analysis
        self._timer.stop()
        self._start_pending()

    def discard_pending(self) -> None:
        """Forget a waiting request and drop the running one's result (the entry became unusable)."""
        self._timer.stop()
        self._pending = None
        self._generation += 1
        if self._running is not None:
            self._running.stop_requested.set()
            self._running = None

    def cancel(self) -> None:
        """Stop the running computation (the Cancel button)."""
        self._timer.stop()
        self._pending = None
        if self._running is not None:
            self._running.stop_requested.set()

    def wait_until_idle(self, timeout_ms: int = 5000) -> bool:
        """Block until no job runs (used when the window closes); True when idle in time."""
        if self._running is not None:
            self._running.stop_requested.set()
        return self._pool.waitForDone(timeout_ms)

    def _start_pending(self) -> None:
        if self._pending is None:
            return
        if self._running is not None:
            self._running.stop_requested.set()
        self._generation += 1
        job = _AnalysisJob(self._generation, self._pending, self._signals)
        self._pending = None
        self._running = job
        self.started.emit()
        self._pool.start(job)

    def _is_current(self, generation: int) -> bool:
        return generation == self._generation and self._running is not None

    def _on_job_progress(self, generation: int, fraction: float) -> None:
        if self._is_current(generation):
            self.progress.emit(fraction)

    def _on_job_finished(self, generation: int, result: object, analysis: object) -> None:
        if self._is_current(generation):
            self._running = None
            self.result_ready.emit(result, analysis)

    def _on_job_failed(self, generation: int, message: str) -> None:
        if self._is_current(generation):
            self._running = None
            self.problem.emit(message)

    def _on_job_cancelled(self, generation: int) -> None:
        if self._is_current(generation):
            self._running = None
            self.stopped.emit()


_T = TypeVar("_T")

BUSY_NOTE_DELAY_MS = 300
"""``run_aside`` shows its note only for work that takes longer than this."""


def run_aside(parent, words: str, work: Callable[[], _T]) -> _T:
    """``work()`` on a thread of its own while the window keeps answering; its result, or the error it raised.

    The caller waits here, as for a dialog: a modal note with ``words`` (after ``BUSY_NOTE_DELAY_MS``)
    keeps the window's controls from being used meanwhile, while its event loop keeps turning.
    """
    from PySide6.QtWidgets import QProgressDialog

    outcome: list = []

    def run() -> None:
        try:
            outcome.append((True, work()))
        except BaseException as error:  # noqa: BLE001 - handed to the caller, on its thread
            outcome.append((False, error))

    loop = QEventLoop()
    note = QProgressDialog(words, "", 0, 0, parent)
    note.setCancelButton(None)
    note.setWindowModality(Qt.WindowModality.ApplicationModal)
    note.setMinimumDuration(BUSY_NOTE_DELAY_MS)
    poll = QTimer(interval=20)
    poll.timeout.connect(lambda: loop.quit() if outcome else None)
    threading.Thread(target=run, name="rankwise-aside", daemon=True).start()
    poll.start()
    while not outcome:
        loop.exec()
    poll.stop()
    note.reset()
    note.deleteLater()
    succeeded, value = outcome[0]
    if not succeeded:
        raise value
    return value
