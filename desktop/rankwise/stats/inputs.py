"""Validation of the numbers handed to the statistics service."""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np


def clean_group(values: Sequence[float] | np.ndarray, label: str) -> tuple[np.ndarray, int]:
    """Return the readings of one group as floats without blanks, and how many blanks were dropped.

    Blanks are ``None`` and NaN. A numeric numpy array is checked in one pass without copying
    when it holds only finite readings (it is then returned as it is, so callers must not change
    it). Raises ``ValueError`` naming the group when an entry is not a number, when a reading is
    infinite, or when no reading is left.
    """
    if isinstance(values, np.ndarray) and values.dtype.kind in "fiu":
        array = values.astype(float, copy=False).ravel()
        if array.size and np.isfinite(array).all():
            return array, 0
    else:
        array = _numbers_or_blanks(values, label)
    blank = np.isnan(array)
    kept = array[~blank]
    if np.isinf(kept).any():
        raise ValueError(f"Group {label} holds an infinite reading; enter finite numbers only.")
    if kept.size == 0:
        raise ValueError(f"Group {label} has no readings; enter at least one number.")
    return kept, int(blank.sum())


def _numbers_or_blanks(values: Sequence[float], label: str) -> np.ndarray:
    """Entries one by one as floats, ``None`` as NaN; ``ValueError`` naming the group for anything else."""
    try:
        return np.asarray([np.nan if v is None else v for v in values], dtype=float).ravel()
    except (TypeError, ValueError) as error:
        raise ValueError(
            f"Group {label} holds an entry that is not a number; only numeric readings can be ranked."
        ) from error


def check_choice(name: str, value: str, allowed: Sequence[str]) -> str:
    """Return ``value`` if it is one of ``allowed``, else raise ``ValueError`` naming the argument."""
    if value not in allowed:
        choices = ", ".join(repr(a) for a in allowed)
        raise ValueError(f"{name} must be one of {choices}; got {value!r}.")
    return value


def check_level(name: str, value: float) -> float:
    """Return ``value`` if it lies strictly between 0 and 1, else raise ``ValueError``."""
    if not 0.0 < float(value) < 1.0:
        raise ValueError(f"{name} must lie strictly between 0 and 1; got {value!r}.")
    return float(value)
