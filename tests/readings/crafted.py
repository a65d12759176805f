"""Workbooks and zips built by hand, byte by byte, for the tests of bad and hostile files.

A spreadsheet program cannot be asked to write a cell at row 10^9 or a part that unpacks to
more than its header says, so these are written directly: small zips of XML as the XLSX format
lays it out (ECMA-376 Part 1, SpreadsheetML), cheap to make however big the sheet they describe.
"""

from __future__ import annotations

import struct
import zipfile
import zlib
from collections.abc import Sequence
from pathlib import Path

MAIN = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
RELATIONS = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
PACKAGE = "http://schemas.openxmlformats.org/package/2006/relationships"


def number(address: str, value: str) -> str:
    """A cell storing ``value`` as a number."""
    return f'<c r="{address}"><v>{value}</v></c>'


def text(address: str, value: str) -> str:
    """A cell holding ``value`` as an inline string."""
    return f'<c r="{address}" t="inlineStr"><is><t>{value}</t></is></c>'


def rows(*cells_by_row: Sequence[str], first: int = 1) -> str:
    """Row elements holding the given cells, numbered from ``first``."""
    return "".join(f'<row r="{first + i}">{"".join(cells)}</row>' for i, cells in enumerate(cells_by_row))


def column_of(values: Sequence[str], header: str = "Reading", column: str = "A") -> str:
    """A header and one column of numbers below it."""
    return rows([text(f"{column}1", header)], *[[number(f"{column}{i + 2}", v)] for i, v in enumerate(values)])


def sheet_xml(sheet_data: str, merged: Sequence[str] = ()) -> bytes:
    merges = ""
    if merged:
        merges = f'<mergeCells count="{len(merged)}">' + "".join(f'<mergeCell ref="{m}"/>' for m in merged) + "</mergeCells>"
    return (f'<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<worksheet xmlns="{MAIN}">'
            f"<sheetData>{sheet_data}</sheetData>{merges}</worksheet>").encode()


def workbook_parts(
    sheets: Sequence[tuple[str, str] | tuple[str, str, str]], active: int = 0, merged: dict[str, Sequence[str]] | None = None
) -> dict[str, bytes]:
    """The parts of a workbook: each sheet given as (name, sheet data XML[, state "hidden"]), in tab order."""
    merged = merged or {}
    types = "".join(
        f'<Override PartName="/xl/worksheets/sheet{i + 1}.xml" '
        'ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/>'
        for i in range(len(sheets))
    )
    parts = {
        "[Content_Types].xml": (
            '<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">'
            '<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>'
            '<Default Extension="xml" ContentType="application/xml"/>'
            '<Override PartName="/xl/workbook.xml" '
            'ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/>'
            f"{types}</Types>"
        ).encode(),
        "_rels/.rels": (
            f'<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="{PACKAGE}"><Relationship Id="rId1" '
            f'Type="{RELATIONS}/officeDocument" Target="xl/workbook.xml"/></Relationships>'
        ).encode(),
    }
    entries = []
    relations = []
    for i, sheet in enumerate(sheets):
        name, data = sheet[0], sheet[1]
        state = f' state="{sheet[2]}"' if len(sheet) > 2 else ""
        entries.append(f'<sheet name="{name}" sheetId="{i + 1}"{state} r:id="rId{i + 1}"/>')
        relations.append(f'<Relationship Id="rId{i + 1}" Type="{RELATIONS}/worksheet" Target="worksheets/sheet{i + 1}.xml"/>')
        parts[f"xl/worksheets/sheet{i + 1}.xml"] = sheet_xml(data, merged.get(name, ()))
    parts["xl/workbook.xml"] = (
        f'<?xml version="1.0" encoding="UTF-8"?><workbook xmlns="{MAIN}" xmlns:r="{RELATIONS}">'
        f'<bookViews><workbookView activeTab="{active}"/></bookViews><sheets>{"".join(entries)}</sheets></workbook>'
    ).encode()
    parts["xl/_rels/workbook.xml.rels"] = (
        f'<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="{PACKAGE}">{"".join(relations)}</Relationships>'
    ).encode()
    return parts


def write_zip(path: Path, parts: dict[str, bytes], method: int = zipfile.ZIP_DEFLATED) -> Path:
    with zipfile.ZipFile(path, "w", method) as archive:
        for name, data in parts.items():
            archive.writestr(name, data)
    return path


def write_workbook(path: Path, *sheets, active: int = 0, merged: dict[str, Sequence[str]] | None = None) -> Path:
    """A workbook with the given sheets (see ``workbook_parts``)."""
    return write_zip(path, workbook_parts(sheets, active, merged))


def deflated(data: bytes) -> bytes:
    compressor = zlib.compressobj(9, zlib.DEFLATED, -15)
    return compressor.compress(data) + compressor.flush()


def write_raw_zip(path: Path, members: Sequence[tuple[str, bytes, int, int]]) -> Path:
    """A zip whose members are (name, deflated bytes, declared unpacked size, declared CRC): headers may lie.

    Laid out as the zip format's APPNOTE.TXT (PKWARE, sections 4.3.7 and 4.3.12) describes.
    """
    body = bytearray()
    directory = bytearray()
    for name, packed, size, crc in members:
        encoded = name.encode()
        offset = len(body)
        body += struct.pack("<4s5H3L2H", b"PK\x03\x04", 20, 0, 8, 0, 0, crc, len(packed), size, len(encoded), 0)
        body += encoded + packed
        directory += struct.pack(
            "<4s6H3L5H2L", b"PK\x01\x02", 20, 20, 0, 8, 0, 0, crc, len(packed), size, len(encoded), 0, 0, 0, 0, 0, offset
        )
        directory += encoded
    end = struct.pack("<4s4H2LH", b"PK\x05\x06", 0, 0, len(members), len(members), len(directory), len(body), 0)
    path.write_bytes(bytes(body + directory + end))
    return path


def lying_workbook(path: Path, real_sheet: bytes, declared: int) -> Path:
    """A workbook whose sheet part unpacks to ``real_sheet`` while its headers declare ``declared`` bytes."""
    parts = workbook_parts([("S", "")])
    members = []
    for name, data in parts.items():
        if name == "xl/worksheets/sheet1.xml":
            data_packed = deflated(real_sheet)
            members.append((name, data_packed, declared, zlib.crc32(real_sheet[:declared])))
        else:
            members.append((name, deflated(data), len(data), zlib.crc32(data)))
    return write_raw_zip(path, members)
