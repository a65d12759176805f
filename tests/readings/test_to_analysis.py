"""From the sheet to the statistics service: entry order, blanks as NaN, censored readings as low ties."""

import math

import pytest

from rankwise.readings import ReadingSheet, ReadingsError
from rankwise.stats.analysis import Question, Settings


def make_sheet(*columns, names=("A", "B", "C")):
    sheet = ReadingSheet(decimal=".")
    for number, column in enumerate(columns):
        sheet.add_group(names[number])
        sheet.paste_block(number, 0, [[text] for text in column])
    return sheet


def test_values_follow_entry_order_with_nan_for_unused_cells():
    sheet = make_sheet(["0.42", "", "scrap", "0.4,2", "0.45"], ["1.5"])
    sheet.set_group_details(0, unit="µm", lsl=0.1, usl=0.9, nominal=0.5)
    analysis = sheet.to_analysis(Question.TWO_GROUPS, Settings(alpha=0.01))
    a, b = analysis.groups
    assert a.values[0] == 0.42 and a.values[4] == 0.45
    assert all(math.isnan(v) for v in a.values[1:4])
    assert (a.unit, a.lsl, a.usl, a.nominal, a.decimals) == ("µm", 0.1, 0.9, 0.5, 2)
    assert b.decimals == 1
    assert analysis.settings.alpha == 0.01
    entries_a = analysis.entries[0]
    assert [(e.row, e.text) for e in entries_a.not_used] == [(3, "scrap"), (4, "0.4,2")]
    assert (entries_a.readings, entries_a.censored, entries_a.empty_between) == (2, 0, 1)


def test_one_count_of_entries_per_group():
    """Counted by hand from the cells (common practice, no source): text is never a blank, empty
    cells above the first entry are not counted, a censored reading is a reading used."""
    sheet = make_sheet(["", "", "0.42", "scrap", "", "<0.05", "0.44", "4.3", "0.45", "0.43"], ["0.5"])
    sheet.set_group_details(0, usl=1.0)
    entries = sheet.to_analysis(Question.TWO_GROUPS).entries[0]
    assert (entries.name, entries.readings, entries.censored, entries.empty_between) == ("A", 6, 1, 1)
    assert [(e.row, e.text) for e in entries.not_used] == [(4, "scrap")]
    flagged = [(e.row, e.text) for e in entries.flagged]
    assert flagged == [(8, "4.3"), (8, "4.3")], "above the USL and a slipped decimal point: two remarks"
    assert any("slipped decimal point" in e.remark for e in entries.flagged)


def test_chosen_groups_in_the_chosen_order():
    sheet = make_sheet(["1"], ["2"], ["3"])
    analysis = sheet.to_analysis(Question.TWO_GROUPS, Settings(), groups=[2, 0])
    assert [g.name for g in analysis.groups] == ["C", "A"]
    with pytest.raises(ValueError, match="groups"):
        sheet.to_analysis(Question.TWO_GROUPS, Settings(), groups=[0, 0])


def test_censored_readings_rank_as_ties_below_every_measured_reading():
    """One common limit: the stand-in is one gauge step below the limit and the lowest reading.

    The treatment (ties below every measured value) follows Helsel, Statistics for Censored
    Environmental Data, 2nd ed. (2012), rank tests with one detection limit; the stand-in value is
    this project's own choice of representative, checked here by its ordering.
    """
    sheet = make_sheet(["<0.05", "0.12", "<0.05"], ["0.07", "0.31"])
    analysis = sheet.to_analysis(Question.TWO_GROUPS, Settings())
    a, b = analysis.groups
    assert a.values[0] == a.values[2]
    measured = [a.values[1], *b.values]
    assert a.values[0] < 0.05 and a.values[0] < min(measured)
    assert a.values[0] == pytest.approx(0.04)
    assert "below the detection limit 0.05" in analysis.notes[0]
    assert "ties" in analysis.notes[0]


def test_a_measured_reading_below_the_limit_still_ranks_above_the_censored():
    sheet = make_sheet(["<0.05", "0.03"], ["0.2"])
    a, _ = sheet.to_analysis(Question.TWO_GROUPS, Settings()).groups
    assert a.values[0] < 0.03
    assert a.values[0] == pytest.approx(0.02)


def test_mixed_detection_limits_ask_the_user_to_choose():
    """The sheet's default; the choice itself is tested in test_censored_choice.py."""
    sheet = make_sheet(["<0.05", "0.12"], ["<0.1", "0.2"])
    with pytest.raises(ReadingsError, match=r"different limits .*Choose to treat them all as below the highest limit \(<0.1\)"):
        sheet.to_analysis(Question.TWO_GROUPS, Settings())


def test_paired_readings_pair_up_by_row():
    """Before/after on the same parts: a missing last 'after' reading shows as a blank in its row."""
    sheet = make_sheet(["1.0", "2.0", "3.0"], ["1.5", "2.5"])
    before, after = sheet.to_analysis(Question.PAIRED, Settings()).groups
    assert len(before.values) == len(after.values) == 3
    assert math.isnan(after.values[2])
    independent = sheet.to_analysis(Question.TWO_GROUPS, Settings()).groups
    assert [len(g.values) for g in independent] == [3, 2]


def test_the_analysis_writes_numbers_with_the_mark_the_readings_were_typed_with():
    """A sheet left on "auto" takes the mark most readings with decimals used (common practice, no source)."""
    comma = ReadingSheet(decimal="auto")
    comma.add_group("A")
    comma.paste_block(0, 0, [["0,38"], ["0,40"], ["12"], ["1.234,5"]])
    assert comma.to_analysis(Question.TWO_GROUPS, Settings()).decimal_mark == ","
    point = make_sheet(["0.38", "0.4", "7"])
    assert point.to_analysis(Question.TWO_GROUPS, Settings()).decimal_mark == "."


def test_readings_without_decimals_leave_the_mark_to_the_machine(monkeypatch):
    """With the sheet's mark on "auto" and no decimals typed, the machine's locale decides."""
    from rankwise.readings import for_analysis

    def whole_numbers_on_auto():
        sheet = ReadingSheet(decimal="auto")
        sheet.add_group("A")
        sheet.paste_block(0, 0, [["12"], ["13"]])
        return sheet

    monkeypatch.setattr(for_analysis, "machine_decimal", lambda: ",")
    assert whole_numbers_on_auto().to_analysis(Question.TWO_GROUPS, Settings()).decimal_mark == ","
    monkeypatch.setattr(for_analysis, "machine_decimal", lambda: ".")
    assert whole_numbers_on_auto().to_analysis(Question.TWO_GROUPS, Settings()).decimal_mark == "."


def test_a_sheet_with_a_stated_mark_keeps_it_for_whole_numbers(monkeypatch):
    from rankwise.readings import for_analysis

    monkeypatch.setattr(for_analysis, "machine_decimal", lambda: ",")
    assert make_sheet(["12", "13"]).to_analysis(Question.TWO_GROUPS, Settings()).decimal_mark == "."


def test_a_stated_sheet_mark_is_used_as_it_is():
    from rankwise.readings.for_analysis import build_analysis

    sheet = make_sheet(["0.38", "0.40"])
    analysis = build_analysis(sheet.groups, Question.TWO_GROUPS, Settings(), decimal=",")
    assert analysis.decimal_mark == ","
