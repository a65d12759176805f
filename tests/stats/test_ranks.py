"""Mid-ranks as the two-group engine uses them, checked against scipy's ranking."""

import numpy as np
import pytest
import scipy.stats

import rankwise.stats
from rankwise.stats import midranks
from rankwise.stats.ranks import rank_groups


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
