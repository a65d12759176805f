"""Validation of the numbers handed to the statistics service."""

from __future__ import annotations

import numbers
from collections.abc import Iterable, Sequence

import numpy as np

from rankwise.stats.frozen_floats import FrozenFloats


def clean_group(values: Sequence[float] | np.ndarray, label: str) -> tuple[np.ndarray, int]:
    """Return the readings of one group as floats without blanks, and how many blanks were dropped.

    Blanks are ``None`` and NaN. A flat numeric numpy array is checked in one pass without
    copying when it holds only finite readings (it is then returned as it is, so callers must not
    change it). Raises ``ValueError`` naming the group, in words saying what was expected, for a
    single number or a text instead of a list, for an entry that is not a number (a text, True or
    False, a list inside the list), for an infinite reading, or when no reading is left.
    """
    array = readings_array(values, f"Group {label}")
    if array.size and np.isfinite(array).all():
        return array, 0
    blank = np.isnan(array)
    kept = array[~blank]
    if np.isinf(kept).any():
        raise ValueError(f"Group {label} holds an infinite reading; enter finite numbers only.")
    if kept.size == 0:
        raise ValueError(f"Group {label} has no readings; enter at least one number.")
    return kept, int(blank.sum())


def readings_array(values: Sequence[float] | np.ndarray, what: str) -> np.ndarray:
    """The readings as a flat float array, blanks (None) as NaN; ``what`` names them in messages
    ("Group A", "The before readings"). Only a flat list (or 1-D array) of numbers is taken."""
    expected = "give one list of numeric readings per group, e.g. [1.2, 1.3, 1.25]"
    if isinstance(values, FrozenFloats):  # already one row of floats, read-only: used as it is
        return np.asarray(values)
    if isinstance(values, np.ndarray):
        if values.ndim != 1:
            raise ValueError(f"{what} is a table of {values.ndim} dimensions, not a list; {expected}.")
        if values.dtype.kind in "fiu":
            return values.astype(float, copy=False)
        if values.dtype.kind == "b":
            raise ValueError(f"{what} holds True/False values, not readings; {expected}.")
        values = values.tolist()
    if isinstance(values, (str, bytes)):
        raise ValueError(f"{what} is a text ({values!r:.40}), not a list of readings; {expected}.")
    if isinstance(values, numbers.Number) or not isinstance(values, Iterable):
        raise ValueError(f"{what} is a single value ({values!r:.40}), not a list of readings; {expected}.")
    entries = list(values)
    for entry in entries:
        _check_entry(entry, what, expected)
    return np.asarray([np.nan if v is None else float(v) for v in entries], dtype=float)


def _check_entry(entry: object, what: str, expected: str) -> None:
    """``ValueError`` in plain words unless ``entry`` is a number or a blank (None)."""
    if entry is None:
        return
    if isinstance(entry, (bool, np.bool_)):
        raise ValueError(f"{what} holds {entry}, a yes/no value, where a reading was expected; {expected}.")
    if isinstance(entry, (str, bytes)):
        raise ValueError(f"{what} holds the text {entry!r:.40}, which is not a number; {expected}.")
    if isinstance(entry, (numbers.Real, np.integer, np.floating)):
        return
    if isinstance(entry, Iterable):
        raise ValueError(f"{what} holds a list inside the list; {expected}.")
    raise ValueError(f"{what} holds an entry that is not a number ({entry!r:.40}); {expected}.")


def check_differences(low: np.ndarray, high: np.ndarray, what: str) -> None:
    """``ValueError`` in plain words when the differences of these readings, or sums of two of them,
    pass the largest number the computer holds (they would come out infinite)."""
    span = max(float(high.max()) - float(low.min()), float(low.max()) - float(high.min()))
    if not np.isfinite(2.0 * span):
        raise ValueError(f"{what} are too large to subtract from each other: their differences pass the "
                         "largest number this computer can hold. Enter them in a larger unit (e.g. thousands).")


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
