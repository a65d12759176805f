"""How many memory pools the window's threads share (GNU C library on Linux only).

The GNU C library's ``malloc`` gives each new thread that allocates a pool ("arena") of its own, up
to eight per processor core, and memory freed in one thread's pool serves only the threads of that
pool. The window passes a 10^6-reading file through several threads (reading, the statistics
worker, the rank table's sort, the recovery writer): each kept tens of MiB that the others could not
reuse, and the window's peak memory grew by 35 MiB or more. Capped at two pools, the freed memory is
used again; the window's stalls did not grow (measured with tests/benchmarks/bench_window.py).
The cap is the library's documented ``M_ARENA_MAX`` option (``mallopt(3)``).
"""

from __future__ import annotations

import ctypes
import sys

M_ARENA_MAX = -8
"""The option number of the pool cap in the GNU C library's ``malloc.h``."""

WINDOW_POOLS = 2
"""Pools the window's threads share: one for the window's thread, one for the threads behind it."""


def limit_memory_pools(pools: int = WINDOW_POOLS) -> bool:
    """Let all threads started from now on share at most ``pools`` memory pools. True when the C
    library took the setting; False elsewhere (another system or C library), where nothing changes."""
    if not sys.platform.startswith("linux"):
        return False
    try:
        mallopt = ctypes.CDLL(None).mallopt
    except (OSError, AttributeError):
        return False
    mallopt.argtypes, mallopt.restype = (ctypes.c_int, ctypes.c_int), ctypes.c_int
    return mallopt(M_ARENA_MAX, pools) == 1
