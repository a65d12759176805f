"""A run of floats kept in one read-only array reads, compares and hashes like the tuple of its values."""

import math

import numpy as np
import pytest

from rankwise.stats.frozen_floats import FrozenFloats
from rankwise.stats.analysis import GroupReadings
from rankwise.stats.results import NullDistribution


def test_reads_compares_and_hashes_like_the_tuple_of_its_values():
    values = (0.0, 0.5, 1.5, 2.0)
    run = FrozenFloats(np.array(values))
    assert run == values and values == run and run == FrozenFloats(values)
    assert run != values[:3] and run != (0.0, 0.5, 1.5, 2.5) and run != FrozenFloats(values[1:])
    assert hash(run) == hash(values)
    assert list(run) == list(values) and len(run) == 4 and run[2] == 1.5 and run[-1] == 2.0
    assert run[1:3] == (0.5, 1.5) and isinstance(run[1:3], FrozenFloats)
    assert all(type(item) is float for item in run) and type(run[0]) is float
    assert 1.5 in run and run.index(2.0) == 3


def test_keeps_its_own_copy_and_cannot_be_changed_through_numpy():
    source = np.array([1.0, 2.0, 3.0])
    run = FrozenFloats(source)
    source[0] = 99.0
    assert run == (1.0, 2.0, 3.0)
    with pytest.raises(ValueError):
        np.asarray(run)[0] = 5.0


def test_refuses_a_table_of_numbers():
    with pytest.raises(ValueError, match="one row of numbers"):
        FrozenFloats(np.zeros((2, 2)))


def test_a_null_distribution_is_the_same_value_whether_given_tuples_or_arrays():
    from_tuples = NullDistribution("U of A", (0.0, 1.0, 2.0), (0.25, 0.5, 0.25), 1.0, True)
    from_arrays = NullDistribution("U of A", np.arange(3.0), np.array([0.25, 0.5, 0.25]), 1.0, True)
    assert from_tuples == from_arrays and hash(from_tuples) == hash(from_arrays)
    assert isinstance(from_tuples.support, FrozenFloats)


def test_a_blank_equals_a_blank_as_math_nan_does_in_a_tuple():
    run = FrozenFloats([1.0, float("nan")])
    assert run == FrozenFloats(np.array([1.0, np.nan])) and run == (1.0, math.nan) and (1.0, math.nan) == run
    assert run != (1.0, 2.0) and run != FrozenFloats([math.nan, 1.0]) and run != FrozenFloats([1.0, 2.0])
    assert hash(run) == hash(FrozenFloats(np.array([1.0, np.nan]))) == hash((1.0, math.nan))


def test_a_group_keeps_its_readings_in_one_array_whatever_sequence_it_was_given():
    from_tuple = GroupReadings("Press 1", (12.5, math.nan, 12.75))
    from_array = GroupReadings("Press 1", np.array([12.5, np.nan, 12.75]))
    assert isinstance(from_tuple.values, FrozenFloats) and isinstance(from_array.values, FrozenFloats)
    assert from_tuple == from_array and hash(from_tuple) == hash(from_array)
    assert from_tuple.values == (12.5, math.nan, 12.75)


def test_a_frozen_run_given_again_is_shared_not_copied():
    run = FrozenFloats([1.0, 2.0])
    assert np.shares_memory(np.asarray(FrozenFloats(run)), np.asarray(run))


def test_an_array_handed_over_is_kept_without_a_copy_and_can_no_longer_be_changed():
    made = np.array([3.0, 1.0, 2.0])
    run = FrozenFloats.handed_over(made)
    assert run == (3.0, 1.0, 2.0) and np.shares_memory(np.asarray(run), made)
    with pytest.raises(ValueError):
        made[0] = 0.0
    with pytest.raises(ValueError, match="float64"):
        FrozenFloats.handed_over(np.arange(3))
