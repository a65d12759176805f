"""Every number the screen and the paper show, with our own labels and plain-words tooltips."""

from __future__ import annotations

import math
from collections.abc import Iterator
from dataclasses import replace

from rankwise.stats.analysis import Analysis
from rankwise.stats.results import (
    CharacteristicsResult,
    ConfidenceInterval,
    GroupSummary,
    PairedResult,
    PlanResult,
    Result,
    SeveralGroupsResult,
    TwoGroupResult,
)
from rankwise.wording.characteristics import characteristics_key_numbers
from rankwise.wording.numbers import (
    MISSING,
    format_centre,
    format_count,
    format_level,
    format_p,
    format_percent,
    format_plain,
    format_setting,
)
from rankwise.wording import entries
from rankwise.wording.planning import plan_names
from rankwise.wording.phrases import EXACT_METHOD, NORMAL_METHOD
from rankwise.wording.questions import decimals_of, in_typed_mark, unit_of, with_unit
from rankwise.wording.verdict_types import KeyNumber

P_TIP = ("The chance of a result at least this far from 'no difference' if the change did nothing. "
         "Small values speak against 'the change did nothing'.")
EXACT_P_TIP = "The p-value counted exactly over every way the readings could have fallen into the groups."
NORMAL_P_TIP = "The p-value from the bell-curve (normal) approximation, with tie and continuity correction."
MID_P_TIP = ("The exact p-value counting the observed result only half: a less cautious figure, "
             "shown for comparison only; the verdict does not use it.")


def key_numbers(result: Result, analysis: Analysis) -> tuple[KeyNumber, ...]:
    """The key numbers of ``result`` in display order, written with the analysis's decimal mark;
    raises ``ValueError`` for other objects."""
    lister = _LISTERS.get(type(result))
    if lister is None:
        raise ValueError(f"result must be a result of the statistics service; got {type(result).__name__}.")
    numbers = lister(result, analysis)
    if analysis.decimal_mark == ".":
        return tuple(numbers)
    return tuple(replace(number, label=in_typed_mark(number.label, analysis), text=in_typed_mark(number.text, analysis),
                         tooltip=in_typed_mark(number.tooltip, analysis)) for number in numbers)


class _Formats:
    """Formatting at the readings' resolution, with the unit."""

    def __init__(self, analysis: Analysis) -> None:
        self.decimals = decimals_of(analysis)
        self.unit = unit_of(analysis)

    def setting(self, value: float | None) -> str:
        """Numbers the user chose (margin, planned shift and spread), never rounded away."""
        return self._with_unit(format_setting(value, self.decimals))

    def centre(self, value: float | None) -> str:
        """Medians, quartiles and shifts: one decimal finer than the readings when off their grid."""
        return self._with_unit(format_centre(value, self.decimals))

    def _with_unit(self, text: str) -> str:
        return text if text == MISSING else with_unit(text, self.unit)


def _number(key: str, label: str, text: str, tooltip: str, value: float | None) -> KeyNumber:
    return KeyNumber(key=key, label=label, text=text, tooltip=tooltip,
                     value=None if value is None else float(value))


def _count(key: str, label: str, value: float | None, tooltip: str) -> KeyNumber:
    return _number(key, label, format_count(value), tooltip, value)


def _p(key: str, label: str, p: float | None, tooltip: str, alpha: float | None = None) -> KeyNumber:
    return _number(key, label, format_p(p, alpha), tooltip, p)


def _summary(tag: str, summary: GroupSummary, formats: _Formats, analysis: Analysis) -> Iterator[KeyNumber]:
    """Counts (as ``rankwise.wording.entries`` words them), median and quartiles of one group."""
    name = summary.name
    yield _count(f"n_{tag}", f"{entries.READINGS_USED}, {name}", summary.n,
                 entries.READINGS_USED_TIP.format(name=name))
    counted = entries.entries_of(analysis, name)
    if counted is None:
        if summary.n_dropped:
            yield _count(f"n_dropped_{tag}", f"Entries without a reading, {name}", summary.n_dropped,
                         entries.NO_READING_TIP.format(name=name))
    else:
        for key, label, count, tip in (
                ("n_censored", entries.CENSORED, counted.censored, entries.CENSORED_TIP),
                ("n_not_used", entries.NOT_USED, len(counted.not_used), entries.NOT_USED_TIP),
                ("n_empty", entries.EMPTY_BETWEEN, counted.empty_between, entries.EMPTY_BETWEEN_TIP)):
            if count:
                yield _count(f"{key}_{tag}", f"{label}, {name}", count, tip.format(name=name))
    yield _number(f"median_{tag}", f"Median, {name}", formats.centre(summary.median),
                  f"The middle reading of {name}: half the readings are at or below it.", summary.median)
    yield _number(f"q1_{tag}", f"Lower quartile, {name}", formats.centre(summary.q1),
                  f"A quarter of the readings of {name} are at or below this value.", summary.q1)
    yield _number(f"q3_{tag}", f"Upper quartile, {name}", formats.centre(summary.q3),
                  f"Three quarters of the readings of {name} are at or below this value.", summary.q3)


def _interval(key: str, what: str, interval: ConfidenceInterval | None, formats: _Formats,
              tooltip: str) -> Iterator[KeyNumber]:
    """The finite ends of an interval as numbers (so a workbook stores them as numbers): both ends,
    or the one bound of a one-sided question; an open end says so in its label."""
    if interval is None:
        return
    level = format_level(interval.level)
    one_sided = not (math.isfinite(interval.low) and math.isfinite(interval.high))
    if math.isfinite(interval.low):
        label = f"{what}, {level} lower bound" if one_sided else f"{what}, {level} interval, lower end"
        yield _number(f"{key}_low", label + ("" if interval.low_included else OPEN_LOW),
                      formats.centre(interval.low), tooltip + _end_tip(interval.low_included, "above"), interval.low)
    if math.isfinite(interval.high):
        label = f"{what}, {level} upper bound" if one_sided else f"{what}, {level} interval, upper end"
        yield _number(f"{key}_high", label + ("" if interval.high_included else OPEN_HIGH),
                      formats.centre(interval.high), tooltip + _end_tip(interval.high_included, "below"), interval.high)


OPEN_LOW = " (not included)"
OPEN_HIGH = " (not included)"
"""Said after the label of an open end: the test rejects the end itself but accepts every value just inside."""


def _end_tip(included: bool, side: str) -> str:
    if included:
        return ""
    return (f" This end itself is not included: the test rejects exactly this value but accepts every value "
            f"just {side} it.")


def _method(method: str, key: str = "method") -> KeyNumber:
    text = {"exact": "exact, given the ties", "normal": "normal approximation"}.get(method, method)
    tip = {"exact": EXACT_METHOD, "normal": NORMAL_METHOD}.get(method, method)
    return _number(key, "How the p-value was found", text,
                   f"{tip[0].upper()}{tip[1:]}. Exact counting is used where affordable; otherwise the "
                   f"normal approximation.", None)


def _critical(key: str, what: str, value: int | None, alpha: float, tooltip: str) -> KeyNumber:
    """The table's critical value at the level, or "none possible" when no result can reach it."""
    return _number(key, f"{what} at {format_level(alpha)}", "none possible" if value is None else str(value),
                   tooltip, value)


def _p_values(r: TwoGroupResult | PairedResult, z_tip: str) -> Iterator[KeyNumber]:
    """The p-value used, how it was found, the exact and the normal-approximation p-values, and z."""
    yield _p("p_value", "p-value", r.p_value, P_TIP, r.alpha)
    yield _method(r.method)
    if r.p_exact is not None:
        yield _p("p_exact", "Exact p-value", r.p_exact, EXACT_P_TIP, r.alpha)
    yield _p("p_normal", "Normal-approximation p-value", r.p_normal, NORMAL_P_TIP, r.alpha)
    yield _number("z", "z (normal approximation)", format_plain(r.z), z_tip, r.z)


def _equivalence(r: TwoGroupResult | PairedResult, formats: _Formats, what: str,
                 meaning: str) -> Iterator[KeyNumber]:
    """The margin and the interval judged against it, when the question asks "the same within ± margin?"."""
    if r.margin is None:
        return
    yield _number("margin", "Equivalence margin (±)", formats.setting(r.margin),
                  f"{meaning} for this characteristic.", r.margin)
    yield from _interval("equivalence_ci", f"{what} for equivalence", r.equivalence_ci, formats,
                         "Equivalent when this whole interval lies inside the margin.")


def _two_groups(r: TwoGroupResult, analysis: Analysis) -> Iterator[KeyNumber]:
    f = _Formats(analysis)
    a, b = r.name_a, r.name_b
    yield from _summary("a", r.summary_a, f, analysis)
    yield from _summary("b", r.summary_b, f, analysis)
    yield _count("rank_sum_a", f"Rank sum, {a}", r.rank_sum_a,
                 f"All readings are ranked together, lowest first; this adds up the ranks of {a}.")
    yield _count("rank_sum_b", f"Rank sum, {b}", r.rank_sum_b,
                 f"All readings are ranked together, lowest first; this adds up the ranks of {b}.")
    yield _count("u_a", f"U of {a}", r.u_a,
                 f"Out of every pairing of a part of {a} with a part of {b}: how many times {a} reads "
                 f"higher (ties count half).")
    yield _count("u_b", f"U of {b}", r.u_b,
                 f"Out of every pairing of a part of {a} with a part of {b}: how many times {b} reads "
                 f"higher (ties count half).")
    yield _count("u", "U (the smaller)", r.u, "The smaller of the two U values, the one compared with the table.")
    yield _critical("critical_u", "Critical U", r.critical_u, r.alpha,
                    "A U at or below this value is significant (without ties); 'none possible' means "
                    "these group sizes can never give a significant result.")
    yield from _p_values(r, f"How many standard errors the rank sum lies from 'no difference'; positive when "
                            f"{b} tends to read higher.")
    if r.mid_p is not None:
        yield _p("mid_p", "Mid-p (for comparison only)", r.mid_p, MID_P_TIP)
    if r.attained_alpha is not None:
        yield _number("attained_alpha", "True significance level of the exact test",
                      format_p(r.attained_alpha),
                      "With few parts the exact test cannot hit the chosen level exactly; this is the "
                      "chance of a false alarm it really runs.", r.attained_alpha)
    if r.shift is not None:
        yield _number("shift", f"Shift, {b} minus {a}", f.centre(r.shift),
                      f"The typical difference between a part of {b} and a part of {a} (Hodges-Lehmann: "
                      f"the median of all differences).", r.shift)
    yield from _interval("shift_ci", "Shift", r.shift_ci, f,
                         "The shifts that fit the readings at this confidence level (a one-sided question "
                         "gives one bound).")
    yield _number("prob_b_greater", f"Share of pairs where {b} reads higher",
                  format_percent(r.prob_b_greater),
                  f"Pair every part of {b} with every part of {a}: the share where {b} reads higher "
                  f"(ties count half). 50 % means neither tends to read higher.", r.prob_b_greater)
    yield _number("rank_biserial", "Rank-biserial correlation", format_plain(r.rank_biserial, 3),
                  f"Share of pairs where {b} reads higher minus the share where it reads lower "
                  f"(-1 to +1; 0 means no tendency).", r.rank_biserial)
    if r.shape is not None:
        yield _number("spread_ratio", f"Spread ratio, {b} to {a}", format_plain(r.shape.spread_ratio, 3),
                      "The middle half's width of the second group divided by that of the first; "
                      "1 means equal spread.", r.shape.spread_ratio)
        yield _p("dispersion_p", "p-value, equal spread", r.shape.dispersion_p,
                 f"{r.shape.dispersion_method}: a small value means the spreads differ.")
        yield _p("shape_p", "p-value, equal shape", r.shape.shape_p,
                 f"{r.shape.shape_method}: a small value means the shapes differ once the medians are lined up.")
    if r.brunner_munzel is not None:
        yield _p("brunner_munzel_p", "Brunner-Munzel p-value", r.brunner_munzel.p_value,
                 "A test of 'one group tends to read higher' that allows unequal spreads.", r.alpha)
    if r.mood_median is not None:
        yield _p("mood_median_p", "Mood's median test p-value", r.mood_median.p_value,
                 "Compares how many readings of each group lie above the overall median "
                 "(not Mood's test of spread).", r.alpha)
    yield from _equivalence(r, f, "Shift", "Shifts inside plus or minus this amount count as 'the same'")


def _paired(r: PairedResult, analysis: Analysis) -> Iterator[KeyNumber]:
    f = _Formats(analysis)
    a, b = r.name_a, r.name_b
    yield _count("n_pairs", "Parts measured twice", r.n_pairs, "Parts with both readings present.")
    yield _count("n", "Parts ranked", r.n, "Parts whose change went into the ranking.")
    yield _count("n_zero", "Parts with no change", r.n_zero, "Parts that read the same both times.")
    if r.n_dropped:
        yield _count("n_dropped", "Incomplete pairs left out", r.n_dropped,
                     "Rows with a reading missing on one side.")
    yield _number("median_a", f"Median, {a}", f.centre(r.summary_a.median),
                  f"The middle reading of {a}.", r.summary_a.median)
    yield _number("median_b", f"Median, {b}", f.centre(r.summary_b.median),
                  f"The middle reading of {b}.", r.summary_b.median)
    yield _count("w_plus", "Rank sum of rises", r.w_plus,
                 f"The changes are ranked by size; this adds the ranks of parts where {b} reads higher.")
    yield _count("w_minus", "Rank sum of falls", r.w_minus,
                 f"The changes are ranked by size; this adds the ranks of parts where {b} reads lower.")
    yield _critical("critical_t", "Critical rank sum", r.critical_t, r.alpha,
                    "The smaller rank sum at or below this value is significant (without ties); "
                    "'none possible' means too few parts for any significant result.")
    yield from _p_values(r, f"How many standard errors the rank sum of rises lies from 'no change'; positive "
                            f"when {b} tends to read higher.")
    if r.shift is not None:
        yield _number("shift", f"Typical change per part, {b} minus {a}", f.centre(r.shift),
                      "Hodges-Lehmann pseudo-median: the median of all averages of two parts' changes.",
                      r.shift)
    yield from _interval("shift_ci", "Change per part", r.shift_ci, f,
                         "The typical changes that fit the readings at this confidence level (a one-sided "
                         "question gives one bound).")
    yield from _equivalence(r, f, "Change", "Changes inside plus or minus this amount count as 'no change'")


def _several(r: SeveralGroupsResult, analysis: Analysis) -> Iterator[KeyNumber]:
    f = _Formats(analysis)
    for index, (summary, mean_rank) in enumerate(zip(r.summaries, r.mean_ranks), start=1):
        yield from _summary(str(index), summary, f, analysis)
        yield _count(f"mean_rank_{index}", f"Average rank, {summary.name}", mean_rank,
                     f"All readings are ranked together, lowest first; the average rank of {summary.name}.")
    yield _number("h", "Kruskal-Wallis H", format_plain(r.h),
                  "How far the groups' average ranks lie apart (tie-corrected); 0 means identical.", r.h)
    yield _count("df", "Degrees of freedom", r.df, "Number of groups minus one.")
    yield _p("p_value", "p-value", r.p_value, P_TIP, r.alpha)
    yield _method(r.method)
    yield _p("p_chi_square", "Chi-square p-value", r.p_chi_square,
             "The p-value from the chi-square approximation, always shown.", r.alpha)
    if r.p_permutation is not None:
        yield _p("p_permutation", "Permutation p-value", r.p_permutation,
                 "The p-value from reassigning the readings to the groups.", r.alpha)
    yield _number("epsilon_squared", "Effect size (epsilon squared)", format_plain(r.epsilon_squared, 3),
                  "Share of the ranks' variation explained by the groups (0 to 1).", r.epsilon_squared)
    if r.mood_median is not None:
        yield _p("mood_median_p", "Mood's median test p-value", r.mood_median.p_value,
                 "Compares how many readings of each group lie above the overall median "
                 "(not Mood's test of spread).", r.alpha)
    for index, pair in enumerate(r.pairs, start=1):
        yield _p(f"p_adjusted_{index}",
                 f"Holm-adjusted p, {pair.group_b} against {pair.group_a}", pair.p_adjusted,
                 "Dunn's two-sided p-value, raised to allow for all comparisons made (Holm). Values "
                 "can repeat, because the step-down keeps them in order.", r.alpha)


def _plan(r: PlanResult, analysis: Analysis) -> Iterator[KeyNumber]:
    f = _Formats(analysis)
    a, b = plan_names(analysis)
    if r.groups >= 3:
        yield _count("n_a", "Parts needed in each group", r.n_a, "Parts to measure in every group (rounded up).")
        yield _count("groups", "Groups", r.groups, "How many separate groups the plan is for.")
    elif r.paired:
        yield _count("n_a", "Parts to measure twice", r.n_a, "Parts needed, each measured before and after.")
    else:
        yield _count("n_a", f"Parts needed, {a}", r.n_a, "Parts to measure in the first group (rounded up).")
        yield _count("n_b", f"Parts needed, {b}", r.n_b, "Parts to measure in the second group (rounded up).")
    yield _number("alpha", "Significance level", format_level(r.alpha),
                  "The accepted chance of a false alarm when the change did nothing.", r.alpha)
    yield _number("power", "Chance of detecting the change", format_level(r.power),
                  "The chance that the test gives a significant result if the change is as large as stated.",
                  r.power)
    if r.shift is not None:
        yield _number("shift", "Change per part worth detecting" if r.paired else "Shift worth detecting",
                      f.setting(r.shift), "The smallest change that matters for this characteristic.", r.shift)
    if r.spread is not None:
        if r.paired:
            yield _number("spread", "Spread of the differences (standard deviation)", f.setting(r.spread),
                          "How much the change from the first to the second reading scatters from part to part.",
                          r.spread)
        else:
            yield _number("spread", "Spread (standard deviation)", f.setting(r.spread),
                          "The usual scatter of single readings.", r.spread)
    if r.groups >= 3:
        yield _number("prob_b_greater", "Share of pairs to detect, the two groups furthest apart",
                      format_percent(r.prob_b_greater),
                      "Between the two groups furthest apart: the share of pairs in which a part of the higher "
                      "group reads higher that the plan is built to detect.", r.prob_b_greater)
    elif r.paired:
        yield _number("prob_b_greater", "Chance of a rise to detect", format_percent(r.prob_b_greater),
                      "The chance that the changes of two parts, added together, come out above zero, "
                      "that the plan is built to detect.", r.prob_b_greater)
    else:
        yield _number("prob_b_greater", "Share of pairs to detect", format_percent(r.prob_b_greater),
                      "The share of pairs in which a part of the second group reads higher that the plan "
                      "is built to detect.", r.prob_b_greater)
    if r.simulated_power is not None:
        yield _number("simulated_power", "Simulated chance of detecting", format_percent(r.simulated_power),
                      "The chance found by simulating the exact test at the planned sizes.", r.simulated_power)


_LISTERS = {TwoGroupResult: _two_groups, PairedResult: _paired, SeveralGroupsResult: _several, PlanResult: _plan,
            CharacteristicsResult: characteristics_key_numbers}
"""The key numbers of each kind of result."""
