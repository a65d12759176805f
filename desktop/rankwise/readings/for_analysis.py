"""From the sheet's groups to the statistics service's ``Analysis``: numbers, blanks, notes, censoring, counts."""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import TYPE_CHECKING

import numpy as np

from rankwise.readings.censored import censoring_for, check_mixed_limits
from rankwise.readings.cells import Cell, CellKind
from rankwise.readings.column_arrays import CENSORED, NUMBER
from rankwise.readings.entry_counts import count_column, count_entries
from rankwise.readings.parse import machine_decimal
from rankwise.readings.snapshot import RowParts
from rankwise.wording import pairing as words
from rankwise.stats.analysis import Analysis, GroupReadings, Question, Settings
from rankwise.stats.frozen_floats import FrozenFloats

if TYPE_CHECKING:
    from rankwise.readings.sheet import GroupColumn


def build_analysis(columns: Sequence[GroupColumn], question: Question, settings: Settings | None,
                   decimal: str = "auto", mixed_limits: str = "ask", parts: RowParts | None = None) -> Analysis:
    """The ``Analysis`` for these groups.

    Each group's values follow entry order; blanks, notes and unreadable entries become NaN (the
    statistics drop and count them). Censored readings with one common limit become one stand-in
    value below every measured reading (see ``rankwise.readings.censored``), with a note saying so;
    mixed limits raise ``MixedLimitsError`` unless ``mixed_limits`` (the sheet's setting) is
    "below-highest", which treats them all as below the highest limit. ``entries`` counts each
    group's readings, entries not used (by row), empty cells between entries and flagged readings
    (see ``rankwise.readings.entry_counts``): the count every output shows.
    For the paired question every group is padded with NaN to the longest one, so that readings
    pair up by row and a missing partner shows as a blank in its row.
    ``decimal`` is the sheet's decimal setting; the analysis writes numbers for people with that
    mark, or with "auto" the mark the readings were typed with (see ``typed_decimal_mark``).
    ``parts`` says which part each row is; the notes then say how the readings were paired and
    name the parts left out, or caution when the same parts are compared as separate groups (see
    ``question_notes``).
    """
    question = Question(question)
    check_mixed_limits(mixed_limits)
    censored = any(bool((column.arrays().kinds == CENSORED).any()) for column in columns)
    censoring = censoring_for([(column.name, column.cells) for column in columns], mixed_limits) if censored else None
    length = max((len(column.cells) for column in columns), default=0) if question is Question.PAIRED else 0
    notes: list[str] = []
    groups = []
    entries = []
    for column in columns:
        if censoring is None:  # nothing below a detection limit: the sheet's arrays hold all it takes
            groups.append(_readings_from_arrays(column, length))
            entries.append(count_column(column))
            continue
        values = []
        decimals = None
        for cell in column.cells:
            stand_in = censoring is not None and censoring.stands_in_for(cell)
            if stand_in:
                values.append(censoring.stand_in)
                decimals = max(decimals or 0, censoring.decimals)
            elif cell.kind is CellKind.NUMBER:
                values.append(cell.value)
                decimals = max(decimals or 0, cell.decimals or 0)
            else:
                values.append(math.nan)
        values.extend([math.nan] * (length - len(values)))
        groups.append(
            GroupReadings(
                name=column.name, values=values, unit=column.unit, lsl=column.lsl, usl=column.usl,
                nominal=column.nominal, decimals=decimals,
            )
        )
        entries.append(count_entries(
            column.name, column.cells, lsl=column.lsl, usl=column.usl, unit=column.unit,
            censored=None if censoring is None else censoring.stands_in_for,
        ))
    if censoring is not None:
        notes.insert(0, censoring.note)
    groups, question_remarks = question_notes(question, groups, parts or RowParts())
    notes[:0] = question_remarks
    mark = decimal if decimal in (".", ",") else typed_decimal_mark(columns)
    return Analysis(question=question, groups=tuple(groups), settings=settings or Settings(), notes=tuple(notes),
                    decimal_mark=mark, entries=tuple(entries))


def _readings_from_arrays(column: GroupColumn, length: int) -> GroupReadings:
    """A group's readings when none is censored: each row's reading, NaN elsewhere, padded to ``length``."""
    arrays = column.arrays()
    values = arrays.values
    if length > values.size:
        values = np.concatenate([values, np.full(length - values.size, np.nan)])
    measured = arrays.decimals[arrays.kinds == NUMBER]
    return GroupReadings(
        name=column.name, values=FrozenFloats(values), unit=column.unit, lsl=column.lsl, usl=column.usl,
        nominal=column.nominal, decimals=max(0, int(measured.max())) if measured.size else None,
    )


def typed_decimal_mark(columns: Sequence[GroupColumn]) -> str:
    """The decimal mark most readings with decimals were typed with; the machine's when none tells.

    A reading's decimal mark is the last point or comma before its exponent (a mark before it
    groups thousands); readings typed without decimals say nothing, nor does a tie of counts.
    """
    counts = {".": 0, ",": 0}
    for column in columns:
        for cell in column.cells:
            mark = _decimal_mark_of(cell)
            if mark:
                counts[mark] += 1
    if counts["."] == counts[","]:
        return machine_decimal()
    return "." if counts["."] > counts[","] else ","


def _decimal_mark_of(cell: Cell) -> str | None:
    """The mark a number (or censored limit) with decimals was typed with, else None."""
    if cell.kind not in (CellKind.NUMBER, CellKind.CENSORED) or not cell.decimals:
        return None
    mantissa = cell.text.lower().split("e")[0]
    last = max(mantissa.rfind("."), mantissa.rfind(","))
    return mantissa[last] if last >= 0 else None


def question_notes(question: Question, groups: list[GroupReadings], parts: RowParts
                   ) -> tuple[list[GroupReadings], list[str]]:
    """The groups the question uses, and the notes the record keeps on how the readings fit it.

    Same parts: how the rows were paired (by identifier or by row) and, by identifier, the parts
    with a reading at one stage only. Two groups of rows known to be the same parts: a caution
    that the pairing is ignored. Several groups: empty groups left out, groups with a single
    reading named in a warning.
    """
    if question is Question.PAIRED and len(groups) == 2:
        if parts.ids is None:
            return groups, [words.paired_by_row()]
        return groups, _part_pairing_notes(groups, parts)
    if question is Question.TWO_GROUPS and parts.ids is not None:
        return groups, [words.same_parts_as_separate_groups(parts.column)]
    if question is Question.SEVERAL:
        notes = []
        kept = []
        for group in groups:
            count = int(np.count_nonzero(~np.isnan(np.asarray(group.values))))
            if count == 0:
                notes.append(words.empty_group_left_out(group.name))
                continue
            if count == 1:
                notes.append(words.small_group(group.name, count))
            kept.append(group)
        return kept, notes
    return groups, []


def _part_pairing_notes(groups: list[GroupReadings], parts: RowParts) -> list[str]:
    """How many parts pair by identifier, and the parts with a reading at one stage only."""
    first, second = groups
    rows = max(len(first.values), len(second.values))
    has_first, has_second = (_has_reading(group, rows) for group in groups)
    paired = int(np.count_nonzero(has_first & has_second))
    unpaired = [(parts.id_of(row) or f"row {row + 1} (no identifier)", first.name if has_first[row] else second.name)
                for row in np.flatnonzero(has_first ^ has_second).tolist()]
    notes = [words.paired_by_part(paired, parts.column)]
    if unpaired:
        notes.append(words.unpaired_parts(unpaired, "parts"))
    return notes


def _has_reading(group: GroupReadings, rows: int) -> np.ndarray:
    """For each of ``rows`` rows, whether ``group`` has a reading there."""
    has = np.zeros(rows, dtype=bool)
    values = np.asarray(group.values)
    has[:values.size] = ~np.isnan(values)
    return has
