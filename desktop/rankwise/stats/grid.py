"""Readings on the gauge's grid: whole numbers of the last decimal, so that ties are exact.

A reading typed as 0.42 is stored as a binary float near 0.42; differences such as 0.45 - 0.03
then carry noise in the last bits, which could split a true tie or create a false one. Before
ranking or differencing, readings are mapped to integers in units of their finest decimal (the
readings' resolution), where every comparison and subtraction is exact. Readings with different
magnitudes can need more digits than such integers hold (0.000001234 beside 123456.7); they are
then ranked as the decimals they were typed as: each reading is snapped to the shortest decimal
of at most 15 significant digits within a few units in its last place (the typed text, read back),
so binary noise never splits a tie; a reading with more digits than that is kept as it is.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

MAX_DECIMALS = 15
"""Finest resolution searched for; readings needing more (or too large for it) are snapped to decimals."""

SIGNIFICANT_DIGITS = 15
"""Readings off every common grid are taken as decimals of at most this many significant digits."""

_EXACT_INTEGER_LIMIT = 2.0**52


@dataclass(frozen=True)
class Grid:
    """A common resolution for a set of readings.

    Attributes:
        decimals: number of decimals of the resolution, or None when the readings are not on
            any grid up to ``MAX_DECIMALS`` (they are then used as floats, unchanged).
    """

    decimals: int | None

    @property
    def step(self) -> float:
        """The resolution in the readings' unit (1 for whole numbers, 0.01 for two decimals)."""
        return 1.0 if self.decimals is None else 10.0 ** (-self.decimals)

    def to_counts(self, values: np.ndarray) -> np.ndarray:
        """Readings as whole numbers of ``step`` (held in float64, exactly), or, off every grid, as
        the decimals they were typed as (``snap_to_decimals``)."""
        values = np.asarray(values, dtype=float)
        if self.decimals is None:
            return snap_to_decimals(values)
        return np.rint(values * 10.0**self.decimals)

    def to_readings(self, counts: np.ndarray | float) -> np.ndarray | float:
        """Map counts (or differences of counts) back to the readings' unit."""
        if self.decimals is None:
            return counts
        return counts / 10.0**self.decimals


def snap_to_decimals(values: np.ndarray) -> np.ndarray:
    """Each value as the nearest decimal of 15 (or 16) significant digits when that lies within 4
    units in its last place (0.30000000000000004 becomes 0.3, the value typed), else unchanged. Readings
    typed as the same decimal of up to 15 significant digits always come out equal, and the
    mapping never reverses an order."""
    values = np.asarray(values, dtype=float)
    result = values.copy()
    nonzero = np.flatnonzero((values != 0.0) & np.isfinite(values))
    if nonzero.size == 0:
        return result
    chosen = values[nonzero]
    _, binary_exponent = np.frexp(chosen)  # chosen = m 2^e, 0.5 <= |m| < 1; one unit in the last place is 2^(e - 53)
    # floor(log10 |chosen|) or one less: 15 or 16 significant digits, the same for equal typed decimals.
    power = SIGNIFICANT_DIGITS - 1 - np.floor((binary_exponent - 1) * _LOG10_2).astype(np.int64)
    scale = _POWERS_OF_TEN[np.minimum(np.abs(power), _POWERS_OF_TEN.size - 1)]
    with np.errstate(over="ignore", invalid="ignore"):  # the branch not taken may overflow
        snapped = np.where(power >= 0, np.rint(chosen * scale) / scale, np.rint(chosen / scale) * scale)
        fits = np.abs(snapped - chosen) <= np.ldexp(1.0, binary_exponent - 51)
    result[nonzero[fits]] = snapped[fits]
    return result


_LOG10_2 = float(np.log10(2.0))
_POWERS_OF_TEN = 10.0 ** np.arange(0, 309)
"""10^0 .. 10^308, the powers of ten a float holds."""


def _fits(values: np.ndarray, decimals: int) -> bool:
    """True when every reading is, within a few units in the last place, a whole number of 10^-decimals.

    A decimal typed as text and parsed to float comes back exactly from round(x * 10^d) / 10^d,
    because both the parsing and the division round correctly; a few units in the last place are
    allowed for values that passed through spreadsheet arithmetic.
    """
    scale = 10.0**decimals
    if not _first_readings_fit(values, scale):
        return False
    for start in range(0, values.size, _CHUNK):
        if not _chunk_fits(values[start:start + _CHUNK], scale):
            return False
    return True


_CHUNK = 1 << 15
"""Readings checked at a time: the temporaries stay in the processor's cache."""


def _chunk_fits(values: np.ndarray, scale: float) -> bool:
    """``_fits`` for one chunk of readings and the scale 10^decimals."""
    with np.errstate(over="ignore"):  # readings near the float limit fit no grid
        scaled = values * scale
    if not max(scaled.max(), -scaled.min()) < _EXACT_INTEGER_LIMIT:
        return False
    off = np.rint(scaled, out=scaled)
    off /= scale
    off -= values
    np.abs(off, out=off)
    allowed = np.abs(values)
    np.spacing(allowed, out=allowed)
    allowed *= 4.0
    return bool(np.all(off <= allowed))


_FIRST_READINGS = 4
"""Readings checked one by one before a whole chunk: most resolutions too coarse fail on them."""


def _first_readings_fit(values: np.ndarray, scale: float) -> bool:
    """``_chunk_fits`` for the first few readings, in the same float arithmetic one reading at a
    time (Python's round is numpy's rint, half to even; math.ulp is numpy's spacing of |x|)."""
    for value in values[:_FIRST_READINGS].tolist():
        scaled = value * scale
        if not abs(scaled) < _EXACT_INTEGER_LIMIT:
            return False
        if not abs(float(round(scaled)) / scale - value) <= 4.0 * math.ulp(abs(value)):
            return False
    return True


PREFIX_READINGS = 256
"""The search first runs on this many readings: no set needs fewer decimals than a part of it."""


def find_grid(*groups: np.ndarray) -> Grid:
    """The coarsest resolution (fewest decimals) on which every reading of every group lies.

    The coarsest resolution of the first ``PREFIX_READINGS`` readings is a lower bound for the
    whole set (a set fits a resolution only if each of its parts does), so the full search starts
    there and usually checks the whole set once; continuous data are mostly settled by the prefix.
    """
    combined = np.concatenate([np.asarray(g, dtype=float).ravel() for g in groups]) if groups else np.array([])
    if not np.isfinite(combined).all():
        combined = combined[np.isfinite(combined)]
    start = _coarsest_fit(combined[:PREFIX_READINGS], 0)
    if start is None or combined.size <= PREFIX_READINGS:  # the prefix was the whole set
        return Grid(start)
    return Grid(_coarsest_fit(combined, start))


def _coarsest_fit(values: np.ndarray, fewest: int) -> int | None:
    """The fewest decimals, from ``fewest`` up to ``MAX_DECIMALS``, that ``values`` fit, or None."""
    for decimals in range(fewest, MAX_DECIMALS + 1):
        if _fits(values, decimals):
            return decimals
    return None
