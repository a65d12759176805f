"""Writing one cell of a result workbook: numbers as numbers, dates as dates, text never as a formula."""

from __future__ import annotations

import math
import re
from datetime import datetime
from functools import lru_cache

from openpyxl.styles import Alignment, Font
from openpyxl.utils import get_column_letter
from openpyxl.worksheet.worksheet import Worksheet

from rankwise.wording.numbers import MISSING
from rankwise.wording.verdict_types import KeyNumber

FORMULA_STARTS = ("=", "+", "-", "@")
"""A text beginning with one of these would be taken for a formula by a spreadsheet program."""

BOLD = Font(bold=True)
TITLE = Font(bold=True, size=14)
DATE_TIME_FORMAT = "yyyy-mm-dd hh:mm:ss"
LINE_HEIGHT = 15.0
"""Points per line of text at the default font size; wrapped cells get a row height of whole lines."""
PAGE_FOOTER = "&A, page &P of &N"
"""Printed at the foot of every page: the sheet's name and the page number out of the sheet's pages."""

DECIMAL_MARK_TAGS = {".": "[$-409]", ",": "[$-407]"}
"""Language tags of number formats: English (United States) writes a decimal point, German
(Germany) a decimal comma (Windows language identifiers 0x0409 and 0x0407)."""
_MINUS_BEFORE_DIGIT = re.compile(r"(?<=[ (])-(?=\d)")
"""A minus sign inside a text, after a space or bracket (a text that starts with "-" is kept as typed)."""
_SPACE_BEFORE_UNIT = re.compile(r"(?<=\d) (?=[%‰°]|µ|(?:mm|cm|kg|Nm|MPa|bar|HRC)\b)")
"""The space between a number and its per cent sign or unit (the units the shop floor writes most)."""
_LEADING_NUMBER = re.compile(r"^[-+]?\d+(?:[.,](\d+))?")
"""A number at the start of a text, written with either decimal mark."""


def put(sheet: Worksheet, row: int, column: int, value: object, number_format: str | None = None,
        *, bold: bool = False, wrap: bool = False, indent: bool = False) -> None:
    """Write ``value`` at (row, column), 1-based.

    Text is always stored as text: a text that begins with = + - or @ is marked as a string and
    quote-prefixed, so no spreadsheet program runs it as a formula. Non-finite numbers and None
    leave the cell empty, apart from a "—" for a missing value. A wrapped text never breaks a line
    inside a number (``numbers_kept_whole``). Datetimes are stored as dates
    (without the UTC offset, which Excel cannot hold; write the offset beside them). Every cell
    sits at the top of its row, level with a wrapped text beside it; ``indent`` moves a text one
    step in from the left, clear of a number that ends at the edge of the cell before it.
    """
    cell = sheet.cell(row=row, column=column)
    if value is None:
        return
    if isinstance(value, float) and not math.isfinite(value):
        value = MISSING
    if isinstance(value, datetime):
        cell.value = value.replace(tzinfo=None, microsecond=0)
        cell.number_format = DATE_TIME_FORMAT
    elif isinstance(value, str):
        cell.value = numbers_kept_whole(value) if wrap else value
        cell.data_type = "s"
        if value.startswith(FORMULA_STARTS):
            cell.quotePrefix = True
    else:
        cell.value = value
        if number_format:
            cell.number_format = number_format
    if bold:
        cell.font = BOLD
    cell.alignment = _alignment(wrap, indent)


@lru_cache(maxsize=None)
def _alignment(wrap: bool, indent: bool) -> Alignment:
    """One shared alignment per kind of cell: openpyxl finds a style it already holds by identity
    before comparing field by field, so tens of thousands of cells are written several times faster."""
    return Alignment(horizontal="left" if indent else None, vertical="top", wrap_text=wrap or None,
                     indent=1 if indent else 0)


def put_paragraph(sheet: Worksheet, row: int, first_column: int, last_column: int, text: str,
                  *, bold: bool = False) -> None:
    """Write a long ``text`` across columns ``first_column`` to ``last_column``, wrapped, with the
    row made tall enough for it, so that neither screen nor printout cuts it off."""
    put(sheet, row, first_column, text, bold=bold, wrap=True)
    if last_column > first_column:
        sheet.merge_cells(start_row=row, start_column=first_column, end_row=row, end_column=last_column)
    width = sum(column_width(sheet, column) for column in range(first_column, last_column + 1))
    fit_row_height(sheet, row, text, width)


def numbers_kept_whole(text: str) -> str:
    """``text`` with no place where a line may break inside a number: a minus sign before a digit
    becomes the non-breaking hyphen U+2011, and the space between a number and its unit or per cent
    sign a no-break space U+00A0 (Unicode Standard Annex #14, line breaking classes GL)."""
    text = _MINUS_BEFORE_DIGIT.sub("\u2011", text)
    return _SPACE_BEFORE_UNIT.sub("\u00a0", text)


def with_decimal_mark(workbook, mark: str) -> None:
    """Tag every number format with a language whose decimal mark is ``mark`` (LibreOffice Calc then
    shows the record's mark whatever the reader's settings; measured with soffice 7.4). Dates keep
    their formats."""
    tag = DECIMAL_MARK_TAGS.get(mark, DECIMAL_MARK_TAGS["."])
    for sheet in workbook.worksheets:
        for row in sheet.iter_rows():
            for cell in row:
                if (isinstance(cell.value, (int, float)) and not isinstance(cell.value, bool)
                        and not cell.number_format.startswith("[$-")):
                    cell.number_format = tag + cell.number_format


def column_width(sheet: Worksheet, column: int) -> float:
    """A column's width in characters (the spreadsheet default, 8.43, when none was set)."""
    return sheet.column_dimensions[get_column_letter(column)].width or 8.43


def fit_row_height(sheet: Worksheet, row: int, text: str, width: float) -> None:
    """Make ``row`` tall enough for ``text`` wrapped in ``width`` characters (never lower it).

    Spreadsheet programs do not grow a row for wrapped text when a file is opened, so the height
    is estimated here: a character of text is taken as one unit of column width (common
    practice, no source), each line break starts a line.
    """
    per_line = max(1, int(width) - 1)
    lines = sum(max(1, math.ceil(len(part) / per_line)) for part in str(text).split("\n"))
    current = sheet.row_dimensions[row].height or LINE_HEIGHT
    sheet.row_dimensions[row].height = max(current, LINE_HEIGHT * lines)


def set_print_setup(sheet: Worksheet, *, landscape: bool = False, title_row: int | None = None,
                    one_page: bool = False) -> None:
    """Print the sheet on A4 scaled to the page width (as many pages down as needed, or with
    ``one_page`` all on one page), with the sheet's name and page numbers at the foot, and
    ``title_row`` repeated at the top of every page."""
    sheet.page_setup.paperSize = sheet.PAPERSIZE_A4
    sheet.page_setup.orientation = "landscape" if landscape else "portrait"
    sheet.page_setup.fitToWidth = 1
    sheet.page_setup.fitToHeight = 1 if one_page else 0
    sheet.sheet_properties.pageSetUpPr.fitToPage = True
    sheet.print_options.gridLines = False
    sheet.page_margins.left = sheet.page_margins.right = 0.5
    sheet.oddFooter.center.text = PAGE_FOOTER
    if title_row is not None:
        sheet.print_title_rows = f"{title_row}:{title_row}"


def reading_format(decimals: int | None, unit: str = "") -> str:
    """The number format that shows a reading at the gauge's resolution, with its unit."""
    if decimals is None:
        base = "General"
    elif decimals == 0:
        base = "0"
    else:
        base = "0." + "0" * decimals
    if unit:
        return f'{base}" {unit.replace(chr(34), "")}"'
    return base


def key_number_cell(number: KeyNumber) -> tuple[object, str | None]:
    """What to store for a key number: its raw value with a format that shows it as ``text``,
    or the text itself when the number has no value or a value a format cannot show.

    The text may be written with a decimal comma; a number format always uses a point (the
    spreadsheet program shows it with the reader's own decimal mark), and a bound such as
    "< 0,0001" is kept as written.
    """
    text = number.text
    if number.value is None or not math.isfinite(number.value) or text == MISSING:
        return text, None
    if text.startswith("<"):
        bound = text[1:].strip()
        decimals = _decimals_of(bound)
        return number.value, f'[<{bound.replace(",", ".")}]"< {bound}";' + reading_format(decimals)
    if text.endswith("%"):
        digits = _decimals_of(text[:-1].strip())
        return number.value, "0" + ("." + "0" * digits if digits else "") + "%"
    match = _LEADING_NUMBER.match(text)
    if match is None or "e" in text.lower()[match.end():match.end() + 1]:
        return number.value, "General"
    decimals = len(match.group(1) or "")
    unit = text[match.end():].strip()
    return number.value, reading_format(decimals, unit)


def _decimals_of(number_text: str) -> int:
    """Digits after the decimal mark (point or comma) of a written number."""
    for mark in ".,":
        if mark in number_text:
            return len(number_text.partition(mark)[2])
    return 0
