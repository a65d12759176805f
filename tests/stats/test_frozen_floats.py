"""A run of floats kept in one read-only array reads, compares and hashes like the tuple of its values."""

import numpy as np
import pytest

from rankwise.stats.frozen_floats import FrozenFloats
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
