"""Checks on a workbook's zip container and XML before any spreadsheet reader sees it.

A spreadsheet reader trusts the file: it unpacks what the zip says and makes room for every cell
between A1 and the last address it finds, so a 1.4 kB workbook with one cell at XFD1048576 asks
for hundreds of gigabytes and aborts the process. Here every part is unpacked once, in bounded
pieces, and measured first: the unpacked size against what the zip declares (a part that unpacks
to more than its header says is refused at once), the stretch between two XML tags (a cell far
too long), and every cell address of every sheet (rows, columns and the filled cells the reader
would make room for). The XLSX format's own limits (1,048,576 rows, 16,384 columns, ECMA-376
Part 1, section 18.3.1.4 and 18.3.1.73; from memory) mark an address as damaged.

Cell addresses are found with vectorised byte comparisons, not per cell in Python: workbooks
written by spreadsheet programs and libraries give every cell its address as ``<c r="B7"``. A
sheet laid out otherwise (cells without addresses, other attribute order) is walked tag by tag,
as the reader would, when it is small enough for that to take a moment.
"""

from __future__ import annotations

import re
import struct
import zipfile
import zlib
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from rankwise.readings.errors import ReadingsError

MAX_UNPACKED_BYTES = 512 << 20
"""A workbook unpacking to more than this (512 MiB) is refused: no readings export is that big."""
MAX_PACKING_RATIO = 100
"""A workbook (over ``RATIO_FLOOR_BYTES`` unpacked) packed more tightly than this marks a zip bomb."""
RATIO_FLOOR_BYTES = 20 << 20
"""Below this unpacked size the packing ratio is not looked at (small parts pack very tightly)."""
MAX_ROWS = 1_048_576
"""The last row an XLSX sheet can have."""
MAX_COLUMNS = 16_384
"""The last column an XLSX sheet can have (XFD)."""
MAX_SHEET_CELLS = 6_000_000
"""Cells from A1 to the last filled cell the reader may make room for (about 10^6 rows by 6 columns)."""
MAX_ENTRY_BYTES = 1 << 20
"""The longest stretch of a workbook's XML without a tag: one cell's text can be no longer."""
MAX_IRREGULAR_SHEET_BYTES = 64 << 20
"""A sheet whose cells are not all addressed is walked tag by tag only up to this size."""

_PIECE = 4 << 20
"""Unpacked bytes looked at in one piece."""
_LOCAL_HEADER = struct.Struct("<4s2B4HL2L2H")
_TINY_NUMBER = re.compile(rb"[eE]-0*[1-9][0-9]{2}|\.0{300}")
"""A stored number's text that may be too small for a binary float (2e-400 would read as 0)."""
_IRREGULAR_TAG = re.compile(rb"""<(/?)(?:[^\s/>:]+:)?(row|c)(?=[\s/>])((?:[^>"']|"[^"]*"|'[^']*')*?)(/?)>""")
_ADDRESS_ATTRIBUTE = re.compile(rb"""\sr\s*=\s*(["'])(.*?)\1""", re.DOTALL)
_ADDRESS = re.compile(rb"([A-Za-z]{0,3})([0-9]{1,7})")
_DOCUMENT_TYPE = (b"<!DOCTYPE", b"<!ENTITY")
_SKIPPED_FOLDERS = ("customxml/", "docprops/")
"""Parts no reader here looks at; only their sizes are checked."""


@dataclass
class SheetExtent:
    """What one XML part would make a reader build: the last filled row and column (1-based) and the filled cells.

    Attributes:
        damaged: plain words on a damaged cell address, or "".
        tiny: stored numbers too small for a binary float, by 0-based (row, column), with their text.
    """

    rows: int = 0
    columns: int = 0
    filled: int = 0
    damaged: str = ""
    tiny: dict[tuple[int, int], str] = field(default_factory=dict)

    @property
    def cells(self) -> int:
        """Cells from A1 to the last filled cell."""
        return self.rows * self.columns


@dataclass(frozen=True)
class WorkbookCheck:
    """A workbook's parts, measured: the extent of every XML part, and the small parts that tell the sheets apart."""

    extents: dict[str, SheetExtent]
    """By part name as stored in the zip."""
    texts: dict[str, bytes]
    """The workbook part and its relationships (lower-case names), for the sheets' order, paths and the active sheet."""

    def extent_of(self, part: str | None) -> SheetExtent:
        """The extent of the part named ``part`` (compared as the reader does, ignoring case); the largest of all when unknown."""
        if part is not None:
            matching = [extent for name, extent in self.extents.items() if name.lower() == part.lower()]
            if matching:
                return max(matching, key=lambda e: (bool(e.damaged), e.cells, e.filled))
        return max(self.extents.values(), key=lambda e: (bool(e.damaged), e.cells, e.filled), default=SheetExtent())


_RECENT: dict[tuple[str, int, int], WorkbookCheck] = {}
"""The last few workbooks measured, by path, size and change time: a file opened twice in a row
(is it a record? then its readings) is measured once."""


def check_workbook(path: Path) -> WorkbookCheck:
    """Measure every part of the workbook at ``path``; refuse a damaged or suspicious one with a plain sentence."""
    try:
        status = path.stat()
        key = (str(path.resolve()), status.st_size, status.st_mtime_ns)
    except OSError as error:
        raise damaged(path) from error
    if key in _RECENT:
        return _RECENT[key]
    check = _measure(path)
    if len(_RECENT) >= 4:
        _RECENT.pop(next(iter(_RECENT)))
    _RECENT[key] = check
    return check


def within_limits(check: WorkbookCheck) -> bool:
    """True when no sheet of the workbook is damaged or spans more cells than a readings export holds."""
    return all(not e.damaged and e.cells <= MAX_SHEET_CELLS and e.filled <= MAX_SHEET_CELLS for e in check.extents.values())


def _measure(path: Path) -> WorkbookCheck:
    try:
        with zipfile.ZipFile(path) as archive:
            members = archive.infolist()
    except (zipfile.BadZipFile, OSError, ValueError, EOFError, NotImplementedError, RuntimeError) as error:
        raise damaged(path) from error
    _check_declared_sizes(path, members)
    names = {member.filename.lower() for member in members}
    if "xl/workbook.xml" not in names:
        if "content.xml" in names:
            raise ReadingsError(f"'{path.name}' is an OpenDocument spreadsheet; save it as XLSX or CSV and open that.")
        raise ReadingsError(f"'{path.name}' is a zip archive, not an Excel workbook; open a CSV or XLSX file of readings.")
    extents: dict[str, SheetExtent] = {}
    texts: dict[str, bytes] = {}
    wanted_texts = ("xl/workbook.xml", "xl/_rels/workbook.xml.rels")
    try:
        with open(path, "rb") as stream:
            for member in members:
                if member.is_dir():
                    continue
                keep = member.filename.lower() in wanted_texts and member.filename.lower() not in texts
                scanner = _PartScanner(path, keep)
                looked_at = not member.filename.lower().startswith(_SKIPPED_FOLDERS)
                for piece in _unpacked_pieces(path, stream, member):
                    if looked_at:
                        scanner.feed(piece)
                scanner.finish()
                if scanner.irregular:
                    # walk the whole part again from its start, tag by tag (its size is bounded, see _look_at)
                    scanner.extent = _walk_irregular(b"".join(_unpacked_pieces(path, stream, member)))
                if scanner.is_xml:
                    extents[member.filename] = scanner.extent
                if keep:
                    texts[member.filename.lower()] = scanner.kept
    except (OSError, zlib.error, struct.error) as error:
        raise damaged(path) from error
    return WorkbookCheck(extents, texts)


def damaged(path: Path) -> ReadingsError:
    """The error for a workbook that cannot be read as it stands."""
    return ReadingsError(
        f"The workbook '{path.name}' is damaged and cannot be opened; open it in a spreadsheet program "
        "and save it again, or export the sheet as CSV."
    )


def _suspicious(path: Path, what: str) -> ReadingsError:
    return ReadingsError(f"The workbook '{path.name}' {what}; it is damaged or not a real workbook, so it was not opened.")


def _check_declared_sizes(path: Path, members: list[zipfile.ZipInfo]) -> None:
    unpacked = sum(member.file_size for member in members)
    packed = path.stat().st_size
    per_part = any(
        member.file_size > 10_000_000 and member.file_size > 2 * MAX_PACKING_RATIO * max(member.compress_size, 1)
        for member in members
    )
    whole = unpacked > RATIO_FLOOR_BYTES and unpacked > MAX_PACKING_RATIO * max(packed, 1)
    if unpacked > MAX_UNPACKED_BYTES or per_part or whole:
        raise _suspicious(path, f"would unpack to {unpacked / 1e9:,.1f} GB from {packed / 1e6:,.1f} MB, far more than any readings export")
    for member in members:
        if member.flag_bits & 0x1:
            raise ReadingsError(
                f"The workbook '{path.name}' is protected by a password; save a copy without the password and open that."
            )
        if member.compress_type not in (zipfile.ZIP_STORED, zipfile.ZIP_DEFLATED):
            raise damaged(path)


def _unpacked_pieces(path: Path, stream, member: zipfile.ZipInfo):
    """The member's unpacked bytes in pieces, checked against the size and checksum the zip declares."""
    stream.seek(member.header_offset)
    header = stream.read(_LOCAL_HEADER.size)
    if len(header) != _LOCAL_HEADER.size or header[:4] != b"PK\x03\x04":
        raise damaged(path)
    fields = _LOCAL_HEADER.unpack(header)
    stream.seek(member.header_offset + _LOCAL_HEADER.size + fields[-2] + fields[-1])
    left = member.compress_size
    inflate = zlib.decompressobj(-15) if member.compress_type == zipfile.ZIP_DEFLATED else None
    total, checksum, pending = 0, 0, b""
    while True:
        if inflate is None:
            piece = stream.read(min(left, _PIECE))
            left -= len(piece)
            done = left == 0 or not piece
        else:
            if not pending and left > 0:
                pending = stream.read(min(left, 1 << 20))
                left = left - len(pending) if pending else 0
            piece = inflate.decompress(pending, _PIECE)
            pending = inflate.unconsumed_tail
            done = inflate.eof or (not piece and not pending and left == 0)
        total += len(piece)
        if total > member.file_size:
            raise _suspicious(path, f"holds a part ('{member.filename[:60]}') that unpacks to more than its header says")
        if piece:
            checksum = zlib.crc32(piece, checksum)
            yield piece
        if done:
            break
    if total != member.file_size or checksum != member.CRC or (inflate is not None and not inflate.eof):
        raise damaged(path)


class _PartScanner:
    """Looks at one part's unpacked pieces in order: XML or not, tag-free stretches, cell addresses."""

    def __init__(self, path: Path, keep: bool) -> None:
        self.path = path
        self.keep = keep
        self.kept = b""
        self.is_xml: bool | None = None
        self.extent = SheetExtent()
        self.carry = b""
        self.since_tag = 0
        self.irregular = False
        """True once a cell without the usual address is met: the part is then walked as a whole."""
        self.size = 0

    def feed(self, piece: bytes) -> None:
        if self.keep:
            self.kept += piece
            if len(self.kept) > 4 * MAX_ENTRY_BYTES:
                raise _suspicious(self.path, "has a workbook part far larger than any workbook needs")
        if self.is_xml is None:
            start = piece.lstrip(b"\xef\xbb\xbf \t\r\n")[:1]
            if not start:
                return
            self.is_xml = start == b"<"
        if not self.is_xml:
            return
        self.size += len(piece)
        data = self.carry + piece
        cut = data.rfind(b"<")
        if cut < 0:
            self.since_tag += len(data)
            self._check_stretch(self.since_tag)
            self.carry = b""
            return
        self._look_at(data[:cut])
        self.carry = data[cut:]
        self._check_stretch(len(self.carry))

    def finish(self) -> None:
        if self.is_xml:
            self._look_at(self.carry)

    def _check_stretch(self, length: int) -> None:
        if length > MAX_ENTRY_BYTES:
            raise ReadingsError(
                f"The workbook '{self.path.name}' holds a cell of more than {MAX_ENTRY_BYTES:,} characters, far too "
                "long for a reading; check that this is the right file."
            )

    def _look_at(self, data: bytes) -> None:
        """Check ``data``, a run of whole tags (it starts at a tag, or at the part's start)."""
        if not data:
            return
        for marker in _DOCUMENT_TYPE:
            if marker in data:
                raise _suspicious(self.path, "declares its own XML document type, which workbooks never do")
        array = np.frombuffer(data, dtype=np.uint8)
        opens = np.flatnonzero(array == 60)
        if opens.size:
            self._check_stretch(self.since_tag + int(opens[0]))
            if opens.size > 1:
                self._check_stretch(int(np.diff(opens).max()))
            self.since_tag = len(data) - int(opens[-1])
        else:
            self.since_tag += len(data)
            self._check_stretch(self.since_tag)
        if not self.irregular and not _measure_addressed_cells(array, opens, data, self.extent):
            self.irregular = True
        if self.irregular and self.size > MAX_IRREGULAR_SHEET_BYTES:
            raise _suspicious(self.path, "holds a very large sheet laid out unlike any spreadsheet program writes it")


def _walk_irregular(data: bytes) -> SheetExtent:
    """Follow the tags as the reader does: a cell without an address goes right of the last one, rows count on.

    Every cell counts, with a value or without (the reader leaves out empty ones, so this errs on the safe side).
    """
    extent = SheetExtent()
    row = column = 0
    look_for_tiny = bool(_TINY_NUMBER.search(data))
    for match in _IRREGULAR_TAG.finditer(data):
        closing, name, attributes, empty = match.groups()
        address = None if closing else _ADDRESS_ATTRIBUTE.search(attributes)
        if name == b"row":
            if address:
                parsed = _address(address[2], need_column=False)
                if parsed is None:
                    extent.damaged = f"row address '{address[2][:20].decode('latin-1')}'"
                    return extent
                row = parsed[0]
            if closing or empty:
                row, column = row + 1, 0
            continue
        if closing:
            continue
        where = (row, column)
        if address:
            where = _address(address[2], need_column=True)
            if where is None:
                extent.damaged = f"cell address '{address[2][:20].decode('latin-1')}'"
                return extent
        if where[0] >= MAX_ROWS or where[1] >= MAX_COLUMNS:
            extent.damaged = "a cell beyond the last row or column a sheet can have"
            return extent
        extent.filled += 1
        extent.rows = max(extent.rows, where[0] + 1)
        extent.columns = max(extent.columns, where[1] + 1)
        if look_for_tiny and not empty:
            tiny = _tiny_value(data, match.start())
            if tiny:
                extent.tiny[where] = tiny
        column = where[1] + 1
    return extent


def _address(text: bytes, need_column: bool) -> tuple[int, int] | None:
    """0-based (row, column) of an address such as b"XFD7" (column -1 when it has none); None when damaged."""
    match = _ADDRESS.fullmatch(text)
    if match is None or (need_column and not match[1]):
        return None
    row = int(match[2]) - 1
    column = -1
    for letter in match[1].upper():
        column = (column + 1) * 26 + letter - 65
    if row < 0 or row >= MAX_ROWS or column >= MAX_COLUMNS:
        return None
    return row, column


def _tiny_value(data: bytes, cell_start: int) -> str:
    """The stored number of the cell whose tag starts at ``cell_start`` when too small for a float (2e-400), else ""."""
    end = data.find(b"c>", cell_start + 2)
    end = len(data) if end < 0 else end
    value_start = data.find(b"v>", cell_start, end)
    if value_start < 0:
        return ""
    value_end = data.find(b"<", value_start + 2)
    text = data[value_start + 2: value_end if value_end >= 0 else len(data)].strip()
    if not _TINY_NUMBER.search(text):
        return ""
    try:
        value = float(text)
    except ValueError:
        return ""
    mantissa = re.split(rb"[eE]", text)[0]
    if abs(value) < _SMALLEST_NORMAL and re.search(rb"[1-9]", mantissa):
        return text.decode("ascii", "replace")
    return ""


_SMALLEST_NORMAL = 2.2250738585072014e-308
"""The smallest positive normal binary64 number (IEEE 754; sys.float_info.min)."""
_AFTER_NAME = np.zeros(256, dtype=bool)
_AFTER_NAME[[32, 9, 10, 13, 62, 47]] = True
"""Bytes that end an element's name (whitespace, ">" and "/")."""
_NAME_BREAK = np.zeros(256, dtype=bool)
_NAME_BREAK[[32, 9, 10, 13, 62, 34, 39]] = True


def _cell_tags(array: np.ndarray, opens: np.ndarray) -> np.ndarray:
    """Positions of the "c" of every cell start tag (``<c ...`` or ``<x:c ...``)."""
    if array.size < 3:
        return np.empty(0, dtype=np.intp)
    name = np.flatnonzero(array[1:-1] == 99) + 1
    name = name[_AFTER_NAME[array[name + 1]]]
    if not name.size:
        return name
    before = array[name - 1]
    plain = name[before == 60]
    prefixed = name[before == 58]
    if prefixed.size and opens.size:
        # a prefixed name: the last "<" before it is near, with only name characters between
        last = np.searchsorted(opens, prefixed) - 1
        starts = opens[np.maximum(last, 0)]
        ok = (last >= 0) & (prefixed - starts <= 40) & (prefixed > starts)
        span = np.arange(41)
        between = np.minimum(starts[:, None] + span[None, :], prefixed[:, None])
        ok &= ~(_NAME_BREAK[array[between]].any(axis=1))
        return np.sort(np.concatenate([plain, prefixed[ok]]))
    return plain


def _measure_addressed_cells(array: np.ndarray, opens: np.ndarray, data: bytes, extent: SheetExtent) -> bool:
    """Add the cells of ``data`` to ``extent`` when every cell tag starts ``c r="ADDRESS"``; False otherwise.

    Every cell counts, with a value or without (the reader leaves out empty ones, so this errs on the safe side).
    """
    cells = _cell_tags(array, opens)
    if not cells.size:
        return True
    padded = np.concatenate([array, np.zeros(16, dtype=np.uint8)]) if cells[-1] + 16 > array.size else array
    tag = np.lib.stride_tricks.sliding_window_view(padded, 16)[cells]
    quote = tag[:, 4]
    regular = (tag[:, 1] == 32) & (tag[:, 2] == 114) & (tag[:, 3] == 61) & ((quote == 34) | (quote == 39))
    if not regular.all():
        return False
    window = tag[:, 5:]
    upper = window[:, :4] & 0xDF
    letters = np.argmin((upper >= 65) & (upper <= 90), axis=1)
    digit = (window >= 48) & (window <= 57)
    end = np.argmax((np.arange(window.shape[1])[None, :] >= letters[:, None]) & ~digit, axis=1)
    digits = end - letters
    sound = (window[np.arange(len(cells)), end] == quote) & (letters >= 1) & (digits >= 1) & (digits <= 7)
    number = np.lib.stride_tricks.sliding_window_view(padded, 8)[cells + 5 + np.minimum(letters, 3)]
    sound &= number[:, 0] != 48  # no row 0, and no leading zeros (never written)
    if not sound.all():
        bad = int(np.flatnonzero(~sound)[0])
        start = int(cells[bad]) + 5
        text = data[start:start + 12].split(bytes([int(quote[bad])]))[0]
        extent.damaged = f"cell address '{text.decode('latin-1')}'"
        return True
    # the largest row and column: among the longest numbers and letter runs, the greatest in byte order
    longest = digits == digits.max()
    keys = np.ascontiguousarray(number[longest]).view(">u8").ravel()
    width = int(digits.max())
    keys &= np.uint64(((1 << (8 * width)) - 1) << (8 * (8 - width)))
    last = np.flatnonzero(longest)[int(np.argmax(keys))]
    row = int(data[int(cells[last]) + 5 + int(letters[last]): int(cells[last]) + 5 + int(end[last])])
    widest = letters == letters.max()
    packed = np.zeros(int(widest.sum()), dtype=np.int64)
    for k in range(int(letters.max())):
        packed = packed * 256 + upper[widest, k]
    last = np.flatnonzero(widest)[int(np.argmax(packed))]
    column = 0
    for letter in bytes(upper[last, : int(letters[last])]):
        column = column * 26 + letter - 64
    if row > MAX_ROWS or column > MAX_COLUMNS:
        extent.damaged = "a cell beyond the last row or column a sheet can have"
        return True
    extent.filled += len(cells)
    extent.rows = max(extent.rows, row)
    extent.columns = max(extent.columns, column)
    if b"e-" in data or b"E-" in data or b".000000" in data:
        for match in _TINY_NUMBER.finditer(data):
            k = int(np.searchsorted(cells, match.start())) - 1
            if k >= 0:
                tiny = _tiny_value(data, int(cells[k]))
                if tiny:
                    address = data[int(cells[k]) + 5: int(cells[k]) + 5 + int(end[k])]
                    extent.tiny[_address(address, need_column=True)] = tiny
    return True


def sheet_parts(check: WorkbookCheck) -> dict[str, str]:
    """Each sheet's name and the part the reader takes it from (as the reader finds it: workbook order, first of a name)."""
    workbook = check.texts.get("xl/workbook.xml", b"")
    relations = check.texts.get("xl/_rels/workbook.xml.rels", b"")
    targets = {}
    for tag in re.finditer(rb"<(?:[^\s/>:]+:)?Relationship\b([^>]*)>", relations):
        ident = re.search(rb"""\sId\s*=\s*["']([^"']*)["']""", tag[1])
        target = re.search(rb"""\sTarget\s*=\s*["']([^"']*)["']""", tag[1])
        if ident and target:
            targets.setdefault(ident[1], target[1].decode("utf-8", "replace"))
    parts: dict[str, str] = {}
    for tag in re.finditer(rb"<(?:[^\s/>:]+:)?sheet\s([^>]*)>", workbook):
        name = re.search(rb"""\sname\s*=\s*["']([^"']*)["']""", b" " + tag[1])
        ident = re.search(rb"""\s(?:r|relationships):id\s*=\s*["']([^"']*)["']""", b" " + tag[1])
        if not name or not ident or ident[1] not in targets:
            continue
        target = targets[ident[1]]
        path = target[1:] if target.startswith("/xl/") else target if target.startswith("xl/") else f"xl/{target}"
        parts.setdefault(_unescape(name[1].decode("utf-8", "replace")), path)
    return parts


def active_sheet_position(check: WorkbookCheck) -> int:
    """The 0-based position of the sheet the workbook opens on (its active tab), 0 when it does not say."""
    match = re.search(rb"""<(?:[^\s/>:]+:)?workbookView\b[^>]*\sactiveTab\s*=\s*["']([0-9]{1,5})["']""",
                      check.texts.get("xl/workbook.xml", b""))
    return int(match[1]) if match else 0


def _unescape(text: str) -> str:
    for escaped, plain in (("&lt;", "<"), ("&gt;", ">"), ("&quot;", '"'), ("&apos;", "'"), ("&amp;", "&")):
        text = text.replace(escaped, plain)
    return text


def describe_extent(extent: SheetExtent) -> str:
    """Plain words for the area a sheet spans: "1,048,576 rows and 16,384 columns"."""
    return f"{extent.rows:,} row{'s' if extent.rows != 1 else ''} and {extent.columns:,} column{'s' if extent.columns != 1 else ''}"
