"""The window says which decimal mark the sheet reads, and a number typed before the deciding one is read again."""

from __future__ import annotations

import pytest

from window_support import PATIENCE_MS, answers, screenshot, type_column, window  # noqa: F401 - pytest fixtures

from rankwise.readings import CellKind
from rankwise.readings import parse as parse_module


@pytest.fixture(autouse=True)
def point_machine(monkeypatch):
    """A machine whose locale writes a decimal point (the case where '1,002' once became 1002)."""
    monkeypatch.setattr(parse_module, "machine_decimal", lambda: ".")


def test_the_status_line_shows_the_decided_mark(qtbot, window):
    """1,002 is flagged until 0,998 shows a decimal comma; then it reads 1.002 (the value written, no source needed)."""
    type_column(qtbot, window.grid, 0, ["1,002"])
    assert window.sheet.cell(0, 0).kind is CellKind.INVALID
    qtbot.waitUntil(lambda: "this computer's" in window.status_decimal.text(), timeout=PATIENCE_MS)
    type_column(qtbot, window.grid, 0, ["0,998", "1,010"], start_row=1)
    assert [window.sheet.cell(0, r).value for r in range(3)] == [1.002, 0.998, 1.010]
    qtbot.waitUntil(lambda: window.status_decimal.text() == "Decimal comma (from 0,998 in A, row 2)", timeout=PATIENCE_MS)
    assert "the first reading that shows one, '0,998'" in window.status_decimal.toolTip()
    screenshot(window, "window-decimal-mark-decided")
