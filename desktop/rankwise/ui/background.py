"""Work the window hands off and does not wait for (sorting a large rank table, placing its dots).

``threading.Thread.start`` makes its caller wait until the new thread runs; on a busy machine,
with other threads holding the interpreter lock, that wait took tens of milliseconds of the
window's thread for every large result shown. A few long-lived threads, started once, take the
work from a queue instead: handing work to them never waits.
"""

from __future__ import annotations

import queue
import sys
import threading
from collections.abc import Callable

THREADS = 2
"""Background threads: a rank table and a dot plot can be worked on at once."""

_work: queue.SimpleQueue[Callable[[], None]] = queue.SimpleQueue()
_threads: list[threading.Thread] = []
_starting = threading.Lock()


def hand_off(work: Callable[[], None]) -> None:
    """Run ``work()`` on a background thread; ``work`` reports what it made itself (by a queued signal).

    The threads are started by the first call (the only one that waits for them)."""
    with _starting:
        while len(_threads) < THREADS:
            thread = threading.Thread(target=_serve, name=f"rankwise-background-{len(_threads) + 1}", daemon=True)
            thread.start()
            _threads.append(thread)
    _work.put(work)


def _serve() -> None:
    while True:
        work = _work.get()
        try:
            work()
        except Exception:  # noqa: BLE001 - one failed piece of work must not end the thread
            sys.excepthook(*sys.exc_info())
