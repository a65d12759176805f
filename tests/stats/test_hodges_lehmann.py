"""Hodges-Lehmann shift, Moses interval and the order-statistic selector."""

import numpy as np
import pytest

from rankwise.stats import critical_u
from rankwise.stats import hodges_lehmann as hl
from rankwise.stats.hodges_lehmann import (
    hodges_lehmann_shift,
    moses_interval,
    select_pairwise_differences,
    select_walsh_sums,
)

# Hollander & Wolfe (1999), Nonparametric Statistical Methods, 2nd ed.
TERM = [0.80, 0.83, 1.89, 1.04, 1.45, 1.38, 1.91, 1.64, 0.73, 1.46]
WEEKS = [1.15, 0.88, 0.90, 0.74, 1.21]
CONTROL = [1042, 1617, 1180, 973, 1552, 1251, 1151, 728, 1079, 951, 1319]
TREATED = [874, 389, 612, 798, 1152, 893, 541, 741, 1064, 862, 213]


def _hundredths(values):
    return np.sort(np.rint(np.asarray(values) * 100))


def test_hollander_wolfe_example_4_1_shift_and_interval():
    """Hollander & Wolfe (1999), Example 4.1, p. 110: weeks - term: -0.305, exact 95 % CI (-0.76, 0.15)."""
    term, weeks = _hundredths(TERM), _hundredths(WEEKS)
    assert hodges_lehmann_shift(term, weeks) / 100 == pytest.approx(-0.305, abs=1e-12)
    low, high = moses_interval(term, weeks, critical_u(10, 5, 0.05))
    assert (low / 100, high / 100) == pytest.approx((-0.76, 0.15), abs=1e-12)


def test_hollander_wolfe_example_4_2_shift_and_interval():
    """Hollander & Wolfe (1999), Example 4.2, p. 112: control - treated: 410, 95 % CI [168, 690]."""
    treated, control = np.sort(TREATED).astype(float), np.sort(CONTROL).astype(float)
    assert hodges_lehmann_shift(treated, control) == 410
    assert moses_interval(treated, control, critical_u(11, 11, 0.05)) == (168.0, 690.0)


@pytest.mark.parametrize("direct_limit", [1 << 18, 40, 2])
def test_selection_equals_sorting_all_differences(monkeypatch, direct_limit):
    """Brute force: build and sort all n_a n_b differences; the selector (also forced through its
    sampling rounds by a tiny direct limit) returns the same order statistics."""
    monkeypatch.setattr(hl, "_DIRECT_LIMIT", direct_limit)
    rng = np.random.default_rng(7)
    for _ in range(12):
        n_a, n_b = rng.integers(1, 300, size=2)
        a = np.sort(rng.integers(0, 25, n_a).astype(float))  # heavy ties, as from a coarse gauge
        b = np.sort(rng.integers(0, 25, n_b).astype(float))
        every = np.sort((b[None, :] - a[:, None]).ravel())
        middle = (every.size + 1) // 2
        ranks = np.r_[1, every.size, rng.integers(1, every.size + 1, 6), middle, min(middle + 1, every.size)]
        np.testing.assert_array_equal(select_pairwise_differences(a, b, ranks), every[ranks - 1])


@pytest.mark.parametrize("direct_limit", [1 << 18, 40])
def test_selection_of_off_grid_floats_equals_sorting(monkeypatch, direct_limit):
    """Readings off any decimal grid: the rounded float differences are selected consistently."""
    monkeypatch.setattr(hl, "_DIRECT_LIMIT", direct_limit)
    rng = np.random.default_rng(8)
    a = np.sort(rng.normal(size=170) * 0.1)
    b = np.sort(np.round(rng.normal(size=230), 1) * 0.3)
    every = np.sort((b[None, :] - a[:, None]).ravel())
    ranks = np.r_[1, every.size, rng.integers(1, every.size + 1, 8), 20_000, 20_001, 20_002]
    np.testing.assert_array_equal(select_pairwise_differences(a, b, ranks), every[ranks - 1])


@pytest.mark.parametrize("direct_limit", [1 << 18, 40])
def test_walsh_sums_equal_brute_force(monkeypatch, direct_limit):
    """Brute force: all n (n + 1) / 2 sums d_i + d_j, i <= j, sorted."""
    monkeypatch.setattr(hl, "_DIRECT_LIMIT", direct_limit)
    rng = np.random.default_rng(9)
    for n in (1, 2, 17, 240):
        d = np.sort(rng.integers(-30, 40, n).astype(float))
        every = np.sort(np.concatenate([d[i] + d[i:] for i in range(n)]))
        ranks = np.r_[1, every.size, rng.integers(1, every.size + 1, 5), (every.size + 1) // 2, min((every.size + 3) // 2, every.size)]
        np.testing.assert_array_equal(select_walsh_sums(d, ranks), every[ranks - 1])


def test_no_critical_value_gives_the_whole_range_of_differences():
    """3 + 3: no critical U at 5 %, so the interval is [smallest, largest difference] (by construction)."""
    assert moses_interval(np.array([1.0, 2, 3]), np.array([4.0, 5, 6]), None) == (1.0, 5.0)


def test_wrong_arguments_are_refused():
    with pytest.raises(ValueError, match="ranks"):
        select_pairwise_differences(np.array([1.0]), np.array([2.0, 3.0]), [3])
    with pytest.raises(ValueError, match="sorted_b must be sorted"):
        select_pairwise_differences(np.array([1.0]), np.array([3.0, 2.0]), [1])
    with pytest.raises(ValueError, match="critical"):
        moses_interval(np.array([1.0, 2.0]), np.array([3.0, 4.0]), 2)


def test_with_coarse_ties_the_interval_still_covers_at_least_its_level():
    """What the interval does with ties, by seeded simulation: invented readings on a whole-number
    gauge, true shift 2 (a whole number of gauge steps), 800 draws of 12 + 15 readings. The closed
    Moses interval with the no-ties critical value keeps at least 95 % coverage (it is wider than
    needed: about 99 % here), which is why the result calls it conservative when readings tie."""
    rng = np.random.default_rng(1)
    c = critical_u(12, 15, 0.05)
    covered = 0
    for _ in range(800):
        a = np.sort(np.round(rng.normal(0.0, 1.5, 12)))
        b = np.sort(np.round(rng.normal(0.0, 1.5, 15)) + 2.0)
        low, high = moses_interval(a, b, c)
        covered += low <= 2.0 <= high
    assert covered / 800 >= 0.95
