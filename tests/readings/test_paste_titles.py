"""A pasted block's title row is recognised only as words over readings."""

from __future__ import annotations

import pytest

from rankwise.readings import GroupColumn, ReadingSheet
from rankwise.readings.paste_titles import split_title_row


@pytest.mark.parametrize(("block", "titles"), [
    ([["Before", "After"], ["0,41", "0,47"]], ["Before", "After"]),
    ([["Wheel A", ""], ["0.41", "0.47"]], ["Wheel A", ""]),
    ([["Lot 7"], ["<0.05"], ["0.07"]], ["Lot 7"]),
    ([["0.41", "After"], ["0.42", "0.47"]], []),  # a reading in the first row: all data
    ([["scrap"], ["re-measure"]], []),  # words over words: notes, not titles
    ([["Before"]], []),  # nothing below
    ([["Before", "After"], ["0.41", "missed"]], []),  # After has no reading under it
])
def test_title_row_is_words_over_readings(block, titles):
    found, body = split_title_row(block)
    assert found == titles
    assert body == (block[1:] if titles else block)


def test_titles_name_groups_in_the_same_undo_step():
    sheet = ReadingSheet([GroupColumn("A"), GroupColumn("B")])
    named = sheet.paste_block(0, 0, [["0.41", "0.47", "0.50"]], ["Before", "After", "Later"])
    assert named == ["Before", "After", "Later"] and sheet.group_names == ["Before", "After", "Later"]
    sheet.undo()
    assert sheet.group_names == ["A", "B"] and sheet.row_count == 0


def test_a_title_another_group_has_leaves_the_name():
    sheet = ReadingSheet([GroupColumn("Before"), GroupColumn("B")])
    assert sheet.paste_block(1, 0, [["0.47"]], ["Before"]) == []
    assert sheet.group_names == ["Before", "B"]
