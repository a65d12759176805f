"""The verdict for several groups (Kruskal-Wallis with Dunn's pairwise follow-up), in plain words."""

from __future__ import annotations

from rankwise.stats.analysis import Analysis
from rankwise.stats.results import PairComparison, SeveralGroupsResult
from rankwise.wording.entries import dropped_notes, entry_notes
from rankwise.wording.numbers import format_plain
from rankwise.wording.phrases import level_phrase, p_phrase, with_warnings
from rankwise.wording.verdict_types import Verdict, cautioned_verdict

SHAPE_NOTE = ("The Kruskal-Wallis test compares the groups' average ranks: it speaks of medians "
              "only when all groups have the same spread and shape.")
HOLM_NOTE = ("Holm-adjusted p-values allow for making several comparisons at once; they can repeat, "
             "because the step-down method keeps them in the same order as the unadjusted ones.")


def describe_several(result: SeveralGroupsResult, analysis: Analysis) -> Verdict:
    """Headline, sentences, method note and assumption notes for a several-groups result."""
    k = len(result.summaries)
    test = (f"Kruskal-Wallis H = {format_plain(result.h)} with {result.df} degrees of freedom, "
            f"{p_phrase(result.p_value, result.alpha)}")
    sentences: list[str] = []
    if result.significant:
        headline = f"The {k} groups do not all read alike."
        sentences.append(f"The difference among the groups is significant at {level_phrase(result.alpha)} ({test}).")
        differing = [pair for pair in result.pairs if pair.significant]
        if differing:
            sentences.extend(_pair_sentence(pair, result.alpha) for pair in differing)
        else:
            sentences.append("No single pair differs clearly once the comparisons are adjusted "
                             "for their number (Holm).")
    else:
        headline = f"No difference among the {k} groups was shown."
        sentences.append(f"{headline[:-1]} at {level_phrase(result.alpha)} ({test}).")
        sentences.append("This does not show that the groups are the same.")
    return cautioned_verdict(headline, sentences, _method_note(result), _assumption_notes(result, analysis))


def _pair_sentence(pair: PairComparison, alpha: float) -> str:
    """ "Press 3 reads higher than Press 1 (Dunn's test, Holm-adjusted p = 0.017)." """
    higher, lower = (pair.group_b, pair.group_a) if pair.z > 0 else (pair.group_a, pair.group_b)
    return f"{higher} reads higher than {lower} (Dunn's test, Holm-adjusted {p_phrase(pair.p_adjusted, alpha)})."


def _method_note(result: SeveralGroupsResult) -> str:
    """Which test, how its p-value was found, and which pairwise comparisons follow."""
    if result.method == "chi-square":
        how = f"p-value from the chi-square distribution with {result.df} degrees of freedom"
    elif result.method == "exact permutation":
        how = "exact p-value (every reassignment of the readings to the groups)"
    elif result.method == "Monte Carlo permutation":
        how = "p-value from random reassignments of the readings to the groups (Monte Carlo)"
    else:
        how = f"p-value by {result.method}"
    family = (f"each group against {result.reference}" if result.comparison == "against-reference"
              and result.reference else "all pairs of groups")
    return (f"Kruskal-Wallis H test, tie-corrected, {how}; follow-up: Dunn's test for {family}, "
            f"two-sided, Holm-adjusted over {len(result.pairs)} comparisons.")


def _assumption_notes(result: SeveralGroupsResult, analysis: Analysis) -> tuple[str, ...]:
    """Shape, Holm, Mood's median test, warnings and the readings' own notes."""
    notes = [SHAPE_NOTE, HOLM_NOTE]
    if result.mood_median is not None:
        notes.append(f"Mood's median test (counts above the overall median; not Mood's test of "
                     f"spread) gives {p_phrase(result.mood_median.p_value, result.alpha)}.")
    return with_warnings([*analysis.notes, *entry_notes(analysis), *dropped_notes(analysis, result.summaries)],
                         notes, result.warnings)
