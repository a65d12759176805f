"""The verdict for the same parts measured twice (Wilcoxon signed-rank), in plain words."""

from __future__ import annotations

import math

from rankwise.stats.analysis import Analysis
from rankwise.stats.results import PairedResult
from rankwise.wording.entries import entry_notes
from rankwise.wording.phrases import (
    NOT_SAMENESS,
    b_reads_higher,
    equivalence_words,
    higher_or_lower,
    interval_disagreement,
    level_phrase,
    not_shown_headline,
    outcome_sentence,
    p_method,
    size_sentence,
    smallest_sign_test_size,
    with_warnings,
)
from rankwise.wording.questions import decimals_of, margin_text, unit_of
from rankwise.wording.verdict_types import Verdict, cautioned_verdict

PAIRING_NOTE = ("Each row must hold the same part measured twice; the test reads the change per "
                "part, and assumes the changes are spread evenly around their centre.")


def describe_paired(result: PairedResult, analysis: Analysis) -> Verdict:
    """Headline, sentences, method note and assumption notes for a before / after result."""
    a, b = result.name_a, result.name_b
    decimals = decimals_of(analysis)
    unit = unit_of(analysis)
    b_higher = b_reads_higher(result.alternative, result.shift, result.w_plus >= result.w_minus)
    not_shown = not_shown_headline(result.alternative, a, b, "change", " on the same parts")
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
        change = size_sentence("typical change per part", (a, b), result.shift, result.shift_ci, decimals, unit)
    outcome = outcome_sentence("The change is significant" if result.significant else not_shown[:-1],
                               result.p_value, result.alpha, result.alternative)
    if result.significant:
        headline = f"{b} reads {higher_or_lower(b_higher)} than {a} on the same parts."
        sentences.extend((change or headline, outcome))
    else:
        headline = not_shown
        sentences.append(outcome)
        if change:
            sentences.append(change)
        if result.margin is None:
            sentences.append(NOT_SAMENESS.replace("the groups are", "the readings are"))

    explained = _heavy_ties_sentence(result)
    if explained is not None:
        sentences.append(explained)
    elif result.shift is not None:
        disagreement = interval_disagreement(result.shift_ci, result.significant, result.alpha, "change per part")
        if disagreement is not None:
            sentences.append(disagreement)

    if result.margin is not None:
        headline, sentence = equivalence_words(
            (a, b), margin_text(analysis, result.margin), result.equivalence_ci, result.equivalent,
            "change per part", decimals, unit, result.alpha)
        sentences.append(sentence)
    if impossible:
        headline = f"No result could reach {level_phrase(result.alpha)} with {result.n} changed parts."
    return cautioned_verdict(headline, sentences, _method_note(result), _assumption_notes(result, analysis))


def _heavy_ties_sentence(result: PairedResult) -> str | None:
    """Why the change per part and its interval are 0: many parts read exactly the same both times;
    says how many parts rose and fell instead. None when that is not the case."""
    interval = result.shift_ci
    if result.shift != 0.0 or interval is None or result.n_zero == 0:
        return None
    if any(end != 0.0 for end in (interval.low, interval.high) if math.isfinite(end)):
        return None
    rises = sum(1 for d in result.differences if d > 0)
    falls = sum(1 for d in result.differences if d < 0)
    return (f"{result.n_zero} of {result.n_pairs} parts read exactly the same both times on the gauge, so "
            f"the typical change per part and its interval come out as 0 at the gauge's resolution; of the "
            f"parts that changed, {rises} read higher and {falls} lower.")


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
    """Pairing, zeros, warnings (incomplete pairs by row among them) and the readings' own notes and counts."""
    notes = [PAIRING_NOTE]
    if result.n_zero:
        kept = "left out of the ranking" if result.zero_method == "wilcox" else "kept in the ranking (Pratt)"
        notes.append(f"{result.n_zero} of {result.n_pairs} parts read the same both times; they were {kept}.")
    return with_warnings([*analysis.notes, *entry_notes(analysis)], notes, result.warnings)
