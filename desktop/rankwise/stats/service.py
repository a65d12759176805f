"""The window's single front door to the statistics: ``run(analysis)`` answers any question.

Each question has one small function here that unpacks the ``Analysis`` (groups and settings)
and calls the public function for that question; ``run`` picks it from the table below.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from rankwise.stats.analysis import Analysis, GroupReadings, Question
from rankwise.stats.characteristics import compare_characteristics
from rankwise.stats.paired import compare_paired
from rankwise.stats.planning import plan_group_size, plan_paired_size, plan_several_size
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


def _two_columns(analysis: Analysis, needs: str) -> tuple[GroupReadings, GroupReadings]:
    """The analysis's two groups, A then B; ``ValueError`` saying what the question ``needs`` otherwise."""
    if len(analysis.groups) != 2:
        raise ValueError(f"{needs}; got {len(analysis.groups)}.")
    return analysis.groups[0], analysis.groups[1]


def _shared_settings(first: GroupReadings, second: GroupReadings, analysis: Analysis, monitor: Monitor) -> dict:
    """The arguments that the two-group and the paired comparison take alike."""
    settings = analysis.settings
    return {
        "alternative": settings.alternative,
        "alpha": settings.alpha,
        "confidence": settings.confidence,
        "method": settings.method,
        "margin": settings.margin,
        "name_a": first.name,
        "name_b": second.name,
        "monitor": monitor,
    }


def _two_groups(analysis: Analysis, monitor: Monitor) -> Result:
    """Mann-Whitney U comparison: groups[0] is A (reference), groups[1] is B."""
    group_a, group_b = _two_columns(analysis, "Comparing two groups needs exactly two groups of readings (A and B)")
    # the frozen runs themselves: the result keeps them instead of copies when no reading is blank
    return compare_two(group_a.values, group_b.values, **_shared_settings(group_a, group_b, analysis, monitor))


def _paired(analysis: Analysis, monitor: Monitor) -> Result:
    """Signed-rank comparison of the same parts: groups[0] is the first reading, groups[1] the second."""
    first, second = _two_columns(
        analysis, "Same parts measured twice needs exactly two columns (first and second reading)")
    return compare_paired(
        _values(first),
        _values(second),
        zero_method=analysis.settings.zero_method,
        **_shared_settings(first, second, analysis, monitor),
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
    """Parts to measure (Noether), checked by simulation: two separate groups, the same parts twice,
    or several separate groups (``plan_groups`` of 3 or more, Kruskal-Wallis).

    For the same parts measured twice (``plan_paired``) the planned spread is that of the
    differences, as the plan's assumptions say; a chance that B reads higher than A is a
    two-group quantity and is refused there in plain words.
    """
    settings = analysis.settings
    monitor.step(0.0)
    shared = {"alpha": settings.alpha, "power": settings.power, "alternative": settings.alternative,
              "n_sim": PLAN_SIMULATIONS}
    if settings.plan_groups >= 3 and not settings.plan_paired:
        if settings.planned_prob_b_greater is not None or settings.alternative != "two-sided":
            raise ValueError("A plan for several groups needs the shift worth detecting and the spread, and looks "
                             "for a difference in any direction.")
        return plan_several_size(settings.planned_shift, settings.planned_spread, groups=settings.plan_groups,
                                 alpha=settings.alpha, power=settings.power, n_sim=PLAN_SIMULATIONS)
    if settings.plan_paired:
        if settings.planned_prob_b_greater is not None:
            raise ValueError(
                "A plan for the same parts measured twice needs the change worth detecting and the spread "
                "of the differences; a chance that one group reads higher applies to two separate groups only."
            )
        return plan_paired_size(settings.planned_shift, settings.planned_spread, **shared)
    return plan_group_size(
        settings.planned_shift,
        settings.planned_spread,
        prob_b_greater=settings.planned_prob_b_greater,
        ratio=settings.ratio,
        **shared,
    )


def _characteristics(analysis: Analysis, monitor: Monitor) -> Result:
    """The two-group comparison on every characteristic, with p adjusted for how many were compared."""
    group_a, group_b = _two_columns(
        analysis, "Comparing characteristics needs exactly two groups (A the reference, B the changed process)")
    settings = analysis.settings
    return compare_characteristics(
        [(item.name, _values(item.a), _values(item.b)) for item in analysis.characteristics],
        alternative=settings.alternative,
        alpha=settings.alpha,
        adjust=settings.adjust,
        confidence=settings.confidence,
        margins=[item.margin for item in analysis.characteristics],
        method=settings.method,
        name_a=group_a.name,
        name_b=group_b.name,
        monitor=monitor,
    )


_ANSWERS: dict[Question, Callable[[Analysis, Monitor], Result]] = {
    Question.TWO_GROUPS: _two_groups,
    Question.PAIRED: _paired,
    Question.SEVERAL: _several,
    Question.PLAN: _plan,
    Question.CHARACTERISTICS: _characteristics,
}
"""Which function answers which question."""
