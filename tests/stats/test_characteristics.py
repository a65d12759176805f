"""Many characteristics compared at once: each row is compare_two on that column; adjusted p checked
against statsmodels.stats.multitest.multipletests (holm, fdr_bh) and against the published
definitions (Holm 1979; Benjamini & Hochberg 1995) written out here step by step."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from statsmodels.stats.multitest import multipletests

from rankwise import stats
from rankwise.stats import (
    Analysis,
    Cancelled,
    Characteristic,
    GroupReadings,
    Monitor,
    Question,
    Settings,
    adjust_p_values,
    compare_characteristics,
    compare_two,
)

# Benjamini & Hochberg (1995), JRSS B 57, p. 296, section 4.1: the 15 p-values of the
# myocardial-infarction trial (from memory of the paper's example).
BH_PAPER_P = [0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459,
              0.3240, 0.4262, 0.5719, 0.6528, 0.7590, 1.0000]


def holm_by_definition(p):
    """Holm (1979), Scand. J. Statist. 6, 65-70 (definition in checks.md): the i-th smallest
    becomes max over j <= i of min(1, (m - j + 1) p_(j)), written out with loops."""
    m = len(p)
    order = sorted(range(m), key=lambda i: p[i])
    adjusted = [0.0] * m
    for rank, index in enumerate(order, start=1):
        adjusted[index] = max(min(1.0, (m - j + 1) * p[order[j - 1]]) for j in range(1, rank + 1))
    return adjusted


def bh_by_definition(p):
    """Benjamini & Hochberg (1995), JRSS B 57, 289-300 (definition in checks.md): the i-th smallest
    becomes min over j >= i of min(1, m p_(j) / j), written out with loops."""
    m = len(p)
    order = sorted(range(m), key=lambda i: p[i])
    adjusted = [0.0] * m
    for rank, index in enumerate(order, start=1):
        adjusted[index] = min(min(1.0, m * p[order[j - 1]] / j) for j in range(rank, m + 1))
    return adjusted


def gauge_columns(count=6, n=12, moved=(1, 4), seed=7):
    """Columns built here for the test (not real readings): rounded normal draws, some moved."""
    rng = np.random.default_rng(seed)
    columns = []
    for index in range(count):
        shift = 0.8 if index in moved else 0.0
        a = np.round(rng.normal(10.0, 0.5, n), 1)
        b = np.round(rng.normal(10.0 + shift, 0.5, n), 1)
        columns.append((f"dimension {index + 1}", a, b))
    return columns


def test_bh_on_the_papers_example_rejects_four_and_holm_three():
    """Benjamini & Hochberg (1995), section 4.1 (from memory): at 0.05 the step-up procedure rejects
    the four smallest p-values, a Bonferroni-type procedure three; here checked with the definitions."""
    bh = adjust_p_values(BH_PAPER_P, "fdr")
    holm = adjust_p_values(BH_PAPER_P, "holm")
    assert bh == pytest.approx(bh_by_definition(BH_PAPER_P), abs=1e-15)
    assert holm == pytest.approx(holm_by_definition(BH_PAPER_P), abs=1e-15)
    assert int((bh <= 0.05).sum()) == 4
    assert int((holm <= 0.05).sum()) == 3


@given(st.lists(st.floats(0.0, 1.0), min_size=1, max_size=30))
def test_adjustments_match_the_published_definitions(p):
    assert adjust_p_values(p, "holm") == pytest.approx(holm_by_definition(p), abs=1e-12)
    assert adjust_p_values(p, "fdr") == pytest.approx(bh_by_definition(p), abs=1e-12)
    assert list(adjust_p_values(p, "none")) == p


@settings(max_examples=25)
@given(st.lists(st.floats(0.0, 1.0), min_size=1, max_size=30))
def test_adjustments_match_statsmodels(p):
    """statsmodels.stats.multitest.multipletests(p, alpha=0.05, method="holm" / "fdr_bh")[1].

    Fewer examples than the test against the published definitions above: each multipletests call
    takes about 40 ms, and the definitions are checked on the full default number of examples."""
    assert adjust_p_values(p, "holm") == pytest.approx(multipletests(p, alpha=0.05, method="holm")[1], abs=1e-12)
    assert adjust_p_values(p, "fdr") == pytest.approx(multipletests(p, alpha=0.05, method="fdr_bh")[1], abs=1e-12)


@given(st.lists(st.floats(0.0, 1.0), min_size=1, max_size=30))
def test_fdr_never_exceeds_holm_and_neither_goes_below_raw(p):
    """m / i <= m - i + 1 for 1 <= i <= m, so Benjamini-Hochberg never exceeds Holm (common practice, no source)."""
    holm, fdr = adjust_p_values(p, "holm"), adjust_p_values(p, "fdr")
    assert np.all(fdr <= holm + 1e-15)
    assert np.all(fdr >= np.asarray(p) - 1e-15)


@pytest.mark.parametrize("adjust", ["holm", "fdr", "none"])
def test_each_row_is_compare_two_on_that_column_in_input_order(adjust):
    columns = gauge_columns()
    result = compare_characteristics(columns, adjust=adjust, name_a="old die", name_b="new die")
    assert [row.name for row in result.rows] == [name for name, _, _ in columns]
    for (name, a, b), row in zip(columns, result.rows):
        assert row.result == compare_two(a, b, name_a="old die", name_b="new die")
    raw = [row.result.p_value for row in result.rows]
    expected = {"holm": holm_by_definition, "fdr": bh_by_definition, "none": list}[adjust](raw)
    if adjust != "none":  # statsmodels multipletests(raw, method="holm" / "fdr_bh")[1]
        reference = multipletests(raw, alpha=0.05, method={"holm": "holm", "fdr": "fdr_bh"}[adjust])[1]
        assert [row.p_adjusted for row in result.rows] == pytest.approx(list(reference), abs=1e-12)
    assert [row.p_adjusted for row in result.rows] == pytest.approx(expected, abs=1e-15)
    assert [row.significant for row in result.rows] == [p <= 0.05 for p in expected]
    assert result.adjust == adjust and result.adjust_method
    assert result.n_significant == sum(p <= 0.05 for p in expected)


def test_the_moved_columns_are_found_and_the_others_not():
    """Columns 2 and 5 are built moved by 1.6 spreads; the others not (how the columns were built)."""
    result = compare_characteristics(gauge_columns(n=20))
    assert [row.name for row in result.rows if row.significant] == ["dimension 2", "dimension 5"]
    assert result.row("dimension 2").result.shift > 0


def test_missing_readings_are_counted_per_characteristic_never_zero():
    a = [1.0, 2.0, np.nan, 3.0, 4.0]
    b = [2.0, np.nan, np.nan, 5.0, 6.0]
    result = compare_characteristics([("bore", a, b), ("depth", [1.0, 2.0, 3.0], [4.0, 5.0, 6.0])])
    bore = result.row("bore").result
    assert (bore.n_a, bore.n_dropped_a, bore.n_b, bore.n_dropped_b) == (4, 1, 3, 2)
    assert 0.0 not in bore.values_a and 0.0 not in bore.values_b
    assert result.row("depth").result.n_dropped_a == 0


def test_margins_by_name_or_in_order():
    columns = gauge_columns(count=3, n=15)
    by_name = compare_characteristics(columns, margins={"dimension 1": 2.0})
    in_order = compare_characteristics(columns, margins=[2.0, None, None])
    assert by_name == in_order
    assert by_name.rows[0].result.equivalent is True  # spread 0.5, no shift built in: well inside +/- 2
    assert by_name.rows[1].result.margin is None
    with pytest.raises(ValueError, match="bore"):
        compare_characteristics(columns, margins={"bore": 1.0})


def test_no_adjustment_is_stated_with_a_warning():
    result = compare_characteristics(gauge_columns(), adjust="none")
    assert result.adjust_method == "none"
    assert any("not adjusted" in warning for warning in result.warnings)
    assert compare_characteristics(gauge_columns()).warnings == ()


@pytest.mark.parametrize("columns, message", [
    ([], "at least one"),
    ([("bore", [1, 2], [3, 4]), ("bore", [1, 2], [3, 4])], "more than once"),
    ([("bore", [1, 2], [3, 4]), ("depth", [np.nan], [3, 4])], "depth"),
])
def test_refusals_say_why(columns, message):
    with pytest.raises(ValueError, match=message):
        compare_characteristics(columns)


def test_of_several_refusals_the_first_in_the_given_order_is_named():
    """The refusal reported is the first in the order given, naming its characteristic."""
    columns = gauge_columns(count=5)
    columns[2] = ("depth", [np.nan], [3.0, 4.0])
    columns[4] = ("flatness", [1.0, 2.0], [])
    with pytest.raises(ValueError, match="^depth: "):
        compare_characteristics(columns)


def test_unknown_adjustment_is_refused():
    with pytest.raises(ValueError, match="adjust"):
        compare_characteristics(gauge_columns(), adjust="bonferroni")


def test_progress_rises_to_one_and_stop_is_obeyed():
    seen = []
    compare_characteristics(gauge_columns(), monitor=Monitor(progress=seen.append))
    assert seen == sorted(seen) and seen[-1] == 1.0 and len(seen) >= 6
    calls = []

    def stop_after_three():
        calls.append(1)
        return len(calls) > 3

    with pytest.raises(Cancelled):
        compare_characteristics(gauge_columns(), monitor=Monitor(cancelled=stop_after_three))


def test_run_answers_the_characteristics_question():
    columns = gauge_columns(count=4)
    analysis = Analysis(
        question=Question.CHARACTERISTICS,
        groups=(GroupReadings("old die", ()), GroupReadings("new die", ())),
        settings=Settings(adjust="fdr", alpha=0.1),
        characteristics=tuple(
            Characteristic(name, GroupReadings("old die", tuple(a), unit="mm"), GroupReadings("new die", tuple(b), unit="mm"),
                           margin=1.0 if index == 0 else None)
            for index, (name, a, b) in enumerate(columns)
        ),
    )
    expected = compare_characteristics(columns, adjust="fdr", alpha=0.1, margins=[1.0, None, None, None],
                                       name_a="old die", name_b="new die")
    assert stats.run(analysis) == expected
    assert math.isclose(expected.alpha, 0.1)
