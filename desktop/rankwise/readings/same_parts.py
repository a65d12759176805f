"""Recognising the same parts measured twice in an opened file, and the question the readings suggest.

Two groups whose cells carry part identifiers (a part column beside two reading columns, or a
part column beside a stage column in a stacked export) are the same parts measured twice when
at least two identifiers appear in both. They are matched by identifier, never by position: one
sheet row per part, in order of first appearance in the file, a blank where a part has no cell
at one stage.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from rankwise.readings.cells import EMPTY_CELL, Cell, CellKind
from rankwise.readings.layout import part_noun
from rankwise.readings.reading_set import PartPairing, ReadingGroup, ReadingSet
from rankwise.stats.analysis import Question
from rankwise.wording.pairing import STACKED_WITHOUT_PARTS, repeated_part, same_parts_found

MIN_SHARED_PARTS = 2
"""Identifiers that must appear at both stages before two groups are taken as the same parts."""


@dataclass(frozen=True)
class Suggestion:
    """The question the readings fit, and one sentence on what was found (for the open dialog)."""

    question: Question
    found: str = ""


def pair_by_part(groups: Sequence[ReadingGroup], part_column: str, first_row_number: int = 1
                 ) -> tuple[PartPairing | None, str]:
    """The pairing of two groups by part identifier, or None; and a plain message when an
    identifier repeats within one stage (then the readings cannot be paired), else ""."""
    if len(groups) != 2 or any(g.cell_part_ids is None for g in groups):
        return None, ""
    present = [_parts_present(group) for group in groups]
    shared = set(present[0]) & set(present[1])
    if len(shared) < MIN_SHARED_PARTS:
        return None, ""
    for group, parts in zip(groups, present):
        for part, positions in parts.items():
            if len(positions) > 1:
                rows = [group.file_rows[k] if k < len(group.file_rows) else k + first_row_number for k in positions]
                return None, repeated_part(part, group.name, rows, part_column)
    order = _first_appearance(groups, present)
    unpaired = tuple((part, groups[0].name if part in present[0] else groups[1].name)
                     for part in order if part not in shared)
    return PartPairing(part_column, part_noun(part_column), order, len(shared), unpaired), ""


def _parts_present(group: ReadingGroup) -> dict[str, list[int]]:
    """Each identifier with a non-blank cell in the group, and the positions of those cells."""
    parts: dict[str, list[int]] = {}
    for position, (part, cell) in enumerate(zip(group.cell_part_ids or (), group.cells)):
        if cell.kind is not CellKind.EMPTY:
            parts.setdefault(part or f"(no identifier, row {_row(group, position)})", []).append(position)
    return parts


def _row(group: ReadingGroup, position: int) -> int:
    return group.file_rows[position] if position < len(group.file_rows) else position + 1


def _first_appearance(groups: Sequence[ReadingGroup], present: list[dict[str, list[int]]]) -> tuple[str, ...]:
    """Every identifier present, ordered by the file row where it first appears."""
    first: dict[str, int] = {}
    for group, parts in zip(groups, present):
        for part, positions in parts.items():
            row = _row(group, positions[0])
            first[part] = min(first.get(part, row), row)
    return tuple(sorted(first, key=first.__getitem__))


def suggest(groups: Sequence[ReadingGroup], pairing: PartPairing | None) -> Suggestion:
    """Same parts when they pair by identifier; several groups for three or more; else two groups."""
    if pairing is not None:
        found = same_parts_found(pairing.paired, pairing.noun, groups[0].name, groups[1].name, pairing.part_column)
        return Suggestion(Question.PAIRED, found)
    if len(groups) > 2:
        return Suggestion(Question.SEVERAL)
    return Suggestion(Question.TWO_GROUPS)


def rows_by_part(groups: Sequence[ReadingGroup], parts: Sequence[str]) -> list[list[Cell]]:
    """Each group's cells rearranged to one row per part (in ``parts`` order), a blank where a part has none."""
    columns = []
    for group in groups:
        by_part = {part: group.cells[positions[0]] for part, positions in _parts_present(group).items()}
        columns.append([by_part.get(part, EMPTY_CELL) for part in parts])
    return columns


def rows_not_parts(reading_set: ReadingSet) -> str:
    """Why the rows of an opened file that was not paired by part cannot be taken as parts, or ""."""
    if reading_set.pairing_problem:
        return reading_set.pairing_problem
    if reading_set.source.layout == "stacked":
        return STACKED_WITHOUT_PARTS
    return ""
