"""What opening a file gives: groups of readings as read, where they came from, what was skipped."""

from __future__ import annotations

import functools
from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np

from rankwise.readings.cells import Cell, SkippedCell
from rankwise.stats.analysis import Question


@dataclass(frozen=True)
class ReadingGroup:
    """One group of an opened file.

    Attributes:
        name: the group's name (the column header in a wide layout, the label in a stacked one).
        values: the numbers in file order (notes, blanks and unreadable entries left out).
        skipped: the cells with text that are not used, each with its row, column and reason.
        decimals: (property) the most decimals written in the group (the gauge's resolution), or None.
        cells: (property) every cell as read, blanks included, in file order.
        unit: the readings' unit when the column title names one in brackets ("Force (kN)"), or
            the title block does; else "".
        lsl, usl, nominal: specification limits and nominal stated in the file's title block, or None.
        part_ids: the part identifier of each of ``values`` (same order), from the file's part
            column, or None when the file has none.
        cell_part_ids: the part identifier of each of ``cells`` (same order), or None.
    """

    name: str
    values: np.ndarray
    skipped: tuple[SkippedCell, ...] = ()
    unit: str = ""
    lsl: float | None = None
    usl: float | None = None
    nominal: float | None = None
    part_ids: tuple[str, ...] | None = None
    cell_part_ids: tuple[str, ...] | None = field(default=None, repr=False, compare=False)
    make_cells: Callable[[], tuple[Cell, ...]] = field(default=tuple, repr=False, compare=False)
    """Builds ``cells`` on first use (a million cells take time to build and are rarely all needed)."""
    make_decimals: Callable[[], int | None] = field(default=lambda: None, repr=False, compare=False)
    """Finds ``decimals`` on first use."""
    make_rows: Callable[[], tuple[int, ...]] = field(default=tuple, repr=False, compare=False)
    """Builds ``file_rows`` on first use."""

    @functools.cached_property
    def file_rows(self) -> tuple[int, ...]:
        """The file's row number (1-based) of each of ``cells``; () when not known."""
        return tuple(self.make_rows())

    @functools.cached_property
    def decimals(self) -> int | None:
        """The most decimals written in the group (the gauge's resolution), or None."""
        return self.make_decimals()

    @functools.cached_property
    def cells(self) -> tuple[Cell, ...]:
        """Every cell of the group as read, in file order."""
        return tuple(self.make_cells())


@dataclass(frozen=True)
class SourceInfo:
    """Where the readings came from and how the file was understood (the open dialog shows this).

    Attributes:
        path: the file opened.
        format: "csv" or "xlsx".
        sheet: the worksheet read (XLSX), or "".
        sheet_names: every worksheet of the workbook (XLSX), or ().
        layout: "wide" (a column per group) or "stacked" (a value column and a group column).
        value_column, group_column: the header names of the columns used in a stacked layout, or "".
        columns: the header names of all columns, in file order.
        header_row: the 0-based row of the header line (rows above it are a title block).
        encoding: the text encoding (CSV), or "".
        delimiter: the field separator (CSV), or "".
        decimal: the decimal mark used to read the numbers, "." or ",".
        preview: the first rows of the file as texts, header and title block included.
    """

    path: str
    format: str
    sheet: str = ""
    sheet_names: tuple[str, ...] = ()
    layout: str = "wide"
    value_column: str = ""
    group_column: str = ""
    columns: tuple[str, ...] = ()
    header_row: int = 0
    encoding: str = ""
    delimiter: str = ""
    decimal: str = "."
    preview: tuple[tuple[str, ...], ...] = ()


@dataclass(frozen=True)
class PartPairing:
    """The same parts measured twice, matched by their identifiers (never by position).

    Attributes:
        part_column: the header of the column of part identifiers.
        noun: what the parts are called, plural ("springs" from "Spring no."; else "parts").
        parts: every identifier, in order of first appearance in the file; one sheet row each.
        paired: how many parts have a reading (or a cell) at both stages.
        unpaired: (identifier, the only stage it appears in) for each part present once.
    """

    part_column: str
    noun: str
    parts: tuple[str, ...]
    paired: int
    unpaired: tuple[tuple[str, str], ...] = ()


@dataclass(frozen=True)
class ReadingSet:
    """The readings of an opened file: groups, where they came from, and plain-words notes.

    Attributes:
        suggested_question: the question the readings fit: the same parts measured twice when
            they pair by part identifier, several groups for three or more, else two groups.
        pairing: how the two groups' readings pair part by part, or None.
        pairing_problem: plain words on why readings recognised as the same parts cannot be
            paired (an identifier repeated within one stage), else "".
        found: one sentence on what was recognised, for the open dialog, or "".
    """

    groups: tuple[ReadingGroup, ...]
    source: SourceInfo
    notes: tuple[str, ...] = ()
    suggested_question: Question = Question.TWO_GROUPS
    pairing: PartPairing | None = None
    pairing_problem: str = ""
    found: str = ""

    @property
    def group_names(self) -> list[str]:
        """The groups' names, in order."""
        return [group.name for group in self.groups]
