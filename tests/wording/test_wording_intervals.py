"""How confidence sets read: open ends, one-sided bounds, heavy ties, and an approximate interval
that disagrees with the test. The results come from the real compare_two / compare_paired."""

import math

from rankwise.stats.analysis import Analysis, GroupReadings, Question, Settings
from rankwise.stats.paired import compare_paired
from rankwise.stats.results import ConfidenceInterval
from rankwise.stats.two_groups import compare_two
from rankwise.wording import describe, key_numbers
from rankwise.wording.phrases import interval_disagreement, interval_phrase

# The tied example whose two-sided exact p is 6/126 = 0.0476 (enumeration of all C(9, 5) splits,
# in tests/stats/test_confidence_sets.py): the test rejects the shift 0 and accepts (0, 0.4].
A = (1.0, 1.1, 1.1, 1.2, 1.2)
B = (1.2, 1.3, 1.4, 1.5)


def worded(a, b, decimals, unit, **settings):
    result = compare_two(a, b, name_a="A", name_b="B", **settings)
    groups = (GroupReadings("A", tuple(a), unit=unit, decimals=decimals),
              GroupReadings("B", tuple(b), unit=unit, decimals=decimals))
    keep = {k: v for k, v in settings.items() if k in ("alpha", "alternative", "margin")}
    analysis = Analysis(Question.TWO_GROUPS, groups, Settings(**keep))
    return result, analysis, describe(result, analysis)


def test_an_open_end_reads_from_just_above():
    result, analysis, verdict = worded(A, B, 3, "mm")
    assert verdict.sentences[0] == ("The shift, B minus A, is +0.200 mm "
                                    "(95 % confidence interval from just above 0.000 to 0.400 mm).")
    numbers = {n.key: n for n in key_numbers(result, analysis)}
    assert numbers["shift_ci_low"].label.endswith("(not included)")
    assert "not included" in numbers["shift_ci_low"].tooltip
    assert not numbers["shift_ci_high"].label.endswith("(not included)")
    closed_high_open = ConfidenceInterval(0.02, 0.1, 0.95, "m", high_included=False)
    assert interval_phrase(closed_high_open, 2, "µm") == "95 % confidence interval from 0.02 to just below 0.10 µm"


def test_one_sided_questions_read_at_least_or_at_most_and_show_one_bound():
    higher, analysis, verdict = worded(A, B, 3, "mm", alternative="b-greater")
    assert verdict.sentences[0] == "The shift, B minus A, is +0.200 mm (at least 0.100 mm with 95 % confidence)."
    numbers = {n.key: n for n in key_numbers(higher, analysis)}
    assert numbers["shift_ci_low"].label == "Shift, 95 % lower bound" and numbers["shift_ci_low"].value == 0.1
    assert "shift_ci_high" not in numbers
    assert all("inf" not in n.text and (n.value is None or math.isfinite(n.value)) for n in numbers.values())
    lower, analysis, _ = worded(A, B, 3, "mm", alternative="b-less")
    assert interval_phrase(lower.shift_ci, 3, "mm") == "at most 0.400 mm with 95 % confidence"
    numbers = {n.key: n for n in key_numbers(lower, analysis)}
    assert numbers["shift_ci_high"].label == "Shift, 95 % upper bound" and "shift_ci_low" not in numbers
    open_bound = ConfidenceInterval(0.5, math.inf, 0.95, "m", low_included=False, high_included=False)
    assert interval_phrase(open_bound, 1, "") == "above 0.5 with 95 % confidence"


def test_heavy_ties_explain_a_zero_shift_and_point_to_the_share_of_pairs():
    """320 + 320 readings on a two-step gauge: 300 of A and 260 of B read 0.00, the rest 0.01. The
    median difference is 0 and the order-statistic interval 0 to 0, yet B reads higher
    (pairs counted by hand: (60*300 + 0.5*(260*300 + 60*20)) / 320^2 = 56 %)."""
    a = (0.0,) * 300 + (0.01,) * 20
    b = (0.0,) * 260 + (0.01,) * 60
    result, _, verdict = worded(a, b, 2, "mm")
    assert result.significant and result.shift == 0.0
    text = " ".join(verdict.sentences)
    assert "read exactly the same on the gauge, so the shift and its interval come out as 0" in text
    assert "the share of pairs where B reads higher: 56 %" in text
    assert "approximation here" not in text  # the heavy-ties sentence already says why


def test_heavy_ties_on_the_same_parts_say_how_many_rose_and_fell():
    """100 parts, 80 read the same both times, 18 rose by one step and 2 fell: the pseudo-median
    and its interval are 0 (most Walsh averages are 0; counted by hand), the verdict says why."""
    before = (1.0,) * 100
    after = (1.0,) * 80 + (1.1,) * 18 + (0.9,) * 2
    result = compare_paired(before, after, name_a="before", name_b="after")
    groups = (GroupReadings("before", before, decimals=1), GroupReadings("after", after, decimals=1))
    verdict = describe(result, Analysis(Question.PAIRED, groups, Settings()))
    assert result.significant and result.shift == 0.0
    assert (result.shift_ci.low, result.shift_ci.high) == (0.0, 0.0)
    text = " ".join(verdict.sentences)
    assert "80 of 100 parts read exactly the same both times" in text and "18 read higher and 2 lower" in text


def test_an_approximate_interval_that_disagrees_with_the_test_is_said_in_plain_words():
    closed = ConfidenceInterval(0.0, 0.4, 0.95, "approximate")
    assert "still reaches 0 although the test found a change" in interval_disagreement(closed, True, 0.05, "shift")
    away = ConfidenceInterval(0.1, 0.4, 0.95, "approximate")
    assert "leaves out 0 although the test found no change" in interval_disagreement(away, False, 0.05, "shift")
    assert interval_disagreement(away, True, 0.05, "shift") is None
    assert interval_disagreement(closed, True, 0.10, "shift") is None  # another level: no comparison
    opened = ConfidenceInterval(0.0, 0.4, 0.95, "inversion", low_included=False)
    assert interval_disagreement(opened, True, 0.05, "shift") is None
