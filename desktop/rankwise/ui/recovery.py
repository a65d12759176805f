"""Nothing lost: every window keeps its unsaved entry in its own recovery file while the user types.

Each window owns one file in the application data folder (``QStandardPaths.AppDataLocation``),
named after its process and a window number, and holds a lock file beside it (``QLockFile``) for
as long as it runs. The file is an entry journal (``rankwise.readings.entry_journal``): a full
copy of the sheet, then each edit appended the moment it is made (``JournalWriter``): a typed
reading is handed to the system before the key press has finished, so a kill loses no committed
edit, and large copies (a 10^6-row sheet) are written by a thread of their own, so they never hold
up the window.

At the next start, the files whose lock nobody holds any more (their window was killed or lost
power) are offered back, each one; a running window's file is never offered or touched by another.
A window closed normally removes its own file only.
"""

from __future__ import annotations

import itertools
import os
import queue
import tempfile
import threading
from collections.abc import Callable, Iterable, Iterator
from pathlib import Path
from typing import Any

from PySide6.QtCore import QLockFile, QObject, QStandardPaths, Signal

from rankwise.readings.entry_journal import (
    PIECE_CELLS,
    JournalEntry,
    WrittenPieces,
    base_lines,
    change_lines,
    change_record,
    header_line,
    question_line,
    read_journal,
)

ENTRY_SUFFIX = ".rankwise-entry"
"""The ending of a window's recovery file."""

SMALL_PIECES = 2
"""Work of at most this many pieces (``PIECE_CELLS`` cells each) is handed to the system at once,
on the window's thread (well under a millisecond); larger work goes to the writer's thread."""

_window_numbers = itertools.count(1)
_pieces_numbers = itertools.count(1)


def recovery_folder() -> Path:
    """The application data folder that holds the windows' recovery files."""
    location = QStandardPaths.writableLocation(QStandardPaths.StandardLocation.AppDataLocation)
    if not location:
        location = os.path.join(tempfile.gettempdir(), "rankwise")
    return Path(location)


def _lock_for(path: Path) -> QLockFile:
    lock = QLockFile(str(path) + ".lock")
    lock.setStaleLockTime(0)  # a lock is stale only when its process is gone, however old it is
    return lock


class RecoveryFile:
    """One window's recovery file and its lock.

    Args:
        path: the file; its lock file lies beside it (``path`` + ".lock"). ``for_new_window`` picks a
            file of its own for each window in a folder.
    """

    def __init__(self, path: str | os.PathLike[str]) -> None:
        self.path = Path(path)
        self._lock = _lock_for(self.path)

    @classmethod
    def for_new_window(cls, folder: Path | None = None) -> RecoveryFile:
        """A file of its own for a new window in ``folder`` (the recovery folder by default)."""
        folder = recovery_folder() if folder is None else Path(folder)
        while True:  # a file left by an earlier process of the same number is offered, never reused
            path = folder / f"window-{os.getpid()}-{next(_window_numbers)}{ENTRY_SUFFIX}"
            if not path.exists():
                return cls(path)

    @property
    def folder(self) -> Path:
        """The folder where this window's and the other windows' files lie."""
        return self.path.parent

    def hold(self) -> bool:
        """Take this file's lock for the window's lifetime; False when another running window holds it."""
        if self._lock.isLocked():
            return True
        self.folder.mkdir(parents=True, exist_ok=True)
        return self._lock.tryLock(0)

    def release(self) -> None:
        """Let go of the lock (the window closed)."""
        self._lock.unlock()

    def load(self) -> JournalEntry:
        """The entry kept in the file; ``ReadingsError`` when it cannot be read back."""
        with open(self.path, encoding="utf-8", newline="\n") as stream:
            return read_journal(stream)

    def exists(self) -> bool:
        """True when there is a kept entry."""
        return self.path.is_file()

    def clear(self) -> None:
        """Remove the file and any temporary copy its writer left behind."""
        self.path.unlink(missing_ok=True)
        for leftover in self.folder.glob(f".{self.path.name}.*.tmp"):
            leftover.unlink(missing_ok=True)


def left_files(folder: Path) -> list[RecoveryFile]:
    """The recovery files in ``folder`` whose window is gone, oldest first, each locked for the caller.

    Files of running windows (their lock is held) are left alone. Temporary copies and lock files of
    gone windows that left no file are removed on the way. The caller releases each lock
    (``RecoveryFile.release``) once the file is restored, removed or put aside.
    """
    if not folder.is_dir():
        return []
    names = set()
    for path in folder.iterdir():
        name = path.name
        if name.endswith(ENTRY_SUFFIX):
            names.add(name)
        elif name.endswith(ENTRY_SUFFIX + ".lock"):
            names.add(name.removesuffix(".lock"))
        elif name.startswith(".") and name.endswith(".tmp") and ENTRY_SUFFIX + "." in name:
            names.add(name[1:name.index(ENTRY_SUFFIX) + len(ENTRY_SUFFIX)])
    found = []
    for name in names:
        left = RecoveryFile(folder / name)
        if not left.hold():
            continue  # its window is running
        for leftover in folder.glob(f".{name}.*.tmp"):
            leftover.unlink(missing_ok=True)
        if left.exists():
            found.append(left)
        else:
            left.release()
    found.sort(key=lambda file: file.path.stat().st_mtime)
    return found


class JournalWriter:
    """Writes a window's entry journal in the order the edits came, never holding up the window.

    A small piece of work (a typed reading, the first copy of a short entry) is handed to the
    system at once, on the caller's thread, when nothing else is waiting: a kill right after the
    key press loses nothing (the system keeps what was handed to it). Anything larger, or anything
    arriving while earlier work is still being written, goes to the writer's own thread. That
    thread also syncs the file to the disk after each batch (for power cuts). A new full copy is
    written beside the file and renamed over it (atomic); work queued before a newer full copy or a
    removal is skipped.
    """

    def __init__(self, path: Path, on_problem: Callable[[str], None]) -> None:
        self.path = path
        self._on_problem = on_problem
        self._queue: queue.SimpleQueue = queue.SimpleQueue()
        self._stream = None
        self._file_lock = threading.Lock()
        self._idle = threading.Condition()
        self._queued = 0
        self._done = 0
        self.copy_lost = threading.Event()
        """Set when a write failed: the next edit must start with a full copy again."""
        self._thread = threading.Thread(target=self._run, name="rankwise-recovery-writer", daemon=True)
        self._thread.start()

    def start_over(self, lines: Callable[[], Any], small: bool = False) -> None:
        """Replace the file with the lines ``lines()`` yields (a full copy), then append to it."""
        self._submit("copy", lines, small)

    def append(self, lines: Callable[[], Any], small: bool = False) -> None:
        """Append the lines ``lines()`` yields."""
        self._submit("append", lines, small)

    def adopt(self, path: Path) -> None:
        """Move the file at ``path`` (a restored entry) into this writer's place and append to it."""
        self._submit("adopt", path, False)

    def remove(self) -> None:
        """Remove the file."""
        self._submit("remove", None, False)

    def wait_until_written(self, timeout_s: float = 60.0) -> bool:
        """Block until everything queued so far is in the file; True when it got there in time."""
        with self._idle:
            target = self._queued
            return self._idle.wait_for(lambda: self._done >= target, timeout=timeout_s)

    def stop(self, timeout_s: float = 60.0) -> None:
        """Write what is queued, then end the thread."""
        self._submit("stop", None, False)
        self._thread.join(timeout_s)

    def _submit(self, kind: str, payload: Any, small: bool) -> None:
        with self._idle:
            idle = self._queued == self._done
        if small and idle and self._file_lock.acquire(blocking=False):
            try:
                self._do(kind, payload, sync=False)
                if self._stream is not None:
                    self._stream.flush()
            except OSError as error:
                self._lost(error)
            finally:
                self._file_lock.release()
            kind, payload = "sync", None  # the thread syncs it to the disk
        with self._idle:
            self._queued += 1
        self._queue.put((kind, payload))

    def _run(self) -> None:
        stopping = False
        while not stopping:
            batch = [self._queue.get()]
            while True:
                try:
                    batch.append(self._queue.get_nowait())
                except queue.Empty:
                    break
            starts = [i for i, (kind, _) in enumerate(batch) if kind in ("copy", "remove", "adopt")]
            with self._file_lock:
                try:
                    for kind, payload in batch[starts[-1]:] if starts else batch:
                        stopping = stopping or kind == "stop"
                        self._do(kind, payload, sync=True)
                    if self._stream is not None:
                        self._stream.flush()
                        os.fsync(self._stream.fileno())
                except OSError as error:
                    self._lost(error)
                if stopping:
                    self._close()
            with self._idle:
                self._done += len(batch)
                self._idle.notify_all()

    def _lost(self, error: OSError) -> None:
        self._close()
        self.copy_lost.set()
        self._on_problem(str(error))

    def _do(self, kind: str, payload: Any, sync: bool) -> None:
        if kind == "copy":
            self._close()
            self.path.parent.mkdir(parents=True, exist_ok=True)
            handle, temporary = tempfile.mkstemp(prefix=f".{self.path.name}.", suffix=".tmp", dir=self.path.parent)
            try:
                with os.fdopen(handle, "w", encoding="utf-8", newline="\n") as stream:
                    stream.writelines(payload())
                    if sync:
                        stream.flush()
                        os.fsync(stream.fileno())
                os.replace(temporary, self.path)
            except BaseException:
                Path(temporary).unlink(missing_ok=True)
                raise
            self._stream = open(self.path, "a", encoding="utf-8", newline="\n")  # noqa: SIM115 - kept open
        elif kind == "adopt":
            self._close()
            os.replace(payload, self.path)
            self._stream = open(self.path, "a", encoding="utf-8", newline="\n")  # noqa: SIM115 - kept open
        elif kind == "append" and self._stream is not None:
            self._stream.writelines(payload())
        elif kind == "remove":
            self._close()
            self.path.unlink(missing_ok=True)

    def _close(self) -> None:
        if self._stream is not None:
            stream, self._stream = self._stream, None
            try:
                stream.close()
            except OSError:
                pass


def _lines_with_pieces(head: str, pieces: Path, tail: Iterable[str]) -> Iterator[str]:
    """``head``, the piece lines kept in ``pieces`` (a megabyte at a time; the file goes once read), then ``tail``."""
    yield head
    with open(pieces, encoding="utf-8", newline="\n") as stream:
        yield from iter(lambda: stream.read(1 << 20), "")
    pieces.unlink(missing_ok=True)
    yield from tail


class RecoveryKeeper(QObject):
    """Keeps a window's unsaved entry in its recovery file, edit by edit, off the window's thread.

    The keeper follows the sheet's change notices: the first edit of an unsaved entry writes a full
    copy, each later edit only what it changed. The window calls ``settle`` after each edit (the
    file is removed when nothing is left unsaved), ``question_changed`` when the question changes,
    ``follow`` when it shows another sheet, and ``close`` when it closes.

    Signals:
        problem(str): the file could not be written (the reason from the system).
    """

    problem = Signal(str)

    def __init__(self, file: RecoveryFile, question: Callable[[], dict], source: Callable[[], str],
                 unsaved: Callable[[], bool], parent: QObject | None = None) -> None:
        super().__init__(parent)
        self.file = file
        self.file.hold()
        self._question = question
        self._source = source
        self._unsaved = unsaved
        self._writer = JournalWriter(file.path, self.problem.emit)
        self._sheet = None
        self._has_copy = False
        self._pieces: tuple[object, WrittenPieces] | None = None
        """The sheet and its piece lines as opened (``use_pieces``)."""

    def follow(self, sheet) -> None:
        """Keep ``sheet`` from now on (a new entry, an opened file): the old entry's file goes."""
        if self._sheet is not None:
            self._sheet.unsubscribe(self._on_change)
        self._sheet = sheet
        sheet.subscribe(self._on_change)
        self._drop_pieces()
        if self._has_copy:
            self._writer.remove()
            self._has_copy = False
        self.settle()

    def pieces_file(self) -> Path:
        """A new path where a reader may write the piece lines of a sheet it opens (``use_pieces``);
        it lies with this window's temporary files and goes with them."""
        return self.file.folder / f".{self.file.path.name}.opened-{next(_pieces_numbers)}.tmp"

    def use_pieces(self, sheet, pieces: WrittenPieces) -> None:
        """``pieces`` are the piece lines of ``sheet`` as it stands now (written by the process that
        read the file): the first edit's full copy takes them instead of encoding every cell here."""
        self._drop_pieces()
        if sheet is self._sheet and not self._has_copy:
            self._pieces = (sheet, pieces)
        else:
            pieces.path.unlink(missing_ok=True)

    def adopt(self, left: RecoveryFile) -> None:
        """Take over ``left``, whose entry the window now shows (restored): its file becomes this
        window's file, and ``left``'s lock is let go once the move is done."""
        self._writer.adopt(left.path)
        self._has_copy = True
        self._writer.wait_until_written()
        if not left.exists():  # moved (a failed move leaves it, and the next edit writes a copy)
            left.clear()
        left.release()

    def settle(self) -> None:
        """After an edit has finished: remove the file when nothing is unsaved, or write it if missing."""
        if self._writer.copy_lost.is_set():
            self._writer.copy_lost.clear()
            self._has_copy = False
        unsaved = self._unsaved()
        if not unsaved and self._has_copy:
            self._writer.remove()
            self._has_copy = False
        elif unsaved and not self._has_copy:
            self._write_copy()

    def question_changed(self) -> None:
        """Keep the new question with the entry."""
        if self._has_copy:
            question = self._question()
            self._writer.append(lambda: [question_line(question)], small=True)
        elif self._unsaved():
            self._write_copy()

    def wait_until_written(self, timeout_s: float = 60.0) -> bool:
        """Block until every edit so far is in the file (tests, and closing)."""
        return self._writer.wait_until_written(timeout_s)

    def close(self) -> None:
        """The window closes normally: remove its file and let go of its lock."""
        if self._sheet is not None:
            self._sheet.unsubscribe(self._on_change)
        self._drop_pieces()
        self._writer.remove()
        self._writer.stop()
        self.file.clear()
        self.file.release()

    def _on_change(self, change) -> None:
        if self._writer.copy_lost.is_set():
            self._writer.copy_lost.clear()
            self._has_copy = False
        record = None
        if self._has_copy or self._pieces is not None:
            columns = [group.cells for group in self._sheet.groups]
            record = change_record(columns, change.kind, change.first_group, change.last_group,
                                   change.first_row, change.last_row)
        if record is None:
            self._drop_pieces()
            self._write_copy()
        elif not self._has_copy:
            self._write_copy_from_pieces(record)
        else:
            self._writer.append(lambda: change_lines(record), small=len(record.pieces) <= SMALL_PIECES)

    def _write_copy_from_pieces(self, record) -> None:
        """The first copy of an opened file: its header, its piece lines as opened, then this first change."""
        pieces = self._pieces[1]
        self._pieces = None
        head = header_line(pieces.header, self._question(), self._source())
        self._writer.start_over(lambda: _lines_with_pieces(head, pieces.path, change_lines(record)))
        self._has_copy = True

    def _drop_pieces(self) -> None:
        if self._pieces is not None:
            self._pieces[1].path.unlink(missing_ok=True)
            self._pieces = None

    def _write_copy(self) -> None:
        snapshot, question, source = self._sheet.snapshot(), self._question(), self._source()
        cells = sum(len(group.cells) for group in snapshot.groups)
        self._writer.start_over(lambda: base_lines(snapshot, question, source), small=cells <= SMALL_PIECES * PIECE_CELLS)
        self._has_copy = True
