"""An unchangeable run of floats, held in one read-only numpy array.

An analysis and its result keep long runs of numbers (a million readings, a null distribution of
thousands of values). As a tuple each value is a Python object of 32 bytes, made one at a time; here
the run is one array of 8 bytes a value, made at once. ``FrozenFloats`` reads, compares and hashes
like the tuple of its values, so an analysis or a result stays a frozen value equal to itself
however it was made (computed, or read from a record). A blank (NaN) equals a blank, as
``math.nan`` does in a tuple.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Iterator, Sequence
from typing import Any, overload

import numpy as np


class FrozenFloats(Sequence[float]):
    """The floats ``values`` (copied; another ``FrozenFloats`` is shared, as it cannot change), in
    order; ``numpy.asarray`` gives them without a copy, read-only."""

    __slots__ = ("_array",)

    def __init__(self, values: Iterable[float] | np.ndarray = ()) -> None:
        if isinstance(values, FrozenFloats):
            self._array = values._array
            return
        array = np.array(values if isinstance(values, np.ndarray) else list(values), dtype=np.float64)
        if array.ndim != 1:
            raise ValueError(f"A run of floats is one row of numbers; got an array of shape {array.shape}.")
        array.flags.writeable = False
        self._array = array

    @classmethod
    def handed_over(cls, array: np.ndarray) -> FrozenFloats:
        """The floats of ``array`` (one row of float64) without a copy, made read-only: for an array just
        computed, whose maker keeps no other way to change it."""
        if array.ndim != 1 or array.dtype != np.float64:
            raise ValueError(f"Only one row of float64 can be handed over; got {array.dtype} of shape {array.shape}.")
        array.flags.writeable = False
        run = cls.__new__(cls)
        run._array = array
        return run

    def __len__(self) -> int:
        return self._array.size

    @overload
    def __getitem__(self, index: int) -> float: ...

    @overload
    def __getitem__(self, index: slice) -> FrozenFloats: ...

    def __getitem__(self, index: int | slice) -> float | FrozenFloats:
        if isinstance(index, slice):
            return FrozenFloats(self._array[index])
        return float(self._array[index])

    def __iter__(self) -> Iterator[float]:
        return iter(self._array.tolist())

    def __array__(self, dtype: Any = None, copy: bool | None = None) -> np.ndarray:
        return np.array(self._array, dtype=dtype, copy=copy)

    def __eq__(self, other: object) -> bool:
        if isinstance(other, FrozenFloats):
            return bool(np.array_equal(self._array, other._array, equal_nan=True))
        if isinstance(other, tuple):
            return len(other) == self._array.size and all(
                a == b or (a != a and b != b) for a, b in zip(self._array.tolist(), other))
        return NotImplemented

    def __hash__(self) -> int:
        return hash(tuple(value if value == value else math.nan for value in self._array.tolist()))

    def __repr__(self) -> str:
        return f"FrozenFloats({self._array.tolist()!r})"


def freeze_fields(frozen: object, *names: str) -> None:
    """Turn the fields ``names`` of a frozen dataclass into ``FrozenFloats`` (any sequence of numbers given)."""
    for name in names:
        if not isinstance(getattr(frozen, name), FrozenFloats):
            object.__setattr__(frozen, name, FrozenFloats(getattr(frozen, name)))
