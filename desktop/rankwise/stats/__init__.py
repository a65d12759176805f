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
from rankwise.stats.progress import Cancelled, Monitor
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
]
