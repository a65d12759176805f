"""One front door to the verdict: ``describe(result, analysis)`` for every question."""

from __future__ import annotations

from rankwise.stats.analysis import Analysis
from rankwise.stats.results import PairedResult, PlanResult, Result, SeveralGroupsResult, TwoGroupResult
from rankwise.wording.paired import describe_paired
from rankwise.wording.planning import describe_plan
from rankwise.wording.several import describe_several
from rankwise.wording.two_groups import describe_two_groups
from rankwise.wording.verdict_types import Verdict


def describe(result: Result, analysis: Analysis) -> Verdict:
    """The verdict in plain words for any result of the statistics service.

    The same ``Verdict`` is shown in the window, written to the workbook and printed.
    Raises ``ValueError`` when ``result`` is not one of the service's result types.
    """
    if isinstance(result, TwoGroupResult):
        return describe_two_groups(result, analysis)
    if isinstance(result, PairedResult):
        return describe_paired(result, analysis)
    if isinstance(result, SeveralGroupsResult):
        return describe_several(result, analysis)
    if isinstance(result, PlanResult):
        return describe_plan(result, analysis)
    raise ValueError(f"result must be a result of the statistics service; got {type(result).__name__}.")
