"""Window speed: from an edit to the updated verdict (2 x 200 readings), from launch to a visible
window, and a 10^6-row stacked export in the window (longest stall, time to verdict, peak memory).

Run as a script (not collected by pytest):

    QT_QPA_PLATFORM=offscreen .venv/bin/python tests/benchmarks/bench_window.py [--big-only]

Prints a table; each figure is set against a reference measured in the same run:
- edit -> verdict is compared with calling the statistics service directly on the same readings
  (the floor: the window cannot be faster than the computation it shows);
- launch -> visible window is compared with a bare PySide6 window started the same way.
- the 10^6-row export (two presses, force at 0,01 kN, invented by a fixed seed) is read by
  ``pandas.read_csv`` in a process of its own in the same run: its time and peak memory are the
  reference for the window's time to verdict and peak memory. The window runs in its own process
  (``big_window_child.py``), with a 5 ms heartbeat timer measuring every stall of its event loop.
Aims (issue 4): edit -> verdict <= 100 ms (the 150 ms typing pause comes on top); launch <= 2 s;
(issue 14) every stall of the window under 100 ms with 10^6 readings, memory a small multiple of
the readings' size.
"""

from __future__ import annotations

import json
import os
import statistics
import subprocess
import sys
import tempfile
import textwrap
import time

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

import numpy as np  # noqa: E402
from PySide6.QtCore import QEventLoop, QTimer  # noqa: E402
from PySide6.QtWidgets import QApplication  # noqa: E402

REPEATS = 15


def _readings(seed: int = 7) -> list[list[str]]:
    """2 x 200 invented readings at 0.01 resolution (ties occur), as typed texts."""
    generator = np.random.default_rng(seed)
    a = np.round(generator.normal(0.42, 0.05, 200), 2)
    b = np.round(generator.normal(0.45, 0.05, 200), 2)
    return [[f"{x:.2f}", f"{y:.2f}"] for x, y in zip(a, b)]


def _wait(application: QApplication, condition, timeout: float = 30.0) -> None:
    """Run the event loop (sleeping between events, as the real window does) until ``condition`` holds."""
    loop = QEventLoop()
    poll = QTimer(interval=1)
    poll.timeout.connect(lambda: loop.quit() if condition() else None)
    deadline = time.perf_counter() + timeout
    poll.start()
    while not condition():
        loop.exec()
        if time.perf_counter() > deadline:
            raise TimeoutError("the window did not answer in time")
    poll.stop()


def bench_edit_to_verdict(application: QApplication) -> tuple[list[float], list[float], list[float]]:
    """Milliseconds from a typed edit to the shown verdict: without the typing pause, with it, and the service alone."""
    from rankwise.stats.service import run
    from rankwise.ui import dialogs
    from rankwise.ui.main_window import MainWindow
    from rankwise.ui.recovery import RecoveryFile

    dialogs.ask_keep_changes = lambda parent, text: "discard"
    folder = tempfile.mkdtemp(prefix="rankwise-bench-")
    window = MainWindow(recovery=RecoveryFile(os.path.join(folder, "recovery.json")))
    window.show()
    window.grid.paste_text("\n".join("\t".join(row) for row in _readings()))
    shown: list[object] = []
    window.runner.result_ready.connect(lambda result, analysis: shown.append(result))
    _wait(application, lambda: bool(shown) and not window.runner.busy)

    at_once, with_pause, service_only = [], [], []
    for repeat in range(REPEATS):
        for immediate, times in ((True, at_once), (False, with_pause)):
            shown.clear()
            text = f"0.{40 + (repeat * 2 + immediate) % 9}"
            start = time.perf_counter()
            window.sheet.set_text(0, 5, text)
            if immediate:
                window._edit_timer.stop()
                window._refresh_after_edit(immediately=True)
            _wait(application, lambda: bool(shown) and not window.runner.busy)
            application.processEvents()
            times.append((time.perf_counter() - start) * 1000.0)
        analysis, _ = window.build_analysis()
        start = time.perf_counter()
        run(analysis)
        service_only.append((time.perf_counter() - start) * 1000.0)
    window.close()
    return at_once, with_pause, service_only


_LAUNCH = """
    import sys, time
    started = float(sys.argv[1])
    from PySide6.QtCore import QTimer
    from PySide6.QtWidgets import QApplication
    application = QApplication(sys.argv[:1])
    def check():
        shown = [w for w in application.topLevelWidgets() if w.isVisible() and w.isWindow() and w.objectName() == "rankwiseMainWindow"]
        if shown:
            print(time.time() - started)
            application.quit()
        else:
            QTimer.singleShot(5, check)
    QTimer.singleShot(0, check)
    from rankwise.app import main
    main([])
"""

_BARE = """
    import sys, time
    started = float(sys.argv[1])
    from PySide6.QtCore import QTimer
    from PySide6.QtWidgets import QApplication, QMainWindow
    application = QApplication(sys.argv[:1])
    window = QMainWindow()
    window.setObjectName("rankwiseMainWindow")
    window.show()
    def check():
        if window.isVisible():
            print(time.time() - started)
            application.quit()
        else:
            QTimer.singleShot(5, check)
    QTimer.singleShot(0, check)
    application.exec()
"""


def bench_launch(code: str, repeats: int = 5) -> list[float]:
    """Milliseconds from starting a fresh interpreter to a visible window."""
    environment = dict(os.environ, QT_QPA_PLATFORM="offscreen")
    folder = tempfile.mkdtemp(prefix="rankwise-bench-home-")
    for variable in ("XDG_CONFIG_HOME", "XDG_DATA_HOME", "XDG_STATE_HOME", "XDG_CACHE_HOME"):
        environment[variable] = os.path.join(folder, variable.lower())
    times = []
    for _ in range(repeats):
        started = time.time()
        done = subprocess.run([sys.executable, "-c", textwrap.dedent(code), repr(started)], env=environment,
                              capture_output=True, text=True, timeout=120, check=True)
        times.append(float(done.stdout.strip().splitlines()[-1]) * 1000.0)
    return times


BIG_ROWS = 1_000_000

_PANDAS = """
import json, sys, time
import pandas
def peak_mib():  # as big_window_child.peak_mib (that module loads Qt, which this reference must not)
    with open("/proc/self/status", encoding="ascii") as status:
        return next(int(line.split()[1]) / 1024.0 for line in status if line.startswith("VmHWM:"))
imported = peak_mib()
started = time.perf_counter()
frame = pandas.read_csv(sys.argv[1], sep=";", decimal=",")
print(json.dumps({"seconds": time.perf_counter() - started, "rows": len(frame), "peak_mib": peak_mib(),
                  "idle_mib": imported, "frame_mib": frame.memory_usage(deep=True).sum() / 2**20}))
"""


def write_big_export(path: str, rows: int = BIG_ROWS, seed: int = 11) -> None:
    """A stacked export: a press column and a force column (kN, decimal comma, 0,01 resolution); invented."""
    generator = np.random.default_rng(seed)
    press = generator.random(rows) < 0.5
    force = np.round(generator.normal(12.5, 0.4, rows) + 0.02 * press, 2)
    with open(path, "w", encoding="utf-8") as stream:
        stream.write("press;force kN\n")
        stream.writelines(f"Press {2 if p else 1};{v:.2f}\n".replace(".", ",") for p, v in zip(press, force))


def bench_big_export() -> tuple[dict, dict]:
    """The window on a 10^6-row export (in a child process) and pandas.read_csv of the same file."""
    folder = tempfile.mkdtemp(prefix="rankwise-bench-big-")
    path = os.path.join(folder, "stacked.csv")
    write_big_export(path)
    environment = dict(os.environ, QT_QPA_PLATFORM="offscreen")
    child = os.path.join(os.path.dirname(os.path.abspath(__file__)), "big_window_child.py")
    load_before = os.getloadavg()[0]
    window = subprocess.run([sys.executable, child, path], env=environment, capture_output=True, text=True,
                            timeout=3600, check=True)
    reference = subprocess.run([sys.executable, "-c", _PANDAS, path], capture_output=True, text=True,
                               timeout=3600, check=True)
    figures = json.loads(window.stdout.strip().splitlines()[-1])
    figures["load"] = (load_before, os.getloadavg()[0])
    figures["file"] = path
    return figures, json.loads(reference.stdout.strip().splitlines()[-1])


def print_big_table(window: dict, reference: dict) -> None:
    """The 10^6-row rows: each step's longest stall, times to verdict and peak memory, against pandas."""
    print(f"\n10^6-row stacked export ({BIG_ROWS:,} readings, two groups); reference: pandas.read_csv, same file, same run")
    print(f"load average of the machine (1 min) before / after: {window['load'][0]:.1f} / {window['load'][1]:.1f} "
          f"on {os.cpu_count()} cores (stalls grow when the cores are shared)")
    print(f"{'measure':44} {'window':>10} {'pandas':>10} {'ratio':>7}")
    for name, key in (("longest stall while opening (ms)", "stall_open_ms"),
                      ("longest stall showing ranks and dots (ms)", "stall_show_ms"),
                      ("longest stall after one edit (ms)", "stall_edit_ms")):
        print(f"{name:44} {window[key]:10.0f} {'':>10} {'':>7}")
    for name, key in (("window thread's own work in one turn (ms)", "busy_open_ms"),
                      ("  the same, showing ranks and dots (ms)", "busy_show_ms"),
                      ("  the same, after one edit (ms)", "busy_edit_ms")):
        print(f"{name:44} {window[key]:10.0f} {'':>10} {'':>7}")
    for name, key, ref in (("open -> verdict (s)", "open_to_verdict_s", reference["seconds"]),
                           ("edit -> verdict (s)", "edit_to_verdict_s", reference["seconds"]),
                           ("memory before the file (MiB)", "idle_mib", reference["idle_mib"]),
                           ("peak memory once opened (MiB)", "peak_open_mib", reference["peak_mib"]),
                           ("peak memory (MiB)", "peak_mib", reference["peak_mib"])):
        print(f"{name:44} {window[key]:10.1f} {ref:10.1f} {window[key] / ref:7.1f}")
    added, added_reference = window["peak_mib"] - window["idle_mib"], reference["peak_mib"] - reference["idle_mib"]
    print(f"{'memory the file added at the peak (MiB)':44} {added:10.1f} {added_reference:10.1f} "
          f"{added / added_reference:7.1f}")
    size = os.path.getsize(window["file"]) / 2**20
    print(f"readings' size: the file {size:.1f} MiB, as pandas holds them {reference['frame_mib']:.1f} MiB, "
          f"as numbers {BIG_ROWS * 8 / 2**20:.1f} MiB; the window added {added / size:.1f}x the file, "
          f"{added / reference['frame_mib']:.1f}x pandas' frame")


def main() -> None:
    """Measure and print the tables."""
    if "--big-only" in sys.argv:
        print_big_table(*bench_big_export())
        return
    application = QApplication.instance() or QApplication(sys.argv[:1])
    at_once, with_pause, service_only = bench_edit_to_verdict(application)
    launch = bench_launch(_LAUNCH)
    bare = bench_launch(_BARE)
    rows = [
        ("edit -> verdict, 2 x 200 (no typing pause)", statistics.median(at_once), "statistics service alone", statistics.median(service_only), 100.0),
        ("edit -> verdict, 2 x 200 (with 150 ms pause)", statistics.median(with_pause), "statistics service alone", statistics.median(service_only), 250.0),
        ("launch -> visible window", statistics.median(launch), "bare PySide6 window", statistics.median(bare), 2000.0),
    ]
    print(f"{'measure':48} {'median ms':>10} {'reference':>26} {'ref ms':>9} {'ratio':>7} {'aim ms':>7}")
    for name, value, reference, reference_value, aim in rows:
        print(f"{name:48} {value:10.1f} {reference:>26} {reference_value:9.1f} {value / reference_value:7.2f} {aim:7.0f}")
    print_big_table(*bench_big_export())


if __name__ == "__main__":
    main()
