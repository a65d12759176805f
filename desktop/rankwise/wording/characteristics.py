"""Many characteristics in plain words: the outcome per characteristic, the summary's columns and headline.

Written once for the window's summary table, the workbook's summary sheet and the one-page printout.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from rankwise.stats.analysis import Analysis, Characteristic
from rankwise.stats.results import CharacteristicRow, CharacteristicsResult
from rankwise.wording.numbers import MISSING, format_centre, format_level, format_p, format_percent
from rankwise.wording.phrases import level_phrase
from rankwise.wording.verdict_types import KeyNumber, Verdict, cautioned_verdict

CHARACTERISTICS_FOUND = ("One row per part, a column naming the process and a column per characteristic: "
                         "the processes can be compared on every characteristic at once.")
"""What the open dialog says when a file fits the many-characteristics question."""

MOVED_UP, MOVED_DOWN = "moved up", "moved down"
MOVED_UP_WITHIN, MOVED_DOWN_WITHIN = "moved up, within the margin", "moved down, within the margin"
NO_CHANGE, SAME_WITHIN = "no change shown", "same within the margin"
NOT_AFTER_ADJUSTMENT = "not shown overall"
"""The plain-words outcomes of one characteristic. "Within the margin": the move is shown, and so is
that it stays inside the margin (two one-sided tests). "Not shown overall": it would
count as moved on its own (p at or below the level, its interval leaving out no change) but not once
the p-values are adjusted for the number compared."""
MOVED = (MOVED_UP, MOVED_DOWN, MOVED_UP_WITHIN, MOVED_DOWN_WITHIN)
"""The outcomes that count as shown to move (by the adjusted p)."""

BEYOND_LIMIT_MARK = "▲ beyond a limit"
"""Beside a characteristic whose B centre, by the shift's interval, may lie beyond LSL or USL:
a symbol and words, never colour alone."""
BEYOND_LIMIT_SHORT = "▲ beyond"
"""The same mark where room is short (the one-page summary), explained in the verdict's sentences."""
SHORT_OUTCOMES = {SAME_WITHIN: "same within margin", MOVED_UP_WITHIN: "up, in margin",
                  MOVED_DOWN_WITHIN: "down, in margin"}
"""Outcomes in fewer words where room is short (the one-page summary)."""

ADJUST_WORDS = {
    "holm": "by Holm (1979): the chance of any false alarm among all of them stays within the {level} level",
    "fdr": "by Benjamini-Hochberg (1995): the expected share of false alarms among the characteristics shown "
           "to move stays within the {level} level",
    "none": "not adjusted: each is judged at the {level} level as if it were the only one",
}
"""What each adjustment for the number of characteristics does, in plain words."""

COLUMNS = ("Characteristic", "Unit", "Used A", "Used B", "Median A", "Median B", "Shift B - A",
           "Interval", "Shift / tolerance", "p", "Adjusted p", "Outcome", "Limit")
"""The summary's columns, in order."""


@dataclass(frozen=True)
class SummaryLine:
    """One characteristic's line of the summary, as texts in ``COLUMNS`` order, and how to sort it."""

    texts: tuple[str, ...]
    outcome: str
    beyond_limit: bool
    tolerance_share: float | None

    @property
    def sort_key(self) -> float:
        """How far it moved relative to its tolerance (largest first); those without limits last."""
        return -abs(self.tolerance_share) if self.tolerance_share is not None else math.inf


def outcome(row: CharacteristicRow) -> str:
    """"moved up" or "moved down" (by the adjusted p), either with ", within the margin" when the
    shift is also shown to stay inside its margin; "same within the margin"; "not shown overall"
    (significant only on its own); or "no change shown"."""
    result = row.result
    if row.significant:
        upward = result.shift > 0 if result.shift else result.prob_b_greater > 0.5
        if result.equivalent:
            return MOVED_UP_WITHIN if upward else MOVED_DOWN_WITHIN
        return MOVED_UP if upward else MOVED_DOWN
    if result.equivalent:
        return SAME_WITHIN
    return NOT_AFTER_ADJUSTMENT if result.significant else NO_CHANGE


def tolerance_share(row: CharacteristicRow, item: Characteristic) -> float | None:
    """The shift B - A as a share of the tolerance width USL - LSL, or None without both limits."""
    lsl, usl, shift = item.a.lsl, item.a.usl, row.result.shift
    if lsl is None or usl is None or shift is None or not usl > lsl:
        return None
    return shift / (usl - lsl)


def beyond_limit(row: CharacteristicRow, item: Characteristic) -> bool:
    """True when A's median moved by any shift in the interval would lie beyond LSL or USL."""
    interval = row.result.shift_ci
    if interval is None:
        return False
    centre = row.result.median_a
    return ((item.a.usl is not None and centre + interval.high > item.a.usl)
            or (item.a.lsl is not None and centre + interval.low < item.a.lsl))


def summary_lines(result: CharacteristicsResult, analysis: Analysis) -> tuple[SummaryLine, ...]:
    """One line per characteristic, in the order compared."""
    items = {item.name: item for item in analysis.characteristics}
    mark = analysis.decimal_mark
    lines = []
    for row in result.rows:
        item = items[row.name]
        r = row.result
        decimals = item.a.decimals if item.a.decimals is not None else item.b.decimals
        share = tolerance_share(row, item)
        interval = (MISSING if r.shift_ci is None else
                    f"{_centre(r.shift_ci.low, decimals, mark)} to {_centre(r.shift_ci.high, decimals, mark)}")
        beyond = beyond_limit(row, item)
        said = outcome(row)
        lines.append(SummaryLine(
            texts=(row.name, item.a.unit, str(r.n_a), str(r.n_b), _centre(r.median_a, decimals, mark),
                   _centre(r.median_b, decimals, mark), _centre(r.shift, decimals, mark), interval,
                   format_percent(share, 1, mark), format_p(r.p_value, None, mark),
                   format_p(row.p_adjusted, result.alpha, mark), said, BEYOND_LIMIT_MARK if beyond else ""),
            outcome=said, beyond_limit=beyond, tolerance_share=share,
        ))
    return tuple(lines)


def _centre(value: float | None, decimals: int | None, mark: str) -> str:
    text = format_centre(value, decimals)
    return text.replace(".", mark) if mark != "." else text


def headline(result: CharacteristicsResult, analysis: Analysis) -> str:
    """One sentence: how many characteristics moved, and which."""
    lines = summary_lines(result, analysis)
    moved = [row.name for row, line in zip(result.rows, lines) if line.outcome in MOVED]
    total = len(result.rows)
    if not moved:
        which = f"The characteristic {result.rows[0].name} was not" if total == 1 else f"No characteristic of the {total} was"
        return f"{which} shown to move from {result.name_a} to {result.name_b} at the {format_level(result.alpha)} level."
    listed = ", ".join(moved[:8]) + (f" and {len(moved) - 8} more" if len(moved) > 8 else "")
    verb = "was" if len(moved) == 1 else "were"
    if total == 1:
        return f"The characteristic {listed} was shown to move from {result.name_a} to {result.name_b}."
    return f"{len(moved)} of {total} characteristics {verb} shown to move from {result.name_a} to {result.name_b}: {listed}."


def adjustment_sentence(result: CharacteristicsResult) -> str:
    """Which adjustment for the number of characteristics was used, and what it does."""
    words = ADJUST_WORDS[result.adjust].format(level=format_level(result.alpha))
    if result.adjust == "none":
        return f"p-values of the {len(result.rows)} characteristics compared {words}."
    return f"p-values adjusted for the {len(result.rows)} characteristics compared {words}."


def interval_sentence(result: CharacteristicsResult) -> str:
    """What the intervals (one-sided questions: bounds) are: each characteristic's own, at the comparison's confidence."""
    kind = "interval" if result.alternative == "two-sided" else "bound"
    return (f"Each {kind} is the {format_level(result.confidence)} confidence {kind} of that characteristic's "
            "shift on its own, not adjusted for the number compared.")


def alone_sentence(lines: tuple[SummaryLine, ...], names: list[str], result: CharacteristicsResult) -> str:
    """Which characteristics would count as moved on their own but not after the adjustment, or ""."""
    alone = [name for name, line in zip(names, lines) if line.outcome == NOT_AFTER_ADJUSTMENT]
    if not alone:
        return ""
    they = "it is" if len(alone) == 1 else "they are"
    return (f"Taken alone, {', '.join(alone)} would count as moved (p at or below {format_level(result.alpha)}, "
            f"{'the interval' if result.alternative == 'two-sided' else 'the bound'} leaves out no change); among the {len(result.rows)} characteristics compared this "
            f"may be chance, so overall {they} not shown to move.")


def limit_sentence(lines: tuple[SummaryLine, ...], names: list[str]) -> str:
    """Which characteristics are marked because their B centre may lie beyond a limit, or ""."""
    marked = [name for name, line in zip(names, lines) if line.beyond_limit]
    if not marked:
        return ""
    return (f"{BEYOND_LIMIT_MARK}: by the shift's interval, the centre of the changed process may lie beyond "
            f"a limit for {', '.join(marked)}.")


def describe_characteristics(result: CharacteristicsResult, analysis: Analysis) -> Verdict:
    """The verdict on the whole comparison: how many moved, the adjustment, the limit marks, the cautions."""
    lines = summary_lines(result, analysis)
    names = [row.name for row in result.rows]
    same = [name for name, line in zip(names, lines) if line.outcome == SAME_WITHIN]
    sentences = [adjustment_sentence(result), interval_sentence(result)]
    alone = alone_sentence(lines, names, result)
    if alone:
        sentences.append(alone)
    if same:
        sentences.append(f"Shown to be the same within their margins: {', '.join(same)}.")
    within = [name for name, line in zip(names, lines) if line.outcome in (MOVED_UP_WITHIN, MOVED_DOWN_WITHIN)]
    if within:
        sentences.append(f"Shown to move, but by less than {'its margin' if len(within) == 1 else 'their margins'} "
                         f"(two one-sided tests, each at {level_phrase(result.alpha)}): {', '.join(within)}.")
    marks = limit_sentence(lines, names)
    if marks:
        sentences.append(marks)
    method = ("Each characteristic: Mann-Whitney U / Wilcoxon rank-sum test of B against A (exact p given the "
              "ties where affordable), Hodges-Lehmann shift with its interval, same-shape check.")
    notes = list(result.warnings) + list(analysis.notes)
    differ = [row.name for row in result.rows if row.result.shape is not None and row.result.shape.differ]
    if differ:
        notes.append(f"Spreads or shapes differ for {', '.join(differ)}: there the result says whether B tends to "
                     "read higher or lower, not that its median moved.")
    return cautioned_verdict(headline(result, analysis), sentences, method, tuple(notes))


def characteristics_key_numbers(result: CharacteristicsResult, analysis: Analysis) -> tuple[KeyNumber, ...]:
    """The comparison's few overall numbers; each characteristic's numbers are in the summary table."""
    lines = summary_lines(result, analysis)
    moved = sum(line.outcome in MOVED for line in lines)
    marked = sum(line.beyond_limit for line in lines)
    return (
        KeyNumber("characteristics", "Characteristics compared", str(len(result.rows)),
                  "How many characteristics were compared between the two processes.", len(result.rows)),
        KeyNumber("moved", "Shown to move", str(moved),
                  "Characteristics whose adjusted p-value is at or below the level.", moved),
        KeyNumber("beyond_limit", "May lie beyond a limit", str(marked),
                  "Characteristics whose changed centre, by the shift's interval, may lie beyond LSL or USL.", marked),
        KeyNumber("adjust", "Adjustment", ADJUST_NAMES[result.adjust],
                  "How the p-values were adjusted for the number of characteristics compared.", None),
        KeyNumber("alpha", "Level", format_level(result.alpha),
                  "The level an adjusted p-value must reach for a characteristic to count as moved.", result.alpha),
    )


ADJUST_NAMES = {"holm": "Holm (1979)", "fdr": "Benjamini-Hochberg (1995)", "none": "none"}
"""The adjustment's short name."""
