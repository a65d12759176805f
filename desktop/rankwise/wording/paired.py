"""The verdict for the same parts measured twice (Wilcoxon signed-rank), in plain words."""

from __future__ import annotations

from rankwise.stats.analysis import Analysis
from rankwise.stats.results import PairedResult
from rankwise.wording.cautions import CAUTION_SHORT
from rankwise.wording.phrases import (
    NOT_SAMENESS,
    alternative_words,
    higher_or_lower,
    interval_phrase,
    level_phrase,
    p_method,
    p_phrase,
    signed_reading,
    smallest_sign_test_size,
)
from rankwise.wording.questions import decimals_of, margin_text, unit_of
from rankwise.wording.verdict_types import Verdict

PAIRING_NOTE = ("Each row must hold the same part measured twice; the test reads the change per "
                "part, and assumes the changes are spread evenly around their centre.")


def describe_paired(result: PairedResult, analysis: Analysis) -> Verdict:
    """Headline, sentences, method note and assumption notes for a before / after result."""
    a, b = result.name_a, result.name_b
    decimals = decimals_of(analysis)
    unit = unit_of(analysis)
    b_higher = _second_reads_higher(result)
    sentences: list[str] = []

    impossible = result.critical_t is None
    if impossible:
        needed = smallest_sign_test_size(result.alpha, result.alternative)
        sentences.append(
            f"With {result.n} parts that changed, no outcome of the test can reach "
            f"{level_phrase(result.alpha)}, whatever the readings. At least {needed} parts with a "
            f"change are needed."
        )

    change = ""
    if result.shift is not None and result.shift_ci is not None:
        change = (f"the typical change per part is {signed_reading(result.shift, decimals, unit)} "
                  f"({b} minus {a}, pseudo-median; {interval_phrase(result.shift_ci, decimals, unit)})")
    tested = alternative_words(result.alternative, a, b)
    if result.significant:
        headline = f"{b} reads {higher_or_lower(b_higher)} than {a} on the same parts."
        sentences.append(f"{headline[:-1]}" + (f": {change}." if change else "."))
        sentences.append(f"The change is significant at {level_phrase(result.alpha)} "
                         f"({p_phrase(result.p_value, result.alpha)}; {tested}).")
    else:
        headline = _not_shown_headline(result)
        sentences.append(f"{headline[:-1]} at {level_phrase(result.alpha)} "
                         f"({p_phrase(result.p_value, result.alpha)}; {tested}).")
        if change:
            sentences.append(change[0].upper() + change[1:] + ".")
        if result.margin is None:
            sentences.append(NOT_SAMENESS.replace("the groups are", "the readings are"))

    if result.margin is not None:
        headline, sentence = _equivalence(result, analysis, unit)
        sentences.append(sentence)
    if impossible:
        headline = f"No result could reach {level_phrase(result.alpha)} with {result.n} changed parts."
    return Verdict(
        headline=headline,
        sentences=tuple(sentences),
        method_note=_method_note(result),
        assumption_notes=_assumption_notes(result, analysis),
        caution=CAUTION_SHORT,
    )


def _second_reads_higher(result: PairedResult) -> bool:
    """True when the second readings tend to be higher (by the tested direction, the shift or W+)."""
    if result.alternative == "b-greater":
        return True
    if result.alternative == "b-less":
        return False
    if result.shift is not None and result.shift != 0.0:
        return result.shift > 0.0
    return result.w_plus >= result.w_minus


def _not_shown_headline(result: PairedResult) -> str:
    """The headline when the test did not reach significance."""
    a, b = result.name_a, result.name_b
    if result.alternative == "b-greater":
        return f"It was not shown that {b} reads higher than {a} on the same parts."
    if result.alternative == "b-less":
        return f"It was not shown that {b} reads lower than {a} on the same parts."
    return f"No change between {a} and {b} on the same parts was shown."


def _equivalence(result: PairedResult, analysis: Analysis, unit: str) -> tuple[str, str]:
    """Headline and sentence for "the same within ± margin?" on the change per part."""
    margin = margin_text(analysis, result.margin)
    interval = result.equivalence_ci
    decimals = decimals_of(analysis)
    if result.equivalent is None or interval is None:
        text = f"Equivalence within {margin} could not be judged: no interval for the change was computed."
        return f"Equivalence within {margin} could not be judged.", text
    shown = interval_phrase(interval, decimals, unit)
    if result.equivalent:
        return (f"{result.name_b} and {result.name_a} are equivalent within {margin}.",
                f"The change per part is within {margin}: its {shown} lies inside the margin "
                f"(two one-sided tests, each at {level_phrase(result.alpha)}).")
    return (f"Equivalence of {result.name_b} and {result.name_a} within {margin} was not shown.",
            f"Equivalence within {margin} was not shown: the change's {shown} reaches the margin "
            f"or beyond (two one-sided tests, each at {level_phrase(result.alpha)}).")


def _method_note(result: PairedResult) -> str:
    """Which test, how zeros were treated, and how the p-value and the change were found."""
    zeros = ("parts with no change left out before ranking" if result.zero_method == "wilcox"
             else "parts with no change kept in the ranking and then given no sign (Pratt)")
    parts = [
        f"Wilcoxon signed-rank test on the changes {result.name_b} minus {result.name_a}, tied "
        f"changes sharing their average rank, {zeros}",
        p_method(result.method, result.alternative),
    ]
    if result.shift is not None:
        change = "change per part: Hodges-Lehmann pseudo-median (median of all pairwise averages of the changes)"
        if result.shift_ci is not None:
            change += f"; its interval: {result.shift_ci.method}"
        parts.append(change)
    return "; ".join(parts) + "."


def _assumption_notes(result: PairedResult, analysis: Analysis) -> tuple[str, ...]:
    """Pairing, zeros, incomplete pairs, warnings and the readings' own notes."""
    notes = [PAIRING_NOTE]
    if result.n_zero:
        kept = "left out of the ranking" if result.zero_method == "wilcox" else "kept in the ranking (Pratt)"
        notes.append(f"{result.n_zero} of {result.n_pairs} parts read the same both times; they were {kept}.")
    if result.n_dropped:
        notes.append(f"{result.n_dropped} incomplete pairs (a reading missing on one side) were left out.")
    notes.extend(w for w in result.warnings if w not in notes)
    notes.extend(n for n in analysis.notes if n not in notes)
    return tuple(notes)
