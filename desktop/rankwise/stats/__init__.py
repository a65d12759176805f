"""The statistics service: rank-based tests on groups of readings (numpy/scipy only, no Qt).

The window calls ``run(analysis)``; scripts and outside checks call the per-question functions.
"""

from rankwise.stats.analysis import (
    ALTERNATIVES,
    METHODS,
    Analysis,
    GroupReadings,
    Question,
    Settings,
)
from rankwise.stats.critical import critical_u
from rankwise.stats.progress import Cancelled, Monitor
from rankwise.stats.ranks import midranks
from rankwise.stats.results import (
    BrunnerMunzelResult,
    ConfidenceInterval,
    GroupSummary,
    MoodMedianResult,
    NullDistribution,
    PairComparison,
    PairedResult,
    PlanResult,
    PowerPoint,
    Result,
    SeveralGroupsResult,
    ShapeCheck,
    TieBlock,
    TwoGroupResult,
)
from rankwise.stats.service import run
from rankwise.stats.two_groups import compare_two

__all__ = [
    "ALTERNATIVES",
    "METHODS",
    "Analysis",
    "BrunnerMunzelResult",
    "Cancelled",
    "ConfidenceInterval",
    "GroupReadings",
    "GroupSummary",
    "Monitor",
    "MoodMedianResult",
    "NullDistribution",
    "PairComparison",
    "PairedResult",
    "PlanResult",
    "PowerPoint",
    "Question",
    "Result",
    "SeveralGroupsResult",
    "Settings",
    "ShapeCheck",
    "TieBlock",
    "TwoGroupResult",
    "compare_two",
    "critical_u",
    "midranks",
    "run",
]
