"""A large file read in a child process gives the window the same readings and sheet as reading it
in the window's own process; a child that crashes, is killed or answers nonsense becomes a plain
message; the file is never changed."""

from __future__ import annotations

import hashlib
import pickle
import sys
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from rankwise.readings import read_aside
from rankwise.readings.cell_codes import CellCodes
from rankwise.readings.cells import EMPTY_CELL, Cell, CellKind
from rankwise.readings.open import open_readings
from rankwise.readings.parse import parse_reading
from rankwise.readings.sheet import GroupColumn

DEMO_FILES = Path(__file__).resolve().parents[2] / "demo_files"
READINGS_FILES = ["two_wheels_roughness.csv", "long_export.csv", "coating_before_after_cure.csv",
                  "gauge_sheet_bore_diameter.xlsx", "push_out_force_three_presses.xlsx"]


def _digest(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


@pytest.mark.parametrize("name", READINGS_FILES)
def test_the_child_gives_what_reading_here_gives(name):
    path = DEMO_FILES / name
    before = _digest(path)
    outcome = read_aside.ChildReading(path).outcome()
    assert outcome.kind == "opened", outcome.message
    here = open_readings(path)
    expected_sheet = read_aside.sheet_of(here)
    got, sheet = outcome.reading_set, outcome.sheet
    assert got.source == here.source and got.pairing == here.pairing and got.found == here.found
    assert got.suggested_question is here.suggested_question and got.notes == here.notes
    for mine, theirs in zip(got.groups, here.groups, strict=True):
        np.testing.assert_array_equal(mine.values, theirs.values)
        assert ((mine.name, mine.skipped, mine.unit, mine.lsl, mine.usl, mine.nominal, mine.part_ids, mine.cell_part_ids)
                == (theirs.name, theirs.skipped, theirs.unit, theirs.lsl, theirs.usl, theirs.nominal, theirs.part_ids,
                    theirs.cell_part_ids))
        assert mine.cells == theirs.cells and mine.decimals == theirs.decimals and mine.file_rows == theirs.file_rows
    assert sheet.snapshot() == expected_sheet.snapshot() and not sheet.is_modified
    for index, group in enumerate(sheet.groups):
        assert group._kept_arrays() is not None  # the arrays came along and mirror the cells
        assert sheet.flags(index) == expected_sheet.flags(index) and sheet.counts(index) == expected_sheet.counts(index)
    assert _digest(path) == before


def test_a_file_of_many_characteristics_is_named_and_not_read():
    outcome = read_aside.ChildReading(DEMO_FILES / "housing_two_dies.csv").outcome()
    assert outcome.kind == "many characteristics" and outcome.reading_set is None


def test_a_file_that_cannot_be_read_gives_the_readers_own_words(tmp_path):
    path = tmp_path / "binary.csv"
    path.write_bytes(bytes(range(256)) * 40)
    outcome = read_aside.ChildReading(path).outcome()
    with pytest.raises(Exception) as raised:
        open_readings(path)
    assert outcome.kind == "failed" and outcome.message == str(raised.value)


@pytest.mark.parametrize("command, words", [
    ("import os; os.abort()", "signal SIGABRT"),
    ("import sys; sys.exit(3)", "exit code 3"),
    ("import sys; sys.stdout.buffer.write(b'not a pickle')", "exit code 0"),
])
def test_a_child_that_ends_without_an_outcome_is_a_plain_message(monkeypatch, command, words):
    monkeypatch.setattr(read_aside, "child_command", lambda *args: [sys.executable, "-c", command])
    outcome = read_aside.ChildReading(DEMO_FILES / "two_wheels_roughness.csv").outcome()
    assert outcome.kind == "failed"
    assert words in outcome.message and "The file is unchanged" in outcome.message and "Traceback" not in outcome.message


def test_cancel_stops_the_child_and_nothing_is_given(monkeypatch):
    monkeypatch.setattr(read_aside, "child_command", lambda *args: [sys.executable, "-c", "import time; time.sleep(600)"])
    reading = read_aside.ChildReading(DEMO_FILES / "two_wheels_roughness.csv")
    reading.cancel()
    outcome = reading.outcome()  # returns at once: the child was killed
    assert reading.cancelled and outcome.kind == "failed"


def _cells():
    typed = st.sampled_from(["0,42", "0,43", "12.5", "n/a", "<0.1", "", "x"])
    return st.lists(typed.map(lambda text: parse_reading(text, decimal=",") if text else EMPTY_CELL), max_size=200)


@settings(max_examples=60, deadline=None)
@given(_cells(), st.data())
def test_cell_codes_give_back_the_same_cells_the_same_objects(cells, data):
    shared = [data.draw(st.sampled_from(cells)) if cells and data.draw(st.booleans()) else cell for cell in cells]
    back = pickle.loads(pickle.dumps(CellCodes(shared))).cells()
    assert back == shared
    assert len({id(cell) for cell in back}) == len({id(cell) for cell in shared})  # equal entries still share one object


def test_a_pickled_group_keeps_its_arrays_in_step_with_its_cells():
    group = GroupColumn("A", unit="kN", cells=[Cell("1,5", CellKind.NUMBER, value=1.5, decimals=1), EMPTY_CELL,
                                               Cell("2,25", CellKind.NUMBER, value=2.25, decimals=2)])
    arrays = group.arrays()
    back = pickle.loads(pickle.dumps(group))
    assert back == group and back._kept_arrays() is not None
    np.testing.assert_array_equal(back.arrays().values, arrays.values)
    np.testing.assert_array_equal(back.arrays().decimals, arrays.decimals)


def test_the_child_writes_the_sheets_piece_lines_where_asked(tmp_path):
    from rankwise.readings.entry_journal import piece_lines, sheet_header

    pieces = tmp_path / "pieces.tmp"
    outcome = read_aside.ChildReading(DEMO_FILES / "long_export.csv", pieces).outcome()
    assert outcome.pieces.path == pieces and outcome.pieces.header == sheet_header(outcome.sheet.snapshot())
    assert pieces.read_text(encoding="utf-8") == "".join(piece_lines(outcome.sheet.snapshot()))


def test_piece_lines_that_cannot_be_written_leave_the_reading_as_it_is(tmp_path):
    outcome = read_aside.ChildReading(DEMO_FILES / "long_export.csv", tmp_path / "no-such-folder" / "pieces.tmp").outcome()
    assert outcome.kind == "opened" and outcome.pieces is None
