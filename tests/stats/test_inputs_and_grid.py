"""Checking readings in (plain-words refusals) and finding their gauge resolution."""

from decimal import Decimal

import numpy as np
import pytest

from rankwise.stats.grid import PREFIX_READINGS, find_grid
from rankwise.stats.inputs import clean_group


@pytest.mark.parametrize("values", [
    [1.0, None, 2.0, float("nan")],
    np.array([1.0, np.nan, 2.0, np.nan]),
])
def test_blanks_are_dropped_and_counted_from_lists_and_arrays(values):
    kept, dropped = clean_group(values, "Press 2")
    assert kept.tolist() == [1.0, 2.0] and dropped == 2


def test_a_whole_number_array_is_taken_as_floats():
    kept, dropped = clean_group(np.array([3, 1, 2], dtype=np.int32), "A")
    assert kept.dtype == float and kept.tolist() == [3.0, 1.0, 2.0] and dropped == 0


@pytest.mark.parametrize("values, words", [
    (np.array([1.0, np.inf]), "infinite"),
    ([1.0, float("-inf")], "infinite"),
    (np.array([], dtype=float), "no readings"),
    (np.array([np.nan, np.nan]), "no readings"),
    ([], "no readings"),
    (["1.2", "ok"], "not a number"),
    (np.array(["a", "b"]), "not a number"),
    ([1.2, "1.3"], "text '1.3', which is not a number"),
    ([1.2, True], "yes/no value"),
    (np.array([True, False]), "True/False"),
    ([[1.0, 2.0], [3.0, 4.0]], "list inside the list"),
    (np.array([[1.0, 2.0], [3.0, 4.0]]), "not a list"),
    (3.0, "single value"),
    ("1.2 1.3", "a text"),
])
def test_bad_groups_are_refused_naming_the_group(values, words):
    with pytest.raises(ValueError, match=f"Group Press 2 .*{words}|{words}.*Press 2|Press 2.*{words}"):
        clean_group(values, "Press 2")


def test_a_finer_reading_after_the_first_ones_still_sets_the_resolution():
    """The first readings are whole numbers; one later reading has two decimals: the grid is 0.01
    (the prefix only gives a lower bound; common practice, no source)."""
    readings = np.concatenate([np.arange(PREFIX_READINGS + 10, dtype=float), [4.25]])
    assert find_grid(readings).decimals == 2
    assert find_grid(readings[:PREFIX_READINGS], readings[PREFIX_READINGS:]).decimals == 2


def test_resolutions_of_typed_decimals_and_of_continuous_readings():
    """0.42-style readings sit on 0.01; noise from sums (0.1 + 0.2) stays on 0.1; readings needing more
    than nine decimals are continuous (None); chunks of many readings are all checked."""
    assert find_grid(np.array([0.42, 0.40, 1.5])).decimals == 2
    assert find_grid(np.array([0.1 + 0.2, 0.5])).decimals == 1
    assert find_grid(np.random.default_rng(3).normal(size=50)).decimals is None
    many = np.round(np.random.default_rng(4).normal(size=200_000), 1)
    many[-1] = 0.123
    assert find_grid(many).decimals == 3


def test_the_resolution_is_the_most_decimals_typed():
    """Seeded readings typed as decimal text with 0 to 9 decimals, one of them with a last digit that
    is not 0, at every position among up to 12 readings: the grid has exactly that many decimals
    (the typed text is the reference)."""
    rng = np.random.default_rng(17)
    for trial in range(400):
        decimals, n = int(rng.integers(0, 10)), int(rng.integers(1, 13))
        steps = rng.integers(-10**6, 10**6, n) * 10
        steps[int(rng.integers(0, n))] += int(rng.integers(1, 10))  # the one reading that needs every decimal
        typed = [str(Decimal(int(k)).scaleb(-decimals)) for k in steps]
        assert find_grid(np.array([float(text) for text in typed])).decimals == decimals, typed


def test_the_callers_readings_are_never_changed():
    """Finite numeric arrays are used without a copy; every step after the check only reads them."""
    from rankwise.stats import compare_two

    a = np.round(np.random.default_rng(8).normal(5.0, 1.0, 40), 1)
    b = a[::-1] + 0.3
    kept_a, kept_b = a.copy(), b.copy()
    a.flags.writeable = False
    compare_two(a, b, margin=0.5)
    np.testing.assert_array_equal(a, kept_a)
    np.testing.assert_array_equal(b, kept_b)


def test_float_noise_never_splits_a_tie_even_beside_a_reading_with_many_decimals():
    """0.1 + 0.2 is 0.30000000000000004 in binary floating point; beside a reading with 13
    decimals (more than the old limit of 9) and beside readings of very different magnitudes
    (no common grid fits in 2^52), it still ties with a typed 0.3 (Python's repr of the typed
    decimals, common practice, no source)."""
    from rankwise.stats import midranks
    from rankwise.stats.grid import snap_to_decimals

    assert find_grid(np.array([0.1 + 0.2, 0.3, 0.1234567891234])).decimals == 13
    assert midranks([0.1 + 0.2, 0.3, 0.1234567891234]).tolist() == [2.5, 2.5, 1.0]
    mixed = [0.1 + 0.2, 0.3, 0.000001234, 123456.7, 0.30000000000001]
    assert find_grid(np.array(mixed)).decimals is None
    assert midranks(mixed).tolist() == [2.5, 2.5, 1.0, 5.0, 4.0]
    snapped = snap_to_decimals(np.array([0.1 + 0.2, 0.9999999999999999, 0.7319838918264537, 123456.789]))
    assert snapped.tolist() == [0.3, 1.0, 0.731983891826454, 123456.789]


def test_readings_whose_differences_overflow_are_refused_in_plain_words():
    """Readings near the largest float give infinite differences: a plain error, never inf in a result."""
    from rankwise.stats import compare_paired, compare_two

    with pytest.raises(ValueError, match="too large to subtract"):
        compare_two([-1.7e308, -1.6e308, 1.0], [1.7e308, 1.6e308, 2.0])
    with pytest.raises(ValueError, match="too large to subtract"):
        compare_paired([-1.7e308, 1.0, 2.0], [1.7e308, 2.0, 3.0])


def test_a_single_number_instead_of_a_list_is_named_as_such():
    from rankwise.stats import compare_two

    with pytest.raises(ValueError, match="Group A is a single value \\(3.0\\), not a list of readings"):
        compare_two(3.0, [1.0, 2.0])
