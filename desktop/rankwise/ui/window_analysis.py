"""Asking for the analysis the sheet and the question describe, and showing what comes back.

Every edit builds an ``Analysis``; the ``AnalysisRunner`` computes it off the GUI thread; the
result is worded once (``rankwise.wording``) and shown in the results panel, rank table and charts.
"""

from __future__ import annotations

import functools
from dataclasses import replace

import numpy as np

from rankwise.readings import ReadingSheet, ReadingsError
from rankwise.readings.censored import MixedLimitsError
from rankwise.readings.for_analysis import build_analysis as analysis_of_columns
from rankwise.stats.analysis import Analysis, Question

PROGRESS_DELAY_MS = 250
"""A calculation shows its progress strip only when it takes longer than this."""

LARGE_SHEET_CELLS = 50_000
"""A sheet with more cells is read into an analysis on the worker, not on the window's thread."""


def analysis_for(sheet: ReadingSheet, choice) -> Analysis:
    """The analysis ``sheet`` and the question ``choice`` ask for; the reason it cannot be made
    yet raises ``ReadingsError`` (``MixedLimitsError`` for readings below different limits)."""
    if choice.question is Question.PLAN and not choice.group_indices:
        return replace(analysis_of_columns((), choice.question, choice.settings, decimal=sheet.decimal),
                       notes=choice.notes)
    if choice.question is Question.PAIRED and len(choice.group_indices) == 2:
        cannot_pair = sheet.pairing_refusal(choice.group_indices)
        if cannot_pair:
            raise ReadingsError(cannot_pair)
    analysis = sheet.to_analysis(choice.question, choice.settings, list(choice.group_indices))
    if sheet.decimal != "auto":  # the sheet reads one stated mark: numbers are shown with it
        analysis = replace(analysis, decimal_mark=sheet.decimal)
    if choice.notes:  # e.g. where a plan's starting values came from, kept in the record
        analysis = replace(analysis, notes=(*analysis.notes, *choice.notes))
    empty = [group.name for group in analysis.groups if not np.isfinite(np.asarray(group.values)).any()]
    if choice.question is not Question.PLAN and empty:
        if len(empty) == len(analysis.groups):
            raise ReadingsError("Type or paste the readings into the sheet, one column per group, "
                                "or open a file with File > Open readings (Ctrl+O).")
        raise ReadingsError(f"{empty[0]} has no readings yet: type or paste them into its column.")
    return analysis


class WindowAnalysis:
    """Mixin of ``MainWindow``: analysis requests, progress, results and problems."""

    def build_analysis(self) -> tuple[Analysis | None, str]:
        """The analysis the sheet and the question ask for, or None with the reason in plain words.

        When the reason is readings below different detection limits, ``mixed_limits_problem`` holds it
        (else None), so that the choice can be offered with it."""
        self.mixed_limits_problem = None
        choice = self.question_panel.choice()
        if choice.problem:
            return None, choice.problem
        try:
            return analysis_for(self.sheet, choice), ""
        except MixedLimitsError as error:
            self.mixed_limits_problem = error
            return None, str(error)
        except ReadingsError as error:
            return None, str(error)

    def request_analysis(self, immediately: bool = False) -> None:
        """Recompute after an edit (debounced) or at once (after opening or a question change).

        A large sheet (more than ``LARGE_SHEET_CELLS`` cells) is read into an analysis on the worker,
        from a copy of the sheet taken now (``ReadingSheet.copy``: the cells shared, the arrays the
        sheet keeps in step copied, so the worker need not read every cell again), so that the
        window never waits for it."""
        if sum(len(group.cells) for group in self.sheet.groups) > LARGE_SHEET_CELLS:
            choice = self.question_panel.choice()
            if not choice.problem:
                job = functools.partial(analysis_for, self.sheet.copy(), choice)
                self.runner.request_now(job) if immediately else self.runner.request(job)
                return
        analysis, reason = self.build_analysis()
        if analysis is None:
            self.runner.discard_pending()
            self._calculation_ended()
            self.last_result = None
            self.last_analysis = None
            self.results_panel.show_waiting(reason)
            if self.mixed_limits_problem is not None and not self.sheet_model.read_only:
                highest = self.mixed_limits_problem.shown[-1]
                self.results_panel.offer_choice(
                    f"Treat all as below the highest limit, <{highest}",
                    f"Count every reading written below a limit, and any reading measured under {highest}, "
                    f"as below {highest}. Undo takes the choice back; the Edit menu holds it too.")
            self.rank_table.clear()
            for chart in self.charts:
                chart.clear()
            self.records.update_enabled()
            return
        self.question_panel.set_decimal_mark(analysis.decimal_mark)
        if immediately:
            self.runner.request_now(analysis)
        else:
            self.runner.request(analysis)

    def _on_question_changed(self) -> None:
        self.keeper.question_changed()
        self.request_analysis(immediately=True)
        self._show_tabs_for_question()

    def _show_tabs_for_question(self) -> None:
        planning = self.question_panel.option.question is Question.PLAN
        for widget in (self.rank_table, self.dot_plot, self.cumulative_plot, self.null_plot):
            self.tabs.setTabVisible(self.tabs.indexOf(widget), not planning)
        self.tabs.setTabVisible(self.tabs.indexOf(self.power_plot), planning)
        if planning or not self.tabs.isTabVisible(self.tabs.currentIndex()):
            self.tabs.setCurrentWidget(self.power_plot if planning else self.rank_table)

    def _on_calculation_started(self) -> None:
        self._progress = 0.0
        self._progress_timer.start()
        self.stop_action.setEnabled(True)

    def _calculation_ended(self) -> None:
        self._progress_timer.stop()
        self.stop_action.setEnabled(False)
        self.results_panel.show_busy(False)

    def _on_calculation_progress(self, fraction: float) -> None:
        self._progress = fraction
        if self.results_panel.busy_strip.isVisible():
            self.results_panel.show_busy(True, fraction)

    def _on_result_ready(self, result, analysis) -> None:
        from rankwise.wording import describe, key_numbers

        self.question_panel.set_decimal_mark(analysis.decimal_mark)
        self._calculation_ended()
        self.last_result = result
        self.last_analysis = analysis
        self.results_panel.show_verdict(describe(result, analysis), key_numbers(result, analysis))
        self.rank_table.show_result(result, analysis)
        for chart in self.charts:
            chart.show_result(result, analysis)
        self.records.update_enabled()

    def _on_calculation_problem(self, message: str) -> None:
        self._calculation_ended()
        self.last_result = None
        self.results_panel.show_problem(message)
        self.rank_table.clear()
        self.records.update_enabled()

    def _on_calculation_stopped(self) -> None:
        self._calculation_ended()
        self.last_result = None
        self.results_panel.show_stopped()
        self.records.update_enabled()
