"""The result workbook: build its sheets from a record, write it atomically, read it back."""

from __future__ import annotations

import dataclasses
import json
import os
import re
import zipfile
from pathlib import Path
from typing import Any

from openpyxl import Workbook, load_workbook

from rankwise.readings.errors import ReadingsError
from rankwise.readings.workbook_check import check_workbook, within_limits
from rankwise.records.atomic import write_atomically
from rankwise.records.canonical import canonical_bytes, sha256_hex
from rankwise.records.characteristics_sheets import fill_characteristics_workbook
from rankwise.records.compare import saved_and_reloaded
from rankwise.records.details_sheet import SHEET_TITLE as DETAILS_TITLE
from rankwise.records.details_sheet import fill_details_sheet
from rankwise.records.errors import RecordError
from rankwise.records.ranks_sheet import fill_ranks_sheet, ranks_sheet_title
from rankwise.records.readings_sheet import SHEET_TITLE as READINGS_TITLE
from rankwise.records.readings_sheet import fill_readings_sheet
from rankwise.records.record import ResultRecord, record_from_data, record_to_data
from rankwise.records.sheet_cells import put, with_decimal_mark
from rankwise.records.sheet_listing import pack_listing, sheet_listing, unpack_listing
from rankwise.records.verdict_sheet import SHEET_TITLE as VERDICT_TITLE
from rankwise.records.verdict_sheet import fill_verdict_sheet
from rankwise.stats.results import CharacteristicsResult

PROGRAM_SHEET = "Program data"
PROGRAM_MARKER = "Rankwise result record: data for the program. Do not edit."
"""Cell A1 of the program sheet; a workbook without it is not a Rankwise record."""
LISTING_MARKER = "What the visible sheets showed when the record was written (zlib, base64)."
"""Cell B1 of the program sheet; B2 holds the number of parts, B3 onwards the packed listing."""
VISIBLE_SHEETS_KEY = "visible_sheets_sha256"
"""Key of the stored data that holds the SHA-256 of the visible sheets' listing (so the
fingerprint covers it); a record written before listings were kept has no such key."""
CHUNK = 30000
"""Characters of the stored JSON per cell (a spreadsheet cell holds at most 32,767)."""
FINGERPRINT_STAND_IN = "#" * 64
"""Written where the fingerprint goes while the listing is taken, then replaced by the fingerprint."""
WRITER_MARK = b"Rankwise result record"
"""The comment of the file's ZIP archive (which no reader shows): a program that saves the
workbook again writes a new archive without it, so a check can say the file was re-saved."""


def build_workbook(record: ResultRecord) -> Workbook:
    """The whole workbook for ``record``: the visible sheets, protected, and the hidden program sheet."""
    workbook = _visible_workbook(record, FINGERPRINT_STAND_IN)
    listing = sheet_listing(saved_and_reloaded(workbook).worksheets, FINGERPRINT_STAND_IN)
    data = _stored_data(record, listing)
    fingerprint = sha256_hex(data)
    fingerprint_title, fingerprint_coordinate = listing["fingerprint_cell"]
    workbook[fingerprint_title][fingerprint_coordinate].value = fingerprint
    program_sheet = workbook.create_sheet(PROGRAM_SHEET)
    _fill_program_sheet(program_sheet, data, fingerprint, pack_listing(listing))
    program_sheet.protection.sheet = True
    workbook.security.lockStructure = True
    return workbook


def record_fingerprint(record: ResultRecord) -> str:
    """The fingerprint that ``build_workbook`` writes for ``record``: SHA-256 over the stored data,
    which hold the SHA-256 of the visible sheets' listing."""
    return sha256_hex(_stored_data(record, rebuilt_listing(record)))


def rebuilt_visible_sheets(record: ResultRecord, fingerprint: str) -> Workbook:
    """The visible sheets this program writes for ``record`` showing ``fingerprint``, as a file gives them back."""
    return saved_and_reloaded(_visible_workbook(record, fingerprint))


def rebuilt_listing(record: ResultRecord) -> dict[str, Any]:
    """The listing of the visible sheets this program writes for ``record`` (for a record written
    before listings were kept, the best stand-in for one)."""
    return sheet_listing(rebuilt_visible_sheets(record, FINGERPRINT_STAND_IN).worksheets, FINGERPRINT_STAND_IN)


def _visible_workbook(record: ResultRecord, fingerprint: str) -> Workbook:
    """A workbook holding only the visible sheets of ``record``, showing ``fingerprint``."""
    workbook = Workbook()
    if isinstance(record.result, CharacteristicsResult):
        fill_characteristics_workbook(workbook, record, fingerprint)
    else:
        verdict = workbook.active
        verdict.title = VERDICT_TITLE
        fill_verdict_sheet(verdict, record, fingerprint)
        fill_readings_sheet(workbook.create_sheet(READINGS_TITLE), record.snapshot, record.analysis.entries)
        fill_ranks_sheet(workbook.create_sheet(ranks_sheet_title(record.result)), record.result, record.analysis)
        fill_details_sheet(workbook.create_sheet(DETAILS_TITLE), record.result, record.analysis)
    with_decimal_mark(workbook, getattr(record.analysis, "decimal_mark", "."))
    for sheet in workbook.worksheets:
        sheet.protection.sheet = True  # against accidental edits; no password (see the decision record)
    return workbook


def _stored_data(record: ResultRecord, listing: dict[str, Any]) -> dict[str, Any]:
    """The record's stored form with the SHA-256 of the visible sheets' listing beside it."""
    return {**record_to_data(record), VISIBLE_SHEETS_KEY: sha256_hex(listing)}


def _fill_program_sheet(sheet, data: dict[str, Any], fingerprint: str, listing_parts: list[str]) -> None:
    """Column A: marker, fingerprint, number of parts, and the canonical JSON cut into parts.
    Column B: marker, number of parts, and the packed listing of the visible sheets."""
    text = canonical_bytes(data).decode("utf-8")
    parts = [text[start:start + CHUNK] for start in range(0, len(text), CHUNK)] or [""]
    put(sheet, 1, 1, PROGRAM_MARKER)
    put(sheet, 2, 1, fingerprint)
    put(sheet, 3, 1, len(parts))
    for row, part in enumerate(parts, start=4):
        put(sheet, row, 1, part)
    put(sheet, 1, 2, LISTING_MARKER)
    put(sheet, 2, 2, len(listing_parts))
    for row, part in enumerate(listing_parts, start=3):
        put(sheet, row, 2, part)
    sheet.sheet_state = "veryHidden"


def write_record(path: str | os.PathLike[str], record: ResultRecord, *, overwrite_signed: bool = False) -> None:
    """Write ``record`` as a result workbook at ``path``, atomically.

    Refuses (``RecordError``) to replace a workbook that is a signed record unless
    ``overwrite_signed`` is True; the existing file is then left as it was.
    """
    target = Path(path)
    if target.suffix.lower() != ".xlsx":
        raise RecordError(f"A result workbook must be saved with the ending .xlsx; got '{target.name}'.")
    if not target.parent.is_dir():
        raise RecordError(f"The folder '{target.parent}' does not exist; choose another place to save.")
    if target.exists() and not overwrite_signed and _is_signed_record(target):
        raise RecordError(
            f"'{target.name}' is a signed record and is kept as it is; save the new result under "
            f"another name, or confirm that the signed record is to be replaced."
        )
    workbook = build_workbook(record)

    def save(temporary: Path) -> None:
        workbook.save(temporary)
        with zipfile.ZipFile(temporary, "a") as archive:
            archive.comment = WRITER_MARK

    try:
        write_atomically(target, save)
    except OSError as error:
        raise RecordError(f"The result could not be saved to '{target}': {error.strerror or error}.") from error


def _measured_first(path: str | os.PathLike[str]) -> bool:
    """True when the workbook is fit to be read at all: its parts unpack as declared and no sheet is
    damaged or vast (``rankwise.readings.workbook_check``, before openpyxl sees it)."""
    try:
        return within_limits(check_workbook(Path(path)))
    except ReadingsError:
        return False


def is_record_file(path: str | os.PathLike[str]) -> bool:
    """True when ``path`` is a workbook holding a Rankwise record's program data (signed or not,
    intact or not), whatever its file name ends with; False for anything else, including files
    that cannot be read."""
    try:
        if not _measured_first(path):
            return False
        with open(path, "rb") as file:
            workbook = load_workbook(file, read_only=True)
            try:
                return (PROGRAM_SHEET in workbook.sheetnames
                        and workbook[PROGRAM_SHEET]["A1"].value == PROGRAM_MARKER)
            finally:
                workbook.close()
    except Exception:  # openpyxl raises many kinds of error for files that are not workbooks
        return False


def _is_signed_record(path: Path) -> bool:
    """True when ``path`` holds a Rankwise record with a sign-off (damaged data count as signed)."""
    try:
        data, _ = read_program_data(load_workbook_safely(path))
    except RecordError:
        return False
    return not isinstance(data, dict) or data.get("signoff") is not None


def resaved_by(path: str | os.PathLike[str]) -> str | None:
    """None when the file is as Rankwise wrote it; otherwise the program that saved it last, as
    the file names it ("another program" when it does not)."""
    try:
        with zipfile.ZipFile(path) as archive:
            if archive.comment == WRITER_MARK:
                return None
            application = re.search(rb"<Application>([^<]*)</Application>", archive.read("docProps/app.xml"))
    except (OSError, KeyError, zipfile.BadZipFile):
        return "another program"
    name = application.group(1).decode("utf-8", "replace").split("$")[0].strip() if application else ""
    return name or "another program"


def load_workbook_safely(path: str | os.PathLike[str]) -> Workbook:
    """Open a workbook, or raise ``RecordError`` in plain words when it cannot be read as one."""
    if Path(path).is_file() and not _measured_first(path):
        raise RecordError(f"'{Path(path).name}' cannot be read as a workbook; it is not a Rankwise record.")
    try:
        return load_workbook(path)
    except FileNotFoundError as error:
        raise RecordError(f"There is no file '{path}'.") from error
    except Exception as error:  # openpyxl raises many kinds of error for damaged or foreign files
        raise RecordError(f"'{Path(path).name}' cannot be read as a workbook; it is not a Rankwise record.") from error


def read_program_data(workbook: Workbook) -> tuple[Any, str]:
    """The stored JSON data and the stored fingerprint of a record workbook.

    Raises ``RecordError`` when the workbook is not a Rankwise record. Returns the parsed JSON
    even when it no longer forms a record, so that verification can report it as changed;
    a JSON text that cannot be parsed is returned as None.
    """
    if PROGRAM_SHEET not in workbook.sheetnames or workbook[PROGRAM_SHEET]["A1"].value != PROGRAM_MARKER:
        raise RecordError("This workbook is not a Rankwise result record (it has no program data).")
    sheet = workbook[PROGRAM_SHEET]
    fingerprint = str(sheet["A2"].value or "")
    count = sheet["A3"].value
    if not isinstance(count, int) or count < 1:
        return None, fingerprint
    text = "".join(str(sheet.cell(row=row, column=1).value or "") for row in range(4, 4 + count))
    try:
        return json.loads(text), fingerprint
    except ValueError:
        return None, fingerprint


def read_signed_listing(workbook: Workbook) -> dict[str, Any] | None:
    """The listing of the visible sheets stored in a record workbook (see ``read_program_data``
    for the check that it is one); None when it is missing or damaged."""
    sheet = workbook[PROGRAM_SHEET]
    count = sheet["B2"].value
    if sheet["B1"].value != LISTING_MARKER or not isinstance(count, int) or count < 1:
        return None
    return unpack_listing(str(sheet.cell(row=row, column=2).value or "") for row in range(3, 3 + count))


def read_record(path: str | os.PathLike[str]) -> ResultRecord:
    """The record stored in a result workbook, so the window can reopen the analysis.

    Raises ``RecordError`` in plain words for a file that is not a record or is damaged.
    """
    data, stored_fingerprint = read_program_data(load_workbook_safely(path))
    if data is None:
        raise RecordError("The record's program data are damaged and cannot be read back.")
    return dataclasses.replace(record_from_data(data), signed_fingerprint=stored_fingerprint or None)
