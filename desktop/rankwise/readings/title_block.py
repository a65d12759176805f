"""Specification limits and the unit written in a file's title block, above the column titles.

Gauge sheets and quality-system exports often state the limits once, above the table:
"LSL | 25.000", "Upper limit: 25.021", "Nominal 25.010", and the unit in the title
("Bore diameter (mm)"). They apply to every group of the table. A label and its number must stand
side by side in one row; anything less clear is left alone (common practice, no source).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from rankwise.readings.cells import CellKind
from rankwise.readings.layout import unit_in_header
from rankwise.readings.parse import parse_reading

_LABELS = {
    "lsl": ("lsl", "lower limit", "lower specification limit", "lower spec limit", "lower tolerance limit", "min limit"),
    "usl": ("usl", "upper limit", "upper specification limit", "upper spec limit", "upper tolerance limit", "max limit"),
    "nominal": ("nominal", "nominal value", "target"),
}


@dataclass(frozen=True)
class TitleBlockDetails:
    """What the title block says about every group: limits, nominal and unit (None / "" when absent).

    Attributes:
        note: a plain-words note of what was taken, or of what was left out and why; "" when nothing was found.
    """

    lsl: float | None = None
    usl: float | None = None
    nominal: float | None = None
    unit: str = ""
    note: str = ""


def _label_key(text: str) -> str | None:
    folded = " ".join(text.strip().rstrip(":=").casefold().split())
    for key, labels in _LABELS.items():
        if folded in labels:
            return key
    return None


def read_title_block(rows: Sequence[Sequence[str]], decimal: str) -> TitleBlockDetails:
    """Limits, nominal and unit from the rows above the column titles."""
    found: dict[str, float] = {}
    unit = ""
    for row in rows:
        cells = [text.strip() for text in row if text and text.strip()]
        if not cells:
            continue
        if not unit:
            unit = unit_in_header(cells[0])
        if len(cells) < 2:
            continue
        key = _label_key(cells[0])
        if key is None or key in found:
            continue
        cell = parse_reading(cells[1], decimal=decimal, unit=unit)
        if cell.kind is CellKind.NUMBER and cell.value is not None:
            found[key] = cell.value
    lsl, usl = found.get("lsl"), found.get("usl")
    if lsl is not None and usl is not None and lsl > usl:
        return TitleBlockDetails(
            nominal=found.get("nominal"), unit=unit,
            note=f"The title block gives LSL {lsl:g} above USL {usl:g}; the limits were left out, set them per group.",
        )
    taken = [f"{name} {found[key]:g}" for key, name in (("lsl", "LSL"), ("usl", "USL"), ("nominal", "nominal")) if key in found]
    note = f"From the title block, for every group: {', '.join(taken)}." if taken else ""
    return TitleBlockDetails(lsl=lsl, usl=usl, nominal=found.get("nominal"), unit=unit, note=note)
