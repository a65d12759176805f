"""An unchangeable run of floats, held in one read-only numpy array.

A result keeps some long runs of numbers (a null distribution has thousands of values). As a tuple
each value is a Python object of 32 bytes, made one at a time; here the run is one array of 8 bytes
a value, made at once. ``FrozenFloats`` reads, compares and hashes like the tuple of its values, so
a result stays a frozen value equal to itself however it was made (computed, or read from a record).
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator, Sequence
from typing import Any, overload

import numpy as np


class FrozenFloats(Sequence[float]):
    """The floats ``values`` (copied), in order; ``numpy.asarray`` gives them without a copy, read-only."""

    __slots__ = ("_array",)

    def __init__(self, values: Iterable[float] | np.ndarray = ()) -> None:
        array = np.array(values if isinstance(values, np.ndarray) else list(values), dtype=np.float64)
        if array.ndim != 1:
            raise ValueError(f"A run of floats is one row of numbers; got an array of shape {array.shape}.")
        array.flags.writeable = False
        self._array = array

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
            return bool(np.array_equal(self._array, other._array))
        if isinstance(other, tuple):
            return len(other) == self._array.size and all(a == b for a, b in zip(self._array.tolist(), other))
        return NotImplemented

    def __hash__(self) -> int:
        return hash(tuple(self._array.tolist()))

    def __repr__(self) -> str:
        return f"FrozenFloats({self._array.tolist()!r})"
