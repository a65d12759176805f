"""One front door to the verdict: ``describe(result, analysis)`` for every question."""

from __future__ import annotations

from dataclasses import replace

from rankwise.stats.analysis import Analysis
from rankwise.stats.results import (
    CharacteristicsResult,
    PairedResult,
    PlanResult,
    Result,
    SeveralGroupsResult,
    TwoGroupResult,
)
from rankwise.wording.characteristics import describe_characteristics
from rankwise.wording.paired import describe_paired
from rankwise.wording.planning import describe_plan
from rankwise.wording.questions import in_typed_mark
from rankwise.wording.several import describe_several
from rankwise.wording.two_groups import describe_two_groups
from rankwise.wording.verdict_types import Verdict

_DESCRIBERS = {TwoGroupResult: describe_two_groups, PairedResult: describe_paired,
               SeveralGroupsResult: describe_several, PlanResult: describe_plan,
               CharacteristicsResult: describe_characteristics}
"""The wording of each kind of result."""


def describe(result: Result, analysis: Analysis) -> Verdict:
    """The verdict in plain words for any result of the statistics service.

    The same ``Verdict`` is shown in the window, written to the workbook and printed, its numbers
    written with the decimal mark the technician typed (``Analysis.decimal_mark``).
    Raises ``ValueError`` when ``result`` is not one of the service's result types.
    """
    describer = _DESCRIBERS.get(type(result))
    if describer is None:
        raise ValueError(f"result must be a result of the statistics service; got {type(result).__name__}.")
    verdict = describer(result, analysis)
    if analysis.decimal_mark == ".":
        return verdict
    return replace(
        verdict,
        headline=in_typed_mark(verdict.headline, analysis),
        sentences=tuple(in_typed_mark(sentence, analysis) for sentence in verdict.sentences),
        method_note=in_typed_mark(verdict.method_note, analysis),
        assumption_notes=tuple(in_typed_mark(note, analysis) for note in verdict.assumption_notes),
    )
