"""The count of a group's entries in words: the same sentences on screen, in the workbook and on paper.

Counts are made up of the entries named in each test (counted by hand; common practice, no source).
"""

from rankwise.stats.analysis import Analysis, Entry, GroupEntries, GroupReadings, Question
from rankwise.stats.service import run
from rankwise.wording import describe, key_numbers
from rankwise.wording.entries import MAX_LISTED, count_sentence, entry_notes


def test_an_analysis_built_without_a_sheet_counts_entries_without_a_reading_and_calls_none_a_blank():
    nan = float("nan")
    analysis = Analysis(Question.TWO_GROUPS, (GroupReadings("A", (1.0, nan, 2.0, 3.0)),
                                              GroupReadings("B", (2.0, 4.0, 5.0))))
    result = run(analysis)
    numbers = {n.key: n for n in key_numbers(result, analysis)}
    assert numbers["n_dropped_a"].label == "Entries without a reading, A" and numbers["n_dropped_a"].value == 1
    assert "n_dropped_b" not in numbers
    notes = describe(result, analysis).assumption_notes
    assert notes.count("A: 1 entry without a reading was left out.") == 1
    assert not any("blank" in note.lower() for note in notes)


def test_each_entry_not_used_is_listed_once_and_long_lists_are_counted():
    entries = GroupEntries("A", readings=12, censored=2,
                           not_used=tuple(Entry(row, "n/a", "Text note 'n/a', not a reading.") for row in range(1, 14)),
                           empty_between=1)
    assert count_sentence(entries, Question.TWO_GROUPS) == (
        "A: 12 readings used (2 below a detection limit); 13 entries not used; 1 empty cell between entries passed over.")
    assert count_sentence(entries, Question.PAIRED).startswith("A: 12 readings (2 below")
    notes = entry_notes(Analysis(Question.TWO_GROUPS, (), entries=(entries,)))
    listed = [note for note in notes if note.startswith("A, row ")]
    assert len(listed) == MAX_LISTED and listed[0] == "A, row 1: Text note 'n/a', not a reading."
    assert notes[-1] == "A: 3 more entries not used, listed in the readings sheet of the record."
