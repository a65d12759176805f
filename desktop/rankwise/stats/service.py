"""The window's single front door to the statistics: ``run(analysis)`` answers any question.

Each question has one small function here that unpacks the ``Analysis`` (groups and settings)
and calls the public function for that question; ``run`` picks it from the table below.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from rankwise.stats.analysis import Analysis, GroupReadings, Question
from rankwise.stats.progress import SILENT, Monitor
from rankwise.stats.results import Result
from rankwise.stats.two_groups import compare_two


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


_ANSWERS: dict[Question, Callable[[Analysis, Monitor], Result]] = {
    Question.TWO_GROUPS: _two_groups,
}
"""Which function answers which question."""
