"""Understanding a table the way a person would: title block, header row, decimal mark, layout.

- The header is the last non-blank row above the first rows of numbers; rows above it are a
  title block (part family, date, operator lines) and are skipped.
- Wide layout: every column of readings is a group. Stacked layout: one column holds the
  readings and a text column with a few labels, each repeated, says which group a row belongs to.
  A column of unique labels (part numbers) or of dates is not a group column, and a column of
  consecutive whole numbers is a row or part count, not readings.
"""

from __future__ import annotations

import re
from collections import Counter
from collections.abc import Sequence
from dataclasses import dataclass

from rankwise.readings.cells import CellKind
from rankwise.readings.errors import ReadingsError
from rankwise.readings.parse import machine_decimal, parse_reading

LAYOUTS = ("auto", "wide", "stacked")
"""Allowed layout choices."""

_COMMA_DECIMAL = re.compile(r"[+-]?(?:\d*,\d{1,2}|\d*,\d{4,}|0,\d+|\d{4,},\d+|\d{1,3}(?:\.\d{3})+,\d+)")
_POINT_DECIMAL = re.compile(r"[+-]?(?:\d*\.\d{1,2}|\d*\.\d{4,}|0\.\d+|\d{4,}\.\d+|\d{1,3}(?:,\d{3})+\.\d+)")
_IDENTIFIER_HEADER = re.compile(r"(?i)\b(?:part|no|nr|number|id|serial|item|pos|position|row|index|count)\b|#")
_GROUP_HEADER = re.compile(
    r"(?i)\b(?:group|press|machine|wheel|line|tool|lot|batch|shift|cavity|station|supplier|die|mou?ld|nest|"
    r"spindle|furnace|oven|cell|setting|recipe|version|condition|state|stage|step|phase|before|after)\b"
)
_ROW_COUNTER_HEADER = re.compile(r"(?i)\s*(?:no\.?|nr\.?|#|row|index|pos\.?|position|count|line no\.?|entry)\s*")
_PART_HEADER = re.compile(
    r"(?i)\b(?:part|parts|serial|s/n|sn|sample|specimen|piece|id|ident|identifier)\b|\b\w+\s*(?:no|nr|number|#)\b\.?"
)


_UNITS = frozenset(
    "nm µm um μm mm cm m in inch mil N kN mN Nm N·m bar mbar Pa kPa MPa psi °C °F K % ppm g kg mg s ms min h "
    "V mV A mA Ω Ohm HV HRC HB HRB dB rpm mm/s µm/m l/min ml/min".split()
)
"""Units of measured characteristics recognised in a column title (common practice, no source)."""
_UNIT_IN_TITLE = re.compile(r".*[(\[]\s*([^()\[\]]{1,10}?)\s*[)\]]\s*")


def unit_in_header(header: str) -> str:
    """The unit written in brackets at the end of a column title ("Force (kN)" gives "kN"), or ""."""
    match = _UNIT_IN_TITLE.fullmatch(header)
    return match[1] if match and match[1] in _UNITS else ""


def name_without_unit(header: str) -> str:
    """A column title without its bracketed unit ("Wheel A [µm]" gives "Wheel A"); unchanged without one."""
    if not unit_in_header(header):
        return header
    return header[: max(header.rfind("("), header.rfind("["))].strip() or header


@dataclass(frozen=True)
class TableShape:
    """Where the table starts: the header row (or -1 for none), the first data row, the column names."""

    header_row: int
    first_data_row: int
    headers: tuple[str, ...]


@dataclass(frozen=True)
class ColumnProfile:
    """What a sample of a column's data rows holds."""

    index: int
    header: str
    rows: int
    filled: int
    numbers: int
    whole_numbers: tuple[float, ...]
    labels: Counter
    dates: int

    @property
    def is_readings(self) -> bool:
        """Mostly numbers, and not a count of rows or parts."""
        return self.numbers > 0 and self.numbers >= 0.5 * self.filled and not self.is_identifier

    @property
    def is_identifier(self) -> bool:
        """Whole numbers counting up by one, or unique whole numbers under a part-number style header."""
        if not self.whole_numbers or len(self.whole_numbers) != self.numbers:
            return False
        steps = {b - a for a, b in zip(self.whole_numbers, self.whole_numbers[1:])}
        if len(self.whole_numbers) >= 3 and steps == {1.0}:
            return True
        if _names_parts(self.header):
            return True
        return bool(_IDENTIFIER_HEADER.search(self.header)) and len(set(self.whole_numbers)) == self.numbers


def _names_parts(header: str) -> bool:
    """A title naming part identifiers ("Serial", "Spring no."), not a group, a unit or a row count."""
    return (bool(_PART_HEADER.search(header)) and not _GROUP_HEADER.search(header)
            and not unit_in_header(header) and not _ROW_COUNTER_HEADER.fullmatch(header))


@dataclass(frozen=True)
class LayoutChoice:
    """The layout and columns chosen, and plain-words notes on what else was possible."""

    layout: str
    value_columns: tuple[int, ...]
    group_column: int | None
    notes: tuple[str, ...] = ()


_NUMBER_LIKE = (CellKind.NUMBER, CellKind.CENSORED)
_PLAIN_NUMBER = re.compile(r"[+-]?[0-9]{1,15}(?:[.,][0-9]{1,15})?")


def is_number_text(text: str) -> bool:
    """True for a text that reads as a number (or a reading below a limit) with either decimal mark."""
    if _PLAIN_NUMBER.fullmatch(text):
        return True
    kind = parse_reading(text, decimal=".").kind
    if kind is CellKind.INVALID:
        kind = parse_reading(text, decimal=",").kind
    return kind in _NUMBER_LIKE


def find_shape(rows: Sequence[Sequence[str]], numeric: Sequence[Sequence[bool]] | None = None) -> TableShape | None:
    """The header row and first data row of a table; None when no column holds numbers.

    The columns of readings are those mostly holding numbers. The data start at a row with a
    number in one of them that is followed by rows that mostly have numbers too (so "Batch: 4711"
    in a title block is not taken for data); the header is the last non-blank row above it.
    ``numeric`` marks cells stored as numbers (workbooks); by default every text is read.
    """
    marks = numeric if numeric is not None else [[is_number_text(t) for t in row] for row in rows]
    width = max((len(row) for row in rows), default=0)
    filled_rows = [i for i, row in enumerate(rows) if any(t.strip() for t in row)]
    reading_columns = []
    for j in range(width):
        cells = [i for i in filled_rows if j < len(rows[i]) and rows[i][j].strip()]
        numbers = sum(1 for i in cells if marks[i][j])
        if numbers and numbers >= 0.5 * (len(cells) - 1):  # the header cell aside
            reading_columns.append(j)
    if not reading_columns:
        return None

    def has_number(i: int) -> bool:
        return any(j < len(marks[i]) and marks[i][j] for j in reading_columns)

    def has_text(i: int) -> bool:
        return any(j < len(rows[i]) and rows[i][j].strip() for j in reading_columns) and not has_number(i)

    starts = [-1] + [i for i in filled_rows if has_text(i)]
    first_data = None
    for start in starts:
        candidate = next((i for i in filled_rows if i > start and has_number(i)), None)
        if candidate is None:
            continue
        following = [i for i in filled_rows if i >= candidate][:5]
        if sum(1 for i in following if has_number(i)) >= max(1, min(4, len(following) - 1)):
            first_data = candidate
            break
    if first_data is None:
        return None
    above = [i for i in filled_rows if i < first_data]
    header_row = -1
    if above:
        candidate = above[-1]
        texts = [t for t in rows[candidate] if t.strip()]
        numbers = sum(1 for j, t in enumerate(rows[candidate]) if t.strip() and marks[candidate][j])
        if numbers <= len(texts) / 2:
            header_row = candidate
    names = list(rows[header_row]) if header_row >= 0 else []
    return TableShape(header_row, header_row + 1 if header_row >= 0 else first_data, unique_headers(names, width))


def unique_headers(names: Sequence[str], width: int) -> tuple[str, ...]:
    """Column names: the header texts, "Column N" for blanks, "(2)" added to repeats."""
    result: list[str] = []
    taken: set[str] = set()
    next_count: dict[str, int] = {}
    for j in range(width):
        name = names[j].strip() if j < len(names) and names[j].strip() else f"Column {j + 1}"
        if name in taken:
            base, count = name, next_count.get(name, 2)
            while f"{base} ({count})" in taken:
                count += 1
            name = f"{base} ({count})"
            next_count[base] = count + 1
        taken.add(name)
        result.append(name)
    return tuple(result)


def guess_decimal(texts: Sequence[str], delimiter: str = "") -> tuple[str, str]:
    """The decimal mark of a file's texts, and plain words on how it was decided."""
    commas = sum(1 for t in texts if _COMMA_DECIMAL.fullmatch(t.strip()))
    points = sum(1 for t in texts if _POINT_DECIMAL.fullmatch(t.strip()))
    if commas > points:
        return ",", f"Numbers are read with a decimal comma ({commas} values such as '0,42' show it)."
    if points > commas:
        return ".", "Numbers are read with a decimal point."
    if delimiter == ";" and any("," in t for t in texts):
        return ",", "Numbers are read with a decimal comma (the file separates fields with semicolons)."
    mark = machine_decimal()
    words = "comma" if mark == "," else "point"
    return mark, f"Nothing in the file shows the decimal mark; numbers are read with a decimal {words}, as this computer is set up."


def profile_columns(
    rows: Sequence[Sequence[str]], numeric: Sequence[Sequence[bool]], headers: Sequence[str], decimal: str
) -> list[ColumnProfile]:
    """What each column of the sample data rows (blank rows left out) holds."""
    kept = [(row, marks) for row, marks in zip(rows, numeric) if any(t.strip() for t in row)]
    rows = [row for row, _ in kept]
    numeric = [marks for _, marks in kept]
    profiles = []
    for j, header in enumerate(headers):
        filled = numbers = dates = 0
        whole: list[float] = []
        labels: Counter = Counter()
        for row, marks in zip(rows, numeric):
            text = row[j].strip() if j < len(row) else ""
            if not text:
                continue
            filled += 1
            cell = parse_reading(text, decimal=decimal)
            if (j < len(marks) and marks[j]) or cell.kind in _NUMBER_LIKE:
                numbers += 1
                if cell.kind is CellKind.NUMBER and cell.value.is_integer():
                    whole.append(cell.value)
            elif cell.kind is CellKind.NOTE and "date or a time" in cell.reason:
                dates += 1
            else:
                labels[text] += 1
        profiles.append(ColumnProfile(j, header, len(rows), filled, numbers, tuple(whole), labels, dates))
    return profiles


def choose_layout(
    profiles: Sequence[ColumnProfile],
    layout: str = "auto",
    value_columns: Sequence[int] | None = None,
    group_column: int | None = None,
) -> LayoutChoice:
    """The layout and columns: as asked where asked, otherwise as a person reading the table would choose."""
    readings = [p.index for p in profiles if p.is_readings]
    headers = [p.header for p in profiles]
    if layout == "auto":
        layout = "stacked" if group_column is not None else ("wide" if value_columns and len(value_columns) > 1 else "")
    if layout in ("", "stacked") and group_column is None:
        candidates = [p for p in profiles if _could_group(p, readings, value_columns)]
        if not candidates and len(readings) > 1:
            candidates = [p for p in profiles if _numbers_naming_groups(p)]
            readings = [j for j in readings if j not in {p.index for p in candidates}]
        candidates.sort(key=lambda p: (not _GROUP_HEADER.search(p.header), len(p.labels), p.index))
        if candidates:
            group_column = candidates[0].index
            layout = "stacked"
            others = [p.header for p in candidates[1:]]
        elif layout == "stacked":
            raise ReadingsError(
                "No column of group labels was found (a text column with a few labels, each repeated); "
                "choose the group column, or open the file as a wide layout."
            )
        else:
            layout = "wide"
    else:
        others = []
    if layout == "wide":
        chosen = tuple(value_columns) if value_columns else tuple(readings)
        if not chosen:
            raise _no_readings()
        used = set(chosen)
        unused = [headers[j] for j in range(len(headers)) if j not in used and profiles[j].filled]
        notes = [f"Each column of readings is a group: {_quoted(headers[j] for j in chosen)}."]
        if unused:
            notes.append(f"Columns not used as readings: {_quoted(unused)}.")
        return LayoutChoice("wide", chosen, None, tuple(notes))
    values = [j for j in (value_columns or readings) if j != group_column]
    if not values:
        raise _no_readings()
    value = values[0]
    notes = [
        f"Readings from column '{headers[value]}', grouped by the labels in column '{headers[group_column]}'."
    ]
    if len(values) > 1 and not value_columns:
        notes.append(
            f"Other columns with numbers, not used: {_quoted(headers[j] for j in values[1:])}; "
            "choose one of them as the readings column if it is the one you want."
        )
    if others:
        notes.append(f"Also possible as group labels: {_quoted(others)}; choose one if it fits the question better.")
    return LayoutChoice("stacked", (value,), group_column, tuple(notes))


def find_part_column(profiles: Sequence[ColumnProfile], used: Sequence[int]) -> int | None:
    """The column of part identifiers (serial, part or sample number, ID) among the unused columns, or None.

    A part column is filled on most rows and either has a title naming an identifier ("Part",
    "Serial", "Spring no.", "ID") or holds labels with digits that are mostly all different
    ("C-01", "BS-26-0007"). A column titled only "No.", "#" or "Row" counting 1, 2, 3... is a row
    count, not a part identifier: pairing by it would pair by position.
    """
    found = []
    for profile in profiles:
        if profile.index in used or profile.filled < 0.8 * profile.rows or profile.dates:
            continue
        texts = list(profile.labels)
        named = _names_parts(profile.header)
        if profile.numbers and not profile.is_identifier and not named:
            continue
        if profile.numbers and _ROW_COUNTER_HEADER.fullmatch(profile.header):
            continue
        distinct = len(texts) + len(set(profile.whole_numbers))
        labelled = sum(profile.labels.values()) + len(profile.whole_numbers)
        if labelled < 0.8 * profile.filled or distinct < 2:
            continue
        with_digits = sum(1 for t in texts if any(ch.isdigit() for ch in t)) + len(profile.whole_numbers)
        if named or (with_digits >= 0.8 * distinct and distinct >= 0.3 * labelled):
            found.append((not named, profile.index))
    return min(found)[1] if found else None


def part_noun(header: str) -> str:
    """What the parts are called, plural, from the part column's title: "Spring no." gives "springs"."""
    words = re.findall(r"[^\W\d_]+", header)
    if len(words) >= 2 and words[-1].lower() in ("no", "nr", "number", "id") \
            and words[-2].lower() not in ("part", "serial", "sample", "item"):
        noun = words[-2].lower()
        return noun if noun.endswith("s") else noun + "s"
    return "parts"


def _could_group(profile: ColumnProfile, readings: list[int], value_columns: Sequence[int] | None) -> bool:
    """A text column, filled on most rows, with a few labels that repeat (not part identifiers)."""
    if profile.index in readings or (value_columns and profile.index in value_columns):
        return False
    if _names_parts(profile.header):
        return False
    labelled = sum(profile.labels.values())
    if labelled == 0 or labelled < 0.8 * profile.rows:
        return False
    distinct = len(profile.labels)
    return 2 <= distinct <= 50 and distinct <= labelled / 2


def _numbers_naming_groups(profile: ColumnProfile) -> bool:
    """A column of a few whole numbers, each repeated, under a header such as "Press" or "Machine"."""
    distinct = len(set(profile.whole_numbers))
    return (
        bool(_GROUP_HEADER.search(profile.header))
        and len(profile.whole_numbers) == profile.numbers >= 0.8 * profile.rows
        and 2 <= distinct <= 20
        and distinct <= profile.numbers / 2
    )


def _quoted(names) -> str:
    return ", ".join(f"'{name}'" for name in names)


def _no_readings() -> ReadingsError:
    return ReadingsError("The file holds no readings: no column has numbers in it; check that this is the right export.")
