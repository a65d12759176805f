"""Mid-ranks and tie blocks: the one place where readings are ranked."""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from rankwise.stats.grid import find_grid
from rankwise.stats.results import TieBlock


def _ranks_of_exact_values(values: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Mid-ranks of values compared exactly, with the sort order and the blocks' starts and ends."""
    order = np.argsort(values, kind="mergesort")
    ordered = values[order]
    boundaries = np.flatnonzero(ordered[1:] != ordered[:-1]) + 1
    starts = np.concatenate(([0], boundaries))
    ends = np.concatenate((boundaries, [values.size]))
    mid = (starts + 1 + ends) / 2.0
    ranks = np.empty(values.size, dtype=float)
    ranks[order] = np.repeat(mid, ends - starts)
    return ranks, order, starts, ends


def midranks(values: Sequence[float] | np.ndarray) -> np.ndarray:
    """1-based ranks; tied readings get the average of the ranks they span (mid-ranks).

    Readings are compared on their common decimal resolution (see ``rankwise.stats.grid``), so
    binary floating-point noise never splits a true tie. Raises ``ValueError`` for NaN.
    """
    array = np.asarray(values, dtype=float).ravel()
    if np.isnan(array).any():
        raise ValueError("Readings to rank must not contain blanks (NaN); drop them first.")
    if array.size == 0:
        return array.copy()
    counts = find_grid(array).to_counts(array)
    return _ranks_of_exact_values(counts)[0]


def rank_groups(counts: Sequence[np.ndarray], values: Sequence[np.ndarray]) -> tuple[list[np.ndarray], tuple[TieBlock, ...]]:
    """Rank several groups together.

    ``counts`` are the groups on their common grid (exactly comparable), ``values`` the same
    readings in their own unit (used to label tie blocks). Returns each group's mid-ranks in entry
    order and the tie blocks (values shared by two or more readings), ascending.
    """
    sizes = [len(c) for c in counts]
    combined = np.concatenate([np.asarray(c, dtype=float) for c in counts])
    combined_values = np.concatenate([np.asarray(v, dtype=float) for v in values])
    labels = np.repeat(np.arange(len(sizes)), sizes)
    ranks, order, starts, ends = _ranks_of_exact_values(combined)
    blocks = []
    for start, end in zip(starts[ends - starts > 1], ends[ends - starts > 1]):
        members = labels[order[start:end]]
        blocks.append(
            TieBlock(
                value=float(combined_values[order[start]]),
                count=int(end - start),
                first_rank=int(start + 1),
                last_rank=int(end),
                mid_rank=float(start + 1 + end) / 2.0,
                counts_by_group=tuple(int(c) for c in np.bincount(members, minlength=len(sizes))),
            )
        )
    split = np.cumsum(sizes)[:-1]
    return list(np.split(ranks, split)), tuple(blocks)


def tie_correction_sum(counts: np.ndarray) -> float:
    """sum(t^3 - t) over the tie blocks of ``counts`` (exactly comparable readings)."""
    _, sizes = np.unique(np.asarray(counts), return_counts=True)
    sizes = sizes.astype(float)
    return float(np.sum(sizes**3 - sizes))
