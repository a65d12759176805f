"""The summary sheet of a result workbook: question, verdict, key numbers, cautions, sign-off."""

from __future__ import annotations

from openpyxl.worksheet.worksheet import Worksheet

from rankwise.records.record import ResultRecord
from rankwise.records.sheet_cells import TITLE, key_number_cell, put
from rankwise.records.signoff import Signature
from rankwise.wording import CAUTION_SHORT, QUESTION_TITLES, describe, describe_question, key_numbers
from rankwise.wording.questions import group_names

SHEET_TITLE = "Verdict"
NOTE_COLUMN_WIDTH = 90


def fill_verdict_sheet(sheet: Worksheet, record: ResultRecord, fingerprint: str) -> None:
    """Write the summary: what was asked, the verdict in words, the key numbers, who signed."""
    analysis, result = record.analysis, record.result
    verdict = describe(result, analysis)
    sheet.column_dimensions["A"].width = 38
    sheet.column_dimensions["B"].width = 24
    sheet.column_dimensions["C"].width = NOTE_COLUMN_WIDTH

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
        put(sheet, row, 1, label, bold=True)
        put(sheet, row, 2, text)
        row += 1

    row += 1
    put(sheet, row, 1, "Verdict", bold=True)
    put(sheet, row, 2, verdict.headline, bold=True)
    row += 1
    for sentence in verdict.sentences:
        put(sheet, row, 2, sentence)
        row += 1
    put(sheet, row, 1, "How it was worked out", bold=True)
    put(sheet, row, 2, verdict.method_note)
    row += 1
    put(sheet, row, 1, "Points to keep in mind", bold=True)
    for note in verdict.assumption_notes:
        put(sheet, row, 2, note)
        row += 1
    if not verdict.assumption_notes:
        row += 1
    put(sheet, row, 1, "Caution", bold=True)
    put(sheet, row, 2, CAUTION_SHORT)
    row += 2

    put(sheet, row, 1, "Key number", bold=True)
    put(sheet, row, 2, "Value", bold=True)
    put(sheet, row, 3, "What it means", bold=True)
    row += 1
    for number in key_numbers(result, analysis):
        value, number_format = key_number_cell(number)
        put(sheet, row, 1, number.label)
        put(sheet, row, 2, value, number_format)
        put(sheet, row, 3, number.tooltip)
        row += 1

    row += 1
    row = _signoff_block(sheet, row, record)
    row += 1
    put(sheet, row, 1, "Written by", bold=True)
    put(sheet, row, 2, f"Rankwise {record.program_version}")
    row += 1
    for name, version in record.library_versions:
        put(sheet, row, 1, f"{name} version")
        put(sheet, row, 2, version)
        row += 1
    put(sheet, row, 1, "Record written at")
    put(sheet, row, 2, record.created_at)
    put(sheet, row, 3, _offset(record.created_at))
    row += 2
    put(sheet, row, 1, "Fingerprint (SHA-256)", bold=True)
    put(sheet, row, 2, fingerprint)
    put(sheet, row + 1, 2, "Any change to the readings, settings, results or sign-off changes this "
                           "fingerprint; the program's check of a record recomputes it.")


def _signoff_block(sheet: Worksheet, row: int, record: ResultRecord) -> int:
    """The sign-off block; returns the next free row."""
    put(sheet, row, 1, "Sign-off", bold=True)
    signoff = record.signoff
    if signoff is None:
        put(sheet, row, 2, "Not signed: a draft, not a record.")
        return row + 1
    put(sheet, row, 2, f"Revision {signoff.revision}")
    row += 1
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
        put(sheet, row, 2, text)
        row += 1
    put(sheet, row, 1, "Signed at")
    put(sheet, row, 2, signature.signed_at)
    put(sheet, row, 3, _offset(signature.signed_at))
    return row + 1


def _offset(moment) -> str:
    """ "UTC+01:00", the offset a spreadsheet date cannot hold, written beside it."""
    offset = moment.strftime("%z")
    return f"UTC{offset[:3]}:{offset[3:]}" if offset else "local time, offset unknown"
