"""A signed record of a many-characteristics comparison: written, read back, verified, and edits found."""

from pathlib import Path

import pytest
from openpyxl import load_workbook

from rankwise.readings import open_characteristics
from rankwise.records import read_record, verify_record, write_record
import rankwise.records.record as record_module
from rankwise.records.canonical import canonical_bytes, encode, sha256_hex
from rankwise.records.characteristics_sheets import DETAILS_TITLE, SUMMARY_TITLE
from rankwise.records.readings_sheet import FIRST_ENTRY_ROW
from rankwise.records.readings_sheet import SHEET_TITLE as READINGS_TITLE
from rankwise.records.record import ResultRecord
from rankwise.records.workbook import CHUNK, PROGRAM_SHEET, load_workbook_safely, read_program_data
from rankwise.stats import CharacteristicsResult, Question, Settings, compare_two, run
from rankwise.stats.results import Result
from rankwise.wording import CAUTION_SHORT

from record_builders import paired_record, signoff
from test_record_verify import edited_copy

DEMO = Path(__file__).resolve().parents[2] / "demo_files" / "housing_two_dies.csv"
CHOSEN = ["Bore depth", "Face flatness", "Mass", "Hardness"]


def housing_record(adjust="holm"):
    table = open_characteristics(DEMO)
    analysis = table.to_analysis("old die", "new die", names=CHOSEN, settings=Settings(adjust=adjust))
    return ResultRecord.now(analysis, table.snapshot("old die", "new die", names=CHOSEN), run(analysis), signoff())


@pytest.fixture(scope="module")
def written(tmp_path_factory):
    path = tmp_path_factory.mktemp("characteristics") / "housing.xlsx"
    record = housing_record()
    write_record(path, record)
    return path, record


def test_the_record_reads_back_as_the_characteristics_result(written):
    path, record = written
    back = read_record(path)
    assert back.analysis.question is Question.CHARACTERISTICS
    assert isinstance(back.result, CharacteristicsResult)
    assert encode(back.result, Result) == encode(record.result, Result)
    assert back.analysis == record.analysis and back.snapshot == record.snapshot
    mass = back.analysis.characteristics[2]
    assert mass.name == "Mass"
    assert back.result.row("Mass").result == compare_two(mass.a.values, mass.b.values, name_a="old die", name_b="new die")


def test_an_untouched_record_is_intact(written):
    verification = verify_record(written[0])
    assert verification.status == "intact", verification.differences


def test_the_sheets_hold_summary_details_and_readings(written):
    path, record = written
    book = load_workbook(path)
    assert [s.title for s in book.worksheets if s.sheet_state == "visible"] == [SUMMARY_TITLE, DETAILS_TITLE, READINGS_TITLE]
    summary = [str(c.value) for row in book[SUMMARY_TITLE].iter_rows() for c in row if c.value is not None]
    assert CAUTION_SHORT in summary
    assert any(text.startswith("3 of 4 characteristics were shown to move") for text in summary)
    assert "moved up" in summary and "moved down" in summary and "no change shown" in summary
    assert any("Holm (1979)" in text for text in summary)
    details = [str(c.value) for row in book[DETAILS_TITLE].iter_rows() for c in row if c.value is not None]
    assert "Mass (g)" in details and "Adjusted p-value" in details
    readings = book[READINGS_TITLE]
    titles = [readings.cell(row=FIRST_ENTRY_ROW - 1, column=c).value for c in range(2, 10)]
    assert titles == [f"{name}: {die}" for name in CHOSEN for die in ("old die", "new die")]


def test_an_edited_reading_is_found(written, tmp_path):
    def edit(book):
        cell = book[READINGS_TITLE].cell(row=FIRST_ENTRY_ROW, column=2)
        cell.value = cell.value + 0.01

    verification = verify_record(edited_copy(written[0], tmp_path, edit))
    assert verification.status == "changed"


def test_an_edited_adjusted_p_on_the_summary_is_found(written, tmp_path):
    def edit(book):
        sheet = book[SUMMARY_TITLE]
        target = next(c for row in sheet.iter_rows() for c in row if c.value == "moved down")
        target.value = "no change shown"

    verification = verify_record(edited_copy(written[0], tmp_path, edit))
    assert verification.status == "changed"
    assert any("Summary" in difference for difference in verification.differences)


def test_the_adjustment_is_stored_and_stated(tmp_path):
    record = housing_record(adjust="fdr")
    path = tmp_path / "fdr.xlsx"
    write_record(path, record)
    back = read_record(path)
    assert back.analysis.settings.adjust == "fdr" and back.result.adjust == "fdr"
    summary = [str(c.value) for row in load_workbook(path)[SUMMARY_TITLE].iter_rows() for c in row if c.value]
    assert any("Benjamini-Hochberg (1995)" in text for text in summary)


def stored_rows(path):
    data, _ = read_program_data(load_workbook_safely(path))
    return data, data["result"]["fields"]["rows"]


def test_the_stored_data_hold_no_null_distributions_yet_read_back_as_the_live_result(written):
    path, record = written
    data, rows = stored_rows(path)
    assert data["record_format"] == 2 and len(rows) == len(CHOSEN)
    assert all("null_distribution" not in row["result"] for row in rows)
    back = read_record(path)
    assert back.result == record.result
    assert all(row.result.null_distribution is not None for row in back.result.rows)


def test_a_single_question_record_still_stores_its_null_distribution_in_form_1(tmp_path):
    path = tmp_path / "paired.xlsx"
    write_record(path, paired_record())
    data, _ = read_program_data(load_workbook_safely(path))
    assert data["record_format"] == 1 and data["result"]["fields"]["null_distribution"] is not None


def test_a_record_written_with_its_null_distributions_stored_still_reads_and_verifies(tmp_path, monkeypatch):
    record = housing_record()
    path = tmp_path / "form1.xlsx"
    with monkeypatch.context() as patch:
        patch.setattr(record_module, "stored_format", lambda record: 1)
        write_record(path, record)
    data, rows = stored_rows(path)
    assert data["record_format"] == 1 and all(row["result"]["null_distribution"] for row in rows)
    assert read_record(path).result == record.result
    verification = verify_record(path)
    assert verification.status == "intact", verification.differences


def test_a_stored_rank_edited_with_the_fingerprint_made_to_match_is_found(written, tmp_path):
    def edit(book):
        sheet = book[PROGRAM_SHEET]
        data, _ = read_program_data(book)
        ranks = data["result"]["fields"]["rows"][0]["result"]["ranks_a"]
        ranks[0], ranks[1] = ranks[1] + 1.0, ranks[0]
        text = canonical_bytes(data).decode("utf-8")
        parts = [text[start:start + CHUNK] for start in range(0, len(text), CHUNK)]
        sheet["A2"].value, sheet["A3"].value = sha256_hex(data), len(parts)
        for row, part in enumerate(parts, start=4):
            sheet.cell(row=row, column=1).value = part

    verification = verify_record(edited_copy(written[0], tmp_path, edit))
    assert verification.status == "changed"
    assert any("no longer follows from the readings" in difference for difference in verification.differences)
