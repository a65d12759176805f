"""New groups continue the naming the sheet already uses."""

from __future__ import annotations

import pytest

from rankwise.readings.group_names import next_group_names


@pytest.mark.parametrize(("existing", "count", "expected"), [
    (["A", "B"], 1, ["C"]),
    (["A", "B"], 3, ["C", "D", "E"]),
    (["a"], 1, ["b"]),
    (["Press 1", "Press 2"], 2, ["Press 3", "Press 4"]),
    (["Lot 07"], 1, ["Lot 08"]),
    (["M9"], 1, ["M10"]),
    (["Wheel A", "Wheel B"], 1, ["Wheel C"]),
    (["Before", "After"], 1, ["Group 3"]),
    ([], 2, ["Group 1", "Group 2"]),
    (["Y", "Z"], 2, ["Group 3", "Group 4"]),  # past Z the letters run out
    (["A", "C", "B"], 2, ["D", "E"]),  # a name already taken is skipped
])
def test_new_names_follow_the_last_group(existing, count, expected):
    assert next_group_names(existing, count) == expected
