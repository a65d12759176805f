"""The answer to "how many parts should I measure?" (Noether 1987), in plain words."""

from __future__ import annotations

from rankwise.stats.analysis import Analysis
from rankwise.stats.results import PlanResult
from rankwise.wording.numbers import format_level, format_percent, format_setting, with_mark
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
    if result.groups >= 3:
        headline = f"Measure at least {result.n_a} parts in each of the {result.groups} groups."
    elif result.paired:
        headline = f"Measure at least {result.n_a} parts, each part twice."
    else:
        headline = f"Measure at least {result.n_a} parts of {a} and {result.n_b} parts of {b}."
    power = format_level(result.power)
    sentences = [
        f"This gives {a_or_an(power)} {power} chance of a significant result at the "
        f"{format_level(result.alpha)} level ({sides(result.alternative)}) if {_target(result, analysis, a, b)}.",
    ]
    if result.shift is not None and result.spread is not None and not result.paired and result.groups == 2:
        sentences.append(f"A part of {b} would then read higher than a part of {a} in "
                         f"{format_percent(result.prob_b_greater)} of pairs.")
    if result.simulated_power is not None:
        sentences.append(
            f"A simulation of the {'Kruskal-Wallis' if result.groups >= 3 else 'exact'} test at these sizes found "
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
        if result.groups >= 3:
            return (f"two of the groups differ by {shift}, the others lying between them, and single readings "
                    f"scatter with a standard deviation of {spread}")
        if result.paired:
            return (f"the change per part ({b} minus {a}) is typically {shift} and the changes scatter "
                    f"from part to part with a standard deviation of {spread}")
        return (f"{b} differs from {a} by {shift} and single readings scatter with a standard "
                f"deviation of {spread}")
    if result.paired:
        return f"two parts' changes add up to more than zero with a chance of {share}"
    return f"a part of {b} reads higher than a part of {a} in {share} of pairs"


def starting_value_notes(start, shift: float, spread: float, *, shift_typed: bool, spread_typed: bool,
                         paired: bool, mark: str = ".") -> tuple[str, str]:
    """Where the plan's shift and spread came from, one sentence each.

    ``start`` is what the sheet knows (``rankwise.readings.plan_start.PlanStart``: spread and its
    readings, shift and the tolerance it is a share of); ``shift`` and ``spread`` are the values in
    use; ``*_typed`` tell that the technician typed them instead.
    """
    def amount(value: float) -> str:
        return with_mark(with_unit(format_setting(value, start.decimals), start.unit), mark)

    shift_name = "Change per part worth finding" if paired else "Shift worth finding"
    if shift_typed:
        shift_note = f"{shift_name} {amount(shift)}: typed."
    elif start.tolerance is not None and start.shift is not None:
        name, lsl, usl = start.tolerance
        shift_note = (f"{shift_name} {amount(shift)}: {format_percent(start.share)} of the tolerance width of {name} "
                      f"(LSL {amount(lsl)} to USL {amount(usl)}); change it if a smaller shift matters.")
    else:
        shift_note = (f"{shift_name} {amount(shift)}: a placeholder, as no group has both LSL and USL; type the "
                      f"smallest change that matters.")
    spread_name = "Spread of the differences" if paired else "Usual spread"
    if spread_typed:
        spread_note = f"{spread_name} {amount(spread)}: typed."
    elif start.spread is not None:
        if start.of_differences:
            spread_note = (f"{spread_name} {amount(spread)}: the standard deviation of the {start.spread_count} "
                           f"row-by-row differences on the sheet.")
        else:
            groups = " and ".join(start.spread_groups)
            spread_note = (f"{spread_name} {amount(spread)}: the standard deviation of the {start.spread_count} "
                           f"readings of {groups} on the sheet, each group about its own mean.")
    else:
        spread_note = (f"{spread_name} {amount(spread)}: a placeholder, as the sheet has too few readings; type "
                       f"the spread you expect.")
    return shift_note, spread_note


def starting_value_brief(start, *, shift_typed: bool, spread_typed: bool) -> str:
    """Where the shift and the spread came from, in two short lines for the planner beside the boxes."""
    if shift_typed:
        shift = "typed"
    elif start.tolerance is not None:
        shift = f"{format_percent(start.share)} of {start.tolerance[0]}'s tolerance"
    else:
        shift = "placeholder, no LSL/USL"
    if spread_typed:
        spread = "typed"
    elif start.spread is not None:
        spread = f"{start.spread_count} {'differences' if start.of_differences else 'readings'} on the sheet"
    else:
        spread = "placeholder, too few readings"
    return f"Shift: {shift}\nSpread: {spread}"
