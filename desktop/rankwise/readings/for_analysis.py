"""From the sheet's groups to the statistics service's ``Analysis``: numbers, blanks, notes, censoring."""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import TYPE_CHECKING

from rankwise.readings.censored import censoring_for
from rankwise.readings.cells import Cell, CellKind
from rankwise.readings.parse import machine_decimal
from rankwise.stats.analysis import Analysis, GroupReadings, Question, Settings

if TYPE_CHECKING:
    from rankwise.readings.sheet import GroupColumn


def build_analysis(columns: Sequence[GroupColumn], question: Question, settings: Settings | None,
                   decimal: str = "auto", mixed_limits: str = "ask") -> Analysis:
    """The ``Analysis`` for these groups.

    Each group's values follow entry order; blanks, notes and unreadable entries become NaN (the
    statistics drop and count them). Censored readings with one common limit become one stand-in
    value below every measured reading (see ``rankwise.readings.censored``), with a note saying so;
    mixed limits raise ``MixedLimitsError`` unless ``mixed_limits`` (the sheet's setting) is
    "below-highest", which treats them all as below the highest limit. The notes also list the entries not used, by row.
    For the paired question every group is padded with NaN to the longest one, so that readings
    pair up by row and a missing partner shows as a blank in its row.
    ``decimal`` is the sheet's decimal setting; the analysis writes numbers for people with that
    mark, or with "auto" the mark the readings were typed with (see ``typed_decimal_mark``).
    """
    question = Question(question)
    censoring = censoring_for([(column.name, column.cells) for column in columns], mixed_limits)
    length = max((len(column.cells) for column in columns), default=0) if question is Question.PAIRED else 0
    notes: list[str] = []
    groups = []
    for column in columns:
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
                name=column.name, values=tuple(values), unit=column.unit, lsl=column.lsl, usl=column.usl,
                nominal=column.nominal, decimals=decimals,
            )
        )
        skipped = [(row, cell.text.strip()) for row, cell in enumerate(column.cells) if cell.is_skipped]
        if skipped:
            listed = ", ".join(f"row {row + 1} '{text[:30]}'" for row, text in skipped[:10])
            more = f" and {len(skipped) - 10} more" if len(skipped) > 10 else ""
            notes.append(f"{column.name}: {len(skipped)} entr{'ies' if len(skipped) != 1 else 'y'} not used as readings: {listed}{more}.")
    if censoring is not None:
        notes.insert(0, censoring.note)
    mark = decimal if decimal in (".", ",") else typed_decimal_mark(columns)
    return Analysis(question=question, groups=tuple(groups), settings=settings or Settings(), notes=tuple(notes),
                    decimal_mark=mark)


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
