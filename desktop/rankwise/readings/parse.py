"""Reading one typed or exported value: decimal point or comma, signs, exponents, units, notes.

The text is never changed; the result is a ``Cell`` that keeps it beside the number, or beside
the plain-words reason why it is not one. Thousands separators are accepted only where they
cannot be mistaken for a decimal mark. Infinity, not-a-number, and numbers too large or too
small for a binary float (1e309, 2e-400) are flagged, never turned into inf or 0.
"""

from __future__ import annotations

import functools
import locale
import math
import os
import re

from rankwise.readings.cells import EMPTY_CELL, Cell, CellKind

DECIMAL_CHOICES = ("auto", ".", ",")
"""Allowed decimal settings: take the mark each value shows (the machine's for "1,234"), a point,
or a comma."""

MAX_TEXT_LENGTH = 200
"""Longer cell texts are not readings (a pasted paragraph, a huge cell in a damaged export)."""

_MINUS_SIGNS = "-\u2212\u2012\u2013\ufe63\uff0d"
_GROUP_SPACES = " \u00a0\u202f\u2009\u2007'\u2019"
"""Characters used only to group thousands: spaces (plain, no-break, thin) and apostrophes."""

_NUMBER_START = re.compile(
    r"(?P<sign>[+" + re.escape(_MINUS_SIGNS) + r"]?)\s*"
    r"(?P<mantissa>[0-9.," + re.escape(_GROUP_SPACES) + r"]*[0-9][0-9.," + re.escape(_GROUP_SPACES) + r"]*)"
    r"(?:[eE](?P<exponent>[+" + re.escape(_MINUS_SIGNS) + r"]?[0-9]{1,4}))?"
    r"\s*(?P<suffix>.*)",
    re.DOTALL,
)
_DATE_OR_TIME = re.compile(
    r"(?:\d{4}|\d{1,2})[-/.]\d{1,2}[-/.](?:\d{4}|\d{2})(?:[ T]\d{1,2}:\d{2}(?::\d{2}(?:[.,]\d+)?)?)?"
    r"|\d{1,2}:\d{2}(?::\d{2}(?:[.,]\d+)?)?(?:\s*[AaPp][Mm])?"
)
"""Dates ("2026-03-02", "02.03.2026", "3/2/26") and times ("14:05", "14:05:30"): never readings."""
_NOT_FINITE = re.compile(r"[+" + re.escape(_MINUS_SIGNS) + r"]?\s*(?:inf|infinity|nan|\u221e)", re.IGNORECASE)
"""Infinity and not-a-number, as programs write them: flagged, never a reading."""
SMALLEST_NORMAL = 2.2250738585072014e-308
"""The smallest positive normal binary64 number (IEEE 754; sys.float_info.min): below it digits are lost."""

_COMMA_LANGUAGES = frozenset(
    "af az be bg bs ca cs da de el es et eu fi fo fr gl hr hu hy id is it ka kk ky lt lv mk mn nb "
    "nl nn no pl pt ro ru sk sl sq sr sv tr uk uz vi".split()
)
"""Languages whose usual locales write a decimal comma (common practice, no source)."""


@functools.lru_cache(maxsize=1)
def machine_decimal() -> str:
    """The decimal mark this machine's locale uses, "." or ",": the first guess for ambiguous values."""
    for variable in ("LC_ALL", "LC_NUMERIC", "LANG"):
        name = os.environ.get(variable, "")
        if name:
            break
    else:
        name = locale.getlocale(locale.LC_NUMERIC)[0] or ""
    language = name.split("_")[0].split(".")[0].lower()
    return "," if language in _COMMA_LANGUAGES else "."


def check_decimal(decimal: str) -> str:
    """Return ``decimal`` if it is "auto", "." or ",", else raise ``ValueError`` naming the argument."""
    if decimal not in DECIMAL_CHOICES:
        raise ValueError(f'decimal must be "auto", "." or ","; got {decimal!r}.')
    return decimal


def same_unit(written: str, unit: str) -> bool:
    """True when a unit written after a number is the group's unit ("um" and "μm" count as "µm")."""
    return _unit_key(written) == _unit_key(unit)


def _unit_key(unit: str) -> str:
    key = unit.strip().replace("\u03bc", "\u00b5")
    if len(key) > 1 and key[0] == "u":
        key = "\u00b5" + key[1:]
    return key


def parse_reading(text: str, *, decimal: str = "auto", unit: str = "") -> Cell:
    """Read one cell's text as a reading, a censored reading, a note, a blank, or an unreadable entry.

    Args:
        text: the text exactly as typed or read.
        decimal: "." or "," for the decimal mark, or "auto" (an unambiguous mark is taken as it
            is; "1,234" or "1.234" is read with the machine's mark). A number whose only separator
            is not the decimal mark and could group thousands ("1,002" with a decimal point) is
            flagged, never read as 1002: the person may have meant 1.002.
        unit: the group's unit; a number followed by this unit ("0,42 µm") is a reading, a
            number followed by any other text is not.
    """
    if not isinstance(text, str):
        raise ValueError(f"text must be a str; got {type(text).__name__}.")
    check_decimal(decimal)
    stripped = text.strip()
    if not stripped:
        return EMPTY_CELL if text == "" else Cell(text, CellKind.EMPTY)
    if len(stripped) > MAX_TEXT_LENGTH:
        return _invalid(text, f"The entry is {len(stripped)} characters long, too long to be a reading.")
    if stripped[0] in "<\u2264":
        return _censored(text, stripped[1:].lstrip(), decimal, unit)
    if stripped[0] in ">\u2265":
        return _invalid(
            text,
            f"'{_short(text)}' is above a limit; only readings below a detection limit can be ranked, "
            "so type the measured value or a note.",
        )
    if _NOT_FINITE.fullmatch(stripped):
        return _invalid(text, f"'{_short(text)}' is not a finite number, so it cannot be a reading.")
    if _DATE_OR_TIME.fullmatch(stripped):
        return Cell(text, CellKind.NOTE, reason=f"'{_short(text)}' is a date or a time, not a reading.")
    read = _read_number(stripped, decimal, unit)
    if read is None:
        return Cell(text, CellKind.NOTE, reason=f"Text note '{_short(text)}', not a reading.")
    if isinstance(read, str):
        return _invalid(text, read)
    value, decimals = read
    return Cell(text, CellKind.NUMBER, value=value, decimals=decimals)


def _censored(text: str, body: str, decimal: str, unit: str) -> Cell:
    read = _read_number(body, decimal, unit) if body else None
    if read is None or isinstance(read, str):
        why = "" if read is None else " " + read
        return _invalid(
            text,
            f"'{_short(text)}' looks like a reading below a detection limit, but the limit cannot be read.{why}",
        )
    limit, decimals = read
    return Cell(
        text, CellKind.CENSORED, limit=limit, decimals=decimals,
        reason=f"Below the detection limit {body.strip()}: ranked below every measured reading.",
    )


def _read_number(stripped: str, decimal: str, unit: str) -> tuple[float, int] | str | None:
    """(value, decimals) for a readable number, a reason for a failed attempt, None for a note."""
    match = _NUMBER_START.fullmatch(stripped)
    if match is None:
        return None
    suffix = match["suffix"].strip()
    if suffix and not same_unit(suffix, unit):
        if unit:
            return (
                f"'{_short(stripped)}' ends in '{_short(suffix, 20)}', which is not this group's unit ({unit}); "
                "type the number alone or correct the unit."
            )
        return (
            f"'{_short(stripped)}' ends in '{_short(suffix, 20)}' but this group has no unit; "
            "type the number alone or set the group's unit."
        )
    split = _split_mantissa(match["mantissa"].strip(_GROUP_SPACES), decimal)
    if isinstance(split, str):
        return f"'{_short(stripped)}' cannot be read as a number: {split}"
    whole, fraction = split
    exponent = int(_ascii_sign(match["exponent"] or "0"))
    negative = match["sign"] not in ("", "+")
    value = float(f"{'-' if negative else ''}{whole or '0'}.{fraction or '0'}e{exponent}")
    if not math.isfinite(value):
        return f"'{_short(stripped)}' is too large to be a reading."
    if abs(value) < SMALLEST_NORMAL and (whole.strip("0") or fraction.strip("0")):
        return f"'{_short(stripped)}' is too small to be kept as a number (it would read as 0 or lose digits)."
    return value, max(0, len(fraction) - exponent)


def _split_mantissa(mantissa: str, decimal: str) -> tuple[str, str] | str:
    """The whole-number digits and the fraction digits, or a reason why the digits cannot be read."""
    points, commas = mantissa.count("."), mantissa.count(",")
    if points and commas:
        mark = "." if mantissa.rfind(".") > mantissa.rfind(",") else ","
        if decimal != "auto" and mark != decimal:
            return f"it uses both a point and a comma, and the last one is not this sheet's decimal mark ('{decimal}')."
        if mantissa.count(mark) > 1:
            return "it has more than one decimal mark."
    elif points or commas:
        sign = "." if points else ","
        if points + commas > 1:
            if decimal == sign:
                return "it has more than one decimal mark."
            mark = None
        elif decimal == sign:
            mark = sign
        elif decimal != "auto":
            name = "comma" if sign == "," else "point"
            if not _is_grouped(mantissa, sign):
                return (
                    f"it has a {name}, but this sheet reads a decimal '{decimal}'; "
                    "change the sheet's decimal mark or retype it."
                )
            grouped, decimal_form = _both_readings(mantissa, sign)
            return (
                f"with this sheet's decimal {'point' if decimal == '.' else 'comma'} its {name} would group "
                f"thousands ({grouped}), but it may mark decimals ({decimal_form}); type {grouped} or {decimal_form} to say which."
            )
        else:
            if _is_grouped(mantissa, sign) and sign != machine_decimal():
                grouped, decimal_form = _both_readings(mantissa, sign)
                name = "comma" if sign == "," else "point"
                return (
                    f"its {name} could group thousands ({grouped}) or mark decimals ({decimal_form}), and no reading "
                    f"shows the sheet's decimal mark yet; type {grouped} or {decimal_form}, or choose the decimal mark."
                )
            mark = sign
    else:
        mark = None
    if mark is None:
        whole, fraction = mantissa, ""
    else:
        whole, _, fraction = mantissa.partition(mark)
    if not fraction.isdigit() and fraction:
        return "the digits after the decimal mark are broken up."
    if whole and not whole.isdigit():
        if not _is_grouped(whole, None):
            return "its points, commas or spaces do not group the digits in threes as thousands separators would."
        whole = "".join(ch for ch in whole if ch.isdigit())
    if not (whole or fraction):
        return "it has no digits."
    return whole, fraction


def decimal_shown(text: str) -> str | None:
    """The decimal mark a typed number shows beyond doubt ("0,42" a comma, "1,234.5" a point), else None.

    "1,234" and "1.234" show none: the separator may group thousands or mark decimals.
    """
    stripped = text.strip().lstrip("<\u2264").strip()
    match = _NUMBER_START.fullmatch(stripped)
    if match is None or len(stripped) > MAX_TEXT_LENGTH:
        return None
    mantissa = match["mantissa"].strip(_GROUP_SPACES)
    points, commas = mantissa.count("."), mantissa.count(",")
    if points and commas:
        return "." if mantissa.rfind(".") > mantissa.rfind(",") else ","
    if points + commas != 1:
        return None
    sign = "." if points else ","
    return None if _is_grouped(mantissa, sign) else sign


def _both_readings(mantissa: str, sign: str) -> tuple[str, str]:
    """A number with one separator read both ways: grouped thousands ("1002") and with the separator as the
    decimal mark, written with the other mark ("1.002" for "1,002")."""
    whole, _, fraction = mantissa.partition(sign)
    return whole + fraction, f"{whole}{'.' if sign == ',' else ','}{fraction}"


def _is_grouped(digits: str, separator: str | None) -> bool:
    """True when ``digits`` is a whole number grouped in threes by one kind of separator ("1,234,567").

    With ``separator`` None any one of point, comma, space or apostrophe may be the separator.
    """
    found = {ch for ch in digits if not ch.isdigit()}
    if len(found) != 1 or (separator is not None and found != {separator}):
        return False
    (sep,) = found
    chunks = digits.split(sep)
    return (
        1 <= len(chunks[0]) <= 3
        and chunks[0][0] != "0"
        and all(len(chunk) == 3 and chunk.isdigit() for chunk in chunks[1:])
        and chunks[0].isdigit()
    )


def _ascii_sign(number: str) -> str:
    return "-" + number[1:] if number[:1] in _MINUS_SIGNS else number


def _short(text: str, limit: int = 40) -> str:
    text = text.strip()
    return text if len(text) <= limit else text[: limit - 1] + "\u2026"


def _invalid(text: str, reason: str) -> Cell:
    return Cell(text, CellKind.INVALID, reason=reason)
