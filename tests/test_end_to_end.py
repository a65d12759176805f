"""End to end from the command line, as a script would use it: ``python -m rankwise report`` on every
demo file (invented readings) writes a signed workbook and a one-page PDF, ``verify`` finds it
intact, and finds it changed once a shown reading is edited. Each command runs in its own process
without a screen; the processes of a step run side by side to keep the test short."""

import os
import re
import subprocess
import sys
from pathlib import Path

import pytest
from openpyxl import load_workbook
from pypdf import PdfReader

from rankwise.records.readings_sheet import FIRST_ENTRY_ROW
from rankwise.wording import CAUTION_SHORT

DEMO = Path(__file__).resolve().parents[1] / "demo_files"
DEMO_FILES = sorted(p for p in DEMO.iterdir() if p.suffix in (".csv", ".xlsx"))
EXIT_DONE, EXIT_CHANGED = 0, 1
FINGERPRINT = re.compile(r"fingerprint ([0-9a-f]{64})")


def command(*words):
    """A running ``python -m rankwise`` with ``words``, offscreen, its output captured."""
    environment = dict(os.environ, QT_QPA_PLATFORM="offscreen")
    return subprocess.Popen([sys.executable, "-m", "rankwise", *map(str, words)], env=environment,
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, encoding="utf-8")


def finished(processes):
    """Wait for every process; (exit code, printed text, complaints) of each, in order."""
    results = []
    for process in processes:
        out, err = process.communicate(timeout=120)
        results.append((process.returncode, out, err))
    return results


def words_of(text):
    return " ".join(text.split())


@pytest.fixture(scope="module")
def reported(tmp_path_factory):
    """Every demo file reported: its source bytes before, the workbook, the PDF and what was printed."""
    folder = tmp_path_factory.mktemp("end_to_end")
    before = {path.name: path.read_bytes() for path in DEMO_FILES}
    outputs = {path.name: (folder / f"{path.stem}.xlsx", folder / f"{path.stem}.pdf") for path in DEMO_FILES}
    processes = [command("report", path, "--out", outputs[path.name][0], "--pdf", outputs[path.name][1],
                         "--signed-by", "Ann Lee", "--role", "process technician",
                         "--decision", "accept the change") for path in DEMO_FILES]
    results = dict(zip((p.name for p in DEMO_FILES), finished(processes)))
    return before, outputs, results


def test_demo_files_are_there():
    assert len(DEMO_FILES) >= 5, [p.name for p in DEMO_FILES]


@pytest.mark.parametrize("name", [p.name for p in DEMO_FILES])
def test_report_writes_the_workbook_and_a_one_page_pdf_with_the_caution(reported, name):
    before, outputs, results = reported
    code, out, err = results[name]
    assert code == EXIT_DONE, err
    workbook, pdf = outputs[name]
    assert workbook.is_file() and pdf.is_file()
    assert words_of(CAUTION_SHORT) in words_of(out)
    assert FINGERPRINT.search(out), out
    pages = PdfReader(pdf).pages
    assert len(pages) == 1
    printed = words_of(pages[0].extract_text())
    assert "Ann Lee" in printed
    assert words_of(CAUTION_SHORT)[:60] in printed
    assert (DEMO / name).read_bytes() == before[name]  # an opened file is never changed


def test_verify_finds_every_written_record_intact(reported):
    _, outputs, results = reported
    names = [name for name, (code, _, _) in results.items() if code == EXIT_DONE]
    assert names == [p.name for p in DEMO_FILES]
    checks = finished([command("verify", outputs[name][0]) for name in names])
    for name, (code, out, err) in zip(names, checks):
        assert code == EXIT_DONE, f"{name}: {out} {err}"
        assert "intact" in out
        assert FINGERPRINT.search(results[name][1]).group(1) in out


def test_verify_finds_an_edited_reading_and_names_its_cell(reported, tmp_path):
    _, outputs, _ = reported
    book = load_workbook(outputs[DEMO_FILES[0].name][0])
    cell = book["Readings as entered"].cell(row=FIRST_ENTRY_ROW, column=2)
    cell.value = cell.value + 1.0
    edited = tmp_path / "edited.xlsx"
    book.save(edited)
    [(code, out, err)] = finished([command("verify", edited)])
    assert code == EXIT_CHANGED, err
    assert f"cell {cell.coordinate}" in out
