"""Verdict wording of results built by the real statistics functions, on published data."""

import dataclasses
import re

from hypothesis import given, settings
from hypothesis import strategies as st

from rankwise.stats.analysis import Analysis, GroupReadings, Question, Settings
from rankwise.stats.paired import compare_paired
from rankwise.stats.several import compare_several
from rankwise.wording import CAUTION_SHORT, QUESTION_TITLES, describe, describe_question, key_numbers

# Hollander & Wolfe (1999), Nonparametric Statistical Methods, 2nd ed., p. 39 (paired, n = 9).
HW_FIRST = (1.83, 0.50, 1.62, 2.48, 1.68, 1.88, 1.55, 3.06, 1.30)
HW_SECOND = (0.878, 0.647, 0.598, 2.05, 1.06, 1.29, 1.06, 3.14, 1.29)

# Zar (2010), Biostatistical Analysis, 5th ed., pH of four ponds.
ZAR_PONDS = {
    "Pond 1": (7.68, 7.69, 7.70, 7.70, 7.72, 7.73, 7.73, 7.76),
    "Pond 2": (7.71, 7.73, 7.74, 7.74, 7.78, 7.78, 7.80, 7.81),
    "Pond 3": (7.74, 7.75, 7.77, 7.78, 7.80, 7.81, 7.84),
    "Pond 4": (7.71, 7.71, 7.74, 7.79, 7.81, 7.85, 7.87, 7.91),
}

# Hollander & Wolfe (1973), p. 116: Kruskal-Wallis H = 0.77143, p = 0.68.
HW_THREE = {"Line 1": (2.9, 3.0, 2.5, 2.6, 3.2), "Line 2": (3.8, 2.7, 4.0, 2.4),
            "Line 3": (2.8, 3.4, 3.7, 2.2, 2.0)}

CLAIMS_SAMENESS = re.compile(r"\b(are|is|read) the same\b(?! within)|\bno difference exists\b", re.IGNORECASE)


def paired_analysis(first, second, names=("Before cure", "After cure"), decimals=2, **settings_kw):
    groups = (GroupReadings(names[0], tuple(first), unit="µm", decimals=decimals),
              GroupReadings(names[1], tuple(second), unit="µm", decimals=decimals + 1))
    return Analysis(Question.PAIRED, groups, Settings(**settings_kw))


def several_analysis(groups):
    return Analysis(Question.SEVERAL, tuple(GroupReadings(n, tuple(v), decimals=2) for n, v in groups.items()))


def all_text(verdict):
    return " ".join((verdict.headline, *verdict.sentences, verdict.method_note, *verdict.assumption_notes))


def test_paired_verdict_names_the_groups_direction_shift_and_interval():
    """Hollander & Wolfe (1999) p. 39: pseudo-median -0.46, exact 95 % CI (-0.786, -0.010), p = 0.0390625."""
    analysis = paired_analysis(HW_FIRST, HW_SECOND)
    result = compare_paired(HW_FIRST, HW_SECOND, name_a="Before cure", name_b="After cure")
    verdict = describe(result, analysis)
    assert verdict.headline == "After cure reads lower than Before cure on the same parts."
    assert "-0.460 µm" in verdict.sentences[0]
    assert "95 % confidence interval -0.786 to -0.010 µm" in verdict.sentences[0]
    assert "p = 0.0391" in verdict.sentences[1]
    assert "exact p-value (permutation distribution given the ties)" in verdict.method_note
    assert "twice the smaller one-sided p-value" in verdict.method_note
    assert verdict.caution == CAUTION_SHORT
    assert not re.search(r"\b[xy]\b", all_text(verdict))


def test_paired_key_numbers_carry_labels_tooltips_and_raw_values():
    analysis = paired_analysis(HW_FIRST, HW_SECOND)
    result = compare_paired(HW_FIRST, HW_SECOND, name_a="Before cure", name_b="After cure")
    numbers = {n.key: n for n in key_numbers(result, analysis)}
    assert numbers["w_plus"].text == "5"  # Hollander & Wolfe (1999) p. 39: T+ = 5
    assert numbers["p_value"].value == result.p_value
    assert numbers["shift"].text == "-0.460 µm"
    assert "if the change did nothing" in numbers["p_value"].tooltip
    assert all(n.label and n.tooltip for n in numbers.values())


def test_too_few_pairs_says_so_first():
    """Five pairs cannot reach 5 % two-sided: the signed-rank table's first entry is n = 6 (checks.md)."""
    first, second = HW_FIRST[:5], HW_SECOND[:5]
    result = compare_paired(first, second, name_a="Before cure", name_b="After cure")
    verdict = describe(result, paired_analysis(first, second))
    assert verdict.headline.startswith("No result could reach the 5 % level")
    assert verdict.sentences[0].endswith("At least 6 parts with a change are needed.")


def test_paired_equivalence_is_worded_as_shown_or_not_shown():
    analysis = paired_analysis(HW_FIRST, HW_SECOND, margin=0.05)
    result = compare_paired(HW_FIRST, HW_SECOND, name_a="Before cure", name_b="After cure", margin=0.05)
    verdict = describe(result, analysis)
    assert result.equivalent is False
    assert verdict.headline == "Equivalence of After cure and Before cure within ± 0.050 µm was not shown."
    assert describe_question(analysis) == "Do After cure and Before cure read the same within ± 0.050 µm on the same parts?"


def test_several_groups_verdict_names_the_pairs_that_differ():
    """Zar (2010): Dunn's Bonferroni p for pairs 3-1 and 4-1 are 0.0191 and 0.0166, all others above 0.05;
    Holm follows from the same z, so exactly these two pairs differ."""
    result = compare_several(ZAR_PONDS)
    verdict = describe(result, several_analysis(ZAR_PONDS))
    assert verdict.headline == "The 4 groups do not all read alike."
    pair_sentences = [s for s in verdict.sentences if "Dunn" in s]
    assert [s.split(" (")[0] for s in pair_sentences] == ["Pond 3 reads higher than Pond 1",
                                                          "Pond 4 reads higher than Pond 1"]
    assert "Holm-adjusted" in verdict.method_note
    assert any("can repeat" in note for note in verdict.assumption_notes)


def test_several_groups_not_significant_never_claims_sameness():
    """Hollander & Wolfe (1973) p. 116: H = 0.77143 (p = 0.68 by chi-square; the exact permutation p
    that the engine uses at these sizes is larger still)."""
    result = compare_several(HW_THREE)
    verdict = describe(result, several_analysis(HW_THREE))
    assert verdict.headline == "No difference among the 3 groups was shown."
    assert "This does not show that the groups are the same." in verdict.sentences
    assert "H = 0.7714 with 2 degrees of freedom" in verdict.sentences[0]
    assert not CLAIMS_SAMENESS.search(verdict.headline + " ".join(verdict.sentences).replace(
        "does not show that the groups are the same", ""))


def test_every_question_has_a_title():
    assert set(QUESTION_TITLES) == set(Question)


@settings(max_examples=40, deadline=None)
@given(st.lists(st.tuples(st.integers(0, 30), st.integers(0, 30)), min_size=2, max_size=12))
def test_paired_verdict_never_claims_sameness_and_always_carries_the_caution(pairs):
    first = [a / 10 for a, _ in pairs]
    second = [b / 10 for _, b in pairs]
    if all(a == b for a, b in zip(first, second)):
        return  # no change at all: the engine refuses, as it should
    result = compare_paired(first, second, name_a="Shift 1", name_b="Shift 2")
    verdict = describe(result, paired_analysis(first, second, names=("Shift 1", "Shift 2"), decimals=1))
    assert verdict.caution == CAUTION_SHORT
    spoken = " ".join((verdict.headline, *verdict.sentences)).replace(
        "does not show that the readings are the same", "")
    assert not CLAIMS_SAMENESS.search(spoken)
    if not result.significant and result.critical_t is not None:
        assert "does not show" in " ".join(verdict.sentences)


def test_plan_wording_states_the_parts_per_group():
    """Noether (1987), JASA 82: alpha 0.05 two-sided, power 0.90, P(B > A) = 0.7, equal groups -> 44 per group."""
    from rankwise.stats.planning import plan_group_size

    result = plan_group_size(prob_b_greater=0.7, alpha=0.05, power=0.9)
    groups = (GroupReadings("Wheel A", (), unit="µm"), GroupReadings("Wheel B", (), unit="µm"))
    analysis = Analysis(Question.PLAN, groups, Settings(planned_prob_b_greater=0.7, power=0.9))
    verdict = describe(result, analysis)
    assert verdict.headline == "Measure at least 44 parts of Wheel A and 44 parts of Wheel B."
    assert verdict.sentences[0].startswith("This gives a 90 % chance of a significant result at the 5 % level")
    assert "Noether (1987)" in verdict.method_note
    assert {n.key: n.text for n in key_numbers(result, analysis)}["n_a"] == "44"
    lower_power = dataclasses.replace(analysis, settings=dataclasses.replace(analysis.settings, power=0.8))
    assert describe_question(lower_power).endswith("with an 80 % chance at the 5 % significance level?")


OUTCOME = re.compile(r" at the 5 % level \(p (= [0-9.,]+|< 0[.,]0001), (two|one)-sided\)\.$")


def test_the_test_outcome_is_one_short_sentence_read_aloud():
    """Hollander & Wolfe (1999) p. 39 paired example (p = 0.0391, two-sided)."""
    result = compare_paired(HW_FIRST, HW_SECOND, name_a="Before cure", name_b="After cure")
    verdict = describe(result, paired_analysis(HW_FIRST, HW_SECOND))
    assert verdict.sentences[0] == ("The typical change per part, After cure minus Before cure, is -0.460 µm "
                                    "(95 % confidence interval -0.786 to -0.010 µm).")
    assert verdict.sentences[1] == "The change is significant at the 5 % level (p = 0.0391, two-sided)."
    one_sided = compare_paired(HW_FIRST, HW_SECOND, name_a="Before cure", name_b="After cure",
                               alternative="b-greater")
    worded = describe(one_sided, paired_analysis(HW_FIRST, HW_SECOND, alternative="b-greater"))
    assert worded.headline == "It was not shown that After cure reads higher than Before cure on the same parts."
    assert OUTCOME.search(worded.sentences[0]) and "one-sided" in worded.sentences[0]
    assert "does not show that the readings are the same" in " ".join(worded.sentences)


def test_equivalence_sentence_names_the_margin_and_the_interval():
    analysis = paired_analysis(HW_FIRST, HW_SECOND, margin=0.05)
    result = compare_paired(HW_FIRST, HW_SECOND, name_a="Before cure", name_b="After cure", margin=0.05)
    sentence = describe(result, analysis).sentences[-1]
    assert sentence.startswith("The change per part's ")
    assert "confidence interval" in sentence and "reaches ± 0.050 µm or beyond" in sentence


def test_several_groups_outcome_reads_as_one_sentence():
    """Hollander & Wolfe (1973) p. 116: H = 0.77143, p = 0.68, not significant."""
    result = compare_several(HW_THREE)
    verdict = describe(result, several_analysis(HW_THREE))
    assert verdict.sentences[0].startswith("No difference among the 3 groups was shown at the 5 % level (")


def test_with_a_decimal_comma_every_number_in_the_verdict_and_key_numbers_uses_it():
    """The technician typed commas; names keep what was typed (here a point in "Die 1.5")."""
    first, second = HW_FIRST, HW_SECOND
    analysis = dataclasses.replace(paired_analysis(first, second, names=("Die 1.5", "Die 2.0")), decimal_mark=",")
    result = compare_paired(first, second, name_a="Die 1.5", name_b="Die 2.0")
    verdict = describe(result, analysis)
    text = all_text(verdict).replace("Die 1.5", "").replace("Die 2.0", "")
    assert "-0,460 µm" in verdict.sentences[0] and "p = 0,0391" in verdict.sentences[1]
    assert not re.search(r"\d\.\d", text)
    assert "Die 1.5" in verdict.sentences[0]
    shown = {n.key: n.text for n in key_numbers(result, analysis)}
    assert shown["shift"] == "-0,460 µm" and shown["p_value"] == "0,0391"
    assert not any(re.search(r"\d\.\d", n.text) for n in key_numbers(result, analysis))


def test_a_plan_for_the_same_parts_measured_twice_speaks_of_the_spread_of_the_differences():
    """Noether (1987) signed-rank plan, as computed by rankwise.stats.planning.plan_paired_size."""
    from rankwise.stats.planning import plan_paired_size

    result = plan_paired_size(0.03, 0.04, alpha=0.05, power=0.8, n_sim=50)
    groups = (GroupReadings("Before cure", (), unit="µm", decimals=2),
              GroupReadings("After cure", (), unit="µm", decimals=2))
    analysis = Analysis(Question.PLAN, groups, Settings(planned_shift=0.03, planned_spread=0.04, plan_paired=True))
    verdict = describe(result, analysis)
    assert verdict.headline == f"Measure at least {result.n_a} parts, each part twice."
    assert "(After cure minus Before cure) is typically 0.03 µm" in verdict.sentences[0]
    assert "changes scatter from part to part with a standard deviation of 0.04 µm" in verdict.sentences[0]
    numbers = {n.key: n for n in key_numbers(result, analysis)}
    assert numbers["spread"].label == "Spread of the differences (standard deviation)"
    assert numbers["shift"].label == "Change per part worth detecting"
    assert "n_b" not in numbers


def test_several_groups_significant_outcome_says_so_once():
    """Zar (2010) pond pH: tie-corrected H = 11.94, df 3, significant at 5 % (checks.md, H from memory there)."""
    verdict = describe(compare_several(ZAR_PONDS), several_analysis(ZAR_PONDS))
    assert verdict.sentences[0].startswith("The difference among the groups is significant at the 5 % level (")
    assert verdict.headline not in verdict.sentences[0]
