"""A frozen copy of the readings sheet, and its plain JSON-able form for records and recovery.

The JSON form keeps each cell's text exactly as typed together with what it was read as, so a
record reopened on a machine with another locale shows the same numbers.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
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
class SheetSnapshot:
    """The whole sheet as it stood: its groups, its decimal setting ("auto", "." or ",") and how
    readings below different detection limits are treated ("ask" or "below-highest")."""

    groups: tuple[GroupSnapshot, ...] = ()
    decimal: str = "auto"
    mixed_limits: str = "ask"

    def to_dict(self, with_cells: bool = True) -> dict[str, Any]:
        """Plain data (dicts, lists, str, float, int, None) that ``json.dumps`` accepts; without the
        cells when ``with_cells`` is False (the entry journal writes them in pieces).

        The mixed-limits setting is written only when it is not the default "ask", so the data of a
        sheet without it (and the fingerprints of records written before it existed) stay as they were.
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
        return cls(groups=groups, decimal=decimal, mixed_limits=mixed_limits)


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
