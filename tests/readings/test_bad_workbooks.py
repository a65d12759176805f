"""Hostile and odd workbooks: every one gets readings or one plain sentence, in bounded memory.

The dangerous ones (far cell addresses, zip bombs) are opened in a child process with a memory
cap and a time limit (``child_open``), so a regression fails these tests instead of aborting the
test run. Expected limits come from the XLSX format (ECMA-376 Part 1: 1,048,576 rows, 16,384
columns, from memory) and the zip format (PKWARE APPNOTE.TXT); the rest is common practice, no source.
"""

import math
import zipfile
import zlib

import pytest

from rankwise.readings import CellKind, ReadingsError, open_readings
from rankwise.readings import workbook_check

from crafted import (
    column_of, lying_workbook, number, rows, text, write_raw_zip, write_workbook, write_zip, workbook_parts, deflated,
)
from child_open import open_in_child


def refused_in_child(*paths):
    outcomes = open_in_child(list(paths))
    messages = []
    for path in paths:
        outcome = outcomes[path]
        assert outcome.refused is not None, f"{path.name} was read: {outcome.groups}"
        assert outcome.refused.endswith("."), outcome.refused
        messages.append(outcome.refused)
    return messages


def test_far_cells_rows_and_damaged_addresses_are_refused_before_the_reader_makes_room(tmp_path, unchanged):
    """One cell at A1 and one at XFD1048576 would make a reader ask for 549 GB and abort."""
    readings = [[number("A2", "1.5")], [number("A3", "2.5")]]
    far = write_workbook(tmp_path / "far.xlsx", ("S", rows([text("A1", "Reading")], *readings, [number("XFD1048576", "2")])))
    row_1e9 = write_workbook(tmp_path / "row.xlsx", ("S", '<row r="1000000000"><c r="A1000000000"><v>1</v></c></row>'))
    no_address = write_workbook(tmp_path / "implied.xlsx", ("S", '<row r="1000000000"><c><v>1</v></c></row>'))
    damaged_address = write_workbook(tmp_path / "damaged.xlsx", ("S", '<row r="1"><c r="A99999999999"><v>1</v></c></row>'))
    long_column = write_workbook(tmp_path / "zzzz.xlsx", ("S", '<row r="1"><c r="ZZZZ1"><v>1</v></c></row>'))
    beyond = write_workbook(tmp_path / "rows.xlsx", ("S", column_of(["1.5", "2.5"]) + rows([number("A5000000", "1")], first=5000000)))
    paths = [unchanged(p) for p in (far, row_1e9, no_address, damaged_address, long_column, beyond)]
    messages = refused_in_child(*paths)
    assert "spans 1,048,576 rows and 16,384 columns (A1 to XFD1048576)" in messages[0]
    assert "far more cells than a readings export holds" in messages[0]
    for message in messages[1:]:
        assert "is damaged" in message and "save it again" in message


def test_a_wide_sheet_past_the_cell_budget_is_refused(tmp_path):
    """A cell in the last column 400 rows down: 6.5 million cells from A1, more than a readings export."""
    path = write_workbook(tmp_path / "wide.xlsx", ("S", column_of(["1", "2"]) + rows([number("XFD400", "3")], first=400)))
    (message,) = refused_in_child(path)
    assert "spans 400 rows and 16,384 columns" in message


def test_a_part_that_unpacks_to_more_than_its_header_says_is_refused(tmp_path, unchanged):
    """A "lying" zip bomb: headers declare 2 kB, the data unpacks to 60 MB of cells."""
    sheet = b'<worksheet><sheetData>' + b'<row r="1"><c r="A1"><v>1</v></c></row>' * 1_500_000 + b"</sheetData></worksheet>"
    path = unchanged(lying_workbook(tmp_path / "lying.xlsx", sheet, declared=2000))
    (message,) = refused_in_child(path)
    assert "unpacks to more than its header says" in message


def test_honest_zip_bombs_are_refused_by_size_and_by_packing_ratio(tmp_path):
    """Declared sizes past 512 MiB, and 40 MB of parts packed a thousand times tighter than cells pack."""
    parts = workbook_parts([("S", column_of(["1", "2"]))])
    zeros = deflated(bytes(600 << 20))
    members = [(name, deflated(data), len(data), zlib.crc32(data)) for name, data in parts.items()]
    huge = write_raw_zip(tmp_path / "huge.xlsx", members + [("xl/media/a.bin", zeros, 600 << 20, 0)])
    for k in range(5):
        parts[f"xl/media/pad{k}.xml"] = b"<a>" + bytes(8_000_000) + b"</a>"
    tight = write_zip(tmp_path / "tight.xlsx", parts)
    messages = refused_in_child(huge, tight)
    assert all("would unpack to" in m and "far more than any readings export" in m for m in messages)


def test_a_huge_cell_is_refused_with_its_length(tmp_path):
    path = write_workbook(tmp_path / "cell.xlsx", ("S", column_of(["1", "2"]) + rows([text("B1", "x" * 3_000_000)])))
    (message,) = refused_in_child(path)
    assert "holds a cell of more than 1,048,576 characters" in message


def test_a_document_type_declaration_is_refused(tmp_path):
    parts = workbook_parts([("S", column_of(["1", "2"]))])
    parts["xl/workbook.xml"] = b'<?xml version="1.0"?><!DOCTYPE x [<!ENTITY a "aaaa">]>' + parts["xl/workbook.xml"].split(b"?>", 1)[1]
    with pytest.raises(ReadingsError, match="declares its own XML document type"):
        open_readings(write_zip(tmp_path / "dtd.xlsx", parts))


def test_cells_without_addresses_are_placed_as_a_reader_places_them(tmp_path):
    """Cells may leave out their address; each then goes right of the last one (ECMA-376 Part 1, 18.3.1.4)."""
    data = '<row r="1"><c t="inlineStr"><is><t>Reading</t></is></c></row>' + "".join(
        f'<row r="{i}"><c><v>{i / 10}</v></c></row>' for i in range(2, 8))
    result = open_readings(write_workbook(tmp_path / "plain.xlsx", ("S", data)))
    assert result.groups[0].values.tolist() == [0.2, 0.3, 0.4, 0.5, 0.6, 0.7]
    check = workbook_check.check_workbook(tmp_path / "plain.xlsx")
    extent = check.extent_of("xl/worksheets/sheet1.xml")
    assert (extent.rows, extent.columns) == (7, 1)


def test_stored_values_that_are_not_finite_or_too_small_are_flagged_not_read(tmp_path):
    """inf, nan and 1e309 come out of a reader as floats, and 2e-400 as 0.0: each is flagged, none is a reading."""
    good = ["1.5", "2.5", "3.5", "4.5", "5.5", "6.5", "7.5", "8.5"]
    stored = good[:4] + ["inf", "nan", "1e309", "2e-400", "1e-310", "-INF"] + good[4:]
    path = write_workbook(tmp_path / "values.xlsx", ("S", column_of(stored)))
    result = open_readings(path)
    (group,) = result.groups
    assert group.values.tolist() == [float(v) for v in good]
    flagged = {cell.text: cell for cell in group.cells if cell.kind is CellKind.INVALID}
    assert set(flagged) == {"inf", "nan", "-inf", "2e-400", "1e-310"}
    assert "not a finite number" in flagged["inf"].reason
    assert "too small" in flagged["2e-400"].reason
    assert len(group.skipped) == 6
    assert all(math.isfinite(v) for v in group.values)


def test_the_active_visible_sheet_is_read_not_a_hidden_first_sheet(tmp_path, unchanged):
    hidden = ("Old", column_of(["100", "200", "300"]), "hidden")
    visible = ("Readings", column_of(["1.5", "2.5", "3.5"]))
    path = unchanged(write_workbook(tmp_path / "hidden.xlsx", hidden, visible, active=1))
    result = open_readings(path)
    assert result.source.sheet == "Readings"
    assert result.groups[0].values.tolist() == [1.5, 2.5, 3.5]
    chosen = open_readings(path, sheet="Old")
    assert chosen.groups[0].values.tolist() == [100, 200, 300]
    assert "Sheet 'Old' is hidden in the workbook; it was read because it was chosen." in chosen.notes


def test_the_sheet_the_workbook_opens_on_is_read(tmp_path):
    first = ("First", column_of(["1", "2", "3"]))
    second = ("Second", column_of(["7.5", "8.5", "9.5"]))
    result = open_readings(write_workbook(tmp_path / "tabs.xlsx", first, second, active=1))
    assert result.source.sheet == "Second"
    assert result.groups[0].values.tolist() == [7.5, 8.5, 9.5]


def test_another_visible_sheet_is_read_only_with_a_note(tmp_path):
    notes_sheet = ("Notes", rows([text("A1", "Measured by the second shift")]))
    data = ("Data", column_of(["1.5", "2.5", "3.5"]))
    result = open_readings(write_workbook(tmp_path / "notes.xlsx", notes_sheet, data))
    assert result.source.sheet == "Data"
    assert any("'Notes', holds no numbers; the readings were read from sheet 'Data'" in note for note in result.notes)


def test_numbers_only_on_hidden_sheets_are_not_read_without_asking(tmp_path):
    notes_sheet = ("Notes", rows([text("A1", "See the other sheet")]))
    hidden = ("Data", column_of(["1.5", "2.5", "3.5"]), "hidden")
    path = write_workbook(tmp_path / "only_hidden.xlsx", notes_sheet, hidden)
    with pytest.raises(ReadingsError, match="only hidden sheets \\('Data'\\) might"):
        open_readings(path)
    all_hidden = write_workbook(tmp_path / "all_hidden.xlsx", ("Data", column_of(["1", "2"]), "hidden"))
    with pytest.raises(ReadingsError, match="Every sheet of the workbook 'all_hidden.xlsx' is hidden"):
        open_readings(all_hidden)


def test_merged_group_labels_apply_to_the_rows_they_span(tmp_path):
    """A press label merged over its rows names each of them; the readings are not pooled into one group."""
    cells = rows(
        [text("A1", "Press"), text("B1", "Force (kN)")],
        [text("A2", "Press 1"), number("B2", "18.3")], [number("B3", "18.4")], [number("B4", "19.2")],
        [text("A5", "Press 2"), number("B5", "19.3")], [number("B6", "18.8")], [number("B7", "18.7")],
    )
    path = write_workbook(tmp_path / "merged.xlsx", ("Force", cells), merged={"Force": ["A2:A4", "A5:A7"]})
    result = open_readings(path)
    assert [(g.name, g.values.tolist()) for g in result.groups] == [("Press 1", [18.3, 18.4, 19.2]), ("Press 2", [19.3, 18.8, 18.7])]
    assert "Labels in merged cells (A2:A4, A5:A7) were applied to every row they span." in result.notes


def test_a_merged_title_across_columns_is_left_alone(tmp_path):
    cells = rows([text("A1", "Bore diameter (mm)")], [],
                 [text("A3", "Before"), text("B3", "After")],
                 *[[number(f"A{i}", f"25.0{i}"), number(f"B{i}", f"25.01{i}")] for i in range(4, 9)])
    path = write_workbook(tmp_path / "title.xlsx", ("Gauge", cells), merged={"Gauge": ["A1:B1"]})
    result = open_readings(path)
    assert [g.name for g in result.groups] == ["Before", "After"]
    assert result.groups[0].unit == "mm"
    assert not any("merged" in note for note in result.notes)


def test_the_workbook_checks_keep_a_normal_sheet_whole(tmp_path):
    """The measured extent of a plain sheet is exactly its rows and columns."""
    path = write_workbook(tmp_path / "plain.xlsx", ("S", column_of(["1", "2", "3"], column="C")))
    extent = workbook_check.check_workbook(path).extent_of("xl/worksheets/sheet1.xml")
    assert (extent.rows, extent.columns, extent.filled, extent.damaged) == (4, 3, 4, "")


def test_a_zip_that_is_not_deflated_or_stored_is_refused(tmp_path):
    path = tmp_path / "bzip.xlsx"
    with zipfile.ZipFile(path, "w", zipfile.ZIP_BZIP2) as archive:
        for name, data in workbook_parts([("S", column_of(["1", "2"]))]).items():
            archive.writestr(name, data)
    with pytest.raises(ReadingsError, match="is damaged"):
        open_readings(path)


def test_cells_without_addresses_after_megabytes_of_addressed_ones_are_placed_as_the_reader_places_them(tmp_path):
    """A sheet that leaves out addresses only late in its XML is walked again from its start; the extent
    measured equals the reader's own (python-calamine's sheet height and width, on this small case)."""
    import python_calamine

    addressed = "".join(f'<row r="{i}"><c r="A{i}"><v>1.5</v></c></row>' for i in range(1, 150_001))
    bare = '<row><c><v>2</v></c></row>' * 10 + "<row>" + "<c><v>3</v></c>" * 5 + "</row>"
    path = write_workbook(tmp_path / "late.xlsx", ("S", addressed + bare))
    extent = workbook_check.check_workbook(path).extent_of("xl/worksheets/sheet1.xml")
    sheet = python_calamine.CalamineWorkbook.from_path(str(path)).get_sheet_by_index(0)
    assert (extent.rows, extent.columns) == (sheet.height, sheet.width) == (150_011, 5)
