"""The question in plain words: titles for the question picker and one sentence per analysis."""

from __future__ import annotations

from rankwise.stats.analysis import Analysis, Question
from rankwise.wording.numbers import format_level, format_setting, write_numbers
from rankwise.wording.phrases import a_or_an

QUESTION_TITLES: dict[Question, str] = {
    Question.TWO_GROUPS: "Did the change move the readings? (two separate groups of parts)",
    Question.PAIRED: "Did the same parts read differently the second time? (before / after)",
    Question.SEVERAL: "Do several groups read alike? (machines, cavities, shifts)",
    Question.PLAN: "How many parts should I measure?",
    Question.CHARACTERISTICS: "Did the change move any characteristic of the part? (many characteristics)",
}
"""Short plain-words title of each question, for the picker, the workbook and the printout."""


def group_names(analysis: Analysis) -> tuple[str, ...]:
    """The groups' names, with "Group 1", "Group 2"... standing in for blank names."""
    return tuple(g.name.strip() or f"Group {i + 1}" for i, g in enumerate(analysis.groups))


def unit_of(analysis: Analysis) -> str:
    """The readings' unit (the first group that states one), or ""."""
    return next((g.unit for g in analysis.groups if g.unit), "")


def decimals_of(analysis: Analysis) -> int | None:
    """The finest resolution of the groups' readings as decimals, or None when not known."""
    known = [g.decimals for g in analysis.groups if g.decimals is not None]
    return max(known) if known else None


def typed_texts(analysis: Analysis) -> tuple[str, ...]:
    """The texts the technician typed that a verdict quotes (names, units, the characteristic, the
    readings' notes, the entries the notes quote): written as typed, whatever the decimal mark of the numbers around them."""
    groups = analysis.groups
    return (*(g.name for g in groups), *(g.unit for g in groups), *group_names(analysis),
            analysis.settings.characteristic, analysis.settings.reference or "", *analysis.notes,
            *(entry.text for group in analysis.entries for entry in (*group.not_used, *group.flagged)))


def in_typed_mark(text: str, analysis: Analysis) -> str:
    """``text`` with its numbers written in the analysis's decimal mark, typed names kept as typed."""
    return write_numbers(text, analysis.decimal_mark, typed_texts(analysis))


def with_unit(text: str, unit: str) -> str:
    """``text`` followed by the unit, if any ("0.06 µm")."""
    return f"{text} {unit}" if unit else text


def margin_text(analysis: Analysis, margin: float) -> str:
    """The equivalence margin as "± 0.05 µm"."""
    return "± " + with_unit(format_setting(margin, decimals_of(analysis)), unit_of(analysis))


def describe_question(analysis: Analysis) -> str:
    """The question asked of these readings, in one plain sentence with the groups' names."""
    return in_typed_mark(_question(analysis), analysis)


def _question(analysis: Analysis) -> str:
    """The question in words, numbers written with decimal points."""
    names = group_names(analysis)
    settings = analysis.settings
    question = analysis.question
    if question is Question.PLAN:
        return _plan_question(analysis)
    if question is Question.SEVERAL:
        listed = ", ".join(names[:-1]) + " and " + names[-1] if len(names) > 1 else "".join(names)
        if settings.comparison == "against-reference" and settings.reference:
            return (f"Do {listed} read alike, and which groups read differently from "
                    f"{settings.reference}?")
        return f"Do {listed} read alike, and if not, which groups differ from which?"
    if len(names) < 2:
        return "Two groups of readings are needed for this question."
    a, b = names[0], names[1]
    same_parts = " on the same parts" if question is Question.PAIRED else ""
    if settings.margin is not None:
        return (f"Do {b} and {a} read the same within {margin_text(analysis, settings.margin)}"
                f"{same_parts}?")
    if settings.alternative == "b-greater":
        return f"Does {b} read higher than {a}{same_parts}?"
    if settings.alternative == "b-less":
        return f"Does {b} read lower than {a}{same_parts}?"
    return f"Does {b} read differently from {a}{same_parts}?"


def _plan_question(analysis: Analysis) -> str:
    """The planning question: how many parts to detect the stated change."""
    settings = analysis.settings
    unit = unit_of(analysis)
    decimals = decimals_of(analysis)
    power = format_level(settings.power)
    if settings.planned_prob_b_greater is not None:
        target = (f"a change that makes a part of the second group read higher than a part of "
                  f"the first in {format_level(settings.planned_prob_b_greater)} of pairs")
    elif settings.planned_shift is not None:
        what = "a change per part" if settings.plan_paired else "a shift"
        target = f"{what} of {with_unit(format_setting(settings.planned_shift, decimals), unit)}"
    else:
        target = "the shift worth detecting"
    parts = "parts, each measured twice," if settings.plan_paired else "parts per group"
    return (f"How many {parts} are needed to detect {target} with {a_or_an(power)} {power} chance "
            f"at the {format_level(settings.alpha)} significance level?")
