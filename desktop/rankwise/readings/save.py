"""Saving the readings as typed, so a half-finished entry can be kept and opened again.

CSV files are written in UTF-8 with a byte-order mark: spreadsheet programs on shop-floor PCs
take a file without the mark for the local code page and garble "µm" and accented names, while
every reader (ours included) understands the mark. With a decimal comma the fields are separated
by semicolons, as such exports usually are. XLSX files hold the texts as typed on a first sheet and
the groups' unit, limits and nominal on a second. Every write goes to a temporary file beside the
target, which then replaces it: a failure part-way leaves the old file as it was.
"""

from __future__ import annotations

import csv
import io
import os
import tempfile
from pathlib import Path

from rankwise.readings.errors import ReadingsError
from rankwise.readings.sheet import ReadingSheet

READINGS_SHEET = "Readings"
DETAILS_SHEET = "Group details"


def save_sheet(sheet: ReadingSheet, path: str | os.PathLike) -> None:
    """Write the sheet's texts as typed to ``path`` (.csv, .txt or .xlsx), atomically; then mark it saved."""
    path = Path(path)
    suffix = path.suffix.lower()
    if suffix in (".csv", ".txt"):
        data = _csv_bytes(sheet)
    elif suffix == ".xlsx":
        data = _xlsx_bytes(sheet)
    else:
        raise ReadingsError(f"Readings can be saved as .csv or .xlsx; '{path.name}' has neither ending.")
    write_atomically(path, data)
    sheet.mark_saved()


def write_atomically(path: Path, data: bytes) -> None:
    """Write ``data`` to a temporary file beside ``path``, then put it in place in one step."""
    if not path.parent.is_dir():
        raise ReadingsError(f"The folder '{path.parent}' does not exist; choose another place to save.")
    try:
        handle, temporary = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    except PermissionError as error:
        raise ReadingsError(f"You may not save in '{path.parent}'; choose a folder of your own.") from error
    try:
        with os.fdopen(handle, "wb") as stream:
            stream.write(data)
            stream.flush()
            os.fsync(stream.fileno())
        os.chmod(temporary, _file_mode(path))
        os.replace(temporary, path)
    except BaseException as error:
        try:
            os.unlink(temporary)
        except OSError:
            pass
        if isinstance(error, PermissionError):
            raise ReadingsError(f"'{path.name}' cannot be replaced (it may be open in another program); close it and save again.") from error
        if isinstance(error, OSError):
            raise ReadingsError(f"Saving '{path.name}' failed ({error.strerror or 'system error'}); the old file is unchanged.") from error
        raise


def _file_mode(path: Path) -> int:
    """The replaced file's permissions, or those a newly created file would get."""
    try:
        return path.stat().st_mode & 0o777
    except OSError:
        umask = os.umask(0)
        os.umask(umask)
        return 0o666 & ~umask


def _rows(sheet: ReadingSheet) -> list[list[str]]:
    return [sheet.group_names] + [
        [sheet.cell(g, row).text for g in range(len(sheet.groups))] for row in range(sheet.row_count)
    ]


def _csv_bytes(sheet: ReadingSheet) -> bytes:
    buffer = io.StringIO()
    writer = csv.writer(buffer, delimiter=";" if sheet.decimal == "," else ",", lineterminator="\r\n")
    writer.writerows(_rows(sheet))
    return buffer.getvalue().encode("utf-8-sig")


def _xlsx_bytes(sheet: ReadingSheet) -> bytes:
    from openpyxl import Workbook
    from openpyxl.utils.exceptions import IllegalCharacterError

    workbook = Workbook()
    readings = workbook.active
    readings.title = READINGS_SHEET
    try:
        for r, row in enumerate(_rows(sheet), start=1):
            for c, text in enumerate(row, start=1):
                if text:
                    cell = readings.cell(row=r, column=c)
                    cell.value = text
                    cell.data_type = "s"  # as typed: never a formula, never converted
        details = workbook.create_sheet(DETAILS_SHEET)
        details.append(["Group", "Unit", "LSL", "USL", "Nominal"])
        for group in sheet.groups:
            details.append([group.name, group.unit, group.lsl, group.usl, group.nominal])
            details.cell(row=details.max_row, column=1).data_type = "s"
    except IllegalCharacterError as error:
        raise ReadingsError(
            "A cell holds a control character that XLSX files cannot store; save as CSV, or retype that cell."
        ) from error
    buffer = io.BytesIO()
    workbook.save(buffer)
    return buffer.getvalue()
