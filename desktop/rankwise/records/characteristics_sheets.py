"""The result workbook of a many-characteristics comparison: a summary sheet, one long sheet of each
characteristic's figures, and the readings as entered (the fingerprint covers all of them)."""

from __future__ import annotations

from openpyxl import Workbook
from openpyxl.utils import get_column_letter
from openpyxl.worksheet.worksheet import Worksheet

from rankwise.records.details_sheet import P_FORMAT
from rankwise.records.readings_sheet import SHEET_TITLE as READINGS_TITLE
from rankwise.records.readings_sheet import fill_readings_sheet
from rankwise.records.record import ResultRecord
from rankwise.records.sheet_cells import TITLE, fit_row_height, put, put_paragraph, reading_format, set_print_setup
from rankwise.records.verdict_sheet import _moment, _signoff_block
from rankwise.stats.analysis import Characteristic
from rankwise.stats.results import CharacteristicRow
from rankwise.wording import CAUTION_SHORT, QUESTION_TITLES, describe, describe_question
from rankwise.wording.characteristics import COLUMNS, summary_lines

SUMMARY_TITLE = "Summary"
DETAILS_TITLE = "Each characteristic"
WIDTHS = (26, 21, 7, 7, 10, 10, 10, 17, 10, 9, 10, 31, 16)
"""Widths of the summary's columns, in ``COLUMNS`` order (landscape A4 or Letter, fitted to the page's width);
the outcome's holds the longest, "moved down, within the margin"; the second
also holds the sign-off's dates and times, which need about 20 characters (narrower, a reader sees ###)."""


def fill_characteristics_workbook(workbook: Workbook, record: ResultRecord, fingerprint: str) -> None:
    """The visible sheets of a many-characteristics record, the summary first."""
    summary = workbook.active
    summary.title = SUMMARY_TITLE
    _fill_summary(summary, record, fingerprint)
    _fill_details(workbook.create_sheet(DETAILS_TITLE), record)
    fill_readings_sheet(workbook.create_sheet(READINGS_TITLE), record.snapshot)


def _fill_summary(sheet: Worksheet, record: ResultRecord, fingerprint: str) -> None:
    """Question, verdict, cautions, one line per characteristic, sign-off, versions, fingerprint."""
    analysis, result = record.analysis, record.result
    verdict = describe(result, analysis)
    last = len(COLUMNS)
    for column, width in enumerate(WIDTHS, start=1):
        sheet.column_dimensions[get_column_letter(column)].width = width
    put(sheet, 1, 1, "Result record", bold=True)
    sheet["A1"].font = TITLE
    row = 3
    lines = [("Question", QUESTION_TITLES[analysis.question]), ("Asked", describe_question(analysis)),
             ("Groups", f"A (reference): {result.name_a}; B (changed): {result.name_b}")]
    lines += [("Verdict", verdict.headline)] + [("", sentence) for sentence in verdict.sentences]
    lines += [("How it was worked out", verdict.method_note)]
    lines += [("Points to keep in mind" if index == 0 else "", note) for index, note in enumerate(verdict.assumption_notes)]
    lines += [("Caution", CAUTION_SHORT)]
    for label, text in lines:
        put(sheet, row, 1, label, bold=True)
        put_paragraph(sheet, row, 2, last, text, bold=label in ("Verdict", "Caution"))
        row += 1
    row += 1
    table_row = row
    for column, heading in enumerate(COLUMNS, start=1):
        put(sheet, row, column, heading, bold=True, wrap=True)
        fit_row_height(sheet, row, heading, WIDTHS[column - 1])
    row += 1
    for line in summary_lines(result, analysis):
        for column, text in enumerate(line.texts, start=1):
            put(sheet, row, column, text, wrap=column in (1, 8, 12, 13))
        fit_row_height(sheet, row, line.texts[0], WIDTHS[0])
        row += 1
    row += 1
    row = _signoff_block(sheet, row, record) + 1
    put(sheet, row, 1, "Written by", bold=True)
    put(sheet, row, 2, f"Rankwise {record.program_version}")
    row += 1
    for name, version in record.library_versions:
        put(sheet, row, 1, f"{name} version")
        put(sheet, row, 2, version)
        row += 1
    _moment(sheet, row, "Record written at", record.created_at)
    row += 2
    put(sheet, row, 1, "Fingerprint (SHA-256)", bold=True)
    put_paragraph(sheet, row, 2, last, fingerprint)
    put_paragraph(sheet, row + 1, 2, last, "Any change to the readings, settings, results or sign-off changes this "
                                           "fingerprint; the program's check of a record recomputes it.")
    set_print_setup(sheet, landscape=True, title_row=table_row)


def _fill_details(sheet: Worksheet, record: ResultRecord) -> None:
    """One block per characteristic: limits, counts, medians, shift and interval, p-values, checks."""
    analysis, result = record.analysis, record.result
    items = {item.name: item for item in analysis.characteristics}
    sheet.column_dimensions["A"].width = 40
    for letter in "BCD":
        sheet.column_dimensions[letter].width = 18
    put_paragraph(sheet, 1, 1, 4, f"Each characteristic: {result.name_a} (A, reference) against {result.name_b} "
                                  "(B, changed), in the order compared.", bold=True)
    row = 3
    for characteristic in result.rows:
        row = _block(sheet, row, characteristic, items[characteristic.name], result.alpha) + 1
    set_print_setup(sheet)


def _block(sheet: Worksheet, row: int, line: CharacteristicRow, item: Characteristic, alpha: float) -> int:
    """One characteristic's figures; returns the next free row."""
    r = line.result
    decimals = item.a.decimals if item.a.decimals is not None else item.b.decimals
    finer = reading_format(None if decimals is None else decimals + 1)
    unit = f" ({item.a.unit})" if item.a.unit else ""
    put(sheet, row, 1, f"{line.name}{unit}", bold=True)
    row += 1
    figures = [
        ("Nominal", item.a.nominal, finer), ("Lower limit (LSL)", item.a.lsl, finer),
        ("Upper limit (USL)", item.a.usl, finer),
        (f"Readings used: {r.name_a} / {r.name_b}", (r.n_a, r.n_b), None),
        (f"Without a reading: {r.name_a} / {r.name_b}", (r.n_dropped_a, r.n_dropped_b), None),
        (f"Median: {r.name_a} / {r.name_b}", (r.median_a, r.median_b), finer),
        ("Shift B - A (Hodges-Lehmann)", r.shift, finer),
        (f"Interval for the shift ({r.confidence:.0%})",
         None if r.shift_ci is None else (r.shift_ci.low, r.shift_ci.high), finer),
        ("Rank sums A / B", (r.rank_sum_a, r.rank_sum_b), "0.0"),
        ("U of A / U of B", (r.u_a, r.u_b), "0.0"),
        (f"p-value ({r.method})", r.p_value, P_FORMAT),
        ("Adjusted p-value", line.p_adjusted, P_FORMAT),
        (f"Moved at the {alpha:.0%} level (adjusted p)", "yes" if line.significant else "no", None),
        ("Chance that B reads higher than A", r.prob_b_greater, "0.000"),
        ("Brunner-Munzel p (unequal spreads)", r.brunner_munzel_p, P_FORMAT),
        ("Same spread and shape", None if r.shape is None else ("no" if r.shape.differ else "yes"), None),
        ("Margin", r.margin, finer),
        ("Same within the margin", None if r.equivalent is None else ("yes" if r.equivalent else "no"), None),
    ]
    for label, value, number_format in figures:
        if value is None and label in ("Nominal", "Lower limit (LSL)", "Upper limit (USL)", "Margin",
                                       "Same within the margin"):
            continue
        put(sheet, row, 1, label)
        values = value if isinstance(value, tuple) else (value,)
        for column, single in enumerate(values, start=2):
            put(sheet, row, column, single, None if isinstance(single, str) else number_format)
        row += 1
    for warning in r.warnings:
        put_paragraph(sheet, row, 1, 4, warning)
        row += 1
    return row
