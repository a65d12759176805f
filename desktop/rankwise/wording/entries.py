"""How each group's entries were counted, in words: the same count and sentences on screen, in the
workbook and on paper (from ``Analysis.entries``, see ``rankwise.readings.entry_counts``)."""

from __future__ import annotations

from collections.abc import Iterator

from rankwise.stats.analysis import Analysis, GroupEntries, Question
from rankwise.stats.results import GroupSummary

MAX_LISTED = 10
"""Entries listed one by one per group and kind; the rest are counted (the readings sheet lists all)."""

READINGS_USED = "Readings used"
NOT_USED = "Entries not used"
CENSORED = "Below a detection limit"
EMPTY_BETWEEN = "Empty cells between entries"
"""Labels of the counts, shared by the key numbers and the workbook's readings sheet."""

READINGS_USED_TIP = ("How many readings of {name} went into the test, including readings below a "
                     "detection limit; notes, unreadable entries and empty cells are not counted.")
NOT_USED_TIP = "Notes and unreadable entries of {name}: kept as typed, listed in the notes, not used."
CENSORED_TIP = ("Readings of {name} below a detection limit: used, and ranked below every measured "
                "reading.")
EMPTY_BETWEEN_TIP = ("Empty cells of {name} between its first and last entry; empty cells above the "
                     "first or below the last are not counted.")
NO_READING_TIP = "Entries of {name} that held no reading and were left out."


def entries_of(analysis: Analysis, name: str) -> GroupEntries | None:
    """The count of group ``name``'s entries, or None when the analysis was built without a sheet."""
    return next((entries for entries in analysis.entries if entries.name == name), None)


def count_sentence(entries: GroupEntries, question: Question) -> str:
    """ "A: 11 readings used (2 below a detection limit); 1 entry not used; 2 empty cells between
    entries passed over." (for the same parts, "readings": the pairs decide which are used)."""
    used = "" if question is Question.PAIRED else " used"
    parts = [f"{_plural(entries.readings, 'reading')}{used}"
             + (f" ({entries.censored} below a detection limit)" if entries.censored else "")]
    if entries.not_used:
        parts.append(f"{_plural(len(entries.not_used), 'entry', 'entries')} not used")
    if entries.empty_between:
        parts.append(f"{_plural(entries.empty_between, 'empty cell')} between entries passed over")
    return f"{entries.name}: " + "; ".join(parts) + "."


def count_phrase(readings: int, censored: int, not_used: int, *, brief: bool = False) -> str:
    """A group's count (as in ``GroupEntries``: readings including those below a detection limit,
    those below it, entries not used): "7 readings used (1 below a detection limit), 1 entry not used"
    for tooltips; ``brief`` for the status line: "7 readings (1 below a limit), 1 not used"."""
    text = f"{_plural(readings, 'reading')}{'' if brief else ' used'}"
    if censored:
        text += f" ({censored} below {'a limit' if brief else 'a detection limit'})"
    if not_used:
        text += (f", {not_used} not used" if brief
                 else f", {_plural(not_used, 'entry', 'entries')} not used")
    return text


def entry_notes(analysis: Analysis) -> tuple[str, ...]:
    """Per group with anything beyond plain readings: its count, then each entry not used and each
    flagged reading, once, with its row and text."""
    notes: list[str] = []
    for entries in analysis.entries:
        if entries.not_used or entries.censored or entries.empty_between:
            notes.append(count_sentence(entries, analysis.question))
        notes.extend(_listed(entries.name, entries.not_used, "entries not used"))
        notes.extend(_listed(entries.name, entries.flagged, "flagged readings"))
    return tuple(notes)


def _listed(name: str, listed, kind: str) -> Iterator[str]:
    for entry in listed[:MAX_LISTED]:
        yield f"{name}, row {entry.row}: {entry.remark}"
    if len(listed) > MAX_LISTED:
        yield f"{name}: {len(listed) - MAX_LISTED} more {kind}, listed in the readings sheet of the record."


def dropped_notes(analysis: Analysis, summaries: tuple[GroupSummary, ...]) -> tuple[str, ...]:
    """For an analysis built without a sheet: how many entries of each group held no reading."""
    if analysis.entries:
        return ()
    return tuple(f"{summary.name}: {_plural(summary.n_dropped, 'entry', 'entries')} without a reading "
                 f"{'was' if summary.n_dropped == 1 else 'were'} left out."
                 for summary in summaries if summary.n_dropped)


def count_cell(summary: GroupSummary, analysis: Analysis) -> str:
    """A group's count in one short cell: "11", "11 (1 not used)", "12 (2 below a limit; 1 not used)"."""
    entries = entries_of(analysis, summary.name)
    extras = []
    if entries is None:
        if summary.n_dropped:
            extras.append(f"{summary.n_dropped} without a reading")
    else:
        if entries.censored:
            extras.append(f"{entries.censored} below a limit")
        if entries.not_used:
            extras.append(f"{len(entries.not_used)} not used")
    return f"{summary.n}" + (f" ({'; '.join(extras)})" if extras else "")


def _plural(count: int, one: str, many: str | None = None) -> str:
    return f"{count} {one if count == 1 else (many or one + 's')}"
