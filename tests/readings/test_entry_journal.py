"""The entry journal: a full copy and the changes appended after it replay into the sheet as it
stood, after any edits, undos and redos, and a journal cut short anywhere gives back the sheet as
it stood after its last complete change (the state a kill leaves). Consistency checks of our own
format: the expected values are the sheet's own snapshots (common practice, no source)."""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from rankwise.readings import ReadingSheet, ReadingsError
from rankwise.readings.entry_journal import (
    PIECE_CELLS,
    Piece,
    base_lines,
    change_lines,
    change_record,
    question_line,
    read_journal,
)

TEXTS = st.sampled_from(["0,42", "0.43", "", "scrap", "<0,05", "12..5", "1,010", "7", "0,5 µm", "n/a"])
EDITS = st.one_of(
    st.tuples(st.just("type"), st.integers(0, 2), st.integers(0, 9), TEXTS),
    st.tuples(st.just("paste"), st.integers(0, 2), st.integers(0, 9),
              st.lists(st.lists(TEXTS, min_size=1, max_size=3), min_size=1, max_size=4)),
    st.tuples(st.just("insert"), st.integers(0, 9), st.integers(1, 3)),
    st.tuples(st.just("delete"), st.integers(0, 9), st.integers(1, 3)),
    st.tuples(st.just("clear"), st.integers(0, 2), st.integers(0, 9)),
    st.tuples(st.just("undo")),
    st.tuples(st.just("redo")),
    st.tuples(st.just("group")),
    st.tuples(st.just("decimal"), st.sampled_from(["auto", ".", ","])),
)


class Journal:
    """Follows a sheet as the recovery keeper does: a full copy first, then each change's lines."""

    def __init__(self, sheet: ReadingSheet) -> None:
        self.sheet = sheet
        self.lines = list(base_lines(sheet.snapshot(), {"option": "differ"}, "gauge.csv"))
        self.states = [(len(self.lines), sheet.snapshot())]
        sheet.subscribe(self.on_change)

    def on_change(self, change) -> None:
        record = change_record([group.cells for group in self.sheet.groups], change.kind, change.first_group,
                               change.last_group, change.first_row, change.last_row)
        if record is None:  # groups or settings changed: the keeper starts over with a full copy
            self.lines = list(base_lines(self.sheet.snapshot(), {"option": "differ"}, "gauge.csv"))
            self.states = []
        else:
            self.lines += list(change_lines(record))
        self.states.append((len(self.lines), self.sheet.snapshot()))


def apply(sheet: ReadingSheet, edit: tuple) -> None:
    kind, *args = edit
    columns = len(sheet.groups)
    if kind == "type" and args[0] < columns:
        sheet.set_text(args[0], args[1], args[2])
    elif kind == "paste" and args[0] <= columns:
        sheet.paste_block(args[0], args[1], args[2])
    elif kind == "insert":
        sheet.insert_rows(*args)
    elif kind == "delete":
        sheet.delete_rows(*args)
    elif kind == "clear" and args[0] < columns:
        sheet.clear([(args[0], args[1])])
    elif kind == "undo":
        sheet.undo()
    elif kind == "redo":
        sheet.redo()
    elif kind == "group":
        sheet.add_group()
    elif kind == "decimal":
        sheet.set_decimal(args[0])


def started_sheet() -> ReadingSheet:
    sheet = ReadingSheet(decimal="auto")
    sheet.add_group("Wheel A")
    sheet.add_group("Wheel B")
    sheet.set_group_details(1, unit="µm", lsl=0.1, usl=0.9)
    sheet.paste_block(0, 0, [["0,41", "0,47"], ["scrap", "0,52"]])
    return sheet


@settings(max_examples=150)
@given(st.lists(EDITS, max_size=25))
def test_the_journal_replays_into_the_sheet_as_it_stands(edits):
    sheet = started_sheet()
    journal = Journal(sheet)
    for edit in edits:
        apply(sheet, edit)
    entry = read_journal(journal.lines)
    assert entry.snapshot == sheet.snapshot()
    assert entry.source == "gauge.csv" and entry.question == {"option": "differ"}


@settings(max_examples=60)
@given(st.lists(EDITS, min_size=1, max_size=15), st.data())
def test_a_journal_cut_anywhere_gives_back_the_last_complete_change(edits, data):
    sheet = started_sheet()
    journal = Journal(sheet)
    for edit in edits:
        apply(sheet, edit)
    text = "".join(journal.lines)
    first_complete = journal.states[0][0]
    base_length = len("".join(journal.lines[:first_complete]))
    cut = data.draw(st.integers(base_length, len(text)), label="cut at character")
    entry = read_journal(text[:cut].splitlines(keepends=True))
    complete = [state for count, state in journal.states if len("".join(journal.lines[:count])) <= cut]
    assert entry.snapshot == complete[-1]


def test_a_question_changed_after_the_copy_comes_back():
    sheet = started_sheet()
    journal = Journal(sheet)
    sheet.set_text(0, 2, "0,44")
    journal.lines.append(question_line({"option": "b-higher"}))
    entry = read_journal(journal.lines)
    assert entry.question == {"option": "b-higher"} and entry.snapshot == sheet.snapshot()
    assert entry.changes == 2 and entry.readings_typed == 5


def test_a_long_column_is_written_in_pieces_and_comes_back_whole():
    sheet = ReadingSheet(decimal=".")
    sheet.add_group("A")
    sheet.paste_block(0, 0, [[f"{i / 1000:.3f}"] for i in range(2 * PIECE_CELLS + 5)])
    lines = list(base_lines(sheet.snapshot(), {}, ""))
    assert len(lines) == 1 + 3
    assert read_journal(lines).snapshot == sheet.snapshot()


def test_a_damaged_or_foreign_header_is_refused_in_words():
    with pytest.raises(ReadingsError, match="damaged"):
        read_journal(['{"format": "rankwise-entry-journal-1", "sheet": 3}\n'])
    with pytest.raises(ReadingsError, match="cannot read"):
        read_journal(['{"format": "some-later-form"}\n'])
    with pytest.raises(ReadingsError, match="damaged"):
        read_journal([])


def test_a_last_line_without_its_ending_is_left_out():
    """A kill can cut a line right before its line ending: the change is not taken as complete."""
    sheet = started_sheet()
    journal = Journal(sheet)
    before = sheet.snapshot()
    sheet.delete_rows(0)
    journal.lines[-1] = journal.lines[-1].rstrip("\n")
    assert read_journal(journal.lines).snapshot == before


@settings(max_examples=60, deadline=None)
@given(columns=st.lists(st.lists(st.one_of(TEXTS, st.text(max_size=6)), max_size=12), min_size=1, max_size=3))
def test_pieces_are_written_as_the_json_module_writes_them(columns):
    """Each distinct cell is encoded once and reused; the lines are those ``json.dumps`` writes for the
    cells one by one (the reference: the standard library's encoder, same separators)."""
    import json

    from rankwise.readings.entry_journal import _piece_line
    from rankwise.readings.snapshot import cell_to_dict

    sheet = ReadingSheet(decimal="auto")
    for number, texts in enumerate(columns):
        sheet.add_group()
        sheet.paste_block(number, 0, [[text] for text in texts])
    snapshot = sheet.snapshot()
    lines = list(base_lines(snapshot, {}, ""))[1:]
    expected = [json.dumps({"piece": [g, start, [cell_to_dict(cell) for cell in group.cells[start:start + PIECE_CELLS]]]},
                           ensure_ascii=False, separators=(",", ":")) + "\n"
                for g, group in enumerate(snapshot.groups) for start in range(0, len(group.cells), PIECE_CELLS)]
    assert lines == expected
    assert _piece_line(Piece(0, 3, ()), {}) == '{"piece":[0,3,[]]}\n'
