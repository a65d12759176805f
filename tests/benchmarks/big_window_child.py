"""One measured run of the window on a big stacked export, in a process of its own (run by bench_window.py).

    python big_window_child.py FILE [--profile OUT.pstats] [--stalls]

A QTimer heartbeat every 5 ms records how long the window's event loop went without turning; the
run opens FILE in the window, waits for the verdict, shows the rank table and the dot plot, types
one reading, and waits for the updated verdict. It prints one line of JSON: the longest stall of
each step, the most processor time the window's thread itself spent between two turns of its loop
in that step (on a shared machine a stall is also time spent waiting for a core or for the other
threads to let go of Python's interpreter lock), the time to each verdict, and the peak memory
of the process (``peak_mib``) before the file (``idle_mib``), once it is open and at the end. With ``--stalls`` a watching
thread looks at every thread every 10 ms while the window's event loop stands still for more than
50 ms and prints to stderr, for the longest stalls, the step they came in and the stacks it found
most often on each thread (the window's thread mostly shows the event loop: it is waiting, and
what it waits for is on the other threads; threads waiting for work are left out).
"""

from __future__ import annotations

import json
import os
import sys
import tempfile
import threading
import time
import traceback
from collections import Counter
from pathlib import Path

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

from PySide6.QtCore import QEventLoop, QTimer  # noqa: E402
from PySide6.QtWidgets import QApplication  # noqa: E402

HEARTBEAT_MS = 5


class Heartbeat:
    """Records the gaps between the turns of the event loop (a stall is a long gap)."""

    def __init__(self) -> None:
        self.timer = QTimer(interval=HEARTBEAT_MS)
        self.timer.timeout.connect(self._beat)
        self.last = time.perf_counter()
        self.last_cpu = time.thread_time()
        self.longest = 0.0
        self.busiest = 0.0
        self.timer.start()

    def _beat(self) -> None:
        now, cpu = time.perf_counter(), time.thread_time()
        self.longest = max(self.longest, now - self.last)
        self.busiest = max(self.busiest, cpu - self.last_cpu)
        self.last, self.last_cpu = now, cpu

    def step(self) -> tuple[float, float]:
        """The longest gap since the last call and the most processor time the window's thread spent
        within one gap, in ms (the gap running into this call counts too)."""
        self._beat()
        longest, busiest, self.longest, self.busiest = self.longest, self.busiest, 0.0, 0.0
        return longest * 1000.0, busiest * 1000.0


IDLE_LEAVES = {"wait", "get", "_serve", "_run", "_watch"}
"""Functions a thread waits for work in (the stacks of such threads are left out of the report)."""


class StallWatch:
    """Samples every thread's stack every 10 ms while the heartbeat has not beaten for more than
    50 ms; keeps the samples of each stall longer than 100 ms, with the step it came in."""

    def __init__(self, heartbeat: Heartbeat) -> None:
        self.heartbeat = heartbeat
        self.step = "opening"
        self.stalls: list[tuple[float, str, Counter]] = []
        self.running = True
        self.main = threading.main_thread().ident
        threading.Thread(target=self._watch, name="stall-watch", daemon=True).start()

    def _watch(self) -> None:
        began, seen = None, Counter()
        while self.running:
            time.sleep(0.01)
            last = self.heartbeat.last
            if began is not None and last != began:  # the loop turned again: the stall is over
                if last - began > 0.1:
                    self.stalls.append((last - began, self.step, seen))
                began, seen = None, Counter()
            if time.perf_counter() - last > 0.05:
                began = last
                names = {thread.ident: thread.name for thread in threading.enumerate()}
                for ident, frame in sys._current_frames().items():
                    stack = traceback.extract_stack(frame)
                    if ident != self.main and (not stack or stack[-1].name in IDLE_LEAVES):
                        continue
                    lines = [f"{Path(f.filename).name}:{f.lineno} {f.name}" for f in stack]
                    seen[(names.get(ident, "?"), *lines[-5:])] += 1

    def report(self) -> None:
        self.running = False
        for duration, step, seen in sorted(self.stalls, key=lambda stall: -stall[0])[:8]:
            print(f"stall of {duration * 1000:.0f} ms ({step}):", file=sys.stderr)
            for (thread, *stack), count in seen.most_common(6):
                print(f"  {count * 10:6d} ms  {thread}: " + "  <  ".join(reversed(stack)), file=sys.stderr)


def peak_mib() -> float:
    """The most memory this process has held (VmHWM, in MiB). Not ``ru_maxrss``: Linux keeps that
    across ``exec``, so a child started by a large process reports its parent's size."""
    with open("/proc/self/status", encoding="ascii") as status:
        for line in status:
            if line.startswith("VmHWM:"):
                return int(line.split()[1]) / 1024.0
    raise OSError("no VmHWM in /proc/self/status")


def wait(condition, timeout_s: float = 600.0) -> None:
    """Turn the event loop until ``condition()`` holds (the heartbeat keeps beating meanwhile)."""
    loop = QEventLoop()
    poll = QTimer(interval=HEARTBEAT_MS)
    poll.timeout.connect(lambda: loop.quit() if condition() else None)
    poll.start()
    deadline = time.perf_counter() + timeout_s
    while not condition():
        loop.exec()
        if time.perf_counter() > deadline:
            raise TimeoutError("the window did not get there in time")
    poll.stop()


def measure(path: Path) -> dict:
    from rankwise.ui import dialogs
    from rankwise.ui.main_window import MainWindow
    from rankwise.ui.recovery import RecoveryFile
    from rankwise.ui.start_up import import_what_the_window_needs

    import_what_the_window_needs()  # as the program does before showing the window
    dialogs.ask_keep_changes = lambda parent, text: "discard"
    window = MainWindow(recovery=RecoveryFile.for_new_window(Path(tempfile.mkdtemp(prefix="rankwise-bench-"))))
    window.resize(1440, 900)
    window.show()
    shown: list[object] = []
    window.runner.result_ready.connect(lambda result, analysis: shown.append(result))
    heartbeat = Heartbeat()
    watch = StallWatch(heartbeat) if "--stalls" in sys.argv else None
    wait(lambda: window.isVisible())
    heartbeat.step()
    figures: dict[str, float] = {"idle_mib": peak_mib()}

    start = time.perf_counter()
    window.open_path(path)
    wait(lambda: bool(shown) and not window.runner.busy and getattr(window, "opening", None) is None)
    figures["open_to_verdict_s"] = time.perf_counter() - start
    figures["stall_open_ms"], figures["busy_open_ms"] = heartbeat.step()
    figures["peak_open_mib"] = peak_mib()

    if watch is not None:
        watch.step = "showing ranks and dots"
    window.tabs.setCurrentWidget(window.rank_table)
    wait(lambda: window.rank_table.model.rowCount() > 0)
    window.tabs.setCurrentWidget(window.dot_plot)
    wait(lambda: window.dot_plot.chart is not None and window.dot_plot.chart.view is not None)
    figures["stall_show_ms"], figures["busy_show_ms"] = heartbeat.step()

    if watch is not None:
        watch.step = "one edit"
    shown.clear()
    start = time.perf_counter()
    window.grid.setFocus()
    window.grid.setCurrentIndex(window.sheet_model.index(5, 0))
    window.sheet_model.setData(window.sheet_model.index(5, 0), "0,01")
    wait(lambda: bool(shown) and not window.runner.busy)
    figures["edit_to_verdict_s"] = time.perf_counter() - start
    wait(lambda: window.keeper.wait_until_written(0))  # the recovery copy written, the window turning meanwhile
    figures["stall_edit_ms"], figures["busy_edit_ms"] = heartbeat.step()
    figures["peak_mib"] = peak_mib()
    if watch is not None:
        watch.report()
    window.close()
    return figures


def main() -> None:
    from rankwise.memory_pools import limit_memory_pools

    limit_memory_pools()  # as the program does before it starts Qt
    path = Path(sys.argv[1])
    application = QApplication.instance() or QApplication(sys.argv[:1])
    if "--profile" in sys.argv:
        import cProfile

        profiler = cProfile.Profile()
        figures = profiler.runcall(measure, path)
        profiler.dump_stats(sys.argv[sys.argv.index("--profile") + 1])
    else:
        figures = measure(path)
    del application
    print(json.dumps(figures))


if __name__ == "__main__":
    main()
