"""The verdict for two separate groups (Mann-Whitney U / Wilcoxon rank-sum), in plain words."""

from __future__ import annotations

import math

from rankwise.stats.analysis import Analysis
from rankwise.stats.results import TwoGroupResult
from rankwise.wording.entries import dropped_notes, entry_notes
from rankwise.wording.numbers import format_level, format_percent
from rankwise.wording.phrases import (
    NOT_SAMENESS,
    b_reads_higher,
    equivalence_words,
    higher_or_lower,
    interval_disagreement,
    level_phrase,
    method_and_p,
    not_shown_headline,
    outcome_sentence,
    p_method,
    p_phrase,
    size_sentence,
    with_warnings,
)
from rankwise.wording.questions import decimals_of, margin_text, unit_of
from rankwise.wording.verdict_types import Verdict, cautioned_verdict

INDEPENDENCE_NOTE = ("Each reading must come from a different part, and the two groups from "
                     "separate parts; for the same parts measured twice, use the before / after question.")


def describe_two_groups(result: TwoGroupResult, analysis: Analysis) -> Verdict:
    """Headline, sentences, method note and assumption notes for a two-group result."""
    a, b = result.name_a, result.name_b
    shift_decimals = decimals_of(analysis)
    unit = unit_of(analysis)
    stochastic = result.shape is not None and result.shape.differ
    b_higher = b_reads_higher(result.alternative, result.shift, result.prob_b_greater >= 0.5)

    sentences: list[str] = []
    impossible = result.critical_u is None
    if impossible:
        sentences.append(_impossible_sentence(result))

    if result.significant:
        headline = f"{b} {'tends to read' if stochastic else 'reads'} {higher_or_lower(b_higher)} than {a}."
        sentences.append(_significant_sentence(result, stochastic, b_higher, shift_decimals, unit))
        sentences.append(outcome_sentence("The difference is significant", result.p_value, result.alpha,
                                          result.alternative))
        if stochastic:
            sentences.append(_stochastic_sentence(result))
    else:
        headline = not_shown_headline(result.alternative, a, b, "difference")
        sentences.append(outcome_sentence(headline[:-1], result.p_value, result.alpha, result.alternative))
        if result.shift is not None and result.shift_ci is not None:
            sentences.append(size_sentence("estimated shift", (a, b), result.shift, result.shift_ci,
                                           shift_decimals, unit))
        if result.margin is None:
            sentences.append(NOT_SAMENESS)

    explained = heavy_ties_sentence(result)
    if explained is not None:
        sentences.append(explained)
    elif result.shift is not None:
        disagreement = interval_disagreement(result.shift_ci, result.significant, result.alpha, "shift")
        if disagreement is not None:
            sentences.append(disagreement)

    if result.margin is not None:
        headline, equivalence_sentence = equivalence_words(
            (a, b), margin_text(analysis, result.margin), result.equivalence_ci, result.equivalent, "shift",
            shift_decimals, unit, result.alpha)
        sentences.append(equivalence_sentence)
    if impossible:
        headline = (f"No result could reach {level_phrase(result.alpha)} with {result.n_a} "
                    f"readings of {a} and {result.n_b} of {b}.")

    return cautioned_verdict(headline, sentences, _method_note(result),
                             _assumption_notes(result, analysis))


def heavy_ties_sentence(result: TwoGroupResult) -> str | None:
    """Why the shift and its interval are 0: most pairs read exactly the same on the gauge; points
    to the share of pairs where B reads higher, which shows the change. None when that is not the case."""
    interval = result.shift_ci
    if result.shift != 0.0 or interval is None:
        return None
    if any(end != 0.0 for end in (interval.low, interval.high) if math.isfinite(end)):
        return None
    level = sum(block.counts_by_group[0] * block.counts_by_group[1] for block in result.tie_blocks)
    share = level / (result.n_a * result.n_b)
    if share == 0.0:
        return None
    a, b = result.name_a, result.name_b
    return (f"In {format_percent(share)} of all pairs of a part of {a} with a part of {b} the two read "
            f"exactly the same on the gauge, so the shift and its interval come out as 0 at the gauge's "
            f"resolution; the change shows in the share of pairs where {b} reads higher: "
            f"{format_percent(result.prob_b_greater)} (ties counted half; 50 % would mean no tendency).")


def _impossible_sentence(result: TwoGroupResult) -> str:
    """Said first when the group sizes cannot give a significant result."""
    needed = (f" At least {result.min_parts_needed} parts per group are needed."
              if result.min_parts_needed is not None else "")
    return (f"With {result.n_a} readings of {result.name_a} and {result.n_b} of {result.name_b}, "
            f"no outcome of the test can reach {level_phrase(result.alpha)}, whatever the "
            f"readings.{needed}")


def _significant_sentence(result: TwoGroupResult, stochastic: bool, b_higher: bool,
                          decimals: int | None, unit: str) -> str:
    """The size of the change: the shift and its interval, or the share of pairs when shapes differ."""
    a, b = result.name_a, result.name_b
    direction = higher_or_lower(b_higher)
    share = result.prob_b_greater if b_higher else 1.0 - result.prob_b_greater
    if stochastic or result.shift is None or result.shift_ci is None:
        return (f"A part of {b} reads {direction} than a part of {a} in {format_percent(share)} "
                f"of pairs (ties counted half).")
    return size_sentence("shift", (a, b), result.shift, result.shift_ci, decimals, unit)


def _stochastic_sentence(result: TwoGroupResult) -> str:
    """Why the verdict speaks of tendencies, and the test that allows unequal spreads."""
    text = ("The groups' spreads or shapes differ, so this says which group tends to read higher, "
            "not that the median moved.")
    if result.brunner_munzel is not None:
        text += (f" The Brunner-Munzel test, which allows unequal spreads, gives "
                 f"{p_phrase(result.brunner_munzel.p_value, result.alpha)}.")
    return text


def _method_note(result: TwoGroupResult) -> str:
    """Which test, which p-value method, and how the shift and its interval were found."""
    parts = [
        "Mann-Whitney U test (Wilcoxon rank-sum), tied readings sharing their average rank",
        p_method(result.method, result.alternative),
    ]
    if result.shift is not None:
        shift = f"shift: Hodges-Lehmann estimate (median of all differences {result.name_b} minus {result.name_a})"
        if result.shift_ci is not None:
            shift += f"; its interval: {result.shift_ci.method}"
        parts.append(shift)
    return "; ".join(parts) + "."


def _assumption_notes(result: TwoGroupResult, analysis: Analysis) -> tuple[str, ...]:
    """Shape check, conservativeness of the exact test, warnings and the readings' own notes."""
    notes = [INDEPENDENCE_NOTE]
    shape = result.shape
    if shape is None:
        notes.append("Too few readings to compare the groups' spreads and shapes: the shift is a "
                     "move of the median only if both groups have the same shape.")
    else:
        tests = (f"{method_and_p(shape.dispersion_method, shape.dispersion_p, result.alpha)}; "
                 f"{method_and_p(shape.shape_method, shape.shape_p, result.alpha)}")
        if shape.differ:
            # The statistics' own warning (among result.warnings, added below) says how to read it.
            notes.append(f"Spreads and shapes compared after aligning the medians: {tests}.")
        else:
            notes.append(f"The groups' spreads and shapes look alike ({tests}), so the shift can be "
                         f"read as a move of the median.")
    if result.mood_median is not None:
        notes.append(f"Mood's median test (counts above the overall median; not Mood's test of spread) "
                     f"gives {p_phrase(result.mood_median.p_value, result.alpha)}.")
    if (result.critical_u is not None and result.method == "exact" and result.attained_alpha is not None
            and result.attained_alpha < 0.8 * result.alpha):
        notes.append(
            f"With these group sizes the exact test is cautious: its true significance level is "
            f"{format_level(result.attained_alpha)} rather than {format_level(result.alpha)}."
        )
    return with_warnings([*analysis.notes, *entry_notes(analysis), *dropped_notes(analysis, (result.summary_a, result.summary_b))],
                         notes, result.warnings)
