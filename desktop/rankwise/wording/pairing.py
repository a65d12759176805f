"""Sentences about which question the readings fit: same parts paired by identifier, groups too small.

Written once here; the open dialog, the window's status line, the verdict's notes, the record and
the command line all use them.
"""

from __future__ import annotations

from collections.abc import Sequence

_LISTED = 10
"""Identifiers named in a note before the rest are counted."""


def _listed(items: Sequence[str]) -> str:
    shown = ", ".join(items[:_LISTED])
    return shown + (f" and {len(items) - _LISTED} more" if len(items) > _LISTED else "")


def same_parts_found(count: int, noun: str, stage_a: str, stage_b: str, part_column: str) -> str:
    """What the open dialog says it found, e.g. "14 springs measured in both 'Before' and 'After'..."."""
    return (f"{count} {noun} measured twice, in '{stage_a}' and in '{stage_b}'; "
            f"paired by the column '{part_column}'.")


def unpaired_parts(unpaired: Sequence[tuple[str, str]], noun: str) -> str:
    """Parts with a reading in only one of the two stages: named, and left out."""
    listed = _listed([f"{part} (only '{stage}')" for part, stage in unpaired])
    return (f"{len(unpaired)} of the {noun} have a reading in one stage only and are left out of the "
            f"same-parts comparison: {listed}.")


def repeated_part(part: str, stage: str, rows: Sequence[int], part_column: str) -> str:
    """An identifier that appears more than once in one stage: the readings cannot be paired."""
    where = " and ".join(str(row) for row in rows[:3])
    return (f"The part '{part}' appears more than once in '{stage}' (rows {where}) in the column "
            f"'{part_column}'; each part must appear once per stage to pair the readings, so they "
            "open as separate groups. Correct the file, or compare them as separate groups.")


def paired_by_part(count: int, part_column: str) -> str:
    """The verdict's note on how readings were paired."""
    return (f"Readings paired by the part identifier in the column '{part_column}' ({count} parts with "
            "a reading at both stages), never by their order in the file.")


def paired_by_row() -> str:
    """The verdict's note on pairing in a typed sheet: one row is one part."""
    return "Readings paired by row: each row of the sheet is taken as one part measured twice."


def same_parts_as_separate_groups(part_column: str) -> str:
    """The caution when readings of the same parts are compared as two independent groups."""
    return (f"Caution: these readings are the same parts measured twice (identified in the column "
            f"'{part_column}'), but they were compared as two separate groups. The test assumes "
            "different parts in each group, so it ignores the pairing and its p-value and interval "
            "are not those of the same-parts question.")


def question_suggested(question_title: str, reason: str) -> str:
    """The status line after opening a file changed the question."""
    return f"The question was set to '{question_title}': {reason}"


def suggestion_reason(question: str, group_count: int, pairing_words: str = "") -> str:
    """Why an opened file suggests its question (``question`` is a ``Question`` value)."""
    if question == "paired":
        return pairing_words or "the file holds the same parts measured twice."
    if question == "several":
        return f"the file holds {group_count} groups."
    return f"the file holds {group_count} group{'s' if group_count != 1 else ''} of different parts."


CHOSEN_WHEN_OPENING = "as chosen when the file was opened."
"""Why the question changed when the technician picked another one in the open dialog."""


def small_group(name: str, count: int) -> str:
    """Several groups: a group with fewer than two readings."""
    readings = "no reading" if count == 0 else "a single reading"
    return (f"Warning: the group '{name}' has {readings}; with fewer than two readings a group says "
            "little about its spread, so read its comparisons with care.")


def empty_group_left_out(name: str) -> str:
    """Several groups: an empty group is left out."""
    return f"The group '{name}' has no readings and was left out of the comparison."


def rows_do_not_pair(name_a: str, rows_a: int, name_b: str, rows_b: int) -> str:
    """Why the same-parts question is not offered for a typed sheet."""
    return (f"The same-parts question pairs the readings row by row, one row per part, but '{name_a}' "
            f"has {rows_a} rows and '{name_b}' has {rows_b} rows; give both groups one row per part "
            "(type a note such as 'n/a' where a reading is missing).")


def rows_are_not_parts(reason: str) -> str:
    """Why the same-parts question is not offered for an opened file."""
    return f"The same-parts question is not offered for these readings: {reason}"


STACKED_WITHOUT_PARTS = ("the file lists readings under group labels without a part identifier, so its "
                         "rows cannot be matched part by part.")
"""Why readings from a stacked export without part identifiers cannot be paired."""
