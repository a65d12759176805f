"""The window's threads share at most two of the C library's memory pools (GNU C library on Linux).

Counted in a fresh interpreter, from the library's own report (``malloc_info(3)``: one ``<heap nr=...>``
per pool), while six threads that each allocated are alive at once.
"""

from __future__ import annotations

import platform
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest

pytestmark = pytest.mark.skipif(platform.libc_ver()[0] != "glibc", reason="memory pools are a GNU C library matter")

_COUNT_POOLS = """
    import ctypes, sys, threading
    import numpy as np
    from rankwise.memory_pools import limit_memory_pools

    if sys.argv[1] == "limited":
        print("TAKEN", limit_memory_pools())
    libc = ctypes.CDLL(None)
    libc.fopen.restype = ctypes.c_void_p
    libc.fopen.argtypes = (ctypes.c_char_p, ctypes.c_char_p)
    libc.malloc_info.argtypes = (ctypes.c_int, ctypes.c_void_p)
    libc.fclose.argtypes = (ctypes.c_void_p,)
    all_allocated = threading.Barrier(7)
    report_written = threading.Event()

    def allocate():
        kept = [np.ones(1000) for _ in range(50)]  # 8 kB each: from the thread's pool, not mapped apart
        all_allocated.wait()
        report_written.wait()

    threads = [threading.Thread(target=allocate) for _ in range(6)]
    for thread in threads:
        thread.start()
    all_allocated.wait()
    stream = libc.fopen(sys.argv[2].encode(), b"w")
    libc.malloc_info(0, stream)
    libc.fclose(stream)
    report_written.set()
    for thread in threads:
        thread.join()
    print("POOLS", open(sys.argv[2]).read().count("<heap nr="))
"""


def _pools(tmp_path: Path, how: str) -> tuple[str, int]:
    """What the child printed, and how many pools it had with its six threads alive."""
    done = subprocess.run([sys.executable, "-c", textwrap.dedent(_COUNT_POOLS), how, str(tmp_path / "pools.xml")],
                          capture_output=True, text=True, timeout=120, check=False)
    assert done.returncode == 0, done.stderr
    return done.stdout, int(done.stdout.split("POOLS")[1])


def test_six_threads_share_at_most_two_pools_once_limited(tmp_path):
    printed, pools = _pools(tmp_path, "limited")
    assert "TAKEN True" in printed
    assert pools <= 2


def test_without_the_limit_the_threads_take_pools_of_their_own(tmp_path):
    """The count above is the limit's doing: the same threads otherwise take a pool each."""
    _, pools = _pools(tmp_path, "as-started")
    assert pools >= 6
