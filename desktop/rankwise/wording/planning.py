"""The answer to "how many parts should I measure?" (Noether 1987), in plain words."""

from __future__ import annotations

from rankwise.stats.analysis import Analysis
from rankwise.stats.results import PlanResult
from rankwise.wording.cautions import CAUTION_SHORT
from rankwise.wording.numbers import format_level, format_percent, format_setting
from rankwise.wording.phrases import a_or_an
from rankwise.wording.questions import decimals_of, group_names, unit_of, with_unit
from rankwise.wording.verdict_types import Verdict


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
    sides = "two-sided" if result.alternative == "two-sided" else "one-sided"
    sentences = [
        f"This gives {a_or_an(format_level(result.power))} {format_level(result.power)} chance of a significant result at the "
        f"{format_level(result.alpha)} level ({sides}) if {_target(result, analysis, a, b)}.",
    ]
    if result.simulated_power is not None:
        sentences.append(
            f"A simulation of the exact test at these sizes found "
            f"{a_or_an(format_percent(result.simulated_power))} {format_percent(result.simulated_power)} "
            f"chance of detecting it."
        )
    notes = list(result.assumptions)
    notes.extend(w for w in result.warnings if w not in notes)
    notes.extend(n for n in analysis.notes if n not in notes)
    return Verdict(
        headline=headline,
        sentences=tuple(sentences),
        method_note=f"Parts needed from {result.method}, rounded up to whole parts.",
        assumption_notes=tuple(notes),
        caution=CAUTION_SHORT,
    )


def _target(result: PlanResult, analysis: Analysis, a: str, b: str) -> str:
    """What the plan is to detect: a shift against a spread, or a share of pairs."""
    unit = unit_of(analysis)
    decimals = decimals_of(analysis)
    share = format_percent(result.prob_b_greater)
    if result.shift is not None and result.spread is not None:
        shift = with_unit(format_setting(result.shift, decimals), unit)
        spread = with_unit(format_setting(result.spread, decimals), unit)
        if result.paired:
            return (f"the change per part is {shift} with a spread (standard deviation) of "
                    f"{spread}")
        return (f"{b} is shifted by {shift} against {a} with a spread (standard deviation) of "
                f"{spread}, so that a part of {b} reads higher than a part of {a} in {share} of pairs")
    if result.paired:
        return f"a part's change is positive with a chance of {share}"
    return f"a part of {b} reads higher than a part of {a} in {share} of pairs"
