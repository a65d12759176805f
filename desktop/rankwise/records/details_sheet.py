"""The details sheet: settings, critical values, companion tests, pairwise table, null distribution."""

from __future__ import annotations

from openpyxl.worksheet.worksheet import Worksheet

from rankwise.records.sheet_cells import fit_row_height, put, put_paragraph, reading_format, set_print_setup
from rankwise.stats.analysis import Analysis
from rankwise.stats.results import (
    NullDistribution,
    PairedResult,
    PlanResult,
    Result,
    SeveralGroupsResult,
    TwoGroupResult,
)
from rankwise.wording.phrases import alternative_words
from rankwise.wording.questions import decimals_of, group_names, unit_of

SHEET_TITLE = "Details"
P_FORMAT = '[<0.000001]"< 0.000001";0.000000'
"""p-values to six places; one too small to show there reads "< 0.000001", never 0.000000."""
CHANCE_FORMAT = "[>=0.001]0.000000;0.000E+00"
"""Chances of the null distribution: six places, or three significant digits when tiny."""
LABEL_WIDTH = 42
VALUE_WIDTH = 20
TABLE_WIDTH = 16
TEXT_LAST_COLUMN = 5
"""A text value runs from column B to this column, wrapped."""
NULL_TABLE_LIMIT = 5000
"""Longest null distribution written value by value; longer ones are summarised."""


class _Rows:
    """Writes label / value rows down the sheet."""

    def __init__(self, sheet: Worksheet) -> None:
        self.sheet = sheet
        self.row = 1
        self.longest_table = (0, None)
        """(rows, heading row) of the longest table: its headings repeat on every printed page."""

    def heading(self, text: str) -> None:
        if self.row > 1:
            self.row += 1
        put(self.sheet, self.row, 1, text, bold=True)
        self.row += 1

    def line(self, label: str, value: object, number_format: str | None = None) -> None:
        put(self.sheet, self.row, 1, label, wrap=True)
        fit_row_height(self.sheet, self.row, label, LABEL_WIDTH)
        if isinstance(value, str):
            put_paragraph(self.sheet, self.row, 2, TEXT_LAST_COLUMN, value)
        else:
            put(self.sheet, self.row, 2, value, number_format)
        self.row += 1

    def table(self, headings: tuple[str, ...], rows: list[tuple[tuple[object, str | None], ...]]) -> None:
        for column, heading in enumerate(headings, start=1):
            put(self.sheet, self.row, column, heading, bold=True, wrap=True)
            fit_row_height(self.sheet, self.row, heading, LABEL_WIDTH if column == 1 else TABLE_WIDTH)
        self.longest_table = max(self.longest_table, (len(rows), self.row), key=lambda table: table[0])
        self.row += 1
        for cells in rows:
            for column, (value, number_format) in enumerate(cells, start=1):
                put(self.sheet, self.row, column, value, number_format)
            self.row += 1


def fill_details_sheet(sheet: Worksheet, result: Result, analysis: Analysis) -> None:
    """Write the settings and every figure behind the verdict for the question asked."""
    sheet.column_dimensions["A"].width = LABEL_WIDTH
    sheet.column_dimensions["B"].width = VALUE_WIDTH
    for letter in "CDEFGH":
        sheet.column_dimensions[letter].width = TABLE_WIDTH
    set_print_setup(sheet, landscape=isinstance(result, SeveralGroupsResult))
    rows = _Rows(sheet)
    _settings(rows, analysis)
    if isinstance(result, TwoGroupResult):
        _two_groups(rows, result, analysis)
    elif isinstance(result, PairedResult):
        _paired(rows, result)
    elif isinstance(result, SeveralGroupsResult):
        _several(rows, result)
    elif isinstance(result, PlanResult):
        _plan(rows, result)
    else:
        raise ValueError(f"result must be a result of the statistics service; got {type(result).__name__}.")
    heading_row = rows.longest_table[1]
    if heading_row is not None:
        sheet.print_title_rows = f"{heading_row}:{heading_row}"


def _settings(rows: _Rows, analysis: Analysis) -> None:
    settings = analysis.settings
    names = group_names(analysis)
    rows.heading("Settings")
    rows.line("Significance level", settings.alpha, "0.0%")
    if len(names) >= 2:
        rows.line("Direction tested", alternative_words(settings.alternative, names[0], names[1]))
    rows.line("Confidence level of intervals", settings.confidence, "0.0%")
    rows.line("p-value method asked for", settings.method)
    if settings.margin is not None:
        rows.line("Equivalence margin (±)", settings.margin, reading_format(decimals_of(analysis), unit_of(analysis)))
    rows.line("Readings' unit", unit_of(analysis))


def _null_distribution(rows: _Rows, null: NullDistribution | None) -> None:
    """The statistic's distribution if the change did nothing, value by value (or a summary)."""
    if null is None:
        return
    rows.heading(f"Distribution of {null.statistic} if the change did nothing"
                 f" ({'exact' if null.exact else 'approximate'})")
    rows.line("Observed value", null.observed, "0.0")
    if len(null.support) > NULL_TABLE_LIMIT:
        mean = sum(s * p for s, p in zip(null.support, null.probabilities))
        rows.line("Possible values", len(null.support))
        rows.line("Average if the change did nothing", mean, "0.00")
        return
    running = 0.0
    table = []
    for value, probability in zip(null.support, null.probabilities):
        running += probability
        table.append(((value, "0.0"), (probability, CHANCE_FORMAT), (min(running, 1.0), CHANCE_FORMAT)))
    rows.table(("Value", "Chance of exactly this", "Chance of this or less"), table)


def _two_groups(rows: _Rows, r: TwoGroupResult, analysis: Analysis) -> None:
    value_format = reading_format(decimals_of(analysis), unit_of(analysis))
    rows.heading("Mann-Whitney U test")
    rows.line("p-value method used", r.method)
    rows.line("Critical U", "none possible" if r.critical_u is None else r.critical_u)
    if r.attained_alpha is not None:
        rows.line("True significance level of the exact test", r.attained_alpha, P_FORMAT)
    if r.min_parts_needed is not None:
        rows.line("Parts per group needed for any significant result", r.min_parts_needed)
    rows.line("z (normal approximation)", r.z, "0.0000")
    if r.shift_ci is not None:
        rows.line("Shift interval method", r.shift_ci.method)
        if r.shift_ci.attained_level is not None:
            rows.line("Shift interval, coverage achieved", r.shift_ci.attained_level, "0.00%")
    if r.equivalence_ci is not None:
        rows.line("Equivalence interval, lower end", r.equivalence_ci.low, value_format)
        rows.line("Equivalence interval, upper end", r.equivalence_ci.high, value_format)
    if r.shape is not None:
        rows.heading("Same spread and shape?")
        rows.line("Spread test", r.shape.dispersion_method)
        rows.line("Spread test p-value", r.shape.dispersion_p, P_FORMAT)
        rows.line("Shape test (medians lined up)", r.shape.shape_method)
        rows.line("Shape test p-value", r.shape.shape_p, P_FORMAT)
        rows.line("Spreads or shapes differ", "yes" if r.shape.differ else "no")
    if r.brunner_munzel is not None:
        rows.heading("Brunner-Munzel test (allows unequal spreads)")
        rows.line("Statistic", r.brunner_munzel.statistic, "0.0000")
        rows.line("Degrees of freedom", r.brunner_munzel.df, "0.000")
        rows.line("p-value", r.brunner_munzel.p_value, P_FORMAT)
    if r.mood_median is not None:
        _mood(rows, r.mood_median, (r.name_a, r.name_b), value_format)
    _null_distribution(rows, r.null_distribution)


def _mood(rows: _Rows, mood, names, value_format: str) -> None:
    rows.heading("Mood's median test (not Mood's test of spread)")
    rows.line("Median of all readings", mood.grand_median, value_format)
    above, below = mood.table
    rows.table(("Group", "Above the overall median", "At or below it"),
               [((name, None), (a, None), (b, None)) for name, a, b in zip(names, above, below)])
    rows.line("Chi-square statistic", mood.statistic, "0.0000")
    rows.line("p-value", mood.p_value, P_FORMAT)


def _paired(rows: _Rows, r: PairedResult) -> None:
    rows.heading("Wilcoxon signed-rank test")
    rows.line("Parts with no change", "left out of the ranking" if r.zero_method == "wilcox"
              else "kept in the ranking without a sign (Pratt)")
    rows.line("p-value method used", r.method)
    rows.line("Critical rank sum", "none possible" if r.critical_t is None else r.critical_t)
    rows.line("z (normal approximation)", r.z, "0.0000")
    if r.shift_ci is not None:
        rows.line("Interval method", r.shift_ci.method)
    _null_distribution(rows, r.null_distribution)


def _several(rows: _Rows, r: SeveralGroupsResult) -> None:
    rows.heading("Kruskal-Wallis test")
    rows.line("p-value method used", r.method)
    rows.line("Tie correction divisor", r.tie_correction, "0.000000")
    rows.heading("Pairs of groups: Dunn's test, two-sided, Holm-adjusted")
    table = [((p.group_a, None), (p.group_b, None), (p.mean_rank_a, "0.00"), (p.mean_rank_b, "0.00"),
              (p.z, "0.0000"), (p.p_value, P_FORMAT), (p.p_adjusted, P_FORMAT),
              ("differ" if p.significant else "not shown", None)) for p in r.pairs]
    rows.table(("Group", "Against", "Average rank", "Average rank (against)", "z", "p-value",
                "Holm-adjusted p", "Verdict"), table)
    if r.mood_median is not None:
        _mood(rows, r.mood_median, tuple(s.name for s in r.summaries), "General")


def _plan(rows: _Rows, r: PlanResult) -> None:
    rows.heading("Plan")
    rows.line("Method", r.method)
    rows.line("Same parts measured twice", "yes" if r.paired else "no")
    rows.line("Parts in the second group per part in the first", r.ratio, "0.00")
    rows.heading("What the plan assumes")
    for assumption in r.assumptions:
        rows.line("", assumption)
