"""The answer to "how many parts should I measure?" (Noether 1987), in plain words."""

from __future__ import annotations

from rankwise.stats.analysis import Analysis
from rankwise.stats.results import PlanResult
from rankwise.wording.numbers import format_level, format_percent, format_setting
from rankwise.wording.phrases import a_or_an, sides, with_warnings
from rankwise.wording.questions import decimals_of, group_names, unit_of, with_unit
from rankwise.wording.verdict_types import Verdict, cautioned_verdict


def plan_names(analysis: Analysis) -> tuple[str, str]:
    """The two groups' names for a plan, or "the first group" / "the second group"."""
    names = group_names(analysis)
    if len(names) >= 2:
        return names[0], names[1]
    return "the first group", "the second group"


def describe_plan(result: PlanResult, analysis: Analysis) -> Verdict:
    """Headline, sentences, method note and assumptions for a planning result."""
    a, b = plan_names(analysis)
    if result.paired:
        headline = f"Measure at least {result.n_a} parts, each part twice."
    else:
        headline = f"Measure at least {result.n_a} parts of {a} and {result.n_b} parts of {b}."
    power = format_level(result.power)
    sentences = [
        f"This gives {a_or_an(power)} {power} chance of a significant result at the "
        f"{format_level(result.alpha)} level ({sides(result.alternative)}) if {_target(result, analysis, a, b)}.",
    ]
    if result.shift is not None and result.spread is not None and not result.paired:
        sentences.append(f"A part of {b} would then read higher than a part of {a} in "
                         f"{format_percent(result.prob_b_greater)} of pairs.")
    if result.simulated_power is not None:
        sentences.append(
            f"A simulation of the exact test at these sizes found "
            f"{a_or_an(format_percent(result.simulated_power))} {format_percent(result.simulated_power)} "
            f"chance of detecting it."
        )
    return cautioned_verdict(headline, sentences, f"Parts needed from {result.method}, rounded up to whole parts.",
                             with_warnings(list(result.assumptions), result.warnings, analysis.notes))


def _target(result: PlanResult, analysis: Analysis, a: str, b: str) -> str:
    """What the plan is to detect: a shift against a spread, or a share of pairs."""
    unit = unit_of(analysis)
    decimals = decimals_of(analysis)
    share = format_percent(result.prob_b_greater)
    if result.shift is not None and result.spread is not None:
        shift = with_unit(format_setting(result.shift, decimals), unit)
        spread = with_unit(format_setting(result.spread, decimals), unit)
        if result.paired:
            return (f"the change per part ({b} minus {a}) is typically {shift} and the changes scatter "
                    f"from part to part with a standard deviation of {spread}")
        return (f"{b} differs from {a} by {shift} and single readings scatter with a standard "
                f"deviation of {spread}")
    if result.paired:
        return f"two parts' changes add up to more than zero with a chance of {share}"
    return f"a part of {b} reads higher than a part of {a} in {share} of pairs"
