"""The planner starts from what the sheet knows: the spread from its readings, the shift from the
tolerance, and says where each came from; it plans one-sided studies and several groups too.

Expected spreads are computed with Python's statistics module (an outside reference): the pooled
variance is sum((n_i - 1) s_i^2) / sum(n_i - 1), with s_i^2 = statistics.variance; the shift is
one tenth of the tolerance width, the planner's stated rule of thumb (common practice, no source).
"""

from __future__ import annotations

import math
import statistics

from window_support import answers, screenshot, wait_for_verdict, window  # noqa: F401 - pytest fixtures

from rankwise.stats import PlanResult

A = ["1.02", "1.05", "0.98", "1.01", "1.04", "0.99", "1.03", "1.00"]
B = ["1.06", "1.04", "1.09", "1.05", "1.08", "1.03", "1.07", "1.10"]
C = ["1.01", "0.97", "1.04", "1.00", "1.02", "0.99"]


def _paste(window, column: int, texts: list[str]) -> None:
    window.grid.move_to(0, column)
    window.grid.paste_text("\n".join(texts) + "\n")


def _pooled_sd(*groups: list[str]) -> float:
    values = [[float(t) for t in group] for group in groups]
    return math.sqrt(sum((len(v) - 1) * statistics.variance(v) for v in values) / sum(len(v) - 1 for v in values))


def _plan_shown(qtbot, window, check) -> PlanResult:
    qtbot.waitUntil(lambda: isinstance(window.last_result, PlanResult) and not window.runner.busy
                    and check(window.last_result), timeout=60000)
    return window.last_result


def test_the_planner_starts_from_the_sheet_and_the_limits(qtbot, window):
    _paste(window, 0, A)
    _paste(window, 1, B)
    window.sheet.set_group_details(0, unit="mm", lsl=0.70, usl=1.50)
    wait_for_verdict(qtbot, window, timeout=60000)
    panel = window.question_panel
    panel.select_option("plan")
    result = _plan_shown(qtbot, window, lambda r: not r.paired)

    spread = _pooled_sd(A, B)
    assert panel.planned_spread.value() == round(spread, 3)
    assert panel.planned_shift.value() == 0.08  # 10 % of 1.50 - 0.70
    assert (result.shift, result.spread) == (0.08, round(spread, 3))
    assert panel.plan_origin.text() == "Shift: 10 % of A's tolerance\nSpread: 16 readings on the sheet"
    origin = panel.plan_origin.toolTip()
    assert "Shift worth finding 0.08 mm: 10 % of the tolerance width of A (LSL 0.70 mm to USL 1.50 mm)" in origin
    assert "standard deviation of the 16 readings of A and B on the sheet" in origin
    notes = window.results_panel.notes.text()
    assert "10 % of the tolerance width of A" in notes and "16 readings of A and B" in notes
    assert all(note in window.last_analysis.notes for note in origin.split("\n")), "kept in the record"
    screenshot(window, "window-planner-from-sheet")

    # The same parts: the spread is that of the row-by-row differences.
    panel.plan_design.setCurrentIndex(panel.plan_design.findData(True))
    result = _plan_shown(qtbot, window, lambda r: r.paired)
    differences = [float(b) - float(a) for a, b in zip(A, B)]
    assert panel.planned_spread.value() == round(statistics.stdev(differences), 3)
    assert "standard deviation of the 8 row-by-row differences" in panel.plan_origin.toolTip()

    # One-sided: B reads higher only; the plan needs fewer parts than the two-sided one.
    panel.plan_design.setCurrentIndex(panel.plan_design.findData(False))
    two_sided = _plan_shown(qtbot, window, lambda r: not r.paired and r.alternative == "two-sided")
    panel.direction.setCurrentIndex(panel.direction.findData("b-greater"))
    one_sided = _plan_shown(qtbot, window, lambda r: r.alternative == "b-greater")
    assert one_sided.n_a < two_sided.n_a and "B reads higher" == panel.direction.currentText()

    # A value typed by the technician is kept, and said to be typed.
    panel.planned_spread.setValue(0.05)
    _plan_shown(qtbot, window, lambda r: r.spread == 0.05)
    assert "Usual spread 0.05 mm: typed." in panel.plan_origin.toolTip()
    assert panel.plan_origin.text().endswith("Spread: typed")


def test_the_planner_plans_for_several_groups_from_their_readings(qtbot, window):
    _paste(window, 0, A)
    _paste(window, 1, B)
    window.add_group() if hasattr(window, "add_group") else window.sheet.add_group("C")
    _paste(window, 2, C)
    wait_for_verdict(qtbot, window, timeout=60000)
    panel = window.question_panel
    panel.select_option("plan")
    panel.plan_design.setCurrentIndex(panel.plan_design.findData("several"))
    result = _plan_shown(qtbot, window, lambda r: r.groups == 3)
    assert panel.planned_spread.value() == round(_pooled_sd(A, B, C), 3)
    assert not panel.direction.isVisible() and not panel.group_a.isVisible()
    assert "in each of the 3 groups" in window.results_panel.headline.text()
    assert result.simulated_power is not None
    assert panel.plan_origin.text() == "Shift: placeholder, no LSL/USL\nSpread: 22 readings on the sheet"
    screenshot(window, "window-planner-several")
