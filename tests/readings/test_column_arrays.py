"""A group's arrays kept in step with each edit: after any sequence of edits, undos and redos they hold
what a fresh pass over the cells finds, and the counts and planning values drawn from them agree
with the full count of ``count_entries`` and with a cell-by-cell computation (the references)."""

import math

import numpy as np
import pytest

from rankwise.readings import CellKind, ReadingsError
from rankwise.readings.column_arrays import ColumnArrays
from rankwise.readings.entry_counts import count_column, count_entries
from rankwise.readings.for_analysis import _readings_from_arrays
from rankwise.readings.plan_start import plan_start
from rankwise.readings.suspicious import flag_readings
from rankwise.stats.analysis import GroupReadings

from test_sheet import _apply, _edit_strategy, make_sheet


def _full_count(column):
    """The reference: every cell counted again (``count_entries``, the count the verdict shows)."""
    entries = count_entries(column.name, column.cells)
    return (entries.readings - entries.censored, len(entries.not_used), entries.censored, entries.empty_between)


def _spread_by_cells(columns, paired):
    """The reference: the planner's spread, decimals and spread groups worked out cell by cell."""
    measured = [{row: float(cell.value) for row, cell in enumerate(column.cells) if cell.kind is CellKind.NUMBER}
                for column in columns]
    decimals = max((cell.decimals for column in columns for cell in column.cells
                    if cell.kind is CellKind.NUMBER and cell.decimals is not None), default=None)
    if paired and len(columns) >= 2:
        a, b = measured[0], measured[1]
        differences = np.array([b[row] - a[row] for row in sorted(set(a) & set(b))])
        spread = float(np.std(differences, ddof=1)) if differences.size >= 2 else None
    else:
        values = [np.array(list(group.values())) for group in measured if len(group) >= 2]
        degrees = sum(v.size - 1 for v in values)
        spread = math.sqrt(sum(float(np.sum((v - v.mean()) ** 2)) for v in values) / degrees) if degrees else None
    if spread is not None and not spread > 0.0:
        spread = None
    return spread, decimals, tuple(column.name for column, group in zip(columns, measured) if group)


def _flags_row_by_row(column):
    """The reference: the remarks worked out row by row, as ``flag_readings`` did before it compared
    whole arrays (the slipped-decimal check itself is shared)."""
    from rankwise.readings.suspicious import _slipped_decimals

    rows = [row for row, cell in enumerate(column.cells) if cell.kind is CellKind.NUMBER]
    values = np.array([column.cells[row].value for row in rows], dtype=float)
    flags, suffix = {}, f" {column.unit}" if column.unit else ""
    for position, row in enumerate(rows):
        text = column.cells[row].text.strip()
        if column.lsl is not None and values[position] < column.lsl:
            flags.setdefault(row, []).append(f"{text} is below the lower limit (LSL {column.lsl:g}{suffix}).")
        if column.usl is not None and values[position] > column.usl:
            flags.setdefault(row, []).append(f"{text} is above the upper limit (USL {column.usl:g}{suffix}).")
    for position, remark in _slipped_decimals(values).items():
        flags.setdefault(rows[position], []).append(remark.format(text=column.cells[rows[position]].text.strip()))
    return {row: tuple(remarks) for row, remarks in sorted(flags.items())}


def _readings_cell_by_cell(column, length):
    """The reference: a group's readings for the analysis read cell by cell (nothing censored)."""
    values, decimals = [], None
    for cell in column.cells:
        if cell.kind is CellKind.NUMBER:
            values.append(cell.value)
            decimals = max(decimals or 0, cell.decimals or 0)
        else:
            values.append(math.nan)
    values.extend([math.nan] * (length - len(values)))
    return GroupReadings(column.name, tuple(values), column.unit, column.lsl, column.usl, column.nominal, decimals)


def _check(sheet):
    for index, column in enumerate(sheet.groups):
        assert count_column(column) == count_entries(column.name, column.cells, lsl=column.lsl, usl=column.usl,
                                                     unit=column.unit)
        if not any(cell.kind is CellKind.CENSORED for cell in column.cells):
            assert _readings_from_arrays(column, 9) == _readings_cell_by_cell(column, 9)
        counts = sheet.counts(index)
        assert (counts.used, counts.skipped, counts.censored, counts.blanks) == _full_count(column)
        kept, fresh = column.arrays(), ColumnArrays(column.cells)
        assert np.array_equal(kept.kinds, fresh.kinds)
        assert np.array_equal(kept.values, fresh.values, equal_nan=True)
        assert np.array_equal(kept.decimals, fresh.decimals)
        assert sheet.flags(index) == _flags_row_by_row(column)
        assert flag_readings(column.cells, lsl=column.lsl, usl=column.usl, unit=column.unit) == _flags_row_by_row(column)
    for paired in (False, True):
        start = plan_start(sheet.groups, paired=paired)
        assert (start.spread, start.decimals, start.spread_groups) == _spread_by_cells(sheet.groups, paired)


def test_kept_arrays_match_a_full_recount_after_any_edits():
    from hypothesis import given, settings
    from hypothesis import strategies as st

    @settings(max_examples=150, deadline=None)
    @given(edits=st.lists(st.one_of(_edit_strategy(), st.just(("undo",)), st.just(("redo",))), max_size=14))
    def run(edits):
        sheet = make_sheet(["1", "", "2", "n/a"], ["", "3", "<0,5"], names=["A", "B"])
        _check(sheet)  # the arrays made now are then kept in step by every edit below
        for edit in edits:
            try:
                _apply(sheet, edit)
            except (ValueError, ReadingsError):
                pass
            _check(sheet)

    run()


@pytest.mark.parametrize("texts", [[], ["", "", "x"], ["1,5", "", "", "0,25", "", "scrap", "<0,1"]])
def test_counts_of_a_column_as_read(texts):
    sheet = make_sheet(texts, names=["A"])
    counts = sheet.counts(0)
    assert (counts.used, counts.skipped, counts.censored, counts.blanks) == _full_count(sheet.groups[0])


def test_a_copy_of_the_sheet_takes_its_arrays_along_and_stands_apart():
    """``ReadingSheet.copy`` (what the window hands to its worker) gives the analysis and the arrays
    that a copy read cell by cell (``from_snapshot``, the reference) gives, and keeps them while the
    sheet is edited on."""
    from hypothesis import given, settings
    from hypothesis import strategies as st

    from rankwise.readings import ReadingSheet
    from rankwise.stats.analysis import Question

    def frozen(sheet):
        analyses = []
        for question in (Question.TWO_GROUPS, Question.PAIRED):
            try:
                analyses.append(sheet.to_analysis(question, groups=[0, 1]))
            except (ValueError, ReadingsError) as error:
                analyses.append(str(error))
        arrays = [(a.kinds.tolist(), a.values.tolist(), a.decimals.tolist())
                  for a in (column.arrays() for column in sheet.groups)]
        return sheet.snapshot(), repr(analyses), repr(arrays), sheet.decimal_label

    @settings(max_examples=80, deadline=None)
    @given(before=st.lists(_edit_strategy(), max_size=8), after=st.lists(_edit_strategy(), min_size=1, max_size=4))
    def run(before, after):
        sheet = make_sheet(["1", "", "2", "n/a"], ["", "3", "<0,5"], names=["A", "B"])
        for column in sheet.groups:
            column.arrays()  # kept in step from here on, as the window's sheet keeps them
        for edit in before:
            try:
                _apply(sheet, edit)
            except (ValueError, ReadingsError):
                pass
        copy = sheet.copy()
        expected = frozen(ReadingSheet.from_snapshot(sheet.snapshot()))
        # the arrays the sheet kept are taken along, not made again from the cells
        assert [column._arrays is not None for column in copy.groups] == [
            column._kept_arrays() is not None for column in sheet.groups]
        for edit in after:
            try:
                _apply(sheet, edit)
            except (ValueError, ReadingsError):
                pass
        assert frozen(copy) == expected

    run()


def test_a_column_of_readings_only_lends_its_values_as_the_measured_readings_and_answers_afresh_after_an_edit():
    """Every row a reading: the measured readings are a read-only view of the column's values (10^6
    readings: 8 MB not copied); an edit answers with the new value, a blank row with a copy."""
    sheet = make_sheet(["1", "2", "3"], names=["A"])
    arrays = sheet.groups[0].arrays()
    measured = arrays.measured()
    assert measured.tolist() == [1.0, 2.0, 3.0] and np.shares_memory(measured, arrays.values)
    with pytest.raises(ValueError):
        measured[0] = 9.0
    sheet.set_text(0, 1, "5")
    assert sheet.groups[0].arrays().measured().tolist() == [1.0, 5.0, 3.0]
    sheet.set_text(0, 1, "")
    with_blank = sheet.groups[0].arrays()
    assert with_blank.measured().tolist() == [1.0, 3.0]
    assert not np.shares_memory(with_blank.measured(), with_blank.values)


def test_unpickled_arrays_leave_out_the_answers_that_are_one_pass_over_them_and_give_them_again():
    import pickle

    sheet = make_sheet(["1", "", "2,5", "x"], names=["A"])
    arrays = sheet.groups[0].arrays()
    rows, measured = arrays.reading_rows().tolist(), arrays.measured().tolist()
    twin = pickle.loads(pickle.dumps(arrays))
    assert "rows" not in twin._answers and "measured" not in twin._answers
    assert twin.reading_rows().tolist() == rows and twin.measured().tolist() == measured
