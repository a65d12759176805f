"""Many characteristics in plain words: outcome, share of tolerance, the beyond-a-limit mark, headline."""

import pytest
import scipy.stats
from statsmodels.stats.multitest import multipletests

from rankwise.stats import Analysis, Characteristic, GroupReadings, Question, Settings, run
from rankwise.wording import CAUTION_SHORT, describe
from rankwise.wording.characteristics import (
    BEYOND_LIMIT_MARK,
    MOVED_UP,
    MOVED_UP_WITHIN,
    NO_CHANGE,
    NOT_AFTER_ADJUSTMENT,
    SAME_WITHIN,
    beyond_limit,
    characteristics_key_numbers,
    summary_lines,
    tolerance_share,
)

A = (9.90, 10.00, 10.10, 10.00, 9.95, 10.05)


def analysis_of(pairs, adjust="holm"):
    return Analysis(
        question=Question.CHARACTERISTICS,
        groups=(GroupReadings("old", ()), GroupReadings("new", ())),
        settings=Settings(adjust=adjust),
        characteristics=tuple(
            Characteristic(name, GroupReadings("old", a, "mm", lsl=9.8, usl=10.2, decimals=2),
                           GroupReadings("new", b, "mm", lsl=9.8, usl=10.2, decimals=2), margin=margin)
            for name, a, b, margin in pairs
        ),
    )


def test_a_separated_shift_moved_up_with_its_share_of_tolerance_and_the_limit_mark():
    moved = tuple(round(v + 0.3, 2) for v in A)
    analysis = analysis_of([("bore", A, moved, None)])
    result = run(analysis)
    row, item = result.rows[0], analysis.characteristics[0]
    # B is A moved by 0.3, so the median of all differences is 0.3 (Hodges-Lehmann, by construction);
    # the groups do not overlap: exact two-sided p = 2 / C(12, 6) = 0.00216 (brute-force count of splits)
    assert row.result.shift == pytest.approx(0.3)
    assert row.result.p_value == pytest.approx(2 / 924)
    assert tolerance_share(row, item) == pytest.approx(0.3 / 0.4)
    assert beyond_limit(row, item)  # median 10.00 + at least 0.3 passes USL 10.2
    line = summary_lines(result, analysis)[0]
    assert line.outcome == MOVED_UP and line.texts[-1] == BEYOND_LIMIT_MARK and line.texts[8] == "75.0 %"


def test_no_change_and_same_within_the_margin():
    same = (9.95, 10.05, 10.00, 10.10, 9.90, 10.00)
    analysis = analysis_of([("depth", A, same, None), ("pitch", A, same, 0.5)])
    result = run(analysis)
    lines = summary_lines(result, analysis)
    assert [line.outcome for line in lines] == [NO_CHANGE, SAME_WITHIN]
    assert not any(line.beyond_limit for line in lines)
    verdict = describe(result, analysis)
    assert verdict.headline.startswith("No characteristic of the 2 was shown to move")
    assert verdict.caution == CAUTION_SHORT
    assert any("pitch" in sentence for sentence in verdict.sentences)


def test_no_adjustment_is_said_in_the_verdict():
    analysis = analysis_of([("depth", A, A, None), ("pitch", A, A, None)], adjust="none")
    verdict = describe(run(analysis), analysis)
    assert "not adjusted" in verdict.sentences[0]
    one = analysis_of([("depth", A, A, None)])
    assert describe(run(one), one).headline == "The characteristic depth was not shown to move from old to new at the 5 % level."


def test_significant_only_on_its_own_is_said_so_beside_an_interval_that_leaves_out_no_change():
    """A characteristic at p = 0.041 alone (scipy.stats.mannwhitneyu exact, no ties) among three compared:
    Holm's adjusted p (statsmodels multipletests) is above 5 %, while its 95 % interval leaves out zero.
    The summary must not put "no change shown" beside that interval without saying why."""
    moved = tuple(round(v + 0.3, 2) for v in A)
    depth_a = (9.91, 9.96, 10.01, 10.04, 10.08, 9.98)
    depth_b = (10.05, 10.09, 10.03, 10.11, 10.02, 10.12)
    analysis = analysis_of([("bore", A, moved, None), ("depth", depth_a, depth_b, None), ("pitch", A, A, None)])
    result = run(analysis)
    depth = result.rows[1]
    assert depth.result.p_value == pytest.approx(scipy.stats.mannwhitneyu(depth_b, depth_a, method="exact").pvalue, abs=1e-12)
    assert depth.result.p_value <= 0.05 and depth.result.shift_ci.low > 0.0
    holm = multipletests([row.result.p_value for row in result.rows], alpha=0.05, method="holm")[1]
    assert depth.p_adjusted == pytest.approx(holm[1], abs=1e-12) and depth.p_adjusted > 0.05
    lines = summary_lines(result, analysis)
    assert [line.outcome for line in lines] == [MOVED_UP, NOT_AFTER_ADJUSTMENT, NO_CHANGE]
    verdict = describe(result, analysis)
    assert verdict.headline.startswith("1 of 3 characteristics was shown to move")
    assert "Taken alone, depth would count as moved" in " ".join(verdict.sentences)
    assert any("95 % confidence interval of that characteristic's shift on its own" in s for s in verdict.sentences)
    alone = analysis_of([("depth", depth_a, depth_b, None)], adjust="none")
    alone_result = run(alone)
    assert [line.outcome for line in summary_lines(alone_result, alone)] == [MOVED_UP]
    assert describe(alone_result, alone).headline == "The characteristic depth was shown to move from old to new."
    assert "Taken alone" not in " ".join(describe(alone_result, alone).sentences)


def test_a_move_inside_its_margin_counts_as_moved_and_says_it_stays_inside():
    """B is A moved by 0.3 (p = 2 / C(12, 6), brute-force count of splits) with a margin of 1.0: the move is
    shown and so is that it stays inside the margin. It counts among the moved, as "Shown to move" says."""
    moved = tuple(round(v + 0.3, 2) for v in A)
    analysis = analysis_of([("bore", A, moved, 1.0), ("pitch", A, A, None)])
    result = run(analysis)
    bore = result.rows[0]
    assert bore.significant and bore.result.equivalent
    assert [line.outcome for line in summary_lines(result, analysis)] == [MOVED_UP_WITHIN, NO_CHANGE]
    verdict = describe(result, analysis)
    assert verdict.headline == "1 of 2 characteristics was shown to move from old to new: bore."
    assert "Shown to move, but by less than its margin (two one-sided tests, each at the 5 % level): bore." in verdict.sentences
    numbers = {number.key: number.value for number in characteristics_key_numbers(result, analysis)}
    assert numbers["moved"] == 1
