"""The summary sheet of a result workbook: question, verdict, key numbers, cautions, sign-off."""

from __future__ import annotations

from openpyxl.worksheet.worksheet import Worksheet

from rankwise.records.record import ResultRecord
from rankwise.records.sheet_cells import (
    TITLE,
    fit_row_height,
    key_number_cell,
    put,
    put_paragraph,
    set_print_setup,
)
from rankwise.records.signoff import Signature
from rankwise.wording import CAUTION_SHORT, QUESTION_TITLES, describe, describe_question, key_numbers
from rankwise.wording.questions import group_names

SHEET_TITLE = "Verdict"
LABEL_WIDTH = 30
VALUE_WIDTH = 20
NOTE_COLUMN_WIDTH = 52
"""Width of column C, which holds what each key number means; texts run across B and C."""


def fill_verdict_sheet(sheet: Worksheet, record: ResultRecord, fingerprint: str) -> None:
    """Write the summary: what was asked, the verdict in words, the key numbers, who signed and,
    beside the signatures, the fingerprint; printed on one page."""
    analysis, result = record.analysis, record.result
    verdict = describe(result, analysis)
    sheet.column_dimensions["A"].width = LABEL_WIDTH
    sheet.column_dimensions["B"].width = VALUE_WIDTH
    sheet.column_dimensions["C"].width = NOTE_COLUMN_WIDTH
    set_print_setup(sheet, one_page=True)

    put(sheet, 1, 1, "Result record", bold=True)
    sheet["A1"].font = TITLE
    row = 3
    rows = [
        ("Question", QUESTION_TITLES[analysis.question]),
        ("Asked", describe_question(analysis)),
        ("Characteristic", analysis.settings.characteristic),
        ("Groups", ", ".join(group_names(analysis))),
    ]
    for label, text in rows:
        row = _text_line(sheet, row, label, text)

    row += 1
    row = _text_line(sheet, row, "Verdict", verdict.headline, bold=True)
    for sentence in verdict.sentences:
        row = _text_line(sheet, row, "", sentence)
    row = _text_line(sheet, row, "How it was worked out", verdict.method_note)
    put(sheet, row, 1, "Points to keep in mind", bold=True)
    for note in verdict.assumption_notes:
        row = _text_line(sheet, row, "", note)
    if not verdict.assumption_notes:
        row += 1
    row = _text_line(sheet, row, "Caution", CAUTION_SHORT, bold=True)
    row += 1

    put(sheet, row, 1, "Key number", bold=True)
    put(sheet, row, 2, "Value", bold=True)
    put(sheet, row, 3, "What it means", bold=True, indent=True)
    row += 1
    for number in key_numbers(result, analysis):
        value, number_format = key_number_cell(number)
        put(sheet, row, 1, number.label, wrap=True)
        put(sheet, row, 2, value, number_format, wrap=isinstance(value, str))
        put(sheet, row, 3, number.tooltip, wrap=True, indent=True)
        fit_row_height(sheet, row, number.label, LABEL_WIDTH)
        fit_row_height(sheet, row, str(value) if isinstance(value, str) else "", VALUE_WIDTH)
        fit_row_height(sheet, row, number.tooltip, NOTE_COLUMN_WIDTH)
        row += 1

    row += 1
    row = _signoff_block(sheet, row, record)
    row = _text_line(sheet, row, "Fingerprint (SHA-256)", fingerprint)
    row = _text_line(sheet, row, "", "Any change to the readings, settings, results or sign-off changes this "
                                     "fingerprint; the program's check of a record recomputes it.")
    row += 1
    row = _text_line(sheet, row, "Written by", f"Rankwise {record.program_version}")
    for name, version in record.library_versions:
        put(sheet, row, 1, f"{name} version")
        put(sheet, row, 2, version)
        row += 1
    _moment(sheet, row, "Record written at", record.created_at)


def _text_line(sheet: Worksheet, row: int, label: str, text: str, *, bold: bool = False) -> int:
    """A bold label in column A and a text wrapped across columns B and C; returns the next row."""
    if label:
        put(sheet, row, 1, label, bold=True)
    put_paragraph(sheet, row, 2, 3, text, bold=bold)
    return row + 1


def _moment(sheet: Worksheet, row: int, label: str, moment) -> None:
    """A labelled date and time, with its offset from UTC beside it."""
    put(sheet, row, 1, label)
    put(sheet, row, 2, moment)
    put(sheet, row, 3, _offset(moment), indent=True)


def _signoff_block(sheet: Worksheet, row: int, record: ResultRecord) -> int:
    """The sign-off block; returns the next free row."""
    signoff = record.signoff
    if signoff is None:
        return _text_line(sheet, row, "Sign-off", "Not signed: a draft, not a record.")
    row = _text_line(sheet, row, "Sign-off", f"Revision {signoff.revision}")
    row = _signature(sheet, row, "Prepared by", signoff.prepared)
    if signoff.reviewed is not None:
        row = _signature(sheet, row, "Reviewed by", signoff.reviewed)
    return row


def _signature(sheet: Worksheet, row: int, title: str, signature: Signature) -> int:
    """One signature's lines; returns the next free row."""
    lines = [(title, signature.name), ("Role", signature.role), ("Decision", signature.decision),
             ("Comment", signature.comment)]
    for label, text in lines:
        put(sheet, row, 1, label)
        put_paragraph(sheet, row, 2, 3, text)
        row += 1
    _moment(sheet, row, "Signed at", signature.signed_at)
    return row + 1


def _offset(moment) -> str:
    """ "UTC+01:00", the offset a spreadsheet date cannot hold, written beside it."""
    offset = moment.strftime("%z")
    return f"UTC{offset[:3]}:{offset[3:]}" if offset else "local time, offset unknown"
