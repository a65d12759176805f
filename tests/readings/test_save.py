"""Saving the readings as typed: CSV and XLSX, reopened to the same groups; atomic; plain errors."""

import os

import openpyxl
import pytest

from rankwise.readings import ReadingSheet, ReadingsError, open_readings, save_sheet
from rankwise.readings import save as save_module


def typed_sheet(decimal=","):
    sheet = ReadingSheet(decimal=decimal)
    sheet.add_group("Wheel A")
    sheet.add_group("Wheel B; new")
    mark = decimal if decimal != "auto" else "."
    sheet.paste_block(0, 0, [
        [f"0{mark}42", f"0{mark}51"], [f"0{mark}45", "scrap"], ["=1+2", f"0{mark}55"],
        [f"<0{mark}05", ""], [f"0{mark}420", f"0{mark}50 µm"],
    ])
    sheet.set_group_details(0, unit="µm", lsl=0.1, usl=0.9, nominal=0.4)
    return sheet


@pytest.mark.parametrize(("suffix", "decimal"), [(".csv", ","), (".csv", "."), (".xlsx", ","), (".xlsx", ".")])
def test_saved_readings_reopen_as_the_same_groups(tmp_path, suffix, decimal):
    sheet = typed_sheet(decimal)
    path = tmp_path / f"entry{suffix}"
    save_sheet(sheet, path)
    assert not sheet.is_modified
    reopened = ReadingSheet.from_reading_set(open_readings(path))
    assert reopened.group_names == sheet.group_names
    for group in range(2):
        texts = [sheet.cell(group, row).text for row in range(sheet.row_count)]
        assert [reopened.cell(group, row).text for row in range(sheet.row_count)] == texts
    assert reopened.cell(0, 4).decimals == 3


def test_csv_is_utf8_with_mark_and_semicolons_for_decimal_comma(tmp_path):
    path = tmp_path / "entry.csv"
    save_sheet(typed_sheet(","), path)
    data = path.read_bytes()
    assert data.startswith(b"\xef\xbb\xbf")
    assert data.decode("utf-8-sig").splitlines()[0] == 'Wheel A;"Wheel B; new"'


def test_xlsx_keeps_texts_as_text_and_details_on_a_second_sheet(tmp_path):
    path = tmp_path / "entry.xlsx"
    save_sheet(typed_sheet(","), path)
    workbook = openpyxl.load_workbook(path)
    readings = workbook["Readings"]
    assert readings["A4"].value == "=1+2" and readings["A4"].data_type == "s"
    details = workbook["Group details"]
    assert [c.value for c in details[2]] == ["Wheel A", "µm", 0.1, 0.9, 0.4]


def test_a_failed_write_leaves_the_old_file_and_no_leftovers(tmp_path, monkeypatch):
    path = tmp_path / "entry.csv"
    path.write_bytes(b"old contents")

    def fail(*args):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(save_module.os, "replace", fail)
    with pytest.raises(ReadingsError, match="old file is unchanged"):
        save_sheet(typed_sheet(), path)
    assert path.read_bytes() == b"old contents"
    assert os.listdir(tmp_path) == ["entry.csv"]


def test_saving_keeps_the_files_permissions(tmp_path):
    path = tmp_path / "entry.csv"
    path.write_bytes(b"old")
    path.chmod(0o640)
    save_sheet(typed_sheet(), path)
    assert path.stat().st_mode & 0o777 == 0o640


def test_unknown_ending_and_missing_folder(tmp_path):
    with pytest.raises(ReadingsError, match=r"\.csv or \.xlsx"):
        save_sheet(typed_sheet(), tmp_path / "entry.ods")
    with pytest.raises(ReadingsError, match="does not exist"):
        save_sheet(typed_sheet(), tmp_path / "missing" / "entry.csv")
