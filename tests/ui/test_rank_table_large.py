"""A large result's rank table is sorted on a background thread: the same table, once ready, and
never the table of a result that is no longer shown."""

from __future__ import annotations

from PySide6.QtCore import Qt

from window_support import DEMO_FILES, PATIENCE_MS, answers, wait_for_verdict, window  # noqa: F401 - pytest fixtures

import rankwise.ui.rank_table as rank_table
from rankwise.ui.rank_table import RankTable


def _everything(table: RankTable) -> tuple:
    model = table.model
    cells = []
    for row in range(model.rowCount()):
        for column in range(model.columnCount()):
            index = model.index(row, column)
            tint = index.data(Qt.ItemDataRole.BackgroundRole)
            cells.append((index.data(), index.data(Qt.ItemDataRole.ToolTipRole), tint and tint.color().name()))
    return model.headers, cells, table.sums.text()


def _demo_result(qtbot, window):
    assert window.open_path(DEMO_FILES / "two_wheels_roughness.csv")
    wait_for_verdict(qtbot, window)
    return window.last_result, window.last_analysis


def test_a_table_sorted_on_its_own_thread_is_the_same_table(qtbot, window, monkeypatch):
    result, analysis = _demo_result(qtbot, window)
    at_once = RankTable()
    qtbot.addWidget(at_once)
    at_once.show_result(result, analysis)
    assert at_once.model.rowCount() == result.n_a + result.n_b
    monkeypatch.setattr(rank_table, "LARGE_RESULT_READINGS", 0)
    sorted_aside = RankTable()
    qtbot.addWidget(sorted_aside)
    sorted_aside.show_result(result, analysis)
    assert sorted_aside.sums.text().startswith("Ranking ")
    qtbot.waitUntil(lambda: sorted_aside.model.rowCount() > 0, timeout=PATIENCE_MS)
    assert _everything(sorted_aside) == _everything(at_once)


def test_a_table_sorted_too_late_is_not_shown(qtbot, window, monkeypatch):
    result, analysis = _demo_result(qtbot, window)
    monkeypatch.setattr(rank_table, "LARGE_RESULT_READINGS", 0)
    table = RankTable()
    qtbot.addWidget(table)
    with qtbot.waitSignal(table._contents_ready, timeout=PATIENCE_MS):
        table.show_result(result, analysis)
        table.clear("The readings changed.")
    assert table.model.rowCount() == 0 and table.sums.text() == "The readings changed."
