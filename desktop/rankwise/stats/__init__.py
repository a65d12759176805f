"""The statistics service: rank-based tests on groups of readings (numpy/scipy only, no Qt).

The window calls ``run(analysis)``; scripts and outside checks call the per-question functions.
Every public name loads its module on first use (PEP 562), so importing a light piece such as
``rankwise.stats.grid`` does not pull in scipy.stats at start-up.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from rankwise.stats.public_names import load_on_first_use

_MODULE_OF = {
    "ALTERNATIVES": "analysis",
    "METHODS": "analysis",
    "Analysis": "analysis",
    "GroupReadings": "analysis",
    "Question": "analysis",
    "Settings": "analysis",
    "compare_paired": "paired",
    "critical_t": "paired",
    "plan_group_size": "planning",
    "plan_paired_size": "planning",
    "plan_several_size": "planning",
    "simulate_paired_power": "planning",
    "simulate_power": "planning",
    "critical_u": "critical",
    "Cancelled": "progress",
    "Monitor": "progress",
    "midranks": "ranks",
    "BrunnerMunzelResult": "results",
    "ConfidenceInterval": "results",
    "GroupSummary": "results",
    "MoodMedianResult": "results",
    "NullDistribution": "results",
    "PairComparison": "results",
    "PairedResult": "results",
    "PlanResult": "results",
    "PowerPoint": "results",
    "Result": "results",
    "SeveralGroupsResult": "results",
    "ShapeCheck": "results",
    "TieBlock": "results",
    "TwoGroupResult": "results",
    "run": "service",
    "compare_two": "two_groups",
    "ADJUSTMENTS": "characteristics",
    "adjust_p_values": "characteristics",
    "benjamini_hochberg_adjust": "characteristics",
    "compare_characteristics": "characteristics",
    "Characteristic": "analysis",
    "CharacteristicRow": "results",
    "CharacteristicsResult": "results",
    "compare_several": "several",
    "holm_adjust": "several",
    "brunner_munzel": "shape",
    "check_shape": "shape",
    "mood_median": "shape",
}
"""Each public name and the module (inside this package) that defines it."""

__all__ = sorted(_MODULE_OF)


__getattr__, __dir__ = load_on_first_use(__name__, _MODULE_OF, globals())


if TYPE_CHECKING:
    from rankwise.stats.analysis import (
        ALTERNATIVES,
        METHODS,
        Analysis,
        Characteristic,
        GroupReadings,
        Question,
        Settings,
    )
    from rankwise.stats.characteristics import (
        ADJUSTMENTS,
        adjust_p_values,
        benjamini_hochberg_adjust,
        compare_characteristics,
    )
    from rankwise.stats.critical import critical_u
    from rankwise.stats.paired import compare_paired, critical_t
    from rankwise.stats.planning import (
        plan_group_size,
        plan_paired_size,
        plan_several_size,
        simulate_paired_power,
        simulate_power,
    )
    from rankwise.stats.progress import Cancelled, Monitor
    from rankwise.stats.ranks import midranks
    from rankwise.stats.results import (
        BrunnerMunzelResult,
        CharacteristicRow,
        CharacteristicsResult,
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
    from rankwise.stats.several import compare_several, holm_adjust
    from rankwise.stats.shape import brunner_munzel, check_shape, mood_median
    from rankwise.stats.two_groups import compare_two
