"""Two-group verdicts of results from the real compare_two, on published worked examples."""

from rankwise.stats.analysis import Analysis, GroupReadings, Question, Settings
from rankwise.stats.two_groups import compare_two
from rankwise.wording import CAUTION_SHORT, describe, describe_question, key_numbers

# Hollander & Wolfe (1999), Nonparametric Statistical Methods, 2nd ed., Example 4.1 (p. 110).
TERM = (0.80, 0.83, 1.89, 1.04, 1.45, 1.38, 1.91, 1.64, 0.73, 1.46)
WEEKS = (1.15, 0.88, 0.90, 0.74, 1.21)
# Hollander & Wolfe (1999), Example 4.2 (p. 112).
CONTROL = (1042, 1617, 1180, 973, 1552, 1251, 1151, 728, 1079, 951, 1319)
TREATED = (874, 389, 612, 798, 1152, 893, 541, 741, 1064, 862, 213)
# Bergmann, Ludbrook & Spooren (2000), The American Statistician 54, rotarod data (heavy ties).
ROTAROD_CONTROL = (300,) * 12
ROTAROD_TREATED = (22, 300, 75, 271, 300, 18, 300, 300, 163, 300, 300, 300)


def compared(a, b, names, decimals, unit="", **settings):
    result = compare_two(a, b, name_a=names[0], name_b=names[1], **settings)
    groups = (GroupReadings(names[0], tuple(a), unit=unit, decimals=decimals),
              GroupReadings(names[1], tuple(b), unit=unit, decimals=decimals))
    keep = {k: v for k, v in settings.items() if k in ("alpha", "alternative", "margin")}
    analysis = Analysis(Question.TWO_GROUPS, groups, Settings(**keep))
    return result, analysis, describe(result, analysis)


def test_significant_shift_is_worded_with_names_units_and_interval():
    """Hollander & Wolfe (1999) Example 4.2: exact two-sided p = 0.00186; shift 410, 95 % CI [168, 690]."""
    result, analysis, verdict = compared(TREATED, CONTROL, ("Old press", "New press"), 0, "N")
    assert verdict.headline == "New press reads higher than Old press."
    assert verdict.sentences[0] == ("The shift, New press minus Old press, is +410 N "
                                    "(95 % confidence interval 168 to 690 N).")
    assert verdict.sentences[1] == "The difference is significant at the 5 % level (p = 0.00186, two-sided)."
    assert "exact p-value (permutation distribution given the ties)" in verdict.method_note
    assert "twice the smaller one-sided p-value" in verdict.method_note
    assert verdict.caution == CAUTION_SHORT
    numbers = {n.key: n for n in key_numbers(result, analysis)}
    assert numbers["shift"].text == "410 N"
    assert (numbers["shift_ci_low"].value, numbers["shift_ci_high"].value) == (168.0, 690.0)
    assert numbers["u"].text == str(int(result.u))


def test_no_difference_shown_never_claims_sameness():
    """Hollander & Wolfe (1999) Example 4.1: exact two-sided p = 0.2544; shift -0.305, CI (-0.76, 0.15)."""
    _, _, verdict = compared(TERM, WEEKS, ("Term", "Weeks"), 2)
    assert verdict.headline == "No difference between Term and Weeks was shown."
    assert verdict.sentences[0] == ("No difference between Term and Weeks was shown at the 5 % level "
                                    "(p = 0.254, two-sided).")
    assert verdict.sentences[1] == ("The estimated shift, Weeks minus Term, is -0.305 "
                                    "(95 % confidence interval -0.76 to 0.15).")
    assert verdict.sentences[2] == ("This does not show that the groups are the same; to show that, "
                                    "set an equivalence margin.")


def test_equivalence_with_a_margin_is_shown_or_not_shown_never_assumed():
    _, analysis, verdict = compared(TERM, WEEKS, ("Term", "Weeks"), 2, margin=0.5)
    assert verdict.headline == "Equivalence of Weeks and Term within ± 0.50 was not shown."
    assert describe_question(analysis) == "Do Weeks and Term read the same within ± 0.50?"
    _, _, wide = compared(TERM, WEEKS, ("Term", "Weeks"), 2, margin=2.0)
    assert wide.headline == "Weeks and Term are equivalent within ± 2.00."


def test_impossible_significance_is_said_first():
    """3 + 3 two-sided at 5 %: no critical value exists (classic table, '(3,3) none', checks.md)."""
    result, _, verdict = compared((1.1, 1.2, 1.3), (1.4, 1.5, 1.6), ("Die 1", "Die 2"), 1)
    assert result.critical_u is None
    assert verdict.headline == "No result could reach the 5 % level with 3 readings of Die 1 and 3 of Die 2."
    assert verdict.sentences[0].startswith("With 3 readings of Die 1 and 3 of Die 2, no outcome of the test")
    assert "cannot be reached with so few readings" in verdict.sentences[2]


def test_unequal_shapes_speak_of_tendency_and_point_to_brunner_munzel():
    """Bergmann et al. (2000): exact conditional one-sided p = 0.0186 (3/161)."""
    result, _, verdict = compared(ROTAROD_CONTROL, ROTAROD_TREATED, ("Control", "Treated"), 0,
                                  alternative="b-less")
    assert result.shape is not None and result.shape.differ
    assert verdict.headline == "Treated tends to read lower than Control."
    assert verdict.sentences[1] == "The difference is significant at the 5 % level (p = 0.0186, one-sided)."
    assert "Brunner-Munzel" in verdict.sentences[2]
    assert "median" not in verdict.headline


def test_one_sided_not_shown_names_the_direction():
    _, _, verdict = compared(TERM, WEEKS, ("Term", "Weeks"), 2, alternative="b-greater")
    assert verdict.headline == "It was not shown that Weeks reads higher than Term."
