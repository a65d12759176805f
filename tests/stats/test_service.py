"""The window's front door: run(analysis) answers the two-group question like compare_two."""

import numpy as np
import pytest

from rankwise.stats import Analysis, GroupReadings, Question, Settings, TwoGroupResult, compare_two, run


def _analysis(*groups, **settings):
    return Analysis(question=Question.TWO_GROUPS, groups=tuple(groups), settings=Settings(**settings))


WHEEL_A = GroupReadings(name="Wheel A", values=(0.42, 0.40, float("nan"), 0.45, 0.41, 0.42), unit="µm")
WHEEL_B = GroupReadings(name="Wheel B", values=(0.47, 0.44, 0.49, 0.45, 0.46), unit="µm")


def test_two_groups_are_answered_by_compare_two_with_the_settings():
    result = run(_analysis(WHEEL_A, WHEEL_B, alpha=0.10, alternative="b-greater", confidence=0.90, margin=0.05))
    expected = compare_two(
        np.array(WHEEL_A.values), np.array(WHEEL_B.values), alternative="b-greater", alpha=0.10,
        confidence=0.90, margin=0.05, name_a="Wheel A", name_b="Wheel B",
    )
    assert isinstance(result, TwoGroupResult)
    assert result == expected
    assert (result.name_a, result.name_b, result.n_dropped_a) == ("Wheel A", "Wheel B", 1)


def test_the_method_setting_is_passed_on():
    assert run(_analysis(WHEEL_A, WHEEL_B, method="normal")).method == "normal"
    assert run(_analysis(WHEEL_A, WHEEL_B)).method == "exact"


def test_a_wrong_number_of_groups_is_refused():
    with pytest.raises(ValueError, match="exactly two groups"):
        run(_analysis(WHEEL_A))


def test_an_unknown_question_is_refused():
    with pytest.raises(ValueError, match="No statistics"):
        run(Analysis(question="guess", groups=(WHEEL_A, WHEEL_B)))


def test_bad_settings_come_back_as_plain_words():
    with pytest.raises(ValueError, match="alternative"):
        run(_analysis(WHEEL_A, WHEEL_B, alternative="up"))


def test_the_result_keeps_the_analysis_readings_without_a_copy_unless_blanks_were_dropped():
    """With 10^6 readings each copy is 8 MB; a copy is still made where the result must not share."""
    analysis = Analysis(Question.TWO_GROUPS, (GroupReadings("A", (1.0, 2.0, 3.0)),
                                              GroupReadings("B", (2.5, float("nan"), 4.0, 5.0))), Settings())
    result = run(analysis)
    assert np.shares_memory(np.asarray(result.values_a), np.asarray(analysis.groups[0].values))
    assert result.values_b == (2.5, 4.0, 5.0) and result.n_dropped_b == 1


def test_a_caller_s_own_array_is_copied_so_changing_it_later_changes_no_result():
    readings_a, readings_b = np.array([1.0, 2.0, 3.0]), np.array([2.5, 4.0, 5.0])
    result = compare_two(readings_a, readings_b)
    readings_a[0] = 99.0
    assert result.values_a == (1.0, 2.0, 3.0)
