"""Checking a result workbook: is it still exactly what was signed?"""

from __future__ import annotations

import os
from dataclasses import dataclass
from itertools import islice
from typing import Any

from openpyxl.worksheet.worksheet import Worksheet

import rankwise
from rankwise.readings import ReadingSheet, ReadingsError
from rankwise.records.canonical import canonical_bytes, encode, sha256_hex, with_defaults
from rankwise.records.characteristics_check import characteristics_readings_differences
from rankwise.records.characteristics_nulls import encoded_without_null_distributions
from rankwise.records.compare import data_differences
from rankwise.records.errors import RecordError
from rankwise.records.record import (
    ResultRecord,
    current_library_versions,
    record_from_data,
    record_to_data,
    with_later_fields,
)
from rankwise.records.sheet_listing import listing_differences
from rankwise.records.workbook import (
    PROGRAM_SHEET,
    VISIBLE_SHEETS_KEY,
    load_workbook_safely,
    read_program_data,
    read_signed_listing,
    rebuilt_listing,
    rebuilt_visible_sheets,
    resaved_by,
)
from rankwise.stats.analysis import GroupReadings, Question
from rankwise.stats.results import Result
from rankwise.stats.service import run

MAX_LISTED = 40
"""Most differences listed one by one; the rest are counted."""


@dataclass(frozen=True)
class Verification:
    """The outcome of checking a record.

    Attributes:
        status: "intact", "changed" (edited since it was written) or "not-a-record".
        summary: one plain sentence saying what was found.
        differences: plain-words list of what differs (sheet, cell, value on record and now).
        notes: remarks that do not make the record changed (e.g. a newer program recomputes a
            last digit differently).
        fingerprint: the fingerprint stored in the record, or "".
        record: the record as stored, when it could be read back, else None.
    """

    status: str
    summary: str
    differences: tuple[str, ...] = ()
    notes: tuple[str, ...] = ()
    fingerprint: str = ""
    record: ResultRecord | None = None

    @property
    def intact(self) -> bool:
        """True when nothing was changed since the record was written."""
        return self.status == "intact"


def verify_record(path: str | os.PathLike[str]) -> Verification:
    """Check a result workbook against itself.

    The fingerprint is recomputed over the stored data; the readings as entered are read again
    into the analysis and the result recomputed with ``rankwise.stats.service.run``; every visible
    cell of the file is compared with the listing of what the sheets showed when the record was
    written, whatever version wrote it. When this program and these libraries wrote the record, or
    it has no listing (written before listings were kept), the visible sheets are also rebuilt from
    the stored data: they must show what the listing says (or, without a listing, what the file shows).
    Cells are compared by what a reader sees, so a re-save by a spreadsheet program is no change
    (a note says so); hidden sheets, rows and columns, unreadable text and removed protection are.
    """
    try:
        workbook = load_workbook_safely(path)
        data, stored_fingerprint = read_program_data(workbook)
    except RecordError as error:
        return Verification("not-a-record", str(error), differences=(str(error),))

    differences: list[str] = []
    if data is None:
        return _changed(["The program data sheet was edited: its text no longer reads as a record."],
                        stored_fingerprint)
    if sha256_hex(data) != stored_fingerprint:
        differences.append(
            "The program data were edited: the fingerprint stored with them no longer matches their contents."
        )
    try:
        record = record_from_data(data)
    except RecordError as error:
        return _changed(differences + [f"The program data were edited so that they no longer form a record: {error}"],
                        stored_fingerprint)
    as_read = {key: value for key, value in data.items() if key != VISIBLE_SHEETS_KEY}
    as_read["analysis"] = with_later_fields(data.get("analysis"))
    as_read["result"] = with_defaults(data.get("result"), Result)
    if canonical_bytes(record_to_data(record, data["record_format"])) != canonical_bytes(as_read):
        differences.append("The program data hold entries that do not belong to a record.")

    notes: list[str] = []
    differences.extend(_readings_differences(record))
    recomputed = _recomputation_differences(record, data["record_format"])
    if recomputed and _same_software(record):
        differences.extend(recomputed)
    elif recomputed:
        notes.append(
            f"Rankwise {rankwise.__version__} with today's libraries recomputes some figures differently "
            f"from Rankwise {record.program_version}, which wrote the record: " + "; ".join(recomputed[:5])
        )

    visible_sheets = [sheet for sheet in workbook.worksheets if sheet.title != PROGRAM_SHEET]
    if workbook[PROGRAM_SHEET].sheet_state == "visible":
        differences.append(f"The sheet '{PROGRAM_SHEET}' is no longer hidden.")
    mark = record.analysis.decimal_mark
    signed_digest = data.get(VISIBLE_SHEETS_KEY)
    listing = read_signed_listing(workbook) if signed_digest is not None else None
    if signed_digest is not None:
        differences.extend(_listing_check(listing, signed_digest, visible_sheets, stored_fingerprint, mark))
    else:
        differences.extend(islice(listing_differences(rebuilt_listing(record), visible_sheets, stored_fingerprint,
                                                      mark), MAX_LISTED + 1))
    if listing is not None and _same_software(record):
        rebuilt = rebuilt_visible_sheets(record, stored_fingerprint).worksheets
        differences.extend(f"The program data no longer give what the sheets showed when signed: {difference}"
                           for difference in islice(listing_differences(listing, rebuilt, stored_fingerprint, mark),
                                                    MAX_LISTED + 1))
    elif listing is not None:
        notes.append(
            f"Rankwise {rankwise.__version__} checked the visible sheets cell by cell against what they showed "
            f"when Rankwise {record.program_version} wrote the record, and recomputed the figures from the "
            f"readings; it did not rebuild the sheets with its own wording and layout."
        )
    resaver = resaved_by(path) if listing is not None and listing["listing_format"] >= 2 else None
    if resaver is not None:
        notes.append(f"The file was saved again by another program ({resaver}) after Rankwise wrote it; "
                     f"it was compared by what a reader sees (numbers to 15 significant digits, dates to the "
                     f"second, number formats by meaning).")
    differences = list(dict.fromkeys(differences))

    if differences:
        return _changed(differences, stored_fingerprint, record, notes)
    return Verification("intact", "The record is intact: nothing was changed since it was written.",
                        notes=tuple(notes), fingerprint=stored_fingerprint, record=record)


def _changed(differences: list[str], fingerprint: str, record: ResultRecord | None = None,
             notes: list[str] | None = None) -> Verification:
    listed = differences[:MAX_LISTED]
    if len(differences) > MAX_LISTED:
        listed.append(f"... and more differences beyond these {MAX_LISTED}.")
    return Verification("changed", "The record was changed after it was written.", tuple(listed),
                        tuple(notes or ()), fingerprint, record)


def _listing_check(listing: dict[str, Any] | None, signed_digest: Any, visible_sheets: list[Worksheet],
                   fingerprint: str, mark: str) -> list[str]:
    """The file's visible sheets against the listing of what they showed when the record was written;
    the listing itself must still match the digest that the fingerprint covers."""
    if listing is None:
        return ["The program data were edited: the list of what the visible sheets showed when the record "
                "was written is missing or damaged."]
    differences = []
    if sha256_hex(listing) != signed_digest:
        differences.append("The program data were edited: the list of what the visible sheets showed when the "
                           "record was written no longer matches its SHA-256, which the fingerprint covers.")
    differences.extend(islice(listing_differences(listing, visible_sheets, fingerprint, mark), MAX_LISTED + 1))
    return differences


def _readings_differences(record: ResultRecord) -> list[str]:
    """The readings as entered, read again, must give the stored analysis's groups."""
    analysis = record.analysis
    if analysis.question is Question.CHARACTERISTICS:
        return characteristics_readings_differences(record)
    names = [group.name for group in record.snapshot.groups]
    try:
        indices = [names.index(group.name) for group in analysis.groups]
        rebuilt = ReadingSheet.from_snapshot(record.snapshot).to_analysis(
            analysis.question, analysis.settings, groups=indices)
    except ReadingsError as error:
        return [f"The readings as entered can no longer be analysed as they were signed: {error}"]
    except ValueError:
        return ["The groups of the analysis are no longer among the readings as entered."]
    hint = tuple[GroupReadings, ...]
    return [f"The readings as entered no longer give the analysed readings ({difference})."
            for difference in data_differences(encode(analysis.groups, hint), encode(rebuilt.groups, hint))]


def _recomputation_differences(record: ResultRecord, record_format: int) -> list[str]:
    """Figures of the stored result that a fresh computation from the stored analysis does not give.
    A record that stores no null distributions (form 2) is compared without them on both sides: its
    own were rebuilt from its stored ranks, which are compared."""
    try:
        fresh = run(record.analysis)
    except (ValueError, ReadingsError) as error:
        return [f"The stored analysis can no longer be computed: {error}"]
    if record_format >= 2:
        stored, recomputed = encoded_without_null_distributions(record.result), encoded_without_null_distributions(fresh)
    else:
        stored, recomputed = encode(record.result, Result), encode(fresh, Result)
    return [f"The result no longer follows from the readings: {difference}."
            for difference in data_differences(stored, recomputed)]


def _same_software(record: ResultRecord) -> bool:
    """True when this program and these libraries wrote the record."""
    return (record.program_version == rankwise.__version__
            and record.library_versions == current_library_versions())
