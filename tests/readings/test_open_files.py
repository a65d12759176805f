"""Opening exports: encodings, separators, layouts, workbooks, title blocks; the file is never changed."""

import datetime as dt
import pathlib
import zipfile

import numpy as np
import openpyxl
import pytest

from rankwise.readings import CellKind, ReadingSheet, ReadingsError, open_readings

DEMO = pathlib.Path(__file__).resolve().parents[2] / "demo_files"

WIDE_TEXT = "Wheel A;Wheel B\n0,42;0,51\n0,45;0,55\n0,41;scrap\n0,44;\n;0,50\n"


def write_text(tmp_path, name, text, encoding="utf-8"):
    path = tmp_path / name
    path.write_bytes(text.encode(encoding))
    return path


def write_workbook(tmp_path, name, rows, sheet_title="Sheet1", extra_sheets=()):
    workbook = openpyxl.Workbook()
    sheet = workbook.active
    sheet.title = sheet_title
    for row in rows:
        sheet.append(row)
    for title, extra_rows in extra_sheets:
        extra = workbook.create_sheet(title)
        for row in extra_rows:
            extra.append(row)
    path = tmp_path / name
    workbook.save(path)
    return path


# ----- demo files ---------------------------------------------------------------------------------


def test_two_wheels_demo(unchanged):
    rs = open_readings(unchanged(DEMO / "two_wheels_roughness.csv"))
    assert rs.group_names == ["Wheel A (current)", "Wheel B (new)"]
    assert [g.unit for g in rs.groups] == ["µm", "µm"]
    assert [g.values.size for g in rs.groups] == [18, 16]
    assert rs.source.delimiter == ";" and rs.source.decimal == ","
    assert rs.source.encoding == "utf-8-sig"
    assert rs.source.header_row == 3
    assert all(g.decimals == 2 for g in rs.groups)
    assert len(np.unique(rs.groups[0].values)) < 18, "gauge resolution should give ties"


def test_push_out_force_demo(unchanged):
    rs = open_readings(unchanged(DEMO / "push_out_force_three_presses.xlsx"))
    assert rs.source.layout == "stacked"
    assert (rs.source.value_column, rs.source.group_column) == ("Push-out force (kN)", "Press")
    assert rs.group_names == ["Press 1", "Press 2", "Press 3"]
    assert [g.values.size for g in rs.groups] == [11, 12, 12]
    (scrap,) = [s for g in rs.groups for s in g.skipped]
    assert scrap.text == "scrap" and scrap.row == 14 and scrap.reason
    assert rs.source.sheet == "Force readings"
    assert rs.source.sheet_names == ("Force readings", "About")
    assert "Part no" in rs.source.columns


def test_coating_demo_is_paired_columns(unchanged):
    rs = open_readings(unchanged(DEMO / "coating_before_after_cure.csv"))
    assert rs.source.layout == "wide"
    assert rs.group_names == ["Before cure", "After cure"]
    assert [g.values.size for g in rs.groups] == [14, 14]


def test_long_export_demo(unchanged):
    rs = open_readings(unchanged(DEMO / "long_export.csv"))
    assert rs.source.layout == "stacked" and rs.source.group_column == "Line"
    assert sum(g.values.size for g in rs.groups) + sum(len(g.skipped) for g in rs.groups) <= 3000
    assert all(s.text == "n/a" for g in rs.groups for s in g.skipped)
    assert any("Operator" in note for note in rs.notes)


def test_gauge_sheet_demo(unchanged):
    rs = open_readings(unchanged(DEMO / "gauge_sheet_bore_diameter.xlsx"))
    assert rs.group_names == ["Before tool change", "After tool change"]
    assert [g.values.size for g in rs.groups] == [15, 13]
    assert rs.source.header_row == 5
    assert rs.groups[0].decimals == 3


def test_every_demo_file_goes_into_a_sheet_and_an_analysis():
    from rankwise.stats.analysis import Question, Settings

    for path in sorted(DEMO.glob("*.csv")) + sorted(DEMO.glob("*.xlsx")):
        reading_set = open_readings(path)
        if reading_set.suggested_question is Question.CHARACTERISTICS:
            continue  # one row per part, a column per characteristic: tests/readings/test_characteristics_file.py
        sheet = ReadingSheet.from_reading_set(reading_set)
        question = Question.SEVERAL if len(sheet.groups) > 2 else Question.TWO_GROUPS
        analysis = sheet.to_analysis(question, Settings())
        empty = [g.name for i, g in enumerate(sheet.groups) if sheet.counts(i).used + sheet.counts(i).censored == 0]
        if question is Question.SEVERAL:  # several groups leave out an empty group, with a note
            assert len(analysis.groups) == len(sheet.groups) - len(empty), path.name
            assert all(any(f"'{name}' has no readings" in note for note in analysis.notes) for name in empty)
        else:
            assert len(analysis.groups) == len(sheet.groups), path.name


# ----- encodings and separators -------------------------------------------------------------------


@pytest.mark.parametrize(
    ("encoding", "expected"),
    [("utf-8", "utf-8"), ("utf-8-sig", "utf-8-sig"), ("utf-16", "utf-16"), ("utf-16-le", "utf-16-le"), ("cp1252", "cp1252")],
)
def test_encodings(tmp_path, unchanged, encoding, expected):
    text = "Ø Wheel µ;Wheel B\n0,42;0,51\n0,45;0,55\n0,41;0,53\n"
    path = unchanged(write_text(tmp_path, "r.csv", text, encoding))
    rs = open_readings(path)
    assert rs.source.encoding == expected
    assert rs.group_names == ["Ø Wheel µ", "Wheel B"]
    assert rs.groups[0].values.tolist() == [0.42, 0.45, 0.41]


@pytest.mark.parametrize("delimiter", [",", ";", "\t", "|"])
def test_delimiters(tmp_path, delimiter):
    rows = ["A", "B"], ["1.5", "2.5"], ["1.25", "2.75"], ["1.0", "3.0"]
    path = write_text(tmp_path, "r.txt", "\n".join(delimiter.join(r) for r in rows) + "\n")
    rs = open_readings(path)
    assert rs.source.delimiter == delimiter
    assert rs.groups[1].values.tolist() == [2.5, 2.75, 3.0]


def test_one_column_with_decimal_commas_is_not_split(tmp_path):
    rs = open_readings(write_text(tmp_path, "one.csv", "Ra\n0,42\n0,45\n0,4\n1,05\n"))
    assert rs.group_names == ["Ra"]
    assert rs.groups[0].values.tolist() == [0.42, 0.45, 0.4, 1.05]


def test_explicit_decimal_and_encoding(tmp_path):
    path = write_text(tmp_path, "r.csv", "A;B\n1,234;2\n1,5;3\n1,25;4\n", "cp1252")
    assert open_readings(path, decimal=",", encoding="cp1252").groups[0].values.tolist() == [1.234, 1.5, 1.25]
    with pytest.raises(ValueError, match="encoding"):
        open_readings(path, encoding="no-such-encoding")
    with pytest.raises(ValueError, match="layout"):
        open_readings(path, layout="sideways")
    with pytest.raises(ValueError, match="group_column"):
        open_readings(path, layout="wide", group_column="A")


def test_wide_layout_with_blanks_notes_and_rows(tmp_path, unchanged):
    rs = open_readings(unchanged(write_text(tmp_path, "w.csv", WIDE_TEXT)))
    a, b = rs.groups
    assert a.values.tolist() == [0.42, 0.45, 0.41, 0.44]
    assert b.values.tolist() == [0.51, 0.55, 0.5]
    assert [(s.row, s.text, s.column) for s in b.skipped] == [(4, "scrap", "Wheel B")]
    assert [c.kind for c in a.cells] == [CellKind.NUMBER] * 4
    assert [c.text for c in b.cells] == ["0,51", "0,55", "scrap", "", "0,50"]
    assert rs.source.preview[0] == ("Wheel A", "Wheel B")


STACKED = (
    "Part no,Machine,Diameter,Remark,Checked\n"
    "P-001,M1,10.02,,2026-03-02\nP-002,M2,10.05,ok,2026-03-02\nP-003,M1,10.01,,2026-03-02\n"
    "P-004,M2,n/a,broken,2026-03-03\nP-005,M1,10.03,,2026-03-03\nP-006,M2,10.06,,2026-03-03\n"
    "P-007,,10.04,,2026-03-03\n"
)


def test_stacked_layout_is_found_like_a_person_would(tmp_path):
    """Machine (two labels, repeated) groups the rows; part numbers (unique) and dates do not."""
    rs = open_readings(write_text(tmp_path, "s.csv", STACKED))
    assert rs.source.layout == "stacked"
    assert (rs.source.value_column, rs.source.group_column) == ("Diameter", "Machine")
    assert rs.group_names == ["M1", "M2"]
    assert rs.groups[0].values.tolist() == [10.02, 10.01, 10.03]
    assert [s.text for s in rs.groups[1].skipped] == ["n/a"]
    assert any("row 8 '10.04'" in note for note in rs.notes), rs.notes


def test_layout_and_columns_can_be_chosen(tmp_path):
    path = write_text(tmp_path, "s.csv", STACKED)
    wide = open_readings(path, layout="wide")
    assert wide.group_names == ["Diameter"]
    by_remark = open_readings(path, group_column="Checked")
    assert by_remark.group_names == ["2026-03-02", "2026-03-03"]
    by_position = open_readings(path, layout="stacked", value_column=2, group_column=1)
    assert by_position.group_names == ["M1", "M2"]
    with pytest.raises(ReadingsError, match="no column 'Force'.*Part no, Machine"):
        open_readings(path, value_column="Force")


def test_stacked_without_any_label_column_says_so(tmp_path):
    with pytest.raises(ReadingsError, match="No column of group labels"):
        open_readings(write_text(tmp_path, "w.csv", WIDE_TEXT), layout="stacked")


def test_a_column_counting_parts_is_not_readings(tmp_path):
    text = "No.,Before,After\n1,5.1,5.3\n2,5.0,5.4\n3,5.2,5.2\n4,5.1,5.5\n"
    assert open_readings(write_text(tmp_path, "n.csv", text)).group_names == ["Before", "After"]


def test_no_header_names_columns_by_position(tmp_path):
    rs = open_readings(write_text(tmp_path, "n.csv", "1.5;2.5\n1.25;2.75\n1.0;3.0\n"))
    assert rs.group_names == ["Column 1", "Column 2"]
    assert rs.source.header_row == -1


# ----- workbooks ----------------------------------------------------------------------------------


def test_workbook_title_block_dates_and_sheet_choice(tmp_path, unchanged):
    rows = [
        ["Housing bore, line 4"], ["Batch", 4711], ["Quantity", 20], ["Checked", dt.datetime(2026, 3, 2, 14, 5)],
        [], ["Tool A", "Tool B"], [1.5, 1.7], [1.6, dt.date(2026, 3, 2)], [1.4, 1.8], [1.5, True], [1.6, 1.9],
    ]
    path = unchanged(write_workbook(tmp_path, "b.xlsx", rows, "Cover", extra_sheets=[("Data", rows)]))
    rs = open_readings(path)
    assert rs.source.sheet == "Cover" and rs.source.header_row == 5
    assert rs.groups[0].values.tolist() == [1.5, 1.6, 1.4, 1.5, 1.6]
    assert rs.groups[1].values.tolist() == [1.7, 1.8, 1.9]
    reasons = [s.reason for s in rs.groups[1].skipped]
    assert len(reasons) == 2 and all("not a reading" in r for r in reasons)
    assert open_readings(path, sheet="Data").source.sheet == "Data"
    assert open_readings(path, sheet=1).source.sheet == "Data"
    with pytest.raises(ReadingsError, match="no sheet 'Nope'.*Cover, Data"):
        open_readings(path, sheet="Nope")


def test_workbook_with_decimal_comma_texts_writes_its_numbers_the_same_way(tmp_path):
    """Stored numbers beside texts such as "0,45" get a comma too, so the sheet reads them all alike."""
    path = write_workbook(tmp_path, "d.xlsx", [["A", "B"], [0.42, "0,51"], [0.45, "0,55"], ["0,41", 0.53]])
    rs = open_readings(path)
    assert rs.source.decimal == ","
    sheet = ReadingSheet.from_reading_set(rs)
    assert sheet.cell(0, 0).text == "0,42"
    sheet.set_decimal(".")
    sheet.set_decimal(",")
    assert [sheet.cell(0, row).value for row in range(3)] == [0.42, 0.45, 0.41]
    assert [sheet.cell(1, row).value for row in range(3)] == [0.51, 0.55, 0.53]


def test_first_sheet_with_numbers_is_chosen(tmp_path):
    path = write_workbook(tmp_path, "c.xlsx", [["About this file"], ["text only"]], "About",
                          extra_sheets=[("Readings", [["A", "B"], [1, 2], [3, 4], [5, 6]])])
    assert open_readings(path).source.sheet == "Readings"


def _with_stored_formula_value(path, cell_ref, formula, stored):
    """Rewrite a workbook so that ``cell_ref`` holds ``formula`` with a stored (calculated) value."""
    with zipfile.ZipFile(path) as archive:
        parts = {name: archive.read(name) for name in archive.namelist()}
    sheet_xml = parts["xl/worksheets/sheet1.xml"].decode()
    start = sheet_xml.index(f'<c r="{cell_ref}"')
    end = sheet_xml.index("</c>", start) + len("</c>")
    sheet_xml = sheet_xml[:start] + f'<c r="{cell_ref}"><f>{formula}</f><v>{stored}</v></c>' + sheet_xml[end:]
    parts["xl/worksheets/sheet1.xml"] = sheet_xml.encode()
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as archive:
        for name, data in parts.items():
            archive.writestr(name, data)


def test_formula_cells_give_their_stored_values(tmp_path):
    path = write_workbook(tmp_path, "f.xlsx", [["A", "B"], [1.5, 2.5], [1.25, 0], [1.0, 3.0]])
    _with_stored_formula_value(path, "B3", "B2*2", "5")
    rs = open_readings(path)
    assert rs.groups[1].values.tolist() == [2.5, 5.0, 3.0]


# ----- from a file into the sheet ----------------------------------------------------------------


def test_reading_set_into_a_sheet_keeps_texts_and_decimal(tmp_path):
    rs = open_readings(write_text(tmp_path, "w.csv", WIDE_TEXT))
    sheet = ReadingSheet.from_reading_set(rs)
    assert sheet.decimal == ","
    assert sheet.group_names == ["Wheel A", "Wheel B"]
    assert sheet.cell(1, 2).text == "scrap" and sheet.cell(1, 2).kind is CellKind.NOTE
    assert not sheet.is_modified and not sheet.can_undo


def test_csv_sample_and_fast_reader_agree_on_a_long_file(tmp_path):
    """Beyond the first rows the file is read by the fast reader: same numbers, same skipped cells."""
    rng = np.random.default_rng(7)
    values = np.round(rng.normal(5, 1, 5000), 3)
    lines = ["Line;Runout"] + [f"{'L1' if i % 2 else 'L2'};{v:.3f}".replace(".", ",") for i, v in enumerate(values)]
    lines[4321] = "L1;0,4,2"
    lines[4000] = "L2;<0,005"
    rs = open_readings(write_text(tmp_path, "long.csv", "\n".join(lines) + "\n"))
    expected_l1 = [float(line.split(";")[1].replace(",", ".")) for line in lines[1:] if line.startswith("L1") and line.count(",") == 1]
    assert rs.groups[1].name == "L1"
    assert rs.groups[1].values.tolist() == expected_l1
    assert [(s.row, s.text) for s in rs.groups[1].skipped] == [(4322, "0,4,2")]
    assert [c.text for c in rs.groups[0].cells if c.kind is CellKind.CENSORED] == ["<0,005"]


# ----- big files read straight as numbers --------------------------------------------------------


def long_numbers_file(tmp_path, rows=600):
    """A wide file longer than the sample, only numbers and blanks: read straight as numbers."""
    rng = np.random.default_rng(3)
    a = np.round(rng.normal(0.42, 0.05, rows), 3)
    b = np.round(rng.normal(0.36, 0.05, rows - 50), 3)
    lines = ["Wheel A;Wheel B"]
    for i in range(rows):
        lines.append(f"{a[i]:.3f}".replace(".", ",") + ";" + (f"{b[i]:.3f}".replace(".", ",") if i < b.size else ""))
    lines[1] = "0,420;0,400"
    path = tmp_path / "long.csv"
    path.write_text("\n".join(lines) + "\n")
    return path, lines


def test_numbers_only_columns_keep_their_texts(tmp_path):
    path, lines = long_numbers_file(tmp_path)
    rs = open_readings(path)
    a, b = rs.groups
    assert a.values.size == 600 and b.values.size == 550
    assert a.values[0] == 0.42 and b.values[0] == 0.4
    assert [c.text for c in a.cells] == [line.split(";")[0] for line in lines[1:]]
    assert len(b.cells) == 550
    assert b.cells[0].text == "0,400" and b.cells[0].decimals == 3
    assert a.decimals == 3
    expected = [float(line.split(";")[1].replace(",", ".")) for line in lines[1:551]]
    assert b.values.tolist() == expected


def test_cells_of_a_file_changed_after_opening_are_refused(tmp_path):
    path, lines = long_numbers_file(tmp_path)
    rs = open_readings(path)
    lines[10] = "9,999;0,5"
    path.write_text("\n".join(lines) + "\n")
    with pytest.raises(ReadingsError, match="changed after it was opened"):
        rs.groups[0].cells


def test_infinity_is_never_a_reading(tmp_path):
    path, lines = long_numbers_file(tmp_path)
    lines[300] = "inf;0,5"
    path.write_text("\n".join(lines) + "\n")
    rs = open_readings(path)
    assert np.isfinite(rs.groups[0].values).all()
    assert [s.text for s in rs.groups[0].skipped] == ["inf"]


def test_stacked_numbers_read_straight(tmp_path):
    rng = np.random.default_rng(4)
    lines = ["Part,Press,Force"] + [f"P{i:05d},Press {1 + i % 3},{rng.normal(18.5, 0.5):.1f}" for i in range(900)]
    lines[500] = "P00499,Press 2,"
    path = tmp_path / "stacked.csv"
    path.write_text("\n".join(lines) + "\n")
    rs = open_readings(path)
    assert rs.group_names == ["Press 1", "Press 2", "Press 3"]
    assert [g.values.size for g in rs.groups] == [300, 299, 300]
    assert rs.groups[1].cells[166].kind is CellKind.EMPTY
    assert rs.groups[0].cells[0].text == lines[1].split(",")[2]


def test_press_numbers_name_the_groups(tmp_path):
    """A "Press" column of 1, 2, 3 (each repeated) beside a column of forces groups the forces."""
    rows = [["Press", "Force (kN)"]] + [[1 + i % 3, 18.0 + (i % 5) / 10] for i in range(12)]
    path = write_workbook(tmp_path, "p.xlsx", rows)
    rs = open_readings(path)
    assert rs.source.layout == "stacked" and rs.source.group_column == "Press"
    assert rs.group_names == ["1", "2", "3"]
    assert [g.values.size for g in rs.groups] == [4, 4, 4]


def test_unknown_single_byte_text_falls_back_and_only_line_ends_split_rows(tmp_path):
    """Bytes that neither UTF-8 nor cp1252 define are read as Latin-1; a stray NEL (0x85) is no line end."""
    path = tmp_path / "odd.csv"
    path.write_bytes(b"Gauge\x81\x85 A;B\r\n1,5;2,5\r\n1,25;2,75\r\n1,0;3,0\r\n")
    rs = open_readings(path)
    assert rs.source.encoding == "latin-1"
    assert rs.group_names == ["Gauge\x81\x85 A", "B"]
    assert rs.groups[0].values.tolist() == [1.5, 1.25, 1.0]


@pytest.mark.parametrize(
    ("title", "unit"),
    [("Push-out force (kN)", "kN"), ("Ra [µm]", "µm"), ("Runout (mm)", "mm"), ("Wheel A (current)", ""), ("Force", ""), ("T (°C) ", "°C")],
)
def test_unit_from_the_column_title(title, unit):
    """Units in brackets at the end of a title are recognised; other bracketed words are not units."""
    from rankwise.readings.layout import unit_in_header

    assert unit_in_header(title) == unit


@pytest.mark.parametrize(
    ("title", "name"),
    [("Wheel A (current) [µm]", "Wheel A (current)"), ("Force (kN)", "Force"), ("Wheel A (current)", "Wheel A (current)"), ("(mm)", "(mm)")],
)
def test_group_name_leaves_the_unit_out(title, name):
    """A wide column "Wheel A [µm]" makes a group named "Wheel A" with unit µm; a bare unit stays the name."""
    from rankwise.readings.layout import name_without_unit

    assert name_without_unit(title) == name


def test_units_reach_the_sheet():
    sheet = ReadingSheet.from_reading_set(open_readings(DEMO / "push_out_force_three_presses.xlsx"))
    assert [g.unit for g in sheet.groups] == ["kN"] * 3
    wheels = ReadingSheet.from_reading_set(open_readings(DEMO / "two_wheels_roughness.csv"))
    assert [g.unit for g in wheels.groups] == ["µm", "µm"]
