"""The readings sheet: groups of cells as typed, every edit one undoable step, change notices.

Qt-free. The window's grid wraps a ``ReadingSheet`` and follows its ``SheetChange`` notices;
records store its ``snapshot()``. Each column never ends in blank cells: a column is as long as
its last entry, and ``row_count`` is the longest column.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

from rankwise.readings.cell_codes import CellCodes
from rankwise.readings.cells import EMPTY_CELL, Cell, CellKind, GroupCounts, SkippedCell
from rankwise.readings.errors import ReadingsError
from rankwise.readings.censored import check_mixed_limits
from rankwise.readings.column_arrays import ColumnArrays
from rankwise.readings.group_names import next_group_names
from rankwise.readings import decimal_mark
from rankwise.readings.parse import check_decimal, parse_reading
from rankwise.readings.snapshot import GroupSnapshot, RowParts, SheetSnapshot

if TYPE_CHECKING:
    from rankwise.readings.reading_set import ReadingSet
    from rankwise.stats.analysis import Analysis, Question, Settings

_UNSET = object()
CHANGE_KINDS = ("cells", "rows-inserted", "rows-removed", "groups", "reset")
"""The kinds of ``SheetChange``."""


@dataclass
class GroupColumn:
    """One group of the sheet. Change it through the sheet's methods so that undo works.

    Attributes:
        name: the group's name, unique in the sheet.
        unit: the readings' unit ("µm"), or "".
        lsl, usl, nominal: specification limits and nominal value, or None.
        cells: the cells in entry order (never ending in a blank).
    """

    name: str
    unit: str = ""
    lsl: float | None = None
    usl: float | None = None
    nominal: float | None = None
    cells: list[Cell] = field(default_factory=list)
    _arrays: ColumnArrays | None = field(default=None, init=False, compare=False, repr=False)

    def copy(self) -> GroupColumn:
        """An independent copy (the cells themselves are immutable)."""
        return dataclasses.replace(self, cells=list(self.cells))

    def __getstate__(self) -> dict:
        return {**self.__dict__, "cells": CellCodes(self.cells)}  # compact: see ``cell_codes``

    def __setstate__(self, state: dict) -> None:
        cells = state["cells"].cells()
        self.__dict__.update(state, cells=cells)
        if self._arrays is not None:
            self._arrays.adopt(cells)

    def arrays(self) -> ColumnArrays:
        """The cells as arrays: made on first use, then kept in step by the sheet's edits."""
        if self._arrays is None or not self._arrays.mirrors(self.cells):
            self._arrays = ColumnArrays(self.cells)
        return self._arrays

    def _kept_arrays(self) -> ColumnArrays | None:
        """The arrays to keep in step with the next change of ``cells``; None when there are none yet."""
        return self._arrays if self._arrays is not None and self._arrays.mirrors(self.cells) else None


@dataclass(frozen=True)
class SheetChange:
    """What an edit (or its undo) changed, so a view can update just that part.

    Attributes:
        kind: "cells" (cell contents in the given ranges; columns may have grown or shrunk),
            "rows-inserted" or "rows-removed" (whole rows ``first_row``..``last_row``, in every group),
            "groups" (groups ``first_group``..``last_group`` or the list of groups changed: added,
            removed, moved, renamed, new details), "reset" (anything may have changed).
        first_group, last_group: the groups concerned (inclusive), or -1 when not applicable.
        first_row, last_row: the rows concerned (inclusive), or -1 when not applicable.
        before: True for the notice sent just before the change (for views that must announce
            inserts and removals in advance), False for the notice sent after it.
    """

    kind: str
    first_group: int = -1
    last_group: int = -1
    first_row: int = -1
    last_row: int = -1
    before: bool = False

    def __post_init__(self) -> None:
        if self.kind not in CHANGE_KINDS:
            raise ValueError(f"kind must be one of {', '.join(CHANGE_KINDS)}; got {self.kind!r}.")


@dataclass
class _Operation:
    """One reversible change to the sheet's data, with the notices for doing and undoing it."""

    apply: Callable[[], None]
    revert: Callable[[], None]
    change: SheetChange
    undo_change: SheetChange


@dataclass
class _Step:
    label: str
    operations: list[_Operation]


class ReadingSheet:
    """Groups of readings as typed, with undo/redo of every edit and notices of every change."""

    def __init__(self, groups: Iterable[GroupColumn] = (), *, decimal: str = "auto", mixed_limits: str = "ask",
                 parts: RowParts | None = None) -> None:
        self.groups: list[GroupColumn] = [group.copy() for group in groups]
        self.parts = parts if parts is not None else RowParts()
        """Which part each row is (when a file paired the readings by part), or why rows are not parts."""
        self._decimal = check_decimal(decimal)
        self._mixed_limits = check_mixed_limits(mixed_limits)
        for position, group in enumerate(self.groups):
            _check_details(group.name, group.lsl, group.usl, [g.name for g in self.groups[:position]])
            _trim(group.cells)
        self._done: list[_Step] = []
        self._undone: list[_Step] = []
        self._saved_step: _Step | None = None
        self._listeners: list[tuple[Callable[[SheetChange], None], bool]] = []
        self._decided = decimal_mark.first_showing(self.groups) if self._decimal == "auto" else None

    # ----- building ---------------------------------------------------------------------------

    @classmethod
    def from_snapshot(cls, snapshot: SheetSnapshot) -> ReadingSheet:
        """A sheet holding the snapshot's groups and cells as they were (not re-read), with no undo history."""
        return cls(
            (
                GroupColumn(g.name, g.unit, g.lsl, g.usl, g.nominal, list(g.cells))
                for g in snapshot.groups
            ),
            decimal=snapshot.decimal,
            mixed_limits=snapshot.mixed_limits,
            parts=snapshot.parts,
        )

    @classmethod
    def from_reading_set(cls, reading_set: ReadingSet) -> ReadingSheet:
        """A sheet holding the groups of an opened file, cells as read, with the file's decimal mark and units.

        When the file holds the same parts measured twice (``reading_set.pairing``), each row is one
        part, matched by its identifier: a blank where a part has no cell at one stage.
        """
        from rankwise.readings.same_parts import rows_by_part, rows_not_parts

        pairing = reading_set.pairing
        cells = rows_by_part(reading_set.groups, pairing.parts) if pairing is not None else [
            list(group.cells) for group in reading_set.groups]
        parts = (RowParts(pairing.part_column, pairing.parts) if pairing is not None
                 else RowParts(not_parts=rows_not_parts(reading_set)))
        return cls(
            (
                GroupColumn(group.name, unit=group.unit, lsl=group.lsl, usl=group.usl, nominal=group.nominal,
                            cells=column)
                for group, column in zip(reading_set.groups, cells)
            ),
            decimal=reading_set.source.decimal,
            parts=parts,
        )

    def copy(self) -> ReadingSheet:
        """An independent copy of the sheet as it stands, without undo history, to read on another
        thread: the cells are shared (they are immutable), the arrays kept in step are copied."""
        twin = ReadingSheet(self.groups, decimal=self._decimal, mixed_limits=self._mixed_limits, parts=self.parts)
        for mine, copied in zip(self.groups, twin.groups):
            kept = mine._kept_arrays()
            if kept is not None:
                copied._arrays = kept.copy_for(copied.cells)
        twin._decided = self._decided
        return twin

    def snapshot(self) -> SheetSnapshot:
        """A frozen copy of the sheet as it stands."""
        return SheetSnapshot(
            groups=tuple(
                GroupSnapshot(g.name, g.unit, g.lsl, g.usl, g.nominal, tuple(g.cells)) for g in self.groups
            ),
            decimal=self._decimal,
            mixed_limits=self._mixed_limits,
            parts=self.parts,
        )

    # ----- reading ----------------------------------------------------------------------------

    @property
    def decimal(self) -> str:
        """The decimal setting: "auto", "." or ","."""
        return self._decimal

    @property
    def decimal_status(self) -> str:
        """Plain words on the decimal mark numbers are read with, and why (the setting, or the reading that decided it)."""
        return decimal_mark.status(self._decimal, self._decided, self.groups)

    @property
    def decimal_label(self) -> str:
        """A few words on the same for a status line ("Decimal comma (from 0,998 in A, row 1)")."""
        return decimal_mark.label(self._decimal, self._decided, self.groups)

    @property
    def _reading_decimal(self) -> str:
        """The mark typed text is read with: the setting, or with "auto" the mark the first readings show."""
        return decimal_mark.reading_mark(self._decimal, self._decided)

    @property
    def mixed_limits(self) -> str:
        """How readings below different detection limits are treated: "ask" or "below-highest"
        (see ``rankwise.readings.censored``)."""
        return self._mixed_limits

    @property
    def row_count(self) -> int:
        """The length of the longest column."""
        return max((len(group.cells) for group in self.groups), default=0)

    @property
    def group_names(self) -> list[str]:
        """The groups' names, in order."""
        return [group.name for group in self.groups]

    def cell(self, group: int, row: int) -> Cell:
        """The cell at ``group``, ``row``; an empty cell past the end of the column."""
        cells = self.groups[self._group_index(group)].cells
        if row < 0:
            raise ValueError(f"row must be 0 or more; got {row}.")
        return cells[row] if row < len(cells) else EMPTY_CELL

    def flags(self, group: int) -> dict[int, tuple[str, ...]]:
        """Suspicious readings of a group by row (slipped decimal point, beyond LSL/USL); never changed."""
        column = self.groups[self._group_index(group)]
        return column.arrays().flags(lambda row: column.cells[row].text, column.lsl, column.usl, column.unit)

    def counts(self, group: int) -> GroupCounts:
        """How many readings of a group are used, skipped, censored, and how many blanks lie between them
        (the count of ``rankwise.readings.entry_counts``, which the verdict shows)."""
        return self.groups[self._group_index(group)].arrays().counts()

    def skipped(self, group: int) -> list[SkippedCell]:
        """The cells of a group that are not used (notes, unreadable entries), with their rows and reasons."""
        column = self.groups[self._group_index(group)]
        return [
            SkippedCell(cell.text, cell.reason, row, column.name)
            for row, cell in enumerate(column.cells)
            if cell.is_skipped
        ]

    def to_analysis(
        self, question: Question, settings: Settings | None = None, groups: Sequence[int] | None = None
    ) -> Analysis:
        """The question with the chosen groups' readings (all groups by default), ready for ``stats.run``.

        See ``rankwise.readings.for_analysis.build_analysis`` for blanks, notes and censored readings.
        """
        from rankwise.readings.for_analysis import build_analysis

        chosen = range(len(self.groups)) if groups is None else [self._group_index(g) for g in groups]
        if len(set(chosen)) != len(chosen):
            raise ValueError(f"groups must not repeat a group; got {list(groups or [])}.")
        return build_analysis([self.groups[g] for g in chosen], question, settings, decimal=self._reading_decimal,
                              mixed_limits=self._mixed_limits, parts=self.parts)

    def pairing_refusal(self, groups: Sequence[int]) -> str:
        """Why the same-parts question cannot be asked of these two groups, in plain words; "" when it can.

        Rows pair up when a file matched them by part identifier, or, typed or opened without
        identifiers, when each row is one part and both groups have as many rows.
        """
        from rankwise.wording.pairing import rows_are_not_parts, rows_do_not_pair

        if self.parts.ids is not None:
            return ""
        if self.parts.not_parts:
            return rows_are_not_parts(self.parts.not_parts)
        first, second = (self.groups[self._group_index(g)] for g in groups)
        if len(first.cells) != len(second.cells):
            return rows_do_not_pair(first.name, len(first.cells), second.name, len(second.cells))
        return ""

    # ----- change notices ---------------------------------------------------------------------

    def subscribe(self, callback: Callable[[SheetChange], None], *, before: bool = False) -> None:
        """Call ``callback(change)`` after every change (with ``before=True``: just before it as well)."""
        self._listeners.append((callback, before))

    def unsubscribe(self, callback: Callable[[SheetChange], None]) -> None:
        """Stop calling ``callback``."""
        self._listeners = [(c, b) for c, b in self._listeners if c != callback]

    def _notify(self, change: SheetChange) -> None:
        for callback, wants_before in list(self._listeners):
            if wants_before or not change.before:
                callback(change)

    # ----- undo, redo, saved state ------------------------------------------------------------

    @property
    def can_undo(self) -> bool:
        """True when there is an edit to undo."""
        return bool(self._done)

    @property
    def can_redo(self) -> bool:
        """True when there is an undone edit to redo."""
        return bool(self._undone)

    @property
    def undo_label(self) -> str:
        """Plain words for the undo action ("Undo typing in Wheel B row 4"), or "" when none."""
        return f"Undo {self._done[-1].label}" if self._done else ""

    @property
    def redo_label(self) -> str:
        """Plain words for the redo action ("Redo typing in Wheel B row 4"), or "" when none."""
        return f"Redo {self._undone[-1].label}" if self._undone else ""

    def undo(self) -> None:
        """Undo the last edit (does nothing when there is none)."""
        if not self._done:
            return
        step = self._done.pop()
        for operation in reversed(step.operations):
            self._run(operation.revert, operation.undo_change)
        self._undone.append(step)

    def redo(self) -> None:
        """Redo the last undone edit (does nothing when there is none)."""
        if not self._undone:
            return
        step = self._undone.pop()
        for operation in step.operations:
            self._run(operation.apply, operation.change)
        self._done.append(step)

    @property
    def is_modified(self) -> bool:
        """True when the sheet differs from when it was last saved (or created)."""
        return (self._done[-1] if self._done else None) is not self._saved_step

    def mark_saved(self) -> None:
        """Remember the present state as saved."""
        self._saved_step = self._done[-1] if self._done else None

    def _run(self, action: Callable[[], None], change: SheetChange) -> None:
        self._notify(dataclasses.replace(change, before=True))
        action()
        self._notify(change)
        self._follow_decimal_mark(change)

    def _follow_decimal_mark(self, change: SheetChange) -> None:
        """With "auto", keep the mark the first showing reading decides; when it changes, read every cell again.

        The decision depends on the texts alone, so undo and redo bring back the same decision.
        """
        if self._decimal != "auto":
            self._decided = None
            return
        decided = self._decided
        if change.kind == "cells" and decided is None:
            found = decimal_mark.first_showing(
                self.groups, range(change.first_group, change.last_group + 1), range(change.first_row, change.last_row + 1))
        elif change.kind == "cells" and (change.first_group > decided.group or (
                change.first_group == decided.group and change.first_row > decided.row)):
            found = decided  # edits after the deciding reading cannot change the decision
        else:
            found = decimal_mark.first_showing(self.groups)
        self._decided = found
        if (found.mark if found else None) == (decided.mark if decided else None):
            return
        if not self.groups or not self.row_count:
            return
        every = SheetChange("cells", 0, len(self.groups) - 1, 0, self.row_count - 1)  # same shape, cells read again
        self._notify(dataclasses.replace(every, before=True))
        mark = self._reading_decimal
        for group in self.groups:
            group.cells = [parse_reading(c.text, decimal=mark, unit=group.unit) for c in group.cells]
        self._notify(every)

    def _commit(self, label: str, operations: list[_Operation]) -> None:
        if not operations:
            return
        step = _Step(label, operations)
        for operation in operations:
            self._run(operation.apply, operation.change)
        self._done.append(step)
        self._undone.clear()

    # ----- edits: cells -----------------------------------------------------------------------

    def set_text(self, group: int, row: int, text: str) -> Cell:
        """Type ``text`` into a cell (past the end of the column extends it); returns the new cell."""
        index = self._group_index(group)
        self._check_row(row)
        column = self.groups[index]
        cell = parse_reading(text, decimal=self._reading_decimal, unit=column.unit)
        if cell == self.cell(index, row):
            return cell
        verb = "clearing" if cell.kind is CellKind.EMPTY else "typing in"
        self._commit(f"{verb} {column.name} row {row + 1}", [self._write_cells({(index, row): cell})])
        return cell

    def paste_block(self, group: int, row: int, block: list[list[str]], titles: Sequence[str] = ()) -> list[str]:
        """Paste rows of texts with their top-left at ``group``, ``row``; adds groups when the block is wider.

        ``titles`` (a title row set apart by ``split_title_row``) name the groups the block lands in,
        in the same undo step; a blank title, or one another group already has, leaves the name as it
        was. Returns the names the titles gave."""
        index = self._group_index(group, allow_end=True)
        self._check_row(row)
        if not block or not any(block):
            return []
        width = max(len(line) for line in block)
        operations = []
        named = self._names_from_titles(index, titles)
        for position, name in named.items():
            if position < len(self.groups):
                operations.append(self._replace_group(position, dataclasses.replace(self.groups[position].copy(), name=name)))
        missing = index + width - len(self.groups)
        if missing > 0:
            names = self._new_names(missing, [named.get(position) for position in range(len(self.groups), index + width)])
            operations.append(self._insert_groups(len(self.groups), [GroupColumn(name) for name in names]))
            units = [group.unit for group in self.groups] + [""] * missing
        else:
            units = [group.unit for group in self.groups]
        writes = {
            (index + offset, row + line_number): parse_reading(text, decimal=self._reading_decimal, unit=units[index + offset])
            for line_number, line in enumerate(block)
            for offset, text in enumerate(line)
        }
        writes = {
            (g, r): cell for (g, r), cell in writes.items() if g >= len(self.groups) or cell != self.cell(g, r)
        }
        if writes:
            operations.append(self._write_cells(writes))
        count = sum(len(line) for line in block)
        target = self.groups[index].name if index < len(self.groups) else "new groups"
        self._commit(f"pasting {count} cell{'s' if count != 1 else ''} into {target}", operations)
        return list(named.values())

    def _names_from_titles(self, index: int, titles: Sequence[str]) -> dict[int, str]:
        """Group position -> new name, for the titles that can name a group."""
        names = list(self.group_names)
        named: dict[int, str] = {}
        for offset, title in enumerate(titles):
            position, title = index + offset, title.strip()
            current = names[position] if position < len(names) else None
            others = [name for i, name in enumerate(names) if i != position]
            if not title or title == current or title in others:
                continue
            names.extend([""] * (position + 1 - len(names)))
            names[position] = title
            named[position] = title
        return named

    def clear(self, cells: Iterable[tuple[int, int]]) -> None:
        """Empty the given (group, row) cells, as one step."""
        writes = {}
        for group, row in cells:
            index = self._group_index(group)
            self._check_row(row)
            if self.cell(index, row).kind is not CellKind.EMPTY or self.cell(index, row).text:
                writes[(index, row)] = EMPTY_CELL
        if writes:
            count = len(writes)
            self._commit(f"clearing {count} cell{'s' if count != 1 else ''}", [self._write_cells(writes)])

    def _write_cells(self, writes: dict[tuple[int, int], Cell]) -> _Operation:
        """An operation writing cells (to groups that exist when it runs)."""
        groups = sorted({g for g, _ in writes})
        rows = [r for _, r in writes]
        old_lengths: dict[int, int] = {}
        old_cells: dict[tuple[int, int], Cell] = {}

        def apply() -> None:
            for g in groups:
                old_lengths[g] = len(self.groups[g].cells)
            for (g, r), cell in writes.items():
                cells = self.groups[g].cells
                old_cells[(g, r)] = cells[r] if r < len(cells) else EMPTY_CELL
                _put(self.groups[g], r, cell)
            for g in groups:
                _trim_column(self.groups[g])

        def revert() -> None:
            for (g, r), cell in old_cells.items():
                _put(self.groups[g], r, cell)
            for g in groups:
                _delete(self.groups[g], old_lengths[g], len(self.groups[g].cells))

        change = SheetChange("cells", groups[0], groups[-1], min(rows), max(rows))
        return _Operation(apply, revert, change, change)

    # ----- edits: rows ------------------------------------------------------------------------

    def _rows_in_reach(self, row: int, count: int) -> bool:
        """Check a row edit's arguments; False when ``row`` lies past the last row (nothing to do)."""
        self._check_row(row)
        if count < 1:
            raise ValueError(f"count must be 1 or more; got {count}.")
        return row < self.row_count

    def insert_rows(self, row: int, count: int = 1) -> None:
        """Insert ``count`` empty rows before ``row`` in every group."""
        if not self._rows_in_reach(row, count):
            return

        parts = self.parts

        def apply() -> None:
            for group in self.groups:
                if row < len(group.cells):
                    _insert(group, row, [EMPTY_CELL] * count)
            self.parts = parts.with_rows_inserted(row, count)

        def revert() -> None:
            for group in self.groups:
                if row < len(group.cells):
                    _delete(group, row, row + count)
            self.parts = parts

        last = row + count - 1
        operation = _Operation(
            apply, revert,
            SheetChange("rows-inserted", first_row=row, last_row=last),
            SheetChange("rows-removed", first_row=row, last_row=last),
        )
        self._commit(f"inserting {_rows_words(row, count)}", [operation])

    def delete_rows(self, row: int, count: int = 1) -> None:
        """Delete ``count`` rows starting at ``row`` from every group; the rows below move up."""
        if not self._rows_in_reach(row, count):
            return
        count = min(count, self.row_count - row)
        removed: list[list[Cell]] = []
        parts = self.parts

        def apply() -> None:
            removed.clear()
            for group in self.groups:
                removed.append(group.cells[row:row + count])
                _delete(group, row, row + count)
                _trim_column(group)
            self.parts = parts.with_rows_deleted(row, count)

        def revert() -> None:
            self.parts = parts
            for group, cells in zip(self.groups, removed):
                if cells:
                    if len(group.cells) < row:
                        _insert(group, len(group.cells), [EMPTY_CELL] * (row - len(group.cells)))
                    _insert(group, row, cells)

        last = row + count - 1
        operation = _Operation(
            apply, revert,
            SheetChange("rows-removed", first_row=row, last_row=last),
            SheetChange("rows-inserted", first_row=row, last_row=last),
        )
        self._commit(f"deleting {_rows_words(row, count)}", [operation])

    # ----- edits: groups ----------------------------------------------------------------------

    def add_group(self, name: str | None = None, index: int | None = None) -> int:
        """Add an empty group (named after the sheet's other groups, e.g. C after A and B, when no name is given) at ``index`` (the end by default)."""
        where = len(self.groups) if index is None else self._group_index(index, allow_end=True)
        name = self._new_names(1)[0] if name is None else name.strip()
        _check_details(name, None, None, self.group_names)
        self._commit(f"adding group {name}", [self._insert_groups(where, [GroupColumn(name)])])
        return where

    def rename_group(self, index: int, name: str) -> None:
        """Rename a group; an empty or duplicate name raises ``ReadingsError`` and changes nothing."""
        index = self._group_index(index)
        old = self.groups[index]
        name = name.strip()
        if name == old.name:
            return
        _check_details(name, old.lsl, old.usl, [n for i, n in enumerate(self.group_names) if i != index])
        self._commit(
            f"renaming {old.name} to {name}", [self._replace_group(index, dataclasses.replace(old.copy(), name=name))]
        )

    def remove_group(self, index: int) -> None:
        """Remove a group with its cells (undo brings it back)."""
        index = self._group_index(index)
        column = self.groups[index]

        def apply() -> None:
            del self.groups[index]

        def revert() -> None:
            self.groups.insert(index, column)

        change = SheetChange("groups", index, index)
        self._commit(f"removing group {column.name}", [_Operation(apply, revert, change, change)])

    def move_group(self, index: int, new_index: int) -> None:
        """Move a group to ``new_index`` (its position after the move)."""
        index = self._group_index(index)
        new_index = self._group_index(new_index)
        if index == new_index:
            return

        def move(source: int, target: int) -> Callable[[], None]:
            def action() -> None:
                self.groups.insert(target, self.groups.pop(source))
            return action

        change = SheetChange("groups", min(index, new_index), max(index, new_index))
        name = self.groups[index].name
        self._commit(
            f"moving group {name}", [_Operation(move(index, new_index), move(new_index, index), change, change)]
        )

    def set_group_details(
        self, index: int, *, unit: object = _UNSET, lsl: object = _UNSET, usl: object = _UNSET,
        nominal: object = _UNSET,
    ) -> None:
        """Set a group's unit, LSL, USL or nominal (None clears a limit); cells are re-read for a new unit.

        LSL above USL, or a limit that is not a finite number, raises ``ReadingsError`` and changes nothing.
        """
        index = self._group_index(index)
        old = self.groups[index]
        new = old.copy()
        if unit is not _UNSET:
            if not isinstance(unit, str):
                raise ValueError(f"unit must be a str; got {type(unit).__name__}.")
            new.unit = unit.strip()
        for name, value in (("lsl", lsl), ("usl", usl), ("nominal", nominal)):
            if value is not _UNSET:
                setattr(new, name, _limit(name, value))
        _check_details(new.name, new.lsl, new.usl, [])
        if new.unit != old.unit:
            new.cells = [parse_reading(c.text, decimal=self._reading_decimal, unit=new.unit) for c in old.cells]
        if new == old:
            return
        self._commit(f"changing the details of {old.name}", [self._replace_group(index, new)])

    def set_decimal(self, sep: str) -> None:
        """Choose the decimal mark ("auto", "." or ","); every cell is re-read with it."""
        check_decimal(sep)
        if sep == self._decimal:
            return
        old_groups, old_decimal = self.groups, self._decimal
        reading = decimal_mark.reading_mark(sep, decimal_mark.first_showing(self.groups) if sep == "auto" else None)
        new_groups = [
            dataclasses.replace(
                g.copy(), cells=_trimmed([parse_reading(c.text, decimal=reading, unit=g.unit) for c in g.cells])
            )
            for g in self.groups
        ]

        def state(groups: list[GroupColumn], decimal: str) -> Callable[[], None]:
            def action() -> None:
                self.groups, self._decimal = groups, decimal
            return action

        words = {"auto": "guessing the decimal mark", ".": "decimal point", ",": "decimal comma"}[sep]
        change = SheetChange("reset")
        self._commit(
            f"switching to {words}",
            [_Operation(state(new_groups, sep), state(old_groups, old_decimal), change, change)],
        )

    def set_mixed_limits(self, choice: str) -> None:
        """Choose how readings below different detection limits are treated ("ask" or "below-highest")."""
        check_mixed_limits(choice)
        if choice == self._mixed_limits:
            return
        old_choice = self._mixed_limits

        def state(value: str) -> Callable[[], None]:
            def action() -> None:
                self._mixed_limits = value
            return action

        words = {"ask": "asking about different detection limits",
                 "below-highest": "treating readings below different limits as below the highest"}[choice]
        change = SheetChange("reset")
        self._commit(words, [_Operation(state(choice), state(old_choice), change, change)])

    def _insert_groups(self, where: int, columns: list[GroupColumn]) -> _Operation:
        def apply() -> None:
            self.groups[where:where] = columns

        def revert() -> None:
            del self.groups[where:where + len(columns)]

        change = SheetChange("groups", where, where + len(columns) - 1)
        return _Operation(apply, revert, change, change)

    def _replace_group(self, index: int, new: GroupColumn) -> _Operation:
        old = self.groups[index]

        def put(column: GroupColumn) -> Callable[[], None]:
            def action() -> None:
                self.groups[index] = column
            return action

        change = SheetChange("groups", index, index)
        return _Operation(put(new), put(old), change, change)

    # ----- checks -----------------------------------------------------------------------------

    def _group_index(self, group: int, *, allow_end: bool = False) -> int:
        limit = len(self.groups) + (1 if allow_end else 0)
        if isinstance(group, bool) or not isinstance(group, int) or not 0 <= group < limit:
            raise ValueError(f"group must be a group number from 0 to {limit - 1}; got {group!r}.")
        return group

    @staticmethod
    def _check_row(row: int) -> None:
        if isinstance(row, bool) or not isinstance(row, int) or row < 0:
            raise ValueError(f"row must be a row number, 0 or more; got {row!r}.")

    def _new_names(self, count: int, wanted: Sequence[str | None] = ()) -> list[str]:
        """Names for ``count`` new groups: the ``wanted`` one where given, else continuing the sheet's naming."""
        names = list(self.group_names)
        chosen = []
        for position in range(count):
            name = wanted[position] if position < len(wanted) else None
            if name is None:
                reserved = {n for n in wanted if n}
                name = next(n for n in next_group_names(names, len(reserved) + 1) if n not in reserved)
            names.append(name)
            chosen.append(name)
        return chosen


def _check_details(name: str, lsl: float | None, usl: float | None, other_names: Sequence[str]) -> None:
    if not name.strip():
        raise ReadingsError("A group needs a name; type one, for example the machine or the wheel.")
    if name in other_names:
        raise ReadingsError(f"There is already a group called '{name}'; give each group its own name.")
    if lsl is not None and usl is not None and lsl > usl:
        raise ReadingsError(
            f"The lower limit (LSL {lsl:g}) is above the upper limit (USL {usl:g}); check which is which."
        )


def _limit(name: str, value: object) -> float | None:
    if value is None:
        return None
    if isinstance(value, str):
        cell = parse_reading(value)
        if cell.kind is CellKind.EMPTY:
            return None
        if cell.kind is not CellKind.NUMBER:
            raise ReadingsError(f"The {name.upper()} '{value}' is not a number; type a number or leave it empty.")
        return cell.value
    if isinstance(value, bool) or not isinstance(value, (int, float)) or value != value or abs(value) == float("inf"):
        raise ReadingsError(f"The {name.upper()} must be a finite number or empty; got {value!r}.")
    return float(value)


def _trim(cells: list[Cell]) -> None:
    while cells and cells[-1].kind is CellKind.EMPTY:
        cells.pop()


# The changes below are the only ones made to a column's list of cells in place; each keeps the
# column's arrays (``GroupColumn.arrays``) in step.

def _put(column: GroupColumn, row: int, cell: Cell) -> None:
    """``column.cells[row] = cell``, extending the column with blanks when ``row`` lies past its end."""
    if row >= len(column.cells):
        _insert(column, len(column.cells), [EMPTY_CELL] * (row + 1 - len(column.cells)))
    arrays = column._kept_arrays()
    column.cells[row] = cell
    if arrays is not None:
        arrays.set(row, cell)


def _insert(column: GroupColumn, row: int, cells: list[Cell]) -> None:
    """``column.cells[row:row] = cells``."""
    arrays = column._kept_arrays()
    column.cells[row:row] = cells
    if arrays is not None:
        arrays.insert(row, cells)


def _delete(column: GroupColumn, start: int, stop: int) -> None:
    """``del column.cells[start:stop]``."""
    stop = min(stop, len(column.cells))
    if start >= stop:
        return
    arrays = column._kept_arrays()
    del column.cells[start:stop]
    if arrays is not None:
        arrays.delete(start, stop)


def _trim_column(column: GroupColumn) -> None:
    """Remove the blanks at the end of the column."""
    end = len(column.cells)
    while end and column.cells[end - 1].kind is CellKind.EMPTY:
        end -= 1
    _delete(column, end, len(column.cells))


def _trimmed(cells: list[Cell]) -> list[Cell]:
    _trim(cells)
    return cells


def _rows_words(row: int, count: int) -> str:
    return f"row {row + 1}" if count == 1 else f"rows {row + 1} to {row + count}"
