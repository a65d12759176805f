"""Phrases shared by the verdicts of every question (directions, levels, p-value methods)."""

from __future__ import annotations

import math
import re

from rankwise.stats.results import ConfidenceInterval
from rankwise.wording.numbers import format_centre, format_level, format_p

NOT_SAMENESS = ("This does not show that the groups are the same; to show that, set an "
                "equivalence margin.")
"""Said after every "no difference shown": a non-significant test never proves sameness."""

EXACT_METHOD = "exact p-value (permutation distribution given the ties)"
NORMAL_METHOD = "normal approximation with tie and continuity correction"
DOUBLING = ("the two-sided p-value is twice the smaller one-sided p-value (at most 1)")


def p_method(method: str, alternative: str) -> str:
    """How the p-value was found, in words, with the two-sided convention where it applies."""
    if method == "exact":
        text = EXACT_METHOD
        if alternative == "two-sided":
            text += "; " + DOUBLING
        return text
    if method == "normal":
        return NORMAL_METHOD
    return method


def alternative_words(alternative: str, name_a: str, name_b: str) -> str:
    """The direction tested, e.g. "two-sided: does B differ from A?"."""
    if alternative == "b-greater":
        return f"one-sided: does {name_b} read higher than {name_a}?"
    if alternative == "b-less":
        return f"one-sided: does {name_b} read lower than {name_a}?"
    return f"two-sided: does {name_b} read differently from {name_a}?"


def sides(alternative: str) -> str:
    """ "two-sided" or "one-sided"."""
    return "two-sided" if alternative == "two-sided" else "one-sided"


def outcome_sentence(lead: str, p: float, alpha: float, alternative: str) -> str:
    """ "<lead> at the 5 % level (p = 0.0019, two-sided)." : the outcome of a test, read aloud."""
    return f"{lead} at {level_phrase(alpha)} ({p_phrase(p, alpha)}, {sides(alternative)})."


def equivalence_words(names: tuple[str, str], margin: str, interval: ConfidenceInterval | None,
                      equivalent: bool | None, what: str, decimals: int | None, unit: str,
                      alpha: float) -> tuple[str, str]:
    """Headline and sentence for "the same within ± margin?", judged on ``what`` ("shift" or
    "change per part") by two one-sided tests; ``names`` are (A, B)."""
    a, b = names
    if equivalent is None or interval is None:
        return (f"Equivalence within {margin} could not be judged.",
                f"No interval for the {what} was computed, so equivalence within {margin} could not be judged.")
    shown = interval_phrase(interval, decimals, unit)
    tests = f"(two one-sided tests, each at {level_phrase(alpha)})"
    if equivalent:
        return (f"{b} and {a} are equivalent within {margin}.",
                f"The {what}'s {shown} lies inside {margin} {tests}.")
    return (f"Equivalence of {b} and {a} within {margin} was not shown.",
            f"The {what}'s {shown} reaches {margin} or beyond {tests}.")


def with_warnings(notes: list[str], *more: tuple[str, ...]) -> tuple[str, ...]:
    """``notes`` followed by each further note (warnings, the readings' notes) not already said."""
    for group in more:
        notes.extend(note for note in group if note not in notes)
    return tuple(notes)


def level_phrase(alpha: float) -> str:
    """ "the 5 % level"."""
    return f"the {format_level(alpha)} level"


def p_phrase(p: float, alpha: float) -> str:
    """ "p = 0.0019" (or "p < 0.0001"), shown with enough digits to sit on the right side of alpha."""
    text = format_p(p, alpha)
    return f"p {text}" if text.startswith("<") else f"p = {text}"


def interval_phrase(interval: ConfidenceInterval, decimals: int | None, unit: str) -> str:
    """ "95 % confidence interval 0.02 to 0.10 µm", with an open end as "from just above 0.000 to
    0.006 mm", and a one-sided bound as "at least 0.02 µm with 95 % confidence" (``decimals``: the
    readings' resolution)."""
    unit_text = f" {unit}" if unit else ""
    attained = interval.attained_level
    short = attained is not None and attained < interval.level - 1e-9
    level = format_level(attained if short else interval.level)
    reach = f"; {format_level(interval.level)} cannot be reached with so few readings" if short else ""
    if not math.isfinite(interval.high) or not math.isfinite(interval.low):
        return f"{bound_words(interval, decimals)}{unit_text} with {level} confidence{reach}"
    low = format_centre(interval.low, decimals)
    high = format_centre(interval.high, decimals)
    if interval.low_included and interval.high_included:
        return f"{level} confidence interval {low} to {high}{unit_text}{reach}"
    low = low if interval.low_included else f"just above {low}"
    high = high if interval.high_included else f"just below {high}"
    return f"{level} confidence interval from {low} to {high}{unit_text}{reach}"


def bound_words(interval: ConfidenceInterval, decimals: int | None) -> str:
    """A one-sided bound in words: "at least 0.02" or "above 0.02" (open), "at most 0.10" or
    "below 0.10" (open); the finite end of an interval with one infinite end."""
    if math.isfinite(interval.low):
        return f"{'at least' if interval.low_included else 'above'} {format_centre(interval.low, decimals)}"
    return f"{'at most' if interval.high_included else 'below'} {format_centre(interval.high, decimals)}"


def interval_disagreement(interval: ConfidenceInterval | None, significant: bool, alpha: float,
                          what: str) -> str | None:
    """A plain sentence when an approximate interval at 1 - alpha and the test disagree about 0, else None."""
    if interval is None or abs(interval.level - (1.0 - alpha)) > 1e-9 or interval.contains(0.0) != significant:
        return None
    if significant:
        return (f"The {what}'s interval still reaches 0 although the test found a change: one of the two is "
                f"an approximation here (the method note says which); the p-value decides, the interval only "
                f"shows the likely size.")
    return (f"The {what}'s interval leaves out 0 although the test found no change at this level: one of the "
            f"two is an approximation here (the method note says which); the p-value decides, the interval "
            f"only shows the likely size.")


def size_sentence(what: str, names: tuple[str, str], value: float, interval: ConfidenceInterval,
                  decimals: int | None, unit: str) -> str:
    """ "The shift, B minus A, is +0.06 µm (95 % confidence interval 0.02 to 0.10 µm)." ; ``names`` are (A, B).

    A one-sided bound reads "(at least 0.02 µm with 95 % confidence)"."""
    a, b = names
    return (f"The {what}, {b} minus {a}, is {signed_reading(value, decimals, unit)} "
            f"({interval_phrase(interval, decimals, unit)}).")


def method_and_p(method: str, p: float, alpha: float) -> str:
    """ "Fligner-Killeen (median-centred), chi-square: p = 0.087" from a method name and its p-value."""
    label = method.strip()
    if label.endswith(" p"):
        label = label[:-2].rstrip(" ,:")
    return f"{label}: {p_phrase(p, alpha)}"


def signed_reading(value: float, decimals: int | None, unit: str) -> str:
    """A change with its sign, "+0.06 µm" or "-0.06 µm"."""
    text = format_centre(value, decimals)
    if math.isfinite(value) and not text.startswith("-") and float(text) != 0.0:
        text = "+" + text
    return f"{text} {unit}" if unit else text


def b_reads_higher(alternative: str, shift: float | None, otherwise: bool) -> bool:
    """True when B tends to read higher than A: by the direction tested, else by the shift's sign,
    else ``otherwise`` (what the ranks say when there is no shift)."""
    if alternative == "b-greater":
        return True
    if alternative == "b-less":
        return False
    if shift is not None and shift != 0.0:
        return shift > 0.0
    return otherwise


def not_shown_headline(alternative: str, a: str, b: str, change: str, where: str = "") -> str:
    """ "No difference between A and B was shown." or, one-sided, "It was not shown that B reads
    higher than A."; ``change`` names what was looked for, ``where`` adds e.g. " on the same parts"."""
    if alternative == "b-greater":
        return f"It was not shown that {b} reads higher than {a}{where}."
    if alternative == "b-less":
        return f"It was not shown that {b} reads lower than {a}{where}."
    return f"No {change} between {a} and {b}{where} was shown."


def higher_or_lower(positive: bool) -> str:
    """ "higher" or "lower"."""
    return "higher" if positive else "lower"


def smallest_sign_test_size(alpha: float, alternative: str) -> int:
    """Fewest pairs for which a signed-rank result can reach ``alpha`` without ties.

    The most extreme outcome (every difference the same sign) has one-sided probability 2^-n,
    so n must satisfy 2^-n <= alpha (one-sided) or 2 * 2^-n <= alpha (two-sided).
    """
    tails = 2.0 if alternative == "two-sided" else 1.0
    return max(1, math.ceil(math.log2(tails / alpha) - 1e-12))


def a_or_an(text: str) -> str:
    """The article for a number read aloud: "an 80 % chance", "an 11 % share", "a 90 % chance"."""
    return "an" if re.match(r"(8|1[18](?!\d))", text) else "a"
