"""Mid-ranks and tie blocks: the one place where readings are ranked."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from itertools import accumulate

import numpy as np

from rankwise.stats.grid import find_grid
from rankwise.stats.results import TieBlock


COUNTING_RANGE_FACTOR = 4
"""Whole-number readings spanning at most this many steps per reading are ranked by counting."""


@dataclass(frozen=True)
class _Ties:
    """The blocks of two or more level readings, ascending (arrays of equal length).

    starts, ends: 0-based positions of each block in sorted order (end exclusive);
    first_entries: each block's first reading in entry order; by_group: readings per group.
    """

    starts: np.ndarray
    ends: np.ndarray
    first_entries: np.ndarray
    by_group: np.ndarray


def _rank_exact_values(values: np.ndarray, sizes: Sequence[int]) -> tuple[np.ndarray, _Ties]:
    """Mid-ranks of values compared exactly, and their tie blocks (``sizes``: the groups, in order).

    Whole numbers in a narrow range (readings on a gauge's grid) are ranked by counting, in time
    proportional to the number of readings; other values by sorting.
    """
    span = _counting_span(values)
    if span is not None:
        return _rank_by_counting(values, sizes, span)
    return _rank_by_sorting(values, sizes)


def _exact_midranks(values: np.ndarray) -> np.ndarray:
    """The mid-ranks of ``_rank_exact_values`` alone, without looking for tie blocks."""
    span = _counting_span(values)
    if span is None:
        return _rank_by_sorting(values, [values.size])[0]
    offsets = _offsets(values)
    tally = np.bincount(offsets, minlength=span)
    return (np.cumsum(tally) - (tally - 1) / 2.0)[offsets]


def _counting_span(values: np.ndarray) -> int | None:
    """max - min + 1 when every value is a whole number and max - min <= COUNTING_RANGE_FACTOR * count
    (the values are then ranked by counting), else None."""
    if not values.size:
        return None
    low, high = values.min(), values.max()
    if not high - low <= COUNTING_RANGE_FACTOR * values.size:
        return None
    if values.size > 256 and not (values[:256] == np.rint(values[:256])).all():
        return None
    if not (values == np.rint(values)).all():
        return None
    return int(high - low) + 1


def _offsets(values: np.ndarray) -> np.ndarray:
    """Whole-number values as steps above their minimum: their places in a tally."""
    return (values - values.min()).astype(np.intp)


def _rank_by_counting(values: np.ndarray, sizes: Sequence[int], span: int) -> tuple[np.ndarray, _Ties]:
    """Mid-rank of value v: (readings below v) + (readings level with v + 1) / 2, from a tally."""
    offsets = _offsets(values)
    bounds = [0, *accumulate(sizes)]
    by_value = np.stack([np.bincount(offsets[s:e], minlength=span) for s, e in zip(bounds[:-1], bounds[1:])])
    tally = by_value.sum(axis=0)
    ends = np.cumsum(tally)
    ranks = (ends - (tally - 1) / 2.0)[offsets]
    tied = np.flatnonzero(tally > 1)
    starts = (ends - tally)[tied]
    # In a stable order by value, a block's first reading in entry order comes first.
    first_entries = np.argsort(offsets, kind="stable")[starts]
    ties = _Ties(starts=starts, ends=ends[tied], first_entries=first_entries, by_group=by_value[:, tied].T)
    return ranks, ties


def _rank_by_sorting(values: np.ndarray, sizes: Sequence[int]) -> tuple[np.ndarray, _Ties]:
    """Mid-ranks from one sort.

    The sort need not be stable: a mid-rank depends only on how many readings lie below and level
    with a reading, not on the order inside a tie block.
    """
    order = np.argsort(values, kind="quicksort")
    ordered = values[order]
    boundaries = np.flatnonzero(ordered[1:] != ordered[:-1]) + 1
    ranks = np.empty(values.size, dtype=float)
    if boundaries.size == values.size - 1:  # no ties: the ranks are the sorted positions
        ranks[order] = np.arange(1.0, values.size + 1.0)
        empty = np.zeros(0, dtype=np.intp)
        return ranks, _Ties(empty, empty, empty, np.zeros((0, len(sizes)), dtype=np.intp))
    starts = np.concatenate(([0], boundaries))
    ends = np.concatenate((boundaries, [values.size]))
    ranks[order] = np.repeat((starts + 1 + ends) / 2.0, ends - starts)
    tied = ends - starts > 1
    group_of = np.searchsorted(np.cumsum(sizes), order, side="right")
    by_group = np.stack([np.add.reduceat(group_of == g, starts)[tied] for g in range(len(sizes))], axis=1)
    first_entries = np.minimum.reduceat(order, starts)[tied]
    return ranks, _Ties(starts=starts[tied], ends=ends[tied], first_entries=first_entries, by_group=by_group)


def midranks(values: Sequence[float] | np.ndarray) -> np.ndarray:
    """1-based ranks; tied readings get the average of the ranks they span (mid-ranks).

    Readings are compared on their common decimal resolution, or off every grid as the decimals
    they were typed as (up to 15 significant digits; see ``rankwise.stats.grid``), so binary
    floating-point noise never splits a true tie. Raises ``ValueError`` for NaN.
    """
    array = np.asarray(values, dtype=float).ravel()
    if np.isnan(array).any():
        raise ValueError("Readings to rank must not contain blanks (NaN); drop them first.")
    if array.size == 0:
        return array.copy()
    return _exact_midranks(find_grid(array).to_counts(array))


def midranks_on_grid(counts: np.ndarray) -> np.ndarray:
    """Mid-ranks of readings already on their common grid (``Grid.to_counts`` of every reading
    compared): the same ranks ``midranks`` gives the readings themselves, without finding the grid again."""
    array = np.asarray(counts, dtype=float).ravel()
    return _exact_midranks(array) if array.size else array.copy()


def midranks_on_grid_together_and_within(groups: Sequence[np.ndarray]) -> tuple[np.ndarray, list[np.ndarray]]:
    """``midranks_on_grid`` of the groups together (in entry order) and of each group alone, from one
    tally when the readings are ranked by counting."""
    arrays = [np.asarray(g, dtype=float).ravel() for g in groups]
    combined = np.concatenate(arrays)
    span = _counting_span(combined)
    if span is None:
        return midranks_on_grid(combined), [midranks_on_grid(g) for g in arrays]
    offsets = _offsets(combined)
    bounds = [0, *accumulate(g.size for g in arrays)]
    within, tally = [], np.zeros(span, dtype=np.intp)
    for start, end in zip(bounds[:-1], bounds[1:]):
        # Steps left empty below a group's lowest reading change none of its cumulative counts.
        group_tally = np.bincount(offsets[start:end], minlength=span)
        within.append((np.cumsum(group_tally) - (group_tally - 1) / 2.0)[offsets[start:end]])
        tally += group_tally
    return (np.cumsum(tally) - (tally - 1) / 2.0)[offsets], within


def rank_groups(counts: Sequence[np.ndarray], values: Sequence[np.ndarray]) -> tuple[list[np.ndarray], tuple[TieBlock, ...]]:
    """Rank several groups together.

    ``counts`` are the groups on their common grid (exactly comparable), ``values`` the same
    readings in their own unit (used to label tie blocks). Returns each group's mid-ranks in entry
    order and the tie blocks (values shared by two or more readings), ascending, each labelled by
    its first reading in entry order.
    """
    sizes = [len(c) for c in counts]
    combined = np.concatenate([np.asarray(c, dtype=float) for c in counts])
    ranks, ties = _rank_exact_values(combined, sizes)
    bounds = [0, *accumulate(sizes)]
    blocks = ()
    if ties.starts.size:
        combined_values = np.concatenate([np.asarray(v, dtype=float) for v in values])
        blocks = tuple(
            TieBlock(
                value=value,
                count=end - start,
                first_rank=start + 1,
                last_rank=end,
                mid_rank=(start + 1 + end) / 2.0,
                counts_by_group=tuple(group_counts),
            )
            for value, start, end, group_counts in zip(
                combined_values[ties.first_entries].tolist(), ties.starts.tolist(), ties.ends.tolist(),
                ties.by_group.tolist())
        )
    return [ranks[start:end] for start, end in zip(bounds[:-1], bounds[1:])], blocks


def tie_correction_sum(counts: np.ndarray) -> float:
    """sum(t^3 - t) over the tie blocks of ``counts`` (exactly comparable readings)."""
    _, sizes = np.unique(np.asarray(counts), return_counts=True)
    sizes = sizes.astype(float)
    return float(np.sum(sizes**3 - sizes))
