"""Opening a file of many characteristics: one row per part, a process column, one column per characteristic.

Gauge and coordinate-measuring exports for a process change hold a column naming the process
("old die" / "new die"), often a part number, and one numeric column per characteristic of the
drawing with its unit in brackets ("Bore diameter [mm]"). Nominal and limits may stand in rows
named nominal, LSL, USL or tolerance, above the readings or in a title block above the column
titles, each number under its characteristic. ``open_characteristics(path)`` reads such a file
(only reads it) and returns a frozen ``CharacteristicsTable``; ``to_analysis`` builds the
comparison of two of its processes. Blank and unreadable cells are counted per characteristic,
never read as zero (common practice, no source).
"""

from __future__ import annotations

import csv
import dataclasses
import os
import re
from collections import Counter
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from rankwise.readings import open_csv, open_xlsx
from rankwise.readings.cells import EMPTY_CELL, Cell, CellKind, SkippedCell
from rankwise.readings.errors import ReadingsError
from rankwise.readings.layout import guess_decimal, is_number_text, name_without_unit, unit_in_header
from rankwise.readings.for_analysis import build_analysis
from rankwise.readings.parse import check_decimal, parse_reading
from rankwise.readings.sheet import GroupColumn
from rankwise.readings.snapshot import GroupSnapshot, SheetSnapshot
from rankwise.stats.analysis import Analysis, Characteristic, GroupReadings, Question, Settings

SNIFF_ROWS = 200
"""Rows looked at to tell whether a file holds many characteristics."""
MAX_PROCESS_LABELS = 12
"""A process column holds at most this many different labels, each on several rows."""

_SPEC_LABELS = {
    "nominal": ("nominal", "nominal value", "target", "nom"),
    "lsl": ("lsl", "lower limit", "lower specification limit", "lower spec limit", "min limit"),
    "usl": ("usl", "upper limit", "upper specification limit", "upper spec limit", "max limit"),
    "tolerance": ("tolerance", "tol", "+/- tolerance", "± tolerance", "±tol", "+/-"),
}
_PROCESS_HEADER = re.compile(
    r"(?i)\b(?:process|group|tool|die|lot|batch|supplier|machine|press|line|mou?ld|cavity|condition|"
    r"setting|recipe|version|state|trial|before|after)\b"
)
_PART_HEADER = re.compile(r"(?i)\b(?:part|serial|id|no|nr|number|item|sample|row|index|count)\b|#")
_PLAIN_NUMBER = re.compile(r"[+-]?\d+(?:\.(\d+))?")


@dataclass(frozen=True)
class CharacteristicColumn:
    """One characteristic of the file.

    Attributes:
        header: the column title as written; name: without its bracketed unit; unit: that unit or "".
        cells: every part row's cell as read (text kept).
        values: the readings per part row, NaN where blank or not a plain reading.
        decimals: the most decimals written, the gauge's resolution, or None.
        nominal, lsl, usl: from the rows or title block that state them, or None.
        skipped: cells that are not readings (text, row number, reason).
    """

    header: str
    name: str
    unit: str
    cells: tuple[Cell, ...] = field(repr=False)
    values: np.ndarray = field(compare=False, repr=False)
    decimals: int | None
    nominal: float | None
    lsl: float | None
    usl: float | None
    skipped: tuple[SkippedCell, ...]

    @property
    def tolerance_width(self) -> float | None:
        """USL - LSL where both limits are known, else None."""
        return None if self.lsl is None or self.usl is None else self.usl - self.lsl


@dataclass(frozen=True)
class CharacteristicsTable:
    """What ``open_characteristics`` found in a file.

    Attributes:
        path: the file; sheet: the workbook sheet read, or "".
        process_column: the title of the column naming the process; processes: its labels in
            order of first appearance; process_of_row: each part row's label.
        part_column: the title of the part-number column, or ""; parts: each row's part number.
        characteristics: in file order.
        decimal: the decimal mark the numbers were read with.
        first_row: the file's row number (1-based) of the first part row.
        notes: plain words on what was found, assumed and skipped.
    """

    path: str
    sheet: str
    process_column: str
    processes: tuple[str, ...]
    process_of_row: tuple[str, ...]
    part_column: str
    parts: tuple[str, ...]
    characteristics: tuple[CharacteristicColumn, ...]
    decimal: str
    first_row: int
    notes: tuple[str, ...]

    def characteristic(self, name: str) -> CharacteristicColumn:
        """The characteristic called ``name`` (its title with or without the unit, any case)."""
        wanted = name.strip().casefold()
        for column in self.characteristics:
            if wanted in (column.name.casefold(), column.header.casefold()):
                return column
        names = ", ".join(column.name for column in self.characteristics)
        raise ReadingsError(f"The file has no characteristic {name!r}; its characteristics are: {names}.")

    def rows_of(self, process: str) -> np.ndarray:
        """The part rows (0-based among the part rows) of ``process``."""
        if process not in self.processes:
            raise ReadingsError(
                f"Column '{self.process_column}' has no process {process!r}; it holds: {', '.join(self.processes)}."
            )
        return np.flatnonzero(np.asarray(self.process_of_row, dtype=object) == process)

    def missing(self, name: str, process: str) -> int:
        """How many of ``process``'s parts have no reading of ``name`` (blank or not a number)."""
        return int(np.isnan(self.characteristic(name).values[self.rows_of(process)]).sum())

    def to_analysis(
        self,
        group_a: str,
        group_b: str,
        *,
        names: Sequence[str] | None = None,
        settings: Settings | None = None,
        margins: Mapping[str, float] | None = None,
        margin_share: float | None = None,
    ) -> Analysis:
        """The comparison of process ``group_b`` (changed) with ``group_a`` (reference).

        ``names`` chooses characteristics (default: all); ``margins`` gives an equivalence margin
        per characteristic in its unit, ``margin_share`` one as a share of each tolerance width
        (for those with both limits). Characteristics without a reading in A or in B are left out
        and named in the notes. The readings go through ``snapshot`` and
        ``analysis_from_snapshot``, so a record's readings as entered give the same analysis.
        """
        chosen, left_out = self._chosen(group_a, group_b, names)
        margins = dict(margins or {})
        margin_of = []
        for column in chosen:
            margin = margins.pop(column.name, None)
            if margin is None and margin_share is not None and column.tolerance_width:
                margin = margin_share * column.tolerance_width
            margin_of.append(margin)
        if margins:
            raise ReadingsError(f"A margin is given for {', '.join(margins)}, which is not among the characteristics chosen.")
        notes = (f"Left out for lack of readings in {group_a} or {group_b}: {', '.join(left_out)}.",) if left_out else ()
        return analysis_from_snapshot(
            self.snapshot(group_a, group_b, names=[column.name for column in chosen]),
            [column.name for column in chosen], group_a, group_b, settings=settings, margins=margin_of, notes=notes,
        )

    def snapshot(self, group_a: str, group_b: str, *, names: Sequence[str] | None = None) -> SheetSnapshot:
        """The readings as entered: per characteristic, A's cells then B's, each titled
        "characteristic: process", with the characteristic's unit and limits."""
        chosen = self.characteristics if names is None else tuple(self.characteristic(n) for n in names)
        groups = []
        for column in chosen:
            for process in (group_a, group_b):
                groups.append(GroupSnapshot(
                    name=snapshot_title(column.name, process), unit=column.unit, lsl=column.lsl, usl=column.usl,
                    nominal=column.nominal, cells=tuple(column.cells[row] for row in self.rows_of(process)),
                ))
        return SheetSnapshot(groups=tuple(groups), decimal=self.decimal)

    def _chosen(self, group_a: str, group_b: str, names: Sequence[str] | None):
        """The chosen characteristics with readings in both processes, and the names of those without."""
        if group_a == group_b:
            raise ReadingsError("Choose two different processes: A the reference and B the changed process.")
        rows_a, rows_b = self.rows_of(group_a), self.rows_of(group_b)
        chosen = self.characteristics if names is None else tuple(self.characteristic(n) for n in names)
        if not chosen:
            raise ReadingsError("Choose at least one characteristic to compare.")
        kept = [c for c in chosen if not (np.isnan(c.values[rows_a]).all() or np.isnan(c.values[rows_b]).all())]
        if not kept:
            raise ReadingsError(f"None of the chosen characteristics has readings in both {group_a} and {group_b}.")
        return kept, [c.name for c in chosen if c not in kept]


def snapshot_title(characteristic: str, process: str) -> str:
    """The title of one characteristic's readings of one process in the readings as entered."""
    return f"{characteristic}: {process}"


def analysis_from_snapshot(
    snapshot: SheetSnapshot,
    names: Sequence[str],
    group_a: str,
    group_b: str,
    *,
    settings: Settings | None = None,
    margins: Sequence[float | None] | None = None,
    notes: Sequence[str] = (),
) -> Analysis:
    """The many-characteristics analysis from readings as entered (A then B per characteristic).

    Blanks, notes and readings below a detection limit follow the same rules as for one
    characteristic (``build_analysis``); each characteristic's notes carry its name.
    """
    if len(snapshot.groups) != 2 * len(names):
        raise ReadingsError("The readings as entered do not hold two processes for every characteristic.")
    margins = list(margins) if margins is not None else [None] * len(names)
    items, all_notes = [], list(notes)
    for index, name in enumerate(names):
        pair = snapshot.groups[2 * index: 2 * index + 2]
        if [g.name for g in pair] != [snapshot_title(name, group_a), snapshot_title(name, group_b)]:
            raise ReadingsError(f"The readings as entered do not hold {name} for {group_a} and {group_b}.")
        columns = [GroupColumn(g.name, g.unit, g.lsl, g.usl, g.nominal, list(g.cells)) for g in pair]
        built = build_analysis(columns, Question.TWO_GROUPS, settings, decimal=snapshot.decimal,
                               mixed_limits=snapshot.mixed_limits)
        a, b = (dataclasses.replace(g, name=p) for g, p in zip(built.groups, (group_a, group_b)))
        items.append(Characteristic(name=name, a=a, b=b, margin=margins[index]))
        all_notes.extend(built.notes)
        all_notes.extend(_not_used_note(name, process, group.cells) for group, process in zip(pair, (group_a, group_b))
                         if any(cell.is_skipped for cell in group.cells))
    return Analysis(
        question=Question.CHARACTERISTICS,
        groups=(GroupReadings(group_a, ()), GroupReadings(group_b, ())),
        settings=settings or Settings(),
        notes=tuple(all_notes),
        decimal_mark=snapshot.decimal if snapshot.decimal in (".", ",") else ".",
        characteristics=tuple(items),
    )


def _not_used_note(name: str, process: str, cells: Sequence[Cell]) -> str:
    """Which entries of one characteristic and process are not readings, by entry number, as typed."""
    skipped = [(row + 1, cell.text.strip()) for row, cell in enumerate(cells) if cell.is_skipped]
    listed = ", ".join(f"entry {row} '{text[:30]}'" for row, text in skipped[:10])
    more = f" and {len(skipped) - 10} more" if len(skipped) > 10 else ""
    return f"{name}, {process}: {len(skipped)} entr{'ies' if len(skipped) != 1 else 'y'} not used as readings: {listed}{more}."


def open_characteristics(
    path: str | os.PathLike,
    *,
    by: str | None = None,
    sheet: str | int | None = None,
    decimal: str = "auto",
    encoding: str | None = None,
) -> CharacteristicsTable:
    """Read a file of many characteristics (CSV/TXT or XLSX); ``by`` names the process column.

    Raises ``ReadingsError`` in plain words when the file cannot be read or has no process column
    or no characteristic columns.
    """
    check_decimal(decimal)
    path = Path(path)
    rows, sheet_name, typed_decimal = _all_rows(path, sheet, encoding)
    if decimal == "auto":
        decimal = typed_decimal or guess_decimal([t for row in rows[:200] for t in row if t])[0]
    found = _find_layout(rows, by, path.name)
    rows, header_row, headers, spec_rows, data_rows, process, part = found
    notes = []
    if header_row > 0:
        notes.append(f"Rows 1 to {header_row} above the column titles were read as a title block.")
    columns = []
    cache: dict[str, Cell] = {}
    for j, header in enumerate(headers):
        if j in (process, part):
            continue
        texts = [row[j].strip() for _, row in data_rows]
        if not _holds_readings(texts):
            if any(texts):
                notes.append(f"Column '{header}' holds text, not readings; it is not compared.")
            continue
        columns.append(_characteristic(header, texts, data_rows, spec_rows, j, decimal, cache))
    if not columns:
        raise ReadingsError(f"'{path.name}' has no column of readings beside the process column.")
    labels = [row[process].strip() for _, row in data_rows]
    processes = tuple(dict.fromkeys(label for label in labels if label))
    unlabelled = labels.count("")
    if unlabelled:
        notes.append(f"{unlabelled} row{'s' if unlabelled != 1 else ''} without a process label in "
                     f"'{headers[process]}' {'are' if unlabelled != 1 else 'is'} not used.")
    found = [key for key in ("nominal", "lsl", "usl", "tolerance") if key in spec_rows]
    if found:
        notes.append(f"Limits read from the rows named {', '.join(k if k in ('nominal', 'tolerance') else k.upper() for k in found)}.")
    notes.append(f"{len(data_rows)} parts, {len(columns)} characteristics, processes: {', '.join(processes)}.")
    return CharacteristicsTable(
        path=str(path), sheet=sheet_name, process_column=headers[process], processes=processes,
        process_of_row=tuple(labels), part_column=headers[part] if part is not None else "",
        parts=tuple(row[part].strip() for _, row in data_rows) if part is not None else (),
        characteristics=tuple(columns), decimal=decimal, first_row=data_rows[0][0] + 1 if data_rows else 0,
        notes=tuple(notes),
    )


def is_characteristics_file(path: str | os.PathLike) -> bool:
    """True when the file's first rows fit the many-characteristics question (see
    ``looks_like_characteristics``); False for any file that cannot be read that far."""
    path = Path(path)
    try:
        with open(path, "rb") as stream:
            head = stream.read(65536)
        if head.startswith((b"PK\x03\x04", b"PK\x05\x06")):
            rows = [[open_xlsx.value_text(v) for v in row] for row in open_xlsx.read_sheet(path, None).rows[:SNIFF_ROWS]]
        else:
            rows = open_csv.read_sample(path, open_csv.find_encoding(head, path)).rows[:SNIFF_ROWS]
    except (OSError, ReadingsError):
        return False
    return looks_like_characteristics(rows)


def looks_like_characteristics(rows: Sequence[Sequence[str]]) -> bool:
    """True when these rows (a file's first rows, as texts) hold one row per part with a process
    column and two or more columns of readings: the many-characteristics question fits them."""
    try:
        _, _, headers, _, data_rows, process, part = _find_layout(rows, None, "")
    except ReadingsError:
        return False
    labels = {row[process].strip() for _, row in data_rows} - {""}
    numeric = sum(_holds_readings([row[j].strip() for _, row in data_rows])
                  for j in range(len(headers)) if j not in (process, part))
    return len(labels) >= 2 and numeric >= 2


def _find_layout(rows: Sequence[Sequence[str]], by: str | None, name: str):
    """Rows padded to one width, the title row, the titles, the limit rows by kind, the part rows
    (file row index, cells), the process column and the part column (or None)."""
    width = max((len(row) for row in rows), default=0)
    rows = [list(row) + [""] * (width - len(row)) for row in rows]
    kinds = [_spec_key(row) for row in rows]
    first = next((i for i, row in enumerate(rows) if kinds[i] is None and any(is_number_text(t) for t in row)), None)
    if first is None:
        raise ReadingsError(f"'{name}' holds no rows of readings: no row has a number in it.")
    header_row = next((i for i in range(first - 1, -1, -1) if kinds[i] is None and any(t.strip() for t in rows[i])), None)
    if header_row is None:
        raise ReadingsError(f"'{name}' has no row of column titles above the readings; add one naming each column.")
    headers = [t.strip() or f"column {j + 1}" for j, t in enumerate(rows[header_row])]
    spec_rows = {kinds[i]: rows[i] for i in range(len(rows)) if kinds[i] is not None and i != header_row}
    data_rows = [(i, row) for i, row in enumerate(rows[header_row + 1:], start=header_row + 1)
                 if kinds[i] is None and any(t.strip() for t in row)]
    process = _process_column(headers, data_rows, by, name)
    return rows, header_row, headers, spec_rows, data_rows, process, _part_column(headers, data_rows, process)


def _holds_readings(texts: Sequence[str]) -> bool:
    """At least one filled cell, and numbers in at least half of the filled ones."""
    filled = [t for t in texts if t]
    return bool(filled) and sum(is_number_text(t) for t in filled) >= 0.5 * len(filled)


def _all_rows(path: Path, sheet: str | int | None, encoding: str | None) -> tuple[list[list[str]], str, str]:
    """Every row of the file as texts, the sheet's name ("" for text) and the decimal mark if known."""
    try:
        with open(path, "rb") as stream:
            head = stream.read(65536)
    except OSError as error:
        raise ReadingsError(f"'{path}' cannot be read ({error.strerror or 'system error'}); check the name and the folder.") from error
    if not head:
        raise ReadingsError(f"'{path.name}' is empty; choose the file that holds the readings.")
    if head.startswith((b"PK\x03\x04", b"PK\x05\x06")):
        read = open_xlsx.read_sheet(path, sheet)
        return [[open_xlsx.value_text(v) for v in row] for row in read.rows], read.name, "."
    chosen = encoding or open_csv.find_encoding(head, path)
    sample = open_csv.read_sample(path, chosen)
    try:
        with open(path, encoding=chosen, newline="") as stream:
            rows = list(csv.reader(stream, delimiter=sample.delimiter or "\t"))
    except (UnicodeDecodeError, csv.Error) as error:
        raise ReadingsError(f"'{path.name}' cannot be read as {chosen} text; check the file's encoding.") from error
    return rows, "", ""


def _spec_key(row: Sequence[str]) -> str | None:
    """"nominal", "lsl", "usl" or "tolerance" when the row's first filled cell names it and numbers follow."""
    cells = [t.strip() for t in row if t and t.strip()]
    if len(cells) < 2:
        return None
    folded = " ".join(cells[0].rstrip(":=").casefold().split())
    for key, labels in _SPEC_LABELS.items():
        if folded in labels:
            return key
    return None


def _process_column(headers: list[str], data_rows: list, by: str | None, name: str) -> int:
    """The column naming the process: ``by``, else a text column of a few repeated labels."""
    if by is not None:
        folded = [h.casefold() for h in headers]
        if by.strip().casefold() not in folded:
            raise ReadingsError(f"The file has no column {by!r} to group the parts by; its columns are: {', '.join(headers)}.")
        return folded.index(by.strip().casefold())
    candidates = []
    for j, header in enumerate(headers):
        labels = Counter(row[j].strip() for _, row in data_rows if row[j].strip())
        if not labels or sum(is_number_text(t) for t in labels) > 0.5 * len(labels):
            continue
        if 2 <= len(labels) <= MAX_PROCESS_LABELS and len(labels) <= 0.5 * sum(labels.values()):
            candidates.append((not _PROCESS_HEADER.search(header), j))
    if not candidates:
        raise ReadingsError(
            f"'{name}' has no column naming the process (a column with a few labels such as 'old die' and "
            "'new die', each on several rows); add one, or name it with --by."
        )
    return min(candidates)[1]


def _part_column(headers: list[str], data_rows: list, process: int) -> int | None:
    """The part-number column: titled like one, or holding a different label on nearly every row."""
    for j, header in enumerate(headers):
        if j == process:
            continue
        texts = [row[j].strip() for _, row in data_rows if row[j].strip()]
        if not texts:
            continue
        unique = len(set(texts)) >= 0.9 * len(texts)
        textual = sum(is_number_text(t) for t in texts) < 0.5 * len(texts)
        if (_PART_HEADER.search(header) and unique) or (textual and unique):
            return j
    return None


def _characteristic(header: str, texts: list[str], data_rows: list, spec_rows: dict, j: int, decimal: str,
                    cache: dict) -> CharacteristicColumn:
    """One characteristic column: cells, readings, resolution, limits, and the cells that are not readings."""
    unit = unit_in_header(header)
    cells = tuple(_cell(text, decimal, unit, cache) for text in texts)
    values = np.array([cell.value if cell.kind is CellKind.NUMBER else np.nan for cell in cells], dtype=float)
    places = [cell.decimals for cell in cells if cell.kind is CellKind.NUMBER and cell.decimals is not None]
    skipped = tuple(SkippedCell(cell.text, cell.reason or "not a reading", data_rows[k][0] + 1, header)
                    for k, cell in enumerate(cells) if cell.is_skipped)
    spec = {key: _spec_number(row[j] if j < len(row) else "", decimal, unit, cache) for key, row in spec_rows.items()}
    nominal, lsl, usl = spec.get("nominal"), spec.get("lsl"), spec.get("usl")
    tolerance = spec.get("tolerance")
    if tolerance is not None and nominal is not None:
        lsl = nominal - abs(tolerance) if lsl is None else lsl
        usl = nominal + abs(tolerance) if usl is None else usl
    if lsl is not None and usl is not None and lsl > usl:
        lsl = usl = None
    return CharacteristicColumn(
        header=header, name=name_without_unit(header), unit=unit, cells=cells, values=values,
        decimals=max(places) if places else None, nominal=nominal, lsl=lsl, usl=usl, skipped=skipped,
    )


def _cell(text: str, decimal: str, unit: str, cache: dict) -> Cell:
    """The cell for ``text`` as ``parse_reading`` reads it; plain numbers such as "10.005" take a
    shortcut to the same cell, and every distinct text is read once."""
    if not text:
        return EMPTY_CELL
    known = cache.get(text)
    if known is None:
        plain = _PLAIN_NUMBER.fullmatch(text) if decimal == "." else None
        if plain:
            known = Cell(text, CellKind.NUMBER, value=float(text), decimals=len(plain[1]) if plain[1] else 0)
        else:
            known = parse_reading(text, decimal=decimal, unit=unit)
        cache[text] = known
    return known


def _spec_number(text: str, decimal: str, unit: str, cache: dict) -> float | None:
    cell = _cell(text.strip(), decimal, unit, cache)
    return cell.value if cell.kind is CellKind.NUMBER else None
