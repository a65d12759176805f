"""Value-by-value comparison of stored data, reported in plain words; a workbook as a file gives it back."""

from __future__ import annotations

import io
import math
from collections.abc import Iterator
from typing import Any

from openpyxl import Workbook, load_workbook
from openpyxl.writer.excel import save_workbook


def saved_and_reloaded(workbook: Workbook) -> Workbook:
    """``workbook`` as a spreadsheet file would give it back (numbers, dates and formats as stored)."""
    buffer = io.BytesIO()
    save_workbook(workbook, buffer)
    buffer.seek(0)
    return load_workbook(buffer)


def data_differences(stored: Any, recomputed: Any, path: str = "") -> Iterator[str]:
    """Where two plain JSON data trees differ; numbers agree within 1e-9 relative (1e-12 absolute)."""
    if isinstance(stored, dict) and isinstance(recomputed, dict):
        for key in sorted(set(stored) | set(recomputed)):
            yield from data_differences(stored.get(key), recomputed.get(key), f"{path}.{key}" if path else key)
    elif isinstance(stored, list) and isinstance(recomputed, list):
        if len(stored) != len(recomputed):
            yield f"{path}: {len(stored)} entries on record, {len(recomputed)} recomputed"
            return
        for index, (a, b) in enumerate(zip(stored, recomputed)):
            yield from data_differences(a, b, f"{path}[{index}]")
    elif _numbers(stored, recomputed):
        if not math.isclose(stored, recomputed, rel_tol=1e-9, abs_tol=1e-12):
            yield f"{path}: {stored!r} on record, {recomputed!r} recomputed"
    elif stored != recomputed:
        yield f"{path}: {stored!r} on record, {recomputed!r} recomputed"


def _numbers(*values: Any) -> bool:
    return all(isinstance(v, (int, float)) and not isinstance(v, bool) for v in values)
