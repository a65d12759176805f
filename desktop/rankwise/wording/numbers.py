"""Numbers as people read them: readings at the gauge's resolution, p-values, percentages.

Every number is written with the decimal mark the technician typed ("." or ","): the formatters
take it as ``mark``, and ``write_numbers`` applies it to a whole worded text at once.
"""

from __future__ import annotations

import math
import re
from collections.abc import Iterable

MISSING = "—"
"""Shown where a number does not apply or could not be computed."""

DECIMAL_MARKS = (".", ",")
"""The decimal marks a number can be written with."""

_P_FLOOR = 0.0001
_DECIMAL_POINT = re.compile(r"(?<=\d)\.(?=\d)")


def with_mark(text: str, mark: str = ".") -> str:
    """``text`` (written by Python, with decimal points) with ``mark`` as its decimal mark.

    Only a point between two digits is a decimal point; a full stop ending a sentence is kept.
    Raises ``ValueError`` when ``mark`` is not "." or ",".
    """
    if mark not in DECIMAL_MARKS:
        raise ValueError(f'mark must be "." or ","; got {mark!r}.')
    return text if mark == "." else _DECIMAL_POINT.sub(mark, text)


def write_numbers(text: str, mark: str = ".", keep: Iterable[str] = ()) -> str:
    """A worded text with its numbers written with ``mark``, leaving the ``keep`` texts (the names
    and units the technician typed, which may hold points of their own) exactly as typed."""
    kept = sorted({k for k in keep if _DECIMAL_POINT.search(k)}, key=len, reverse=True)
    if mark == "." or not kept:
        return with_mark(text, mark)
    pieces = re.split("(" + "|".join(re.escape(k) for k in kept) + ")", text)
    return "".join(piece if index % 2 else with_mark(piece, mark) for index, piece in enumerate(pieces))


def format_reading(value: float | None, decimals: int | None, mark: str = ".") -> str:
    """A reading (or a shift, an interval end) with ``decimals`` decimals, or 6 significant digits.

    ``decimals`` is the gauge's resolution as typed (``GroupReadings.decimals``); None means it is
    not known, and the value is shown with up to six significant digits. Missing values show as "—".
    ``mark`` is the decimal mark to write ("." or ",").
    """
    if value is None or not math.isfinite(value):
        return MISSING
    if decimals is None:
        text = f"{value:.6g}"
    else:
        if decimals < 0:
            raise ValueError(f"decimals must be 0 or more; got {decimals!r}.")
        text = f"{value:.{decimals}f}"
    text = "0" + text[2:] if text.startswith("-0") and float(text) == 0.0 else text
    return with_mark(text, mark)


def format_p(p: float | None, alpha: float | None = None, mark: str = ".") -> str:
    """A p-value: "< 0.0001" below that, three significant digits below 0.1, else three decimals.

    With ``alpha`` given, digits are added until the shown value lies on the same side of
    ``alpha`` as the true one, so that a shown "0.0500" never stands for a significant 0.04996.
    ``mark`` is the decimal mark to write ("." or ",").
    """
    if p is None or not math.isfinite(p):
        return MISSING
    if not 0.0 <= p <= 1.0:
        raise ValueError(f"p must lie between 0 and 1; got {p!r}.")
    if p < _P_FLOOR:
        return with_mark("< 0.0001", mark)
    digits = 3
    while True:
        text = f"{p:.{digits}f}" if p >= 0.1 else _significant(p, digits)
        if alpha is None or digits >= 8 or (float(text) <= alpha) == (p <= alpha):
            return with_mark(text, mark)
        digits += 1


def _significant(value: float, digits: int) -> str:
    """``value`` (0 < value < 1) with ``digits`` significant digits, written without an exponent."""
    exponent = math.floor(math.log10(value))
    decimals = max(0, digits - 1 - exponent)
    text = f"{value:.{decimals}f}"
    if float(text) >= 10.0 ** (exponent + 1):  # rounding carried into the next decade
        text = f"{value:.{max(0, decimals - 1)}f}"
    return text


def format_percent(share: float | None, decimals: int = 0, mark: str = ".") -> str:
    """A share (0..1) as a percentage with a space before the sign, e.g. "95 %" (``mark``: the decimal mark)."""
    if share is None or not math.isfinite(share):
        return MISSING
    return with_mark(f"{100.0 * share:.{decimals}f} %", mark)


def format_level(share: float) -> str:
    """A significance or confidence level as a percentage, with only the decimals it needs ("5 %", "2.5 %")."""
    return f"{100.0 * share:.4g} %"


def format_plain(value: float | None, significant: int = 4) -> str:
    """A statistic without a unit (z, H, a ratio) with a few significant digits."""
    if value is None or not math.isfinite(value):
        return MISSING
    return f"{value:.{significant}g}"


def format_count(value: float | None, mark: str = ".") -> str:
    """A count or a rank sum: whole numbers without decimals, halves (from ties) with one."""
    if value is None or not math.isfinite(value):
        return MISSING
    if float(value).is_integer():
        return str(int(value))
    return with_mark(f"{value:.1f}" if (2 * value).is_integer() else f"{value:.4g}", mark)


def format_centre(value: float | None, decimals: int | None) -> str:
    """A median, quartile, shift or interval end: at the readings' resolution when it falls on the
    gauge's grid, otherwise one decimal finer (a median of two readings can fall half-way)."""
    if value is None or not math.isfinite(value) or decimals is None:
        return format_reading(value, decimals)
    scaled = value * 10.0**decimals
    on_grid = abs(scaled - round(scaled)) <= 1e-9 * max(1.0, abs(scaled))
    return format_reading(value, decimals if on_grid else decimals + 1)


def format_setting(value: float | None, decimals: int | None) -> str:
    """A number the user chose (a margin, a planned shift): never rounded away, and shown with at
    least the readings' decimals ("0.05" stays "0.05" even for readings to one decimal)."""
    if value is None or not math.isfinite(value):
        return MISSING
    plain = f"{value:.6g}"
    if "e" in plain:
        return plain
    needed = len(plain.partition(".")[2])
    return format_reading(value, max(needed, decimals or 0))
