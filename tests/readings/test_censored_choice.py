"""Readings below different detection limits: ask first, or (as chosen) treat all as below the highest.

The treatment chosen, censoring everything at the highest limit so all of it ties below the
measured readings at or above that limit, is Helsel's recommendation for rank tests with several
limits (Helsel, Statistics for Censored Environmental Data, 2nd ed., 2012; from memory). The checks
of the ranks below compare with brute-force pairwise counting of the rule applied by hand.
"""

import itertools
import math

import pytest

from rankwise.readings import GroupColumn, ReadingSheet, SheetSnapshot, parse_reading
from rankwise.readings.censored import MixedLimitsError
from rankwise.stats.analysis import Question, Settings
from rankwise.stats.ranks import midranks


def make_sheet(*columns, mixed_limits="ask"):
    return ReadingSheet(
        [GroupColumn(name, cells=[parse_reading(t, decimal=".") for t in column])
         for name, column in zip(("A", "B", "C"), columns)],
        decimal=".", mixed_limits=mixed_limits,
    )


def test_by_default_mixed_limits_are_refused_naming_the_limits():
    sheet = make_sheet(["<0.05", "0.12"], ["<0.10", "0.2"])
    assert sheet.mixed_limits == "ask"
    with pytest.raises(MixedLimitsError, match=r"different limits \(0.05, 0.10\)") as caught:
        sheet.to_analysis(Question.TWO_GROUPS, Settings())
    assert (caught.value.limits, caught.value.shown) == ((0.05, 0.1), ("0.05", "0.10"))


def test_below_highest_treats_every_censored_reading_as_below_the_highest_limit():
    sheet = make_sheet(["<0.05", "0.12", "<0.05"], ["<0.10", "0.20", "0.10"], mixed_limits="below-highest")
    analysis = sheet.to_analysis(Question.TWO_GROUPS, Settings())
    a, b = analysis.groups
    stand_ins = [a.values[0], a.values[2], b.values[0]]
    assert len(set(stand_ins)) == 1
    assert stand_ins[0] == pytest.approx(0.09)  # one gauge step (0.01) below the highest limit 0.10
    assert (a.values[1], b.values[1], b.values[2]) == (0.12, 0.20, 0.10)
    note = analysis.notes[0]
    assert note.startswith("3 readings were written below different detection limits (0.05, 0.10, in A, B)")
    assert "as chosen, all are treated as below the highest limit 0.10" in note
    assert "0.09" in note


def test_a_measured_reading_below_the_highest_limit_is_censored_there_too():
    sheet = make_sheet(["<0.05", "0.07", "0.30"], ["<0.10", "0.08", "0.15"], mixed_limits="below-highest")
    analysis = sheet.to_analysis(Question.TWO_GROUPS, Settings())
    a, b = analysis.groups
    assert a.values[0] == a.values[1] == b.values[0] == b.values[1] == pytest.approx(0.09)
    assert (a.values[2], b.values[2]) == (0.30, 0.15)
    assert "2 readings measured below 0.10 (in A, B) cannot be ordered against them" in analysis.notes[0]
    assert "These 4 readings rank as ties" in analysis.notes[0]


def test_one_common_limit_is_unchanged_by_the_setting():
    columns = (["<0.05", "0.03"], ["0.2"])
    asked = make_sheet(*columns).to_analysis(Question.TWO_GROUPS, Settings())
    chosen = make_sheet(*columns, mixed_limits="below-highest").to_analysis(Question.TWO_GROUPS, Settings())
    assert asked == chosen
    assert asked.groups[0].values == (pytest.approx(0.02), 0.03)


def test_the_setting_is_one_undo_step_and_reruns_nothing_else():
    sheet = make_sheet(["<0.05", "0.12"], ["<0.10", "0.2"])
    changes = []
    sheet.subscribe(changes.append)
    sheet.set_mixed_limits("below-highest")
    assert sheet.mixed_limits == "below-highest"
    assert sheet.undo_label == "Undo treating readings below different limits as below the highest"
    assert [change.kind for change in changes] == ["reset"]
    sheet.to_analysis(Question.TWO_GROUPS, Settings())
    sheet.undo()
    assert sheet.mixed_limits == "ask"
    with pytest.raises(MixedLimitsError):
        sheet.to_analysis(Question.TWO_GROUPS, Settings())
    sheet.redo()
    assert sheet.mixed_limits == "below-highest"
    sheet.set_mixed_limits("below-highest")
    assert sheet.undo_label.startswith("Undo treating")  # choosing it again is no new step
    with pytest.raises(ValueError, match="mixed_limits must be one of ask, below-highest"):
        sheet.set_mixed_limits("lowest")


def test_the_setting_survives_the_snapshot_round_trip():
    sheet = make_sheet(["<0.05", "0.12"], ["<0.10", "0.2"], mixed_limits="below-highest")
    data = sheet.snapshot().to_dict()
    assert data["mixed_limits"] == "below-highest"
    back = SheetSnapshot.from_dict(data)
    assert back == sheet.snapshot()
    reopened = ReadingSheet.from_snapshot(back)
    assert reopened.mixed_limits == "below-highest"
    assert reopened.to_analysis(Question.TWO_GROUPS, Settings()) == sheet.to_analysis(Question.TWO_GROUPS, Settings())


def test_an_older_snapshot_without_the_setting_means_ask_and_keeps_its_data():
    """Data written before the setting existed have no such key; the default adds none either."""
    sheet = make_sheet(["<0.05", "0.12"], ["0.2"])
    data = sheet.snapshot().to_dict()
    assert "mixed_limits" not in data
    assert set(data) == {"format", "decimal", "groups"}
    assert SheetSnapshot.from_dict(data).mixed_limits == "ask"


def test_a_damaged_setting_is_refused_in_plain_words():
    data = make_sheet(["1"]).snapshot().to_dict()
    data["mixed_limits"] = "lowest"
    from rankwise.readings import ReadingsError

    with pytest.raises(ReadingsError, match="damaged"):
        SheetSnapshot.from_dict(data)


# ----- brute force: the ranks handed to the statistics are the ranks of the rule ---------------

POOL = ("<0.05", "<0.10", "0.04", "0.10", "0.07", "0.25")
"""Small readings around two limits: censored at either, measured below, at and above the highest."""


def ranks_by_the_rule(texts, highest):
    """Mid-ranks counted pair by pair: below the highest limit (written or measured) ties lowest."""
    def key(text):
        if text.startswith("<") or float(text) < highest:
            return (0, 0.0)
        return (1, float(text))

    keys = [key(text) for text in texts]
    return [1 + sum(other < own for other in keys) + (sum(other == own for other in keys) - 1) / 2 for own in keys]


def stand_ins_by_hand(texts, highest):
    """The rule applied by hand: every reading below the highest limit becomes -1."""
    return [-1.0 if text.startswith("<") or float(text) < highest else float(text) for text in texts]


@pytest.mark.parametrize("size", [4, 5])
def test_ranks_given_to_the_statistics_equal_the_rule_for_every_small_sheet(size):
    """Every way to fill ``size`` cells (split into two groups) from the pool, with both limits present."""
    checked = 0
    for texts in itertools.product(POOL, repeat=size):
        if not {"<0.05", "<0.10"} <= set(texts):
            continue
        first, second = list(texts[:2]), list(texts[2:])
        analysis = make_sheet(first, second, mixed_limits="below-highest").to_analysis(Question.TWO_GROUPS, Settings())
        values = [value for group in analysis.groups for value in group.values]
        assert not any(math.isnan(value) for value in values)
        expected = ranks_by_the_rule(texts, 0.10)
        assert list(midranks(values)) == expected
        assert list(midranks(stand_ins_by_hand(texts, 0.10))) == expected
        checked += 1
    assert checked > 100
