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
from rankwise.stats.paired import compare_paired, critical_t
from rankwise.stats.planning import plan_group_size, plan_paired_size, simulate_paired_power, simulate_power
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
from rankwise.stats.several import compare_several, holm_adjust
from rankwise.stats.shape import brunner_munzel, check_shape, mood_median

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
    "brunner_munzel",
    "check_shape",
    "compare_paired",
    "compare_several",
    "critical_t",
    "holm_adjust",
    "mood_median",
    "plan_group_size",
    "plan_paired_size",
    "simulate_paired_power",
    "simulate_power",
]
