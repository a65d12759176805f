"""Open files in a child process with a memory cap and a time limit, so that a reader that aborts
or hangs fails the test that asked, instead of taking the whole test run down with it."""

from __future__ import annotations

import json
import os
import subprocess
import sys
from dataclasses import dataclass
from pathlib import Path

MEMORY_BUDGET = 1536 << 20
"""Address space the child may add, on top of what it holds once the readers are imported (1.5 GiB)."""
TIME_LIMIT = 300.0
"""Seconds a whole batch may take before it counts as hung: generous, for a machine busy with other work."""

_CHILD = r"""
import json, resource, sys
import numpy, pandas, python_calamine
from rankwise.readings import ReadingsError, open_readings
import rankwise.readings.open
pages = int(open("/proc/self/statm").read().split()[0])
limit = pages * resource.getpagesize() + int(sys.argv[1])
resource.setrlimit(resource.RLIMIT_AS, (limit, limit))
for line in sys.stdin:
    path = line.rstrip("\n")
    print(json.dumps({"start": path}), flush=True)
    try:
        result = open_readings(path)
    except ReadingsError as error:
        outcome = {"refused": str(error)}
    else:
        outcome = {"groups": [[g.name, g.values.size, bool(numpy.isfinite(g.values).all())] for g in result.groups],
                   "notes": list(result.notes)}
    outcome["path"] = path
    print(json.dumps(outcome), flush=True)
"""


@dataclass(frozen=True)
class Outcome:
    """What opening one file gave: readings (group name, count, all finite) or a refusal's message."""

    groups: list | None = None
    notes: list | None = None
    refused: str | None = None


class ChildFailed(AssertionError):
    """The child process died or hung while opening ``path``."""


def open_in_child(paths: list[Path], memory: int = MEMORY_BUDGET, time_limit: float = TIME_LIMIT) -> dict[Path, Outcome]:
    """Open every path in one child process; raise ``ChildFailed`` naming the file it died or hung on."""
    env = dict(os.environ)
    here = Path(__file__).resolve().parents[2] / "desktop"
    env["PYTHONPATH"] = os.pathsep.join(p for p in (env.get("PYTHONPATH", ""), str(here)) if p)
    child = subprocess.Popen(
        [sys.executable, "-c", _CHILD, str(memory)], stdin=subprocess.PIPE, stdout=subprocess.PIPE,
        stderr=subprocess.PIPE, text=True, env=env,
    )
    try:
        out, err = child.communicate("".join(f"{p}\n" for p in paths), timeout=time_limit)
    except subprocess.TimeoutExpired:
        child.kill()
        out, err = child.communicate()
        raise ChildFailed(f"opening hung (over {time_limit:.0f} s); last file started: {_last_started(out)}") from None
    outcomes: dict[Path, Outcome] = {}
    for line in out.splitlines():
        record = json.loads(line)
        if "path" in record:
            outcomes[Path(record["path"])] = Outcome(record.get("groups"), record.get("notes"), record.get("refused"))
    if child.returncode != 0 or len(outcomes) != len(paths):
        raise ChildFailed(
            f"the child stopped with exit code {child.returncode} while opening {_last_started(out)}:\n{err[-2000:]}"
        )
    return outcomes


def _last_started(out: str) -> str:
    started = [json.loads(line)["start"] for line in out.splitlines() if '"start"' in line]
    return started[-1] if started else "(none)"
