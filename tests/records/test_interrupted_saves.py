"""Saves cut short leave no temporary files behind: the next start removes those no process has open.

A save killed half-way runs in a child process with a time limit."""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import pytest

from rankwise.records.atomic import remove_interrupted_saves

CHILD_LIMIT_S = 120

_SLOW_SAVE = """
    import sys, time
    from pathlib import Path
    from rankwise.records.atomic import write_atomically

    def write(temporary):
        with open(temporary, "w") as stream:
            stream.write("half a workbook")
            stream.flush()
            print("WRITING", flush=True)
            time.sleep(600)

    write_atomically(Path(sys.argv[1]), write)
"""


def _age(path: Path, seconds: float) -> None:
    then = time.time() - seconds
    os.utime(path, (then, then))


def test_a_save_killed_half_way_leaves_a_temporary_file_that_the_next_start_removes(tmp_path):
    target = tmp_path / "result.xlsx"
    target.write_bytes(b"the signed record as it was")
    environment = dict(os.environ, PYTHONPATH=str(Path(__file__).resolve().parents[2] / "desktop"))
    child = subprocess.Popen([sys.executable, "-c", textwrap.dedent(_SLOW_SAVE), str(target)],
                             stdout=subprocess.PIPE, text=True, env=environment)
    try:
        assert child.stdout.readline().strip() == "WRITING"
        left = [p for p in tmp_path.iterdir() if p.name.startswith(".result.xlsx.")]
        assert len(left) == 1
        assert remove_interrupted_saves(tmp_path, quiet_s=0) == []  # still open by the running save
        child.send_signal(signal.SIGKILL)
        child.wait(CHILD_LIMIT_S)
    finally:
        if child.poll() is None:
            child.kill()
            child.wait()
    assert left[0].exists()
    assert remove_interrupted_saves(tmp_path, quiet_s=0) == left
    assert sorted(p.name for p in tmp_path.iterdir()) == ["result.xlsx"]
    assert target.read_bytes() == b"the signed record as it was"


def test_only_quiet_temporary_files_of_atomic_writes_are_removed(tmp_path):
    old = tmp_path / ".readings.csv.ab12cd_9.tmp"
    fresh = tmp_path / ".verdict.pdf.zz99yy88.tmp"
    others = [tmp_path / ".hidden.tmp", tmp_path / "notes.tmp", tmp_path / ".readings.csv.ABCDEFGH.tmp"]
    for path in [old, fresh, *others]:
        path.write_text("x")
        _age(path, 120)
    fresh.write_text("still being written")
    assert remove_interrupted_saves(tmp_path, quiet_s=60) == [old]
    assert fresh.exists() and all(path.exists() for path in others)


def test_a_temporary_file_this_process_holds_open_is_kept(tmp_path):
    held = tmp_path / ".readings.xlsx.k3j4l5m6.tmp"
    with open(held, "w") as stream:
        stream.write("x")
        _age(held, 120)
        assert remove_interrupted_saves(tmp_path, quiet_s=0) == []
    assert remove_interrupted_saves(tmp_path, quiet_s=0) == [held]


def test_a_folder_that_is_gone_gives_nothing(tmp_path):
    assert remove_interrupted_saves(tmp_path / "not there") == []


@pytest.mark.skipif(not Path("/proc/self/fd").is_dir(), reason="needs /proc to see open files")
def test_open_files_are_seen_through_proc(tmp_path):
    from rankwise.records.atomic import files_open_by_processes

    path = tmp_path / "open.txt"
    with open(path, "w"):
        assert str(path) in files_open_by_processes()
