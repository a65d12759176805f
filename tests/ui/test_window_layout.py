"""What the technician sees is not cut off: the spare column's title, the notes under the verdict, and every
label, button and tab at 1024 x 700, 1440 x 900, 1920 x 1080 and 200 % scaling."""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import pytest
from PySide6.QtGui import QTextDocument
from layout_checks import cut_off_texts, window_problems
from pytestqt.exceptions import TimeoutError as WaitTimedOut
from window_support import PATIENCE_MS, SCREENSHOTS, answers, screenshot, wait_for_verdict, window  # noqa: F401

from rankwise.stats.results import PlanResult


def test_the_new_group_column_is_in_view_with_its_whole_title(qtbot, window):
    """With the two-wheel demo (two groups), the spare column sits inside the sheet and its title fits it."""
    window.open_demo()
    wait_for_verdict(qtbot, window)
    grid = window.grid
    header = grid.horizontalHeader()
    spare = grid.model().columnCount() - 1
    right_edge = header.sectionViewportPosition(spare) + header.sectionSize(spare)
    assert right_edge <= grid.viewport().width()
    title = grid.model().headerData(spare, header.orientation())
    widest = max(header.fontMetrics().horizontalAdvance(line) for line in title.splitlines())
    assert header.sectionSize(spare) >= widest


def test_the_notes_of_a_plan_follow_their_heading(qtbot, window):
    """The plan's notes are shown as a list right under "Notes:", not after an empty gap."""
    window.open_demo()
    wait_for_verdict(qtbot, window)
    window.question_panel.select_option("plan")
    window.question_panel.planned_shift.setValue(0.03)
    window.question_panel.planned_spread.setValue(0.04)
    qtbot.waitUntil(lambda: isinstance(window.last_result, PlanResult) and not window.runner.busy, timeout=60000)
    notes = window.results_panel.notes
    assert notes.isVisible() and notes.text().startswith("<b>Notes:</b>")
    document = QTextDocument()
    document.setDefaultFont(notes.font())
    document.setHtml(notes.text())
    document.setTextWidth(notes.width())
    layout = document.documentLayout()
    heading, first_note = document.firstBlock(), document.firstBlock().next()
    assert first_note.text().startswith("The test will be")
    gap = layout.blockBoundingRect(first_note).top() - layout.blockBoundingRect(heading).bottom()
    assert gap <= notes.fontMetrics().height() / 4


def settled_problems(qtbot, window, find_problems=window_problems) -> list[str]:
    """What is cut off once the layout has caught up with the verdict (on a busy machine the
    layout pass can come after the result): waits for no problems, else returns the last ones seen."""
    seen: list[str] = []

    def nothing_cut_off() -> bool:
        seen[:] = find_problems(window)
        return not seen

    try:
        qtbot.waitUntil(nothing_cut_off, timeout=PATIENCE_MS)
    except WaitTimedOut:
        pass
    return seen


SCALED_SCREEN = {"synchronousWindowSystemEvents": False, "windowFrameMargins": False,
                 "screens": [{"name": "shop-floor", "x": 0, "y": 0, "width": 2048, "height": 1400,
                              "logicalDpi": 96, "logicalBaseDpi": 96, "dpr": 1}]}


@pytest.mark.parametrize(("width", "height"), [(1024, 700), (1920, 1080), (1440, 900)])
def test_nothing_is_cut_off_at_shop_floor_and_desktop_sizes(qtbot, window, width, height):
    """At 1024 x 700 the question and the sheet fold into tabs; at every size the verdict and the
    cautions note show whole, at least five rank rows show, and no label, button or tab is cut off."""
    window.resize(width, height)
    window.open_demo()
    wait_for_verdict(qtbot, window)
    qtbot.waitUntil(lambda: window.width() == width, timeout=60000)
    assert settled_problems(qtbot, window) == []
    screenshot(window, f"window-{width}x{height}")
    if width < 1280:
        window.focus_pane("question")
        assert window.question_panel.isVisible()
        assert settled_problems(qtbot, window, cut_off_texts) == []
        screenshot(window, f"window-{width}x{height}-question")


def test_nothing_is_cut_off_at_200_percent_scaling(tmp_path):
    """At QT_SCALE_FACTOR=2 on a 2048 x 1400 screen the window fits the screen with nothing cut off, and
    the open dialog's buttons and the many-characteristics window are on screen (child process: the scale is fixed when Qt starts)."""
    config = tmp_path / "screen.json"
    config.write_text(json.dumps(SCALED_SCREEN), encoding="utf-8")
    SCREENSHOTS.mkdir(parents=True, exist_ok=True)
    environment = dict(os.environ, QT_SCALE_FACTOR="2", QT_QPA_PLATFORM=f"offscreen:configfile={config}",
                       PYTHONPATH=os.pathsep.join(sys.path))
    finished = subprocess.run([sys.executable, str(Path(__file__).with_name("scaled_window.py")), str(SCREENSHOTS)],
                              env=environment, capture_output=True, text=True, timeout=300)
    assert finished.returncode == 0, finished.stderr
    report = json.loads(finished.stdout.strip().splitlines()[-1])
    assert report["scale"] == 2.0
    assert report["window_inside_screen"] and report["dialog_inside_screen"]
    assert report["characteristics_compared"] and report["characteristics_inside_screen"]
    assert report["characteristics_texts_cut"] == []
    assert report["window_problems"] == []


def test_a_long_status_line_ends_in_an_ellipsis_with_the_whole_count_in_its_tooltip(qtbot, window):
    """Four groups with long names at 1024 x 700: the counts never stop mid-word at the edge."""
    window.resize(1024, 700)
    qtbot.waitUntil(lambda: window.width() == 1024, timeout=PATIENCE_MS)
    names = ["Wheel A, current supplier", "Wheel B, new supplier", "Wheel C, trial dressing", "Wheel D, trial coolant"]
    rows = ["\t".join(names)] + ["\t".join(f"3,{10 + row + column}" for column in range(4)) for row in range(6)]
    window.grid.move_to(0, 0)
    window.grid.paste_text("\n".join(rows))
    status = window.status_counts
    qtbot.waitUntil(lambda: status.text().startswith(names[0]), timeout=PATIENCE_MS)
    assert all(name in status.toolTip() for name in names)
    shown = status.shown_text()
    assert shown.endswith("…") and status.fontMetrics().horizontalAdvance(shown) <= status.contentsRect().width()
    screenshot(window, "window-1024x700-long-status-line")
