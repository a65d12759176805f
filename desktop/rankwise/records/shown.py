"""What a reader sees in a cell, independent of how a spreadsheet program stored it.

A spreadsheet program that re-saves a workbook keeps what a reader sees but may store it
differently: numbers with 15 significant digits (the precision a spreadsheet keeps, IEEE 754
doubles printed to 15 digits; common practice, no source), dates as serial numbers read back to
within a second, and number formats with literal characters escaped ("yyyy\\-mm\\-dd" for
"yyyy-mm-dd"). ``meaning`` gives one key for all those forms; ``displayed`` writes a value as its
number format shows it, for messages.
"""

from __future__ import annotations

import re
from datetime import datetime, timedelta
from decimal import ROUND_HALF_UP, Decimal
from functools import lru_cache

SIGNIFICANT_DIGITS = 15
"""Significant digits of a number that survive a re-save by a spreadsheet program."""
GENERAL_DIGITS = 10
"""Significant digits the "General" format shows in a cell of default width (common practice, no source)."""

_SELF_LITERAL = set(" -+/():$!^&'~{}<>=")
"""Characters a number format shows as themselves whether or not they are escaped or quoted."""
_LEADING_BRACKETS = re.compile(r"^(?:\[[^\]]*\])*")
"""Language tags and conditions at the start of a format section, e.g. "[$-409][<0.001]"."""
_CONDITION = re.compile(r"^\[(<=|>=|<>|<|>|=)(-?[\d.]+)\]")
_NUMBER_PATTERN = re.compile(r"[0#?][0#?,]*(?:\.([0#?]+))?(?:E[+-]([0#]+))?")


def number_key(text: str) -> str:
    """A number's canonical text at the precision that survives a re-save: its shortest decimal
    text rounded half up to 15 significant digits, as LibreOffice Calc writes a number it re-saves
    (measured: 0.4444444444444445 is saved as 0.444444444444445)."""
    exact = Decimal(repr(float(text)))
    if not exact.is_finite() or exact == 0:
        return repr(float(exact))
    step = Decimal(1).scaleb(exact.adjusted() - SIGNIFICANT_DIGITS + 1)
    return f"{float(exact.quantize(step, rounding=ROUND_HALF_UP)):.{SIGNIFICANT_DIGITS}g}"


def date_key(text: str) -> str:
    """A date's ISO text rounded to the nearest second (a re-save may leave it a hair off)."""
    try:
        moment = datetime.fromisoformat(text)
    except ValueError:
        return text
    rounded = (moment + timedelta(microseconds=500_000)).replace(microsecond=0)
    return rounded.isoformat()


@lru_cache(maxsize=4096)
def format_key(number_format: str | None) -> str | None:
    """A number format by meaning: literal text written the same way whether quoted, escaped or bare.

    Kept for each format once worked out: a record holds tens of thousands of cells but few formats."""
    if number_format is None:
        return None
    parts: list[str] = []
    literal: list[str] = []
    index = 0
    text = number_format

    def flush() -> None:
        if literal:
            parts.append('"' + "".join(literal) + '"')
            literal.clear()

    while index < len(text):
        char = text[index]
        if char == '"':
            end = text.find('"', index + 1)
            end = len(text) if end < 0 else end
            literal.append(text[index + 1:end])
            index = end + 1
            continue
        if char == "\\" and index + 1 < len(text):
            literal.append(text[index + 1])
            index += 2
            continue
        if char in _SELF_LITERAL:
            literal.append(char)
        elif char == "[":
            end = text.find("]", index)
            end = len(text) - 1 if end < 0 else end
            flush()
            parts.append(text[index:end + 1])
            index = end + 1
            continue
        else:
            flush()
            parts.append(char.lower() if char.isalpha() and text.lower() != "general" else char)
        index += 1
    flush()
    parts = _brackets_in_order(parts)
    joined = "".join(parts)
    return "General" if joined.lower() == "general" else joined


def _brackets_in_order(parts: list[str]) -> list[str]:
    """Neighbouring bracketed tokens (language tag, condition, colour) sorted: their order carries no
    meaning, and LibreOffice Calc writes "[$-407][<0.001]" back as "[<0.001][$-407]"."""
    ordered: list[str] = []
    run: list[str] = []
    for part in [*parts, ""]:
        if part.startswith("["):
            run.append(part)
            continue
        ordered.extend(sorted(run))
        run = []
        if part:
            ordered.append(part)
    return ordered


def meaning(kind: str, text: str, number_format: str | None) -> tuple[str, str, str | None]:
    """One key for a cell's value and format as a reader sees them, however they are stored."""
    if kind == "number":
        return kind, number_key(text), format_key(number_format)
    if kind == "date":
        return kind, date_key(text), format_key(number_format)
    return kind, text, format_key(number_format)


def displayed(kind: str, text: str, number_format: str | None, mark: str = ".") -> str:
    """The value as its cell shows it ("2.48 µm", "0.0079", "< 0.000001"), for a message;
    ``mark`` is the decimal mark the record was written with."""
    if kind == "date":
        try:
            return datetime.fromisoformat(text).strftime("%Y-%m-%d %H:%M:%S")
        except ValueError:
            return text
    if kind == "truth":
        return "TRUE" if text == "true" else "FALSE"
    if kind != "number":
        return f"'{text}'"
    value = float(text)
    shown = _number_shown(value, number_format or "General")
    if not shown:
        return "nothing"
    return shown.replace(".", mark) if mark != "." else shown


def _number_shown(value: float, number_format: str) -> str:
    """``value`` through ``number_format`` (the parts of the format language the records use)."""
    sections = _sections(number_format)
    section = sections[0]
    condition = next((found for found in map(_CONDITION.match, _LEADING_BRACKETS.match(section).group(0)
                                             .replace("][", "]\n[").split("\n")) if found), None)
    if condition is not None:
        if not _holds(value, condition.group(1), float(condition.group(2))):
            section = sections[1] if len(sections) > 1 else section
    elif value < 0 and len(sections) > 1:
        section, value = sections[1], -value
    section = _LEADING_BRACKETS.sub("", section)
    if not section and len(sections) > 1:
        return ""  # an empty section shows nothing (";;;" hides every number)
    if section.lower() == "general" or not section:
        return f"{value:.{GENERAL_DIGITS}g}"
    plain, literals = _without_literals(section)
    match = _NUMBER_PATTERN.search(plain)
    if match is None:
        return "".join(literals.get(i, "") for i in sorted(literals)) or plain
    decimals = len(match.group(1) or "")
    if match.group(2) is not None:
        mantissa, exponent = f"{value:.{decimals}E}".split("E")
        number = f"{mantissa}E{exponent[0]}{abs(int(exponent)):0{len(match.group(2))}d}"
    else:
        if "%" in plain:
            value *= 100
        number = f"{value:,.{decimals}f}" if "," in match.group(0) else f"{value:.{decimals}f}"
    before = _literal_text(plain[:match.start()], literals, 0)
    after = _literal_text(plain[match.end():], literals, match.end())
    return f"{before}{number}{after}"


def _sections(number_format: str) -> list[str]:
    """The ``;``-separated sections of a format, quotes respected."""
    sections, current, quoted = [], [], False
    for char in number_format:
        if char == '"':
            quoted = not quoted
        if char == ";" and not quoted:
            sections.append("".join(current))
            current = []
        else:
            current.append(char)
    sections.append("".join(current))
    return sections


def _without_literals(section: str) -> tuple[str, dict[int, str]]:
    """The section with each quoted or escaped literal replaced by one placeholder character,
    and the literal texts by the placeholder's position."""
    plain, literals, index = [], {}, 0
    while index < len(section):
        char = section[index]
        if char == '"':
            end = section.find('"', index + 1)
            end = len(section) if end < 0 else end
            literals[len(plain)] = section[index + 1:end]
            plain.append("\x00")
            index = end + 1
        elif char == "\\" and index + 1 < len(section):
            literals[len(plain)] = section[index + 1]
            plain.append("\x00")
            index += 2
        else:
            plain.append(char)
            index += 1
    return "".join(plain), literals


def _literal_text(plain: str, literals: dict[int, str], offset: int) -> str:
    """The text a piece of a format shows around the number: its literals and bare characters."""
    out = []
    for position, char in enumerate(plain, start=offset):
        out.append(literals.get(position, "") if char == "\x00" else char)
    return "".join(out)


def _holds(value: float, operator: str, bound: float) -> bool:
    return {"<": value < bound, "<=": value <= bound, ">": value > bound, ">=": value >= bound,
            "=": value == bound, "<>": value != bound}[operator]
