"""The window's single front door to the statistics: ``run(analysis)`` answers any question.

Each question has one small function here that unpacks the ``Analysis`` (groups and settings)
and calls the public function for that question; ``run`` picks it from the table below.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from rankwise.stats.analysis import Analysis, GroupReadings, Question
from rankwise.stats.paired import compare_paired
from rankwise.stats.planning import plan_group_size
from rankwise.stats.progress import SILENT, Monitor
from rankwise.stats.results import Result
from rankwise.stats.several import compare_several
from rankwise.stats.two_groups import compare_two

PLAN_SIMULATIONS = 2000
"""Simulated studies behind the plan's check of its own power."""


def run(analysis: Analysis, monitor: Monitor = SILENT) -> Result:
    """Answer ``analysis.question`` for its groups and settings.

    Raises ``ValueError`` for a question this service cannot answer, a wrong number of groups,
    or readings and settings that the question's function refuses (the message says why).
    """
    try:
        answer = _ANSWERS[analysis.question]
    except KeyError:
        raise ValueError(f"No statistics are available for the question {analysis.question!r}.") from None
    return answer(analysis, monitor)


def _values(group: GroupReadings) -> np.ndarray:
    """A group's readings as floats (NaN for blanks, which the statistics drop and count)."""
    return np.asarray(group.values, dtype=float)


def _two_groups(analysis: Analysis, monitor: Monitor) -> Result:
    """Mann-Whitney U comparison: groups[0] is A (reference), groups[1] is B."""
    if len(analysis.groups) != 2:
        raise ValueError(
            f"Comparing two groups needs exactly two groups of readings (A and B); got {len(analysis.groups)}."
        )
    group_a, group_b = analysis.groups
    settings = analysis.settings
    return compare_two(
        _values(group_a),
        _values(group_b),
        alternative=settings.alternative,
        alpha=settings.alpha,
        confidence=settings.confidence,
        method=settings.method,
        margin=settings.margin,
        name_a=group_a.name,
        name_b=group_b.name,
        monitor=monitor,
    )


def _paired(analysis: Analysis, monitor: Monitor) -> Result:
    """Signed-rank comparison of the same parts: groups[0] is the first reading, groups[1] the second."""
    if len(analysis.groups) != 2:
        raise ValueError(
            f"Same parts measured twice needs exactly two columns (first and second reading); got {len(analysis.groups)}."
        )
    first, second = analysis.groups
    settings = analysis.settings
    return compare_paired(
        _values(first),
        _values(second),
        alternative=settings.alternative,
        alpha=settings.alpha,
        method=settings.method,
        zero_method=settings.zero_method,
        confidence=settings.confidence,
        margin=settings.margin,
        name_a=first.name,
        name_b=second.name,
        monitor=monitor,
    )


def _several(analysis: Analysis, monitor: Monitor) -> Result:
    """Kruskal-Wallis over all groups, with Dunn's pairs."""
    names = [group.name for group in analysis.groups]
    if len(set(names)) != len(names):
        raise ValueError("Every group needs its own name to compare several groups; two groups share one.")
    settings = analysis.settings
    return compare_several(
        {group.name: _values(group) for group in analysis.groups},
        alpha=settings.alpha,
        comparison=settings.comparison,
        reference=settings.reference,
        method=settings.method,
        monitor=monitor,
    )


def _plan(analysis: Analysis, monitor: Monitor) -> Result:
    """Parts per group for the rank-sum test (Noether), checked by simulation."""
    settings = analysis.settings
    monitor.step(0.0)
    return plan_group_size(
        settings.planned_shift,
        settings.planned_spread,
        prob_b_greater=settings.planned_prob_b_greater,
        alpha=settings.alpha,
        power=settings.power,
        ratio=settings.ratio,
        alternative=settings.alternative,
        n_sim=PLAN_SIMULATIONS,
    )


_ANSWERS: dict[Question, Callable[[Analysis, Monitor], Result]] = {
    Question.TWO_GROUPS: _two_groups,
    Question.PAIRED: _paired,
    Question.SEVERAL: _several,
    Question.PLAN: _plan,
}
"""Which function answers which question."""
