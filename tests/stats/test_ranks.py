"""Mid-ranks as the two-group engine uses them, checked against scipy's ranking."""

import numpy as np
import pytest
import scipy.stats

import rankwise.stats
from rankwise.stats import midranks
from rankwise.stats.ranks import midranks_on_grid_together_and_within, rank_groups


def test_public_name_is_the_one_ranking():
    """rankwise.stats.midranks is the function in stats/ranks.py (one place ranks readings)."""
    assert rankwise.stats.midranks is rankwise.stats.ranks.midranks


def test_midranks_match_scipy_average_ranks_on_tied_gauge_readings():
    """scipy.stats.rankdata(method="average") gives the same mid-ranks."""
    readings = np.array([0.42, 0.40, 0.42, 0.45, 0.40, 0.42, 0.50, 0.38])
    np.testing.assert_array_equal(midranks(readings), scipy.stats.rankdata(readings, method="average"))


def test_float_noise_does_not_split_a_true_tie():
    """0.1 + 0.2 and 0.3 are the same reading at one decimal (common practice, no source): one tie block."""
    ranks = midranks([0.1 + 0.2, 0.3, 0.2])
    assert ranks.tolist() == [2.5, 2.5, 1.0]


def test_ranks_sum_to_n_times_n_plus_one_over_two():
    """Sum of 1..N is N(N+1)/2 (Gauss; common practice, no source), ties or not."""
    readings = np.round(np.random.default_rng(5).normal(size=57), 1)
    assert midranks(readings).sum() == 57 * 58 / 2


def test_rank_groups_agree_with_scipy_on_the_combined_sample():
    """Per-group mid-ranks equal scipy.stats.rankdata of the concatenated groups."""
    a, b = np.array([3.0, 1.0, 2.0, 2.0]), np.array([2.0, 5.0, 1.0])
    (ranks_a, ranks_b), blocks = rank_groups([a, b], [a, b])
    expected = scipy.stats.rankdata(np.concatenate([a, b]))
    np.testing.assert_array_equal(np.concatenate([ranks_a, ranks_b]), expected)
    assert [(blk.value, blk.count, blk.counts_by_group) for blk in blocks] == [(1.0, 2, (1, 1)), (2.0, 3, (2, 1))]


def test_blank_readings_are_refused_by_the_ranking():
    """NaN must be dropped before ranking; the message says so."""
    with pytest.raises(ValueError, match="blanks"):
        midranks([1.0, np.nan])


def _tie_blocks_by_hand(values, sizes):
    """Brute force: for each value held by two or more readings, its readings per group and first entry."""
    labels = np.repeat(np.arange(len(sizes)), sizes)
    blocks = []
    for value in sorted(set(values.tolist())):
        members = np.flatnonzero(values == value)
        if members.size > 1:
            below = int(np.sum(values < value))
            blocks.append((float(values[members[0]]), members.size, below + 1, below + members.size,
                           tuple(int(np.sum(labels[members] == g)) for g in range(len(sizes)))))
    return blocks


@pytest.mark.parametrize("decimals", [0, 1, 2, None])
def test_rank_groups_agree_with_scipy_and_enumeration_by_counting_and_by_sorting(decimals):
    """Whole numbers in a narrow range are ranked by counting, others by sorting: both give
    scipy.stats.rankdata(method="average") of the combined sample, and the tie blocks found by
    going through every distinct value by hand (brute force)."""
    rng = np.random.default_rng(11 + (decimals or 9))
    groups = [rng.normal(5.0, 1.0, n) for n in (40, 33, 27)]
    if decimals is not None:
        groups = [np.rint(g * 10.0**decimals) for g in groups]  # whole numbers: the counting path
    combined = np.concatenate(groups)
    ranks, blocks = rank_groups(groups, groups)
    np.testing.assert_array_equal(np.concatenate(ranks), scipy.stats.rankdata(combined, method="average"))
    assert [(b.value, b.count, b.first_rank, b.last_rank, b.counts_by_group) for b in blocks] == \
        _tie_blocks_by_hand(combined, [40, 33, 27])
    assert all(b.mid_rank == (b.first_rank + b.last_rank) / 2 for b in blocks)


def test_a_tie_block_is_labelled_by_its_first_reading_in_entry_order():
    """Counts equal, readings a hair apart (spreadsheet noise): the block shows the first one typed."""
    first, later = 0.3, 0.1 + 0.2
    for counts in ([3.0, 3.0, 1.0], [3.5, 3.5, 1.0]):  # counting path, sorting path
        _, blocks = rank_groups([np.array(counts)], [np.array([later, first, 0.1])])
        assert blocks[0].value == later
        _, blocks = rank_groups([np.array(counts)], [np.array([first, later, 0.1])])
        assert blocks[0].value == first


def test_wide_whole_numbers_are_ranked_by_sorting_with_the_same_result():
    """A range far wider than the number of readings (counting would need a huge tally): still
    scipy.stats.rankdata(method="average")."""
    values = np.array([0.0, 1e12, 5.0, 1e12, -3e9])
    (ranks,), blocks = rank_groups([values], [values])
    np.testing.assert_array_equal(ranks, scipy.stats.rankdata(values))
    assert [(b.value, b.count) for b in blocks] == [(1e12, 2)]


@pytest.mark.parametrize("spread", [3.0, 1e9])
def test_ranks_together_and_within_each_group_agree_with_scipy(spread):
    """scipy.stats.rankdata(method="average") of the groups together and of each group alone, for whole
    numbers in a narrow range (one tally) and in a wide one (sorting)."""
    rng = np.random.default_rng(int(spread) % 97)
    groups = [np.rint(rng.normal(0.0, spread, n)) for n in (23, 31, 9)]
    together, within = midranks_on_grid_together_and_within(groups)
    np.testing.assert_array_equal(together, scipy.stats.rankdata(np.concatenate(groups), method="average"))
    for ours, group in zip(within, groups):
        np.testing.assert_array_equal(ours, scipy.stats.rankdata(group, method="average"))
