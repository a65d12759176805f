"""Many characteristics in plain words: outcome, share of tolerance, the beyond-a-limit mark, headline."""

import pytest

from rankwise.stats import Analysis, Characteristic, GroupReadings, Question, Settings, run
from rankwise.wording import CAUTION_SHORT, describe
from rankwise.wording.characteristics import (
    BEYOND_LIMIT_MARK,
    MOVED_UP,
    NO_CHANGE,
    SAME_WITHIN,
    beyond_limit,
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
