"""The entry journal: a full copy of the readings sheet, then every change as appended lines.

A technician's typing must survive a kill, whatever the sheet's size. Rewriting a whole sheet after
each edit costs seconds for a 10^6-row export, so the journal writes the sheet once (``base_lines``)
and then appends what each edit changed (``change_record`` taken when the edit happens, written by
``change_lines``): a few hundred bytes per typed reading. ``read_journal`` replays the lines into
the sheet as it stood after the last complete change.

The form is JSON lines (UTF-8): a header line (format, time, source file, question, the sheet's
settings and groups with their lengths), then ``piece`` lines with up to ``PIECE_CELLS`` cells each;
a change is a ``change`` line followed by its pieces, a question change a ``question`` line. A kill
can only cut the end of the file short: a cut line or a change missing some of its pieces ends the
replay, and everything before it comes back.
"""

from __future__ import annotations

import json
from collections.abc import Iterable, Iterator
from dataclasses import dataclass, replace
from datetime import datetime, timezone
from pathlib import Path
from typing import Any

from rankwise.readings.cells import EMPTY_CELL, Cell
from rankwise.readings.errors import ReadingsError
from rankwise.readings.snapshot import SheetSnapshot, cell_from_dict, cell_to_dict

JOURNAL_FORMAT = "rankwise-entry-journal-1"
"""The header's format name; raised when the meaning of the lines changes."""

PIECE_CELLS = 2000
"""Cells per ``piece`` line: short lines keep each write small and each encoding step brief."""


@dataclass(frozen=True)
class Piece:
    """Cells of one group from ``row`` down, as they stand after a change."""

    group: int
    row: int
    cells: tuple[Cell, ...]


@dataclass(frozen=True)
class ChangeRecord:
    """What an edit left behind, taken from the sheet the moment the edit happened.

    Attributes:
        rows: "" for changed cells, "inserted" or "removed" for whole rows ``first_row`` onwards.
        first_row, count: the rows inserted or removed (unused for changed cells).
        pieces: the cells to write after the rows moved.
        lengths: (group, length) of every group the change touched, after it.
    """

    rows: str
    first_row: int
    count: int
    pieces: tuple[Piece, ...]
    lengths: tuple[tuple[int, int], ...]


@dataclass(frozen=True)
class WrittenPieces:
    """A sheet's ``piece_lines``, written to the file ``path`` ahead of its journal, and its ``sheet_header``."""

    path: Path
    header: dict[str, Any]


@dataclass(frozen=True)
class JournalEntry:
    """An entry read back: the sheet, the question as the window stored it, the source file, when."""

    snapshot: SheetSnapshot
    question: dict[str, Any]
    source: str
    started_at: str
    changes: int

    @property
    def readings_typed(self) -> int:
        """How many cells hold text (to describe the entry when it is offered back)."""
        return sum(1 for group in self.snapshot.groups for cell in group.cells if cell.text)


def change_record(groups: list[list[Cell]], kind: str, first_group: int, last_group: int,
                  first_row: int, last_row: int) -> ChangeRecord | None:
    """What a ``SheetChange`` of ``kind`` left in ``groups`` (each group's cell list, after the change).

    Returns None for changes of groups or settings ("groups", "reset"): they need a new full copy.
    Only references to the (immutable) cells are taken here, so this is quick on the editing thread.
    """
    if kind == "cells":
        touched = range(first_group, last_group + 1)
        rows, count = "", 0
    elif kind in ("rows-inserted", "rows-removed"):
        touched = range(len(groups))
        rows, count = kind.removeprefix("rows-"), last_row - first_row + 1
    else:
        return None
    lengths = tuple((g, len(groups[g])) for g in touched)
    pieces = []
    if rows != "removed":
        for g in touched:
            stop = min(last_row + 1, len(groups[g]))
            for start in range(first_row, stop, PIECE_CELLS):
                pieces.append(Piece(g, start, tuple(groups[g][start:min(start + PIECE_CELLS, stop)])))
    return ChangeRecord(rows, first_row, count, tuple(pieces), lengths)


def base_lines(snapshot: SheetSnapshot, question: dict[str, Any], source: str) -> Iterator[str]:
    """The journal's first lines: the header, then the whole sheet in pieces."""
    yield header_line(sheet_header(snapshot), question, source)
    yield from piece_lines(snapshot)


def sheet_header(snapshot: SheetSnapshot) -> dict[str, Any]:
    """What the header says of the sheet: its settings, its groups with their lengths, and how many
    ``piece_lines`` of it follow the header."""
    sheet = snapshot.to_dict(with_cells=False)
    for data, group in zip(sheet["groups"], snapshot.groups):
        data["length"] = len(group.cells)
    return {"sheet": sheet, "pieces": sum(-(-len(group.cells) // PIECE_CELLS) for group in snapshot.groups)}


def header_line(header: dict[str, Any], question: dict[str, Any], source: str) -> str:
    """The journal's first line (``header``: the ``sheet_header`` of the sheet whose pieces follow)."""
    return _line({
        "format": JOURNAL_FORMAT,
        "started_at": datetime.now(timezone.utc).isoformat(timespec="seconds"),
        "source": source,
        "question": question,
        **header,
    })


def piece_lines(snapshot: SheetSnapshot) -> Iterator[str]:
    """The whole sheet in pieces (``Piece``), group by group (written after ``header_line``)."""
    encoded: dict[int, str] = {}
    for g, group in enumerate(snapshot.groups):
        for start in range(0, len(group.cells), PIECE_CELLS):
            yield _piece_line(Piece(g, start, group.cells[start:start + PIECE_CELLS]), encoded)


def change_lines(record: ChangeRecord) -> Iterator[str]:
    """The lines of one change: the change line, then its pieces."""
    yield _line({"change": record.rows or "cells", "first_row": record.first_row, "count": record.count,
                 "lengths": [list(pair) for pair in record.lengths], "pieces": len(record.pieces)})
    encoded: dict[int, str] = {}
    yield from (_piece_line(piece, encoded) for piece in record.pieces)


def question_line(question: dict[str, Any]) -> str:
    """The line of a changed question."""
    return _line({"question": question})


def read_journal(lines: Iterable[str]) -> JournalEntry:
    """Replay a journal's lines; a damaged header raises ``ReadingsError``, a cut end is left out."""
    stream = iter(lines)
    try:
        header = json.loads(next(stream))
        if header.get("format") != JOURNAL_FORMAT:
            raise ReadingsError(
                f"The kept entry is in form {header.get('format')!r}, which this version cannot read; "
                "open it with the version that wrote it.")
        sheet = header["sheet"]
        lengths = [int(group.pop("length")) for group in sheet["groups"]]
        shape = SheetSnapshot.from_dict({**sheet, "groups": [{**group, "cells": []} for group in sheet["groups"]]})
        question, source, started_at = dict(header["question"]), str(header["source"]), str(header["started_at"])
        columns = [[EMPTY_CELL] * length for length in lengths]
        pieces = _take_pieces(stream, int(header["pieces"]))
        if pieces is None:
            raise ValueError("the full copy is incomplete")
        _put(columns, pieces)
    except ReadingsError:
        raise
    except (StopIteration, AttributeError, KeyError, TypeError, ValueError) as error:
        raise ReadingsError(
            "The kept entry is damaged and cannot be restored; use the original file or retype the readings."
        ) from error
    changes = 0
    for text in stream:
        if not text.endswith("\n"):
            break  # the last line, cut short by the kill (its ending is written with it)
        try:
            record = json.loads(text)
            if "question" in record:
                question = dict(record["question"])
            elif not _replay_change(columns, record, stream):
                break
        except (AttributeError, KeyError, TypeError, ValueError, IndexError):
            break  # a line cut short by the kill, or damage: what came before is the entry
        changes += 1
    groups = tuple(replace(group, cells=tuple(cells)) for group, cells in zip(shape.groups, columns))
    return JournalEntry(replace(shape, groups=groups), question, source, started_at, changes)


def _replay_change(columns: list[list[Cell]], record: dict[str, Any], stream: Iterator[str]) -> bool:
    """Apply one change; False (nothing applied) when the journal ends before all its pieces."""
    kind, first, count = record["change"], int(record["first_row"]), int(record["count"])
    if kind not in ("cells", "inserted", "removed") or first < 0 or count < 0:
        raise ValueError("unknown change")
    pieces = _take_pieces(stream, int(record["pieces"]))
    if pieces is None:
        return False
    if kind == "inserted":
        for cells in columns:
            if first < len(cells):
                cells[first:first] = [EMPTY_CELL] * count
    elif kind == "removed":
        for cells in columns:
            del cells[first:first + count]
    _put(columns, pieces)
    for group, length in record["lengths"]:
        cells = columns[group]
        del cells[length:]
        cells.extend([EMPTY_CELL] * (length - len(cells)))
    return True


def _take_pieces(stream: Iterator[str], count: int) -> list[tuple[int, int, list[Cell]]] | None:
    """The next ``count`` pieces, decoded; None when the journal ends (or is cut) before them all."""
    pieces = []
    for _ in range(count):
        text = next(stream, None)
        if text is None or not text.endswith("\n"):
            return None
        group, row, cells = json.loads(text)["piece"]
        if not isinstance(group, int) or not isinstance(row, int) or group < 0 or row < 0:
            raise ValueError("piece address")
        pieces.append((group, row, [cell_from_dict(cell) for cell in cells]))
    return pieces


def _put(columns: list[list[Cell]], pieces: list[tuple[int, int, list[Cell]]]) -> None:
    for group, row, cells in pieces:
        column = columns[group]
        if len(column) < row + len(cells):
            column.extend([EMPTY_CELL] * (row + len(cells) - len(column)))
        column[row:row + len(cells)] = cells


def _piece_line(piece: Piece, encoded: dict[int, str]) -> str:
    """The line ``_line({"piece": [group, row, [cell_to_dict(cell), ...]]})`` writes.

    The cells of an opened file are shared by equal entries (an export of 10^6 readings has a few
    hundred cell objects), and encoding each reading again held the interpreter lock for seconds
    while the window was being typed in: each cell object is encoded once, ``encoded`` keeping its
    text by ``id(cell)`` from piece to piece (the caller keeps every cell alive meanwhile, so no id
    is reused). A piece of mostly new cells (typed ones) is encoded whole, as one list.
    """
    keys = list(map(id, piece.cells))
    texts = list(map(encoded.get, keys))
    if None in texts:
        new = {key: cell for key, cell, text in zip(keys, piece.cells, texts) if text is None}
        if len(new) > len(texts) // 4:
            return _line({"piece": [piece.group, piece.row, [cell_to_dict(cell) for cell in piece.cells]]})
        for key, cell in new.items():
            encoded[key] = json.dumps(cell_to_dict(cell), ensure_ascii=False, separators=(",", ":"))
        texts = list(map(encoded.get, keys))
    return f'{{"piece":[{piece.group:d},{piece.row:d},[' + ",".join(texts) + "]]}\n"


def _line(data: dict[str, Any]) -> str:
    return json.dumps(data, ensure_ascii=False, separators=(",", ":")) + "\n"

