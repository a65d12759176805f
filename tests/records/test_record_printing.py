"""Printing a record from a spreadsheet program: the verdict sheet on one page with the fingerprint
beside the sign-off, table headings repeated on every page, the record's decimal mark in number
cells, no line break inside a number, texts clear of the numbers beside them. Printed with
LibreOffice Calc headless (in a child process with a time limit) and read back with pypdf."""

import re
import shutil
import subprocess

import pytest
from openpyxl import load_workbook
from pypdf import PdfReader

from rankwise.readings import GroupColumn, ReadingSheet, parse_reading
from rankwise.records import ResultRecord, write_record
from rankwise.records.readings_sheet import FIRST_ENTRY_ROW
from rankwise.stats.analysis import Question, Settings
from rankwise.stats.service import run

from record_builders import paired_record, signoff

SOFFICE = shutil.which("soffice")
LIBREOFFICE_TIMEOUT_S = 600


def long_two_group_record():
    """Invented readings (15 parts per wheel, µm, typed with decimal commas): the null distribution
    of U has 226 values, several printed pages."""
    a = [f"0,{40 + (i * 7) % 9}" for i in range(15)]
    b = [f"0,{43 + (i * 5) % 8}" for i in range(15)]
    sheet = ReadingSheet([GroupColumn("Wheel A", unit="µm", cells=[parse_reading(t, decimal=",") for t in a]),
                          GroupColumn("Wheel B", unit="µm", cells=[parse_reading(t, decimal=",") for t in b])],
                         decimal=",")
    analysis = sheet.to_analysis(Question.TWO_GROUPS, Settings(characteristic="surface roughness"))
    return ResultRecord.now(analysis, sheet.snapshot(), run(analysis), signoff())


@pytest.fixture(scope="module")
def records(tmp_path_factory):
    folder = tmp_path_factory.mktemp("printing")
    paths = {"paired": folder / "paired.xlsx", "comma": folder / "comma.xlsx", "long": folder / "long.xlsx"}
    write_record(paths["paired"], paired_record())
    write_record(paths["comma"], paired_record(comma=True))
    write_record(paths["long"], long_two_group_record())
    return paths


@pytest.fixture(scope="module")
def printed(records, tmp_path_factory):
    """Each record printed to PDF by LibreOffice Calc: the text of every page."""
    if SOFFICE is None:
        pytest.skip("LibreOffice Calc (soffice) is not installed; resources/install.sh --test installs it")
    folder = tmp_path_factory.mktemp("printed")
    done = subprocess.run([SOFFICE, f"-env:UserInstallation={(folder / 'profile').as_uri()}", "--headless",
                           "--norestore", "--convert-to", "pdf", "--outdir", str(folder),
                           *map(str, records.values())],
                          capture_output=True, text=True, timeout=LIBREOFFICE_TIMEOUT_S, check=False)
    pages = {}
    for name in records:
        pdf = folder / f"{name}.pdf"
        assert pdf.exists(), done.stdout + done.stderr
        pages[name] = [page.extract_text() for page in PdfReader(str(pdf)).pages]
    return pages


def pages_of(pages, sheet):
    return [text for text in pages if re.search(rf"{sheet}, page \d+ of \d+", text)]


def test_the_verdict_sheet_prints_on_one_page_with_the_fingerprint_beside_the_signoff(records, printed):
    for name in records:
        verdict = pages_of(printed[name], "Verdict")
        assert len(verdict) == 1, name  # the footer counts the pages of the whole printout
        text = " ".join(verdict[0].split())
        assert "Fingerprint (SHA-256)" in text and "Signed at" in text and "This verdict supports" in text
    sheet = load_workbook(records["paired"])["Verdict"]
    labels = [sheet.cell(row=r, column=1).value for r in range(1, sheet.max_row + 1)]
    last_signature = max(r for r, label in enumerate(labels) if label == "Signed at")
    assert labels[last_signature + 1] == "Fingerprint (SHA-256)"
    assert sheet.page_setup.fitToHeight == 1 and sheet.page_setup.fitToWidth == 1


def test_every_printed_page_of_a_long_table_repeats_its_headings(records, printed):
    details = pages_of(printed["long"], "Details")
    assert len(details) >= 3
    for text in details:
        assert "Chance of exactly this" in text
    readings = pages_of(printed["long"], "Readings as entered")
    assert all("Wheel A" in text for text in readings)
    book = load_workbook(records["long"])
    heading_row = int(book["Details"].print_title_rows.split(":")[0].lstrip("$"))
    assert book["Details"].cell(row=heading_row, column=2).value == "Chance of exactly this"


def test_number_cells_print_with_the_records_decimal_mark(records, printed):
    comma = " ".join(pages_of(printed["comma"], "Verdict")[0].split())
    point = " ".join(pages_of(printed["paired"], "Verdict")[0].split())
    # Hollander & Wolfe (1999), 2nd ed., p. 39: exact two-sided p = 0.039 (0.0391 to four places).
    assert "0,0391" in comma and "0.0391" not in comma
    assert "0.0391" in point and "0,0391" not in point
    readings = " ".join(pages_of(printed["comma"], "Readings as entered")[0].split())
    assert "2,48" in readings and "2.48" not in readings
    for name, tag in (("comma", "[$-407]"), ("paired", "[$-409]")):
        book = load_workbook(records[name])
        numbers = [cell for sheet in book.worksheets[:4] for row in sheet.iter_rows() for cell in row
                   if isinstance(cell.value, (int, float)) and not isinstance(cell.value, bool)]
        assert numbers and all(cell.number_format.startswith(tag) for cell in numbers), name


def test_no_line_may_break_inside_a_number_and_texts_keep_clear_of_numbers(records):
    book = load_workbook(records["comma"])
    wrapped = [cell.value for sheet in book.worksheets[:4] for row in sheet.iter_rows() for cell in row
               if isinstance(cell.value, str) and cell.alignment.wrap_text]
    assert any("\u2011" in text for text in wrapped)  # the interval's negative ends, -0,786 and -0,010
    for text in wrapped:
        assert not re.search(r"[ (]-\d", text), text  # a plain hyphen-minus before a digit may break
        assert not re.search(r"\d [%µ]", text), text  # a plain space between a number and its unit may break
    readings = book["Readings as entered"]
    scrap = readings.cell(row=FIRST_ENTRY_ROW + 9, column=2)
    assert scrap.value == "scrap" and scrap.alignment.indent >= 1  # not "10scrap" beside the entry number


def test_printed_pages_carry_the_cautions_note(printed):
    for name, pages in printed.items():
        verdict = " ".join(pages_of(pages, "Verdict")[0].split())
        assert "does not replace, the plant's own procedures" in verdict, name
