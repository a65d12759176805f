"""A frozen copy of the readings sheet, and its plain JSON-able form for records and recovery.

The JSON form keeps each cell's text exactly as typed together with what it was read as, so a
record reopened on a machine with another locale shows the same numbers.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Any

from rankwise.readings.cells import EMPTY_CELL, Cell, CellKind
from rankwise.readings.censored import check_mixed_limits
from rankwise.readings.errors import ReadingsError
from rankwise.readings.parse import DECIMAL_CHOICES

FORMAT_VERSION = 1
"""Version of the ``to_dict`` form; raised when its meaning changes."""


@dataclass(frozen=True)
class GroupSnapshot:
    """One group as it stood: name, unit, limits, nominal, and its cells in entry order."""

    name: str
    unit: str = ""
    lsl: float | None = None
    usl: float | None = None
    nominal: float | None = None
    cells: tuple[Cell, ...] = ()


@dataclass(frozen=True)
class RowParts:
    """Which part each row of the sheet is, or why its rows are not parts.

    Attributes:
        column: the file's column of part identifiers the rows were matched by, or "".
        ids: the part identifier of each row (rows past the end have none), or None when the
            rows were not matched by identifier (typed, or opened without a part column).
        not_parts: plain words on why the rows cannot be paired as parts (a stacked export
            without identifiers), or "" when a row may be taken as one part.
    """

    column: str = ""
    ids: tuple[str, ...] | None = None
    not_parts: str = ""

    def with_rows_inserted(self, row: int, count: int) -> RowParts:
        """The same parts with ``count`` rows without an identifier inserted before ``row``."""
        if self.ids is None or row >= len(self.ids):
            return self
        return replace(self, ids=self.ids[:row] + ("",) * count + self.ids[row:])

    def with_rows_deleted(self, row: int, count: int) -> RowParts:
        """The same parts with rows ``row`` to ``row + count - 1`` deleted."""
        if self.ids is None:
            return self
        return replace(self, ids=self.ids[:row] + self.ids[row + count:])

    def id_of(self, row: int) -> str:
        """The part identifier of a row, or "" when it has none."""
        return self.ids[row] if self.ids is not None and row < len(self.ids) else ""

    def to_dict(self) -> dict[str, Any]:
        """Plain data for the snapshot's JSON form."""
        data: dict[str, Any] = {}
        if self.ids is not None:
            data.update(column=self.column, ids=list(self.ids))
        if self.not_parts:
            data["not_parts"] = self.not_parts
        return data

    @classmethod
    def from_dict(cls, data: Any) -> RowParts:
        """Rebuild from ``to_dict`` data; ``TypeError`` or ``ValueError`` when damaged."""
        ids = data.get("ids")
        if ids is not None and not all(isinstance(part, str) for part in ids):
            raise TypeError("part identifiers")
        return cls(str(data.get("column", "")), None if ids is None else tuple(ids), str(data.get("not_parts", "")))


@dataclass(frozen=True)
class SheetSnapshot:
    """The whole sheet as it stood: its groups, its decimal setting ("auto", "." or ","), how
    readings below different detection limits are treated ("ask" or "below-highest"), and which
    part each row is (see ``RowParts``)."""

    groups: tuple[GroupSnapshot, ...] = ()
    decimal: str = "auto"
    mixed_limits: str = "ask"
    parts: RowParts = RowParts()

    def to_dict(self, with_cells: bool = True) -> dict[str, Any]:
        """Plain data (dicts, lists, str, float, int, None) that ``json.dumps`` accepts; without the
        cells when ``with_cells`` is False (the entry journal writes them in pieces).

        The mixed-limits setting and the rows' parts are written only when they are not the defaults,
        so the data of a sheet without them (and the fingerprints of records written before they
        existed) stay as they were.
        """
        data: dict[str, Any] = {
            "format": FORMAT_VERSION,
            "decimal": self.decimal,
            "groups": [
                {
                    "name": group.name,
                    "unit": group.unit,
                    "lsl": group.lsl,
                    "usl": group.usl,
                    "nominal": group.nominal,
                    **({"cells": [cell_to_dict(cell) for cell in group.cells]} if with_cells else {}),
                }
                for group in self.groups
            ],
        }
        if self.mixed_limits != "ask":
            data["mixed_limits"] = self.mixed_limits
        if self.parts.to_dict():
            data["parts"] = self.parts.to_dict()
        return data

    @classmethod
    def from_dict(cls, data: Any) -> SheetSnapshot:
        """Rebuild a snapshot from ``to_dict`` data; damaged data raise ``ReadingsError``.

        Data without a mixed-limits setting (written before it existed) mean "ask"."""
        try:
            if data.get("format") != FORMAT_VERSION:
                raise ReadingsError(
                    f"The stored readings are in form {data.get('format')!r}, which this version cannot read; "
                    "open them with the version that wrote them."
                )
            decimal = data["decimal"]
            if decimal not in DECIMAL_CHOICES:
                raise ValueError(decimal)
            mixed_limits = check_mixed_limits(data.get("mixed_limits", "ask"))
            parts = RowParts.from_dict(data.get("parts", {}))
            groups = tuple(
                GroupSnapshot(
                    name=str(group["name"]),
                    unit=str(group["unit"]),
                    lsl=_optional_number(group["lsl"]),
                    usl=_optional_number(group["usl"]),
                    nominal=_optional_number(group["nominal"]),
                    cells=tuple(cell_from_dict(cell) for cell in group["cells"]),
                )
                for group in data["groups"]
            )
        except ReadingsError:
            raise
        except (AttributeError, KeyError, TypeError, ValueError) as error:
            raise ReadingsError(
                "The stored readings are damaged and cannot be restored; use the original file or retype them."
            ) from error
        return cls(groups=groups, decimal=decimal, mixed_limits=mixed_limits, parts=parts)


def cell_to_dict(cell: Cell) -> dict[str, Any]:
    """One cell as plain data: its text and kind, and its number, limit, decimals and reason when set."""
    data: dict[str, Any] = {"text": cell.text, "kind": cell.kind.value}
    for name in ("value", "limit", "decimals"):
        if getattr(cell, name) is not None:
            data[name] = getattr(cell, name)
    if cell.reason:
        data["reason"] = cell.reason
    return data


def cell_from_dict(data: dict[str, Any]) -> Cell:
    """The cell ``cell_to_dict`` wrote; data that do not fit together raise ``ValueError`` or ``TypeError``."""
    kind = CellKind(data["kind"])
    text = data["text"]
    if not isinstance(text, str):
        raise TypeError("cell text")
    if kind is CellKind.EMPTY and text == "":
        return EMPTY_CELL
    value = _optional_number(data.get("value"))
    limit = _optional_number(data.get("limit"))
    decimals = data.get("decimals")
    if decimals is not None and (not isinstance(decimals, int) or decimals < 0):
        raise ValueError("decimals")
    if (kind is CellKind.NUMBER) != (value is not None) or (kind is CellKind.CENSORED) != (limit is not None):
        raise ValueError("cell kind and number disagree")
    return Cell(text, kind, value=value, limit=limit, decimals=decimals, reason=str(data.get("reason", "")))


def _optional_number(value: Any) -> float | None:
    if value is None:
        return None
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise ValueError("not a finite number")
    return float(value)
