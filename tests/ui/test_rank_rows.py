"""The rank table's rows against a plain Python sort of the same readings (brute force): order,
group, reading, rank, and the tie column (bracket by place in the block, block number, tint parity)."""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from rankwise.stats.paired import compare_paired
from rankwise.stats.two_groups import compare_two
from rankwise.ui.rank_table import rows_for_groups, rows_for_pairs

gauge_readings = st.lists(st.integers(0, 6).map(lambda tenths: tenths / 10.0), min_size=2, max_size=25)


def _expected_tie_column(keys: list[float], tied: dict[float, int]) -> list[tuple[str, int]]:
    """For keys in table order: the bracket mark and the block number, worked out one row at a time."""
    numbers = {key: number for number, key in enumerate(sorted(k for k in set(keys) if k in tied), start=1)}
    expected = []
    for position, key in enumerate(keys):
        if key not in tied:
            expected.append(("", 0))
            continue
        place, count = position - keys.index(key), tied[key]
        expected.append(("┌" if place == 0 else "└" if place == count - 1 else "│", numbers[key]))
    return expected


@settings(max_examples=60, deadline=None)
@given(gauge_readings, gauge_readings)
def test_two_groups_rows_follow_a_plain_sort_by_rank_group_and_entry(a, b):
    if len(set(a + b)) < 2:
        return
    result = compare_two(a, b)
    rows = rows_for_groups(("A", "B"), (result.values_a, result.values_b), (result.ranks_a, result.ranks_b),
                           result.tie_blocks, 1)
    entries = sorted((rank, group, entry, value)
                     for group, (values, ranks) in enumerate(((result.values_a, result.ranks_a),
                                                              (result.values_b, result.ranks_b)))
                     for entry, (value, rank) in enumerate(zip(values, ranks)))
    tied = {block.mid_rank: block.count for block in result.tie_blocks}
    assert len(rows) == len(entries)
    for position, ((rank, group, entry, value), (mark, number)) in enumerate(
            zip(entries, _expected_tie_column([e[0] for e in entries], tied))):
        row = rows[position]
        assert row.cells[:3] == (str(position + 1), "AB"[group], f"{value:.1f}")
        assert float(row.cells[3]) == rank and f"reading {entry + 1} of that group" in row.tooltip
        assert (row.tie_mark, row.block_number) == (mark, number)


@settings(max_examples=60, deadline=None)
@given(gauge_readings, gauge_readings, st.sampled_from(["wilcox", "pratt"]))
def test_same_parts_rows_follow_a_plain_sort_by_rank_size(before, after, zero_method):
    rows_count = min(len(before), len(after))
    before, after = before[:rows_count], after[:rows_count]
    try:
        result = compare_paired(before, after, zero_method=zero_method)
    except ValueError:  # no pair differs: nothing to rank
        return
    rows = rows_for_pairs(result, 1)
    sizes = [abs(r) for r in result.signed_ranks]
    order = sorted(range(len(sizes)), key=lambda i: (sizes[i], abs(result.differences[i]), i))
    tied = {block.mid_rank: block.count for block in result.tie_blocks}
    expected = _expected_tie_column([sizes[i] for i in order], tied)
    assert len(rows) == len(order)
    for position, (pair, (mark, number)) in enumerate(zip(order, expected)):
        assert rows[position].cells[0] == str(pair + 1)
        assert (rows[position].tie_mark, rows[position].block_number) == (mark, number)
