"""The readings sheet: edits, one undo step per edit, change notices, flags and counts."""

import dataclasses
import json

import pytest

from rankwise.readings import CellKind, ReadingSheet, ReadingsError, SheetChange, SheetSnapshot


def make_sheet(*columns, names=None, decimal=","):
    """A sheet with the given columns of texts typed in, and a clean history."""
    sheet = ReadingSheet(decimal=decimal)
    for number, texts in enumerate(columns):
        sheet.add_group(names[number] if names else None)
        for row, text in enumerate(texts):
            sheet.set_text(number, row, text)
    return ReadingSheet.from_snapshot(sheet.snapshot())


def texts(sheet, group):
    return [sheet.cell(group, row).text for row in range(sheet.row_count)]


def test_typing_parses_and_keeps_the_text():
    sheet = make_sheet([], names=["Wheel A"])
    cell = sheet.set_text(0, 2, "0,42")
    assert cell.value == pytest.approx(0.42) and cell.is_reading and not cell.is_skipped
    assert sheet.row_count == 3
    assert sheet.cell(0, 0).kind is CellKind.EMPTY
    assert sheet.cell(0, 99).kind is CellKind.EMPTY
    assert sheet.undo_label == "Undo typing in Wheel A row 3"


def test_every_edit_undoes_and_redoes_as_one_step():
    sheet = make_sheet(["0,41", "0,42", "0,43"], ["0,50", "0,51"], names=["A", "B"])
    before = sheet.snapshot()
    edits = [
        lambda: sheet.set_text(1, 4, "0,55"),
        lambda: sheet.paste_block(1, 1, [["1", "2", "3"], ["4", "5", "6"]]),
        lambda: sheet.clear([(0, 0), (1, 1), (0, 2)]),
        lambda: sheet.insert_rows(1, 2),
        lambda: sheet.delete_rows(0, 2),
        lambda: sheet.add_group("C", 0),
        lambda: sheet.rename_group(0, "Wheel A"),
        lambda: sheet.remove_group(1),
        lambda: sheet.move_group(0, 1),
        lambda: sheet.set_group_details(0, unit="µm", lsl=0.1, usl=0.9, nominal=0.5),
        lambda: sheet.set_decimal("."),
    ]
    for edit in edits:
        edit()
        changed = sheet.snapshot()
        assert changed != before, edit
        sheet.undo()
        assert sheet.snapshot() == before
        sheet.redo()
        assert sheet.snapshot() == changed
        sheet.undo()
        assert not sheet.can_undo and sheet.can_redo


def test_a_chain_of_edits_unwinds_in_order():
    sheet = make_sheet(["1", "2"], names=["A"])
    states = [sheet.snapshot()]
    sheet.set_text(0, 0, "7"); states.append(sheet.snapshot())
    sheet.insert_rows(0); states.append(sheet.snapshot())
    sheet.paste_block(0, 0, [["3", "4"]]); states.append(sheet.snapshot())
    for state in reversed(states[:-1]):
        sheet.undo()
        assert sheet.snapshot() == state
    assert sheet.redo_label == "Redo typing in A row 1"
    for state in states[1:]:
        sheet.redo()
        assert sheet.snapshot() == state


def test_paste_extends_rows_and_groups():
    sheet = make_sheet(["1"], names=["A"])
    sheet.paste_block(0, 1, [["2", "20"], ["3", "30", "300"]])
    assert sheet.group_names == ["A", "B", "C"]  # new groups continue the naming
    assert texts(sheet, 0) == ["1", "2", "3"]
    assert texts(sheet, 2) == ["", "", "300"]
    assert sheet.undo_label == "Undo pasting 5 cells into A"


def test_edits_that_change_nothing_leave_no_undo_step():
    sheet = make_sheet(["1", "2"], names=["A"])
    sheet.paste_block(0, 0, [["1"], ["2"]])
    sheet.set_text(0, 1, "2")
    sheet.clear([(0, 5)])
    sheet.insert_rows(7)
    sheet.rename_group(0, "A")
    sheet.move_group(0, 0)
    sheet.set_group_details(0, lsl=None)
    sheet.set_decimal(sheet.decimal)
    assert not sheet.can_undo and not sheet.is_modified


def test_columns_never_end_in_blanks():
    sheet = make_sheet(["1", "2", "3"], ["4"], names=["A", "B"])
    sheet.clear([(0, 2), (0, 1)])
    assert sheet.row_count == 1
    assert sheet.counts(0).blanks == 0


def test_insert_and_delete_rows_move_every_group():
    sheet = make_sheet(["1", "2", "3"], ["4", "5"], names=["A", "B"])
    sheet.insert_rows(1, 2)
    assert texts(sheet, 0) == ["1", "", "", "2", "3"]
    assert texts(sheet, 1) == ["4", "", "", "5", ""]
    sheet.delete_rows(0, 3)
    assert texts(sheet, 0) == ["2", "3"]
    assert texts(sheet, 1) == ["5", ""]


def test_invalid_group_details_are_refused_and_change_nothing():
    sheet = make_sheet(["1"], ["2"], names=["A", "B"])
    before = sheet.snapshot()
    with pytest.raises(ReadingsError, match="already a group called 'A'"):
        sheet.rename_group(1, "A")
    with pytest.raises(ReadingsError, match="needs a name"):
        sheet.rename_group(1, "  ")
    with pytest.raises(ReadingsError, match="above the upper limit"):
        sheet.set_group_details(0, lsl=5, usl=1)
    with pytest.raises(ReadingsError, match="not a number"):
        sheet.set_group_details(0, lsl="abc")
    with pytest.raises(ReadingsError, match="already a group"):
        sheet.add_group("B")
    assert sheet.snapshot() == before
    assert not sheet.can_undo


def test_wrong_positions_raise_value_error_naming_them():
    sheet = make_sheet(["1"], names=["A"])
    with pytest.raises(ValueError, match="group"):
        sheet.set_text(3, 0, "1")
    with pytest.raises(ValueError, match="row"):
        sheet.set_text(0, -1, "1")
    with pytest.raises(ValueError, match="count"):
        sheet.insert_rows(0, 0)
    with pytest.raises(ValueError, match="decimal"):
        sheet.set_decimal(";")


def test_a_new_unit_rereads_the_cells():
    sheet = make_sheet(["0,42 µm", "0,43"], names=["A"])
    assert sheet.cell(0, 0).kind is CellKind.INVALID
    sheet.set_group_details(0, unit="µm")
    assert sheet.cell(0, 0).value == pytest.approx(0.42)
    assert sheet.undo_label == "Undo changing the details of A"


def test_switching_the_decimal_mark_rereads_every_cell():
    sheet = make_sheet(["1,5", "2.5"], names=["A"], decimal=",")
    assert sheet.cell(0, 0).value == 1.5
    assert sheet.cell(0, 1).kind is CellKind.INVALID
    sheet.set_decimal(".")
    assert sheet.cell(0, 0).kind is CellKind.INVALID
    assert sheet.cell(0, 1).value == 2.5


def test_change_notices_come_before_and_after_each_change():
    sheet = make_sheet(["1", "2"], ["3"], names=["A", "B"])
    after, both = [], []
    sheet.subscribe(after.append)
    sheet.subscribe(both.append, before=True)
    sheet.insert_rows(1, 2)
    assert after == [SheetChange("rows-inserted", first_row=1, last_row=2)]
    assert both == [SheetChange("rows-inserted", first_row=1, last_row=2, before=True), after[0]]
    sheet.undo()
    assert after[-1] == SheetChange("rows-removed", first_row=1, last_row=2)
    sheet.set_text(1, 5, "9")
    assert after[-1] == SheetChange("cells", 1, 1, 5, 5)
    sheet.unsubscribe(after.append)
    sheet.add_group()
    assert after[-1].kind == "cells"
    assert both[-1] == SheetChange("groups", 2, 2)


def test_modified_follows_saving_and_undo():
    sheet = make_sheet(["1"], names=["A"])
    assert not sheet.is_modified
    sheet.set_text(0, 1, "2")
    assert sheet.is_modified
    sheet.mark_saved()
    assert not sheet.is_modified
    sheet.undo()
    assert sheet.is_modified
    sheet.redo()
    assert not sheet.is_modified


def test_counts_and_skipped_cells():
    sheet = make_sheet(["0,41", "", "scrap", "<0,05", "0,4,2", "0,44"], names=["Wheel A"])
    counts = sheet.counts(0)
    assert (counts.used, counts.skipped, counts.censored, counts.blanks) == (2, 2, 1, 1)
    skipped = sheet.skipped(0)
    assert [(s.row, s.text, s.column) for s in skipped] == [(2, "scrap", "Wheel A"), (4, "0,4,2", "Wheel A")]
    assert all(s.reason for s in skipped)


def test_suspicious_readings_are_flagged_not_changed():
    """A tenfold reading (a slipped decimal point) and readings beyond LSL/USL are flagged."""
    sheet = make_sheet(["0,42", "0,45", "4,4", "0,41", "0,43", "0,44", "0,04"], names=["A"])
    sheet.set_group_details(0, lsl=0.1, usl=1.0)
    flags = sheet.flags(0)
    assert set(flags) == {2, 6}
    assert any("slipped decimal point" in remark for remark in flags[2])
    assert any("above the upper limit" in remark for remark in flags[2])
    assert any("below the lower limit" in remark for remark in flags[6])
    assert sheet.cell(0, 2).value == pytest.approx(4.4)


def test_ordinary_spread_is_not_flagged():
    sheet = make_sheet(["0,22", "0,45", "0,61", "0,31", "0,38", "0,52"], names=["A"])
    assert sheet.flags(0) == {}


def test_snapshot_round_trips_through_json():
    sheet = make_sheet(["0,42 µm", "<0,05", "scrap", "", "1,5"], ["7"], names=["A", "B"])
    sheet.set_group_details(0, unit="µm", lsl=0.1, usl=2.0, nominal=0.5)
    data = json.loads(json.dumps(sheet.snapshot().to_dict()))
    restored = SheetSnapshot.from_dict(data)
    assert restored == sheet.snapshot()
    assert ReadingSheet.from_snapshot(restored).snapshot() == sheet.snapshot()


@pytest.mark.parametrize(
    "damage",
    [
        lambda d: d.pop("groups"),
        lambda d: d.update(format=99),
        lambda d: d["groups"][0]["cells"][0].update(kind="banana"),
        lambda d: d["groups"][0]["cells"][0].pop("value"),
        lambda d: d["groups"][0].update(lsl="x"),
        lambda d: d.update(decimal=";"),
    ],
)
def test_damaged_stored_readings_give_a_plain_error(damage):
    data = make_sheet(["1"], names=["A"]).snapshot().to_dict()
    damage(data)
    with pytest.raises(ReadingsError):
        SheetSnapshot.from_dict(data)


TEXTS = ["0,42", "1,5", "", "scrap", "<0,05", "0,4,2", "12 µm", "7"]


def _edit_strategy():
    from hypothesis import strategies as st

    small = st.integers(0, 4)
    return st.one_of(
        st.tuples(st.just("set_text"), small, small, st.sampled_from(TEXTS)),
        st.tuples(st.just("paste_block"), small, small,
                  st.lists(st.lists(st.sampled_from(TEXTS), min_size=1, max_size=3), min_size=1, max_size=3)),
        st.tuples(st.just("clear"), st.lists(st.tuples(small, small), max_size=4)),
        st.tuples(st.just("insert_rows"), small, st.integers(1, 3)),
        st.tuples(st.just("delete_rows"), small, st.integers(1, 3)),
        st.tuples(st.just("add_group"), st.sampled_from([None, "X", "Y"]), st.sampled_from([None, 0, 1])),
        st.tuples(st.just("rename_group"), small, st.sampled_from(["P", "Q", "A", ""])),
        st.tuples(st.just("remove_group"), small),
        st.tuples(st.just("move_group"), small, small),
        st.tuples(st.just("set_group_details"), small, st.sampled_from(["", "µm"]), st.sampled_from([None, 0.1, 2.0])),
        st.tuples(st.just("set_decimal"), st.sampled_from(["auto", ".", ","])),
    )


def _apply(sheet, edit):
    name, *args = edit
    if name == "set_group_details":
        index, unit, lsl = args
        sheet.set_group_details(index, unit=unit, lsl=lsl)
    else:
        getattr(sheet, name)(*args)


def test_any_sequence_of_edits_undoes_and_redoes_exactly():
    """Random edits: undoing all of them restores each earlier state in turn, redoing restores the rest."""
    from hypothesis import given, settings
    from hypothesis import strategies as st

    @settings(max_examples=120, deadline=None)
    @given(edits=st.lists(_edit_strategy(), max_size=12))
    def run(edits):
        sheet = make_sheet(["1", "2"], ["3"], names=["A", "B"])
        notices = []
        sheet.subscribe(notices.append, before=True)
        states = [sheet.snapshot()]
        for edit in edits:
            try:
                _apply(sheet, edit)
            except (ValueError, ReadingsError):
                assert sheet.snapshot() == states[-1], f"a refused edit changed the sheet: {edit}"
                continue
            if sheet.snapshot() != states[-1]:
                states.append(sheet.snapshot())
        assert [n.before for n in notices] == [True, False] * (len(notices) // 2)
        assert all(a == dataclasses.replace(b, before=False) for b, a in zip(notices[::2], notices[1::2]))
        for state in reversed(states[:-1]):
            sheet.undo()
            assert sheet.snapshot() == state
        assert not sheet.can_undo and not sheet.is_modified
        for state in states[1:]:
            sheet.redo()
            assert sheet.snapshot() == state
        assert not sheet.can_redo
        for group in range(len(sheet.groups)):
            cells = sheet.groups[group].cells
            assert not cells or cells[-1].kind is not CellKind.EMPTY

    run()
