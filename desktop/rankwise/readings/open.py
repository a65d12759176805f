"""Opening a file of readings: ``open_readings(path) -> ReadingSet``, or a plain ``ReadingsError``.

The file is only ever read. Every cell keeps its text; cells that are not readings are listed
with their row and reason; the choices made (layout, columns, decimal mark, title block) are
returned so the open dialog can show them and the user can change them.
"""

from __future__ import annotations

import codecs
import dataclasses
import os
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import pandas as pd

from rankwise.readings import open_csv, open_xlsx
from rankwise.readings.cells import CellKind, SkippedCell
from rankwise.readings.columns import ParsedColumn, RawColumn, check_texts_match, parse_column
from rankwise.readings.errors import ReadingsError
from rankwise.readings.layout import (
    LAYOUTS, LayoutChoice, TableShape, choose_layout, find_part_column, find_shape, guess_decimal, is_number_text,
    profile_columns,
    name_without_unit,
    unit_in_header,
)
from rankwise.readings.characteristics import looks_like_characteristics
from rankwise.readings.same_parts import Suggestion, pair_by_part, suggest
from rankwise.readings.parse import check_decimal
from rankwise.readings.reading_set import ReadingGroup, ReadingSet, SourceInfo
from rankwise.readings.title_block import TitleBlockDetails, read_title_block
from rankwise.stats.analysis import Question
from rankwise.wording.characteristics import CHARACTERISTICS_FOUND

PREVIEW_ROWS = 20
"""Rows of the file shown in the open dialog's preview."""
SAMPLE_ROWS = open_csv.SAMPLE_ROWS
"""Rows looked at to find the header, the decimal mark and the layout."""

_SIGNATURES = {
    b"%PDF": "a PDF document",
    b"\x89PNG": "a picture",
    b"\xff\xd8\xff": "a picture",
    b"GIF8": "a picture",
    b"\x7fELF": "a program",
    b"MZ": "a program",
}


@dataclass(frozen=True)
class _Table:
    """A file's table before the layout is chosen: a sample of its rows, and a way to load columns."""

    source: dict[str, object]
    """Fields of ``SourceInfo`` known from the file's kind (format, encoding, sheet names...)."""
    rows: list[list[str]]
    numeric: list[list[bool]]
    decimal: str
    decimal_note: str
    load: Callable[[TableShape, list[int], list[int]], list[RawColumn]]
    """Loads the wanted columns; the second list names the columns expected to hold readings."""
    sheet_notes: tuple[str, ...] = ()
    """Which sheet of a workbook was read when that was not plain, and merged labels spread down."""


def open_readings(
    path: str | os.PathLike,
    *,
    layout: str = "auto",
    sheet: str | int | None = None,
    value_column: str | int | Sequence[str | int] | None = None,
    group_column: str | int | None = None,
    decimal: str = "auto",
    encoding: str | None = None,
) -> ReadingSet:
    """Open a CSV/TXT or XLSX file of readings.

    Args:
        path: the file.
        layout: "auto" (choose like a person would), "wide" (a column per group) or "stacked"
            (a column of readings and a column of group labels).
        sheet: the workbook sheet, by name or 0-based position (default: the first with numbers).
        value_column: the readings column (stacked), or the columns to use as groups (wide), by
            header name or 0-based position.
        group_column: the column of group labels (stacked); giving it implies a stacked layout.
        decimal: "." or "," for the file's decimal mark, or "auto" to find it from the numbers.
        encoding: the text file's encoding, or None to find it.

    Raises:
        ReadingsError: one plain sentence on what is wrong with the file and what to do.
        ValueError: an argument that is not one of the allowed choices.
    """
    if layout not in LAYOUTS:
        raise ValueError(f'layout must be "auto", "wide" or "stacked"; got {layout!r}.')
    if layout == "wide" and group_column is not None:
        raise ValueError('group_column belongs to the "stacked" layout; leave it out for "wide" or choose "stacked".')
    check_decimal(decimal)
    if encoding is not None:
        try:
            codecs.lookup(encoding)
        except (LookupError, TypeError) as error:
            raise ValueError(f"encoding must be a known text encoding such as 'utf-8' or 'cp1252'; got {encoding!r}.") from error
    path = Path(path)
    head = _read_head(path)
    if head.startswith(b"PK\x03\x04") or head.startswith(b"PK\x05\x06"):
        table = _workbook_table(path, sheet, decimal)
    elif head.startswith(open_xlsx.OLE_SIGNATURE):
        raise ReadingsError(
            f"'{path.name}' is an old-style .xls workbook or a password-protected workbook; save it as XLSX "
            "without a password (or as CSV) and open that."
        )
    elif path.suffix.lower() in (".xlsx", ".xlsm"):
        raise ReadingsError(
            f"The workbook '{path.name}' is damaged and cannot be opened; open it in a spreadsheet program "
            "and save it again, or export the sheet as CSV."
        )
    else:
        for signature, what in _SIGNATURES.items():
            if head.startswith(signature):
                raise ReadingsError(f"'{path.name}' is {what}, not a spreadsheet; open a CSV or XLSX file of readings.")
        table = _text_table(path, head, decimal, encoding)
    return _read_groups(path, table, layout, value_column, group_column)


def _read_head(path: Path) -> bytes:
    """The file's first bytes; a missing, unreadable or empty file raises ``ReadingsError``."""
    try:
        with open(path, "rb") as stream:
            head = stream.read(65536)
    except FileNotFoundError as error:
        raise ReadingsError(f"There is no file '{path}'; check the name and the folder.") from error
    except IsADirectoryError as error:
        raise ReadingsError(f"'{path}' is a folder, not a file; choose a CSV or XLSX file inside it.") from error
    except PermissionError as error:
        raise ReadingsError(
            f"You do not have permission to read '{path.name}'; ask for access, or copy the file to your own folder."
        ) from error
    except OSError as error:
        raise ReadingsError(f"'{path.name}' cannot be read ({error.strerror or 'system error'}); try a copy of the file.") from error
    if not head:
        raise ReadingsError(f"'{path.name}' is empty; choose the file that holds the readings.")
    return head


def _text_table(path: Path, head: bytes, decimal: str, encoding: str | None) -> _Table:
    open_csv.check_size(path)
    chosen = encoding or open_csv.find_encoding(head, path)
    sample = open_csv.read_sample(path, chosen)
    rows = sample.rows
    if decimal == "auto":
        decimal, note = guess_decimal([t for row in rows for t in row if t], sample.delimiter)
    else:
        note = f"Numbers are read with a decimal {'comma' if decimal == ',' else 'point'}, as chosen."
    numeric = [[is_number_text(t) for t in row] for row in rows]

    def load(shape: TableShape, wanted: list[int], numeric: list[int]) -> list[RawColumn]:
        width = len(shape.headers)
        fast = open_csv.read_number_columns(path, sample, shape.first_data_row, width, wanted, numeric, decimal)
        if fast is None:
            columns = open_csv.read_columns(path, sample, shape.first_data_row, width, wanted)
            open_csv.check_cell_lengths(path, columns, shape.first_data_row)
            return [RawColumn(shape.headers[j], columns[j]) for j in wanted]
        texts, numbers = fast
        open_csv.check_cell_lengths(path, texts, shape.first_data_row)

        def texts_of(j: int) -> Callable[[], np.ndarray]:
            def load_texts() -> np.ndarray:
                read = open_csv.read_columns(path, sample, shape.first_data_row, width, [j])[j]
                return check_texts_match(shape.headers[j], read, numbers[j], decimal)
            return load_texts

        return [
            RawColumn(shape.headers[j], None, numbers[j], load_texts=texts_of(j)) if j in numbers
            else RawColumn(shape.headers[j], texts[j])
            for j in wanted
        ]

    source = {"format": "csv", "encoding": sample.encoding, "delimiter": sample.delimiter}
    return _Table(source, rows, numeric, decimal, note, load)


def _workbook_table(path: Path, sheet: str | int | None, decimal: str) -> _Table:
    read = open_xlsx.read_sheet(path, sheet)
    head_rows = read.rows[:SAMPLE_ROWS]
    typed = [[open_xlsx.is_stored_number(v) for v in row] for row in head_rows]
    texts = [[open_xlsx.value_text(v) for v in row] for row in head_rows]
    for row, marks in zip(texts, typed):  # blank cells right of the last entry are not columns
        while row and row[-1] == "":
            row.pop()
            marks.pop()
    if decimal == "auto":
        typed_texts = [t for row, marks in zip(texts, typed) for t, m in zip(row, marks) if t and not m]
        decimal, note = guess_decimal(typed_texts)
        if not any(is_number_text(t) for t in typed_texts):
            decimal, note = ".", ""
    else:
        note = ""
    numeric = [[m or is_number_text(t) for t, m in zip(row, marks)] for row, marks in zip(texts, typed)]

    def load(shape: TableShape, wanted: list[int], numeric: list[int]) -> list[RawColumn]:
        return open_xlsx.raw_columns(read.rows, shape.first_data_row, list(shape.headers), decimal, wanted)

    source = {"format": "xlsx", "sheet": read.name, "sheet_names": read.names}
    return _Table(source, texts, numeric, decimal, note, load, read.notes)


def _column_index(name: str | int, headers: Sequence[str], argument: str) -> int:
    if isinstance(name, int) and not isinstance(name, bool):
        if 0 <= name < len(headers):
            return name
    elif isinstance(name, str):
        if name in headers:
            return headers.index(name)
        folded = [h.casefold() for h in headers]
        if name.strip().casefold() in folded:
            return folded.index(name.strip().casefold())
    raise ReadingsError(
        f"The file has no column {name!r} to use as the {argument}; its columns are: {', '.join(headers)}."
    )


def _read_groups(
    path: Path, table: _Table, layout: str, value_column: object, group_column: str | int | None
) -> ReadingSet:
    """Find the table's shape and layout in the sample, load the columns needed, and build the groups."""
    width = max((len(row) for row in table.rows), default=0)
    if width > open_csv.MAX_COLUMNS:
        raise ReadingsError(
            f"'{path.name}' has {width:,} columns, more than a readings export holds (at most "
            f"{open_csv.MAX_COLUMNS:,}); check that this is the right file, or export only the columns you need."
        )
    shape = find_shape(table.rows, table.numeric)
    if shape is None:
        width = max((len(row) for row in table.rows), default=0)
        if width <= 1:
            raise ReadingsError(
                f"'{path.name}' holds a single column of text and no numbers; open the export that has the readings."
            )
        raise ReadingsError(
            f"'{path.name}' holds no readings: no column has numbers in it; check that this is the right export."
        )
    headers = shape.headers
    if value_column is None:
        values = None
    elif isinstance(value_column, (str, int)):
        values = [_column_index(value_column, headers, "readings column")]
    else:
        values = [_column_index(v, headers, "readings column") for v in value_column]
    group = None if group_column is None else _column_index(group_column, headers, "group column")
    sample_rows = table.rows[shape.first_data_row:]
    sample_marks = table.numeric[shape.first_data_row:]
    profiles = profile_columns(sample_rows, sample_marks, headers, table.decimal)
    choice = choose_layout(profiles, layout, values, group)
    used = set(choice.value_columns) | ({choice.group_column} if choice.group_column is not None else set())
    part_column = find_part_column(profiles, sorted(used))
    wanted = sorted(used | ({part_column} if part_column is not None else set()))
    raw = dict(zip(wanted, table.load(shape, wanted, list(choice.value_columns))))
    first_row_number = shape.first_data_row + 1
    ids = _part_texts(raw[part_column]) if part_column is not None else None
    if choice.layout == "wide":
        groups = [_wide_group(raw[j], table.decimal, first_row_number, ids) for j in choice.value_columns]
        unlabelled: list[SkippedCell] = []
    else:
        groups, unlabelled = _stacked_groups(raw[choice.value_columns[0]], raw[choice.group_column], table.decimal,
                                             first_row_number, ids)
    if not any(g.values.size for g in groups) and not any(
        c.kind is CellKind.CENSORED for g in groups for c in g.cells
    ):
        raise ReadingsError(
            f"'{path.name}' holds no readings in the chosen columns; choose the column that holds the numbers."
        )
    notes = _notes(shape, table, choice, groups, unlabelled)
    title = read_title_block(table.rows[: max(shape.header_row, 0)], table.decimal)
    if title.unit and not all(g.unit for g in groups):
        notes.append(f"Unit taken from the title block: {title.unit}.")
    if title.note:
        notes.append(title.note)
    groups = [_with_title_details(g, title) for g in groups]
    pairing, problem = (None, "")
    if part_column is not None:
        pairing, problem = pair_by_part(groups, headers[part_column], first_row_number)
    suggestion = suggest(groups, pairing)
    if pairing is None and looks_like_characteristics(table.rows):
        suggestion = Suggestion(Question.CHARACTERISTICS, CHARACTERISTICS_FOUND)
    if problem:
        notes.append(problem)
    source = SourceInfo(
        path=str(path),
        layout=choice.layout,
        value_column=headers[choice.value_columns[0]] if choice.layout == "stacked" else "",
        group_column=headers[choice.group_column] if choice.group_column is not None else "",
        columns=headers,
        header_row=shape.header_row,
        decimal=table.decimal,
        preview=tuple(tuple(row) for row in table.rows[:PREVIEW_ROWS]),
        **table.source,
    )
    return ReadingSet(groups=tuple(groups), source=source, notes=tuple(notes), suggested_question=suggestion.question,
                      pairing=pairing, pairing_problem=problem, found=suggestion.found)


def _part_texts(raw: RawColumn) -> np.ndarray:
    """The part column's identifiers as stripped texts, one per data row."""
    return np.array([str(text).strip() for text in raw.cell_texts], dtype=object)


def _ids_for(ids: np.ndarray | None, rows: np.ndarray | range) -> tuple[str, ...] | None:
    """The identifiers of these data rows ("" past the end of the part column), or None without a part column."""
    if ids is None:
        return None
    return tuple(ids[r] if r < len(ids) else "" for r in rows)


def _with_title_details(group: ReadingGroup, title: TitleBlockDetails) -> ReadingGroup:
    """The group with the title block's limits and nominal, and its unit where the column names none."""
    return dataclasses.replace(
        group, unit=group.unit or title.unit, lsl=title.lsl, usl=title.usl, nominal=title.nominal
    )


def _wide_group(raw: RawColumn, decimal: str, first_row_number: int, ids: np.ndarray | None) -> ReadingGroup:
    parsed = parse_column(raw, decimal)
    length = parsed.length
    values = parsed.values[:length]
    blank = np.isnan(values)
    cell_ids = _ids_for(ids, range(length))
    return ReadingGroup(
        name=name_without_unit(raw.header),
        unit=unit_in_header(raw.header),
        values=values[~blank] if blank.any() else values,
        part_ids=None if cell_ids is None else tuple(p for p, gap in zip(cell_ids, blank) if not gap),
        cell_part_ids=cell_ids,
        make_rows=lambda: tuple(range(first_row_number, first_row_number + length)),
        skipped=_skipped(parsed, raw.header, first_row_number),
        make_decimals=lambda: parsed.decimals,
        make_cells=lambda: parsed.cells(np.arange(length)),
    )


def _stacked_groups(
    value: RawColumn, label: RawColumn, decimal: str, first_row_number: int, ids: np.ndarray | None
) -> tuple[list[ReadingGroup], list[SkippedCell]]:
    """Groups by label, in order of first appearance; labels differing only in outer spaces are one group."""
    parsed = parse_column(value, decimal)
    raw_codes, raw_names = pd.factorize(label.texts, use_na_sentinel=False)
    names: list[str] = []
    merge = np.empty(len(raw_names), dtype=np.intp)
    for k, name in enumerate(raw_names):
        name = str(name).strip()
        if name not in names:
            names.append(name)
        merge[k] = names.index(name)
    codes = merge[raw_codes] if len(raw_names) else np.empty(0, dtype=np.intp)
    skipped: dict[int, list[SkippedCell]] = {}
    for cell in _skipped(parsed, value.header, first_row_number):
        skipped.setdefault(int(codes[cell.row - first_row_number]), []).append(cell)
    order = np.argsort(codes, kind="stable")
    bounds = np.searchsorted(codes[order], np.arange(len(names) + 1))
    groups, unlabelled = [], []
    for k, name in enumerate(names):
        rows = order[bounds[k]:bounds[k + 1]]
        if name == "":
            unlabelled = [
                SkippedCell(parsed.cell(int(r)).text, f"The row has no group label in column '{label.header}'.",
                            int(r) + first_row_number, value.header)
                for r in rows if parsed.cell(int(r)).kind is not CellKind.EMPTY
            ]
            continue
        values = parsed.values[rows]
        gaps = np.isnan(values)
        cell_ids = _ids_for(ids, rows)
        groups.append(
            ReadingGroup(
                name=name,
                unit=unit_in_header(value.header),
                values=values[~gaps],
                part_ids=None if cell_ids is None else tuple(p for p, gap in zip(cell_ids, gaps) if not gap),
                cell_part_ids=cell_ids,
                make_rows=lambda rows=rows: tuple(int(r) + first_row_number for r in rows),
                skipped=tuple(skipped.get(k, ())),
                make_decimals=lambda: parsed.decimals,
                make_cells=lambda rows=rows: parsed.cells(rows),
            )
        )
    return groups, unlabelled


def _skipped(parsed: ParsedColumn, header: str, first_row_number: int) -> tuple[SkippedCell, ...]:
    return tuple(
        SkippedCell(cell.text, cell.reason, row + first_row_number, header)
        for row, cell in sorted(parsed.odd_rows.items())
        if cell.is_skipped
    )


def _notes(
    shape: TableShape, table: _Table, choice: LayoutChoice, groups: list[ReadingGroup], unlabelled: list[SkippedCell]
) -> list[str]:
    """Plain words on what was chosen, assumed and skipped."""
    notes = list(table.sheet_notes) + list(choice.notes)
    if shape.header_row == 1:
        notes.append("Row 1, above the header, was taken as a title and skipped.")
    elif shape.header_row > 1:
        notes.append(f"Rows 1 to {shape.header_row}, above the header, were taken as a title block and skipped.")
    elif shape.header_row < 0:
        notes.append("The file has no header row; the columns are named by position.")
    if table.decimal_note:
        notes.append(table.decimal_note)
    units = sorted({g.unit for g in groups if g.unit})
    if units:
        notes.append(f"Unit taken from the column title: {', '.join(units)}.")
    total = sum(g.values.size for g in groups)
    notes.append(f"{total} readings in {len(groups)} group{'s' if len(groups) != 1 else ''}.")
    skipped = [s for g in groups for s in g.skipped] + unlabelled
    if skipped:
        shown = "; ".join(f"row {s.row} '{s.text.strip()[:30]}'" for s in skipped[:5])
        more = f" and {len(skipped) - 5} more" if len(skipped) > 5 else ""
        notes.append(f"{len(skipped)} cell{'s' if len(skipped) != 1 else ''} not used as readings: {shown}{more}.")
    return notes
