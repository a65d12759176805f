"""Every bad file gets one plain sentence (a ReadingsError), never a traceback, and is never changed."""

import contextlib
import os
import pathlib
import shutil
import tempfile
import zipfile

import openpyxl
import pytest

from rankwise.readings import ReadingsError, open_readings
from rankwise.readings import open as open_module
from rankwise.readings import open_xlsx, workbook_check

DEMO = pathlib.Path(__file__).resolve().parents[2] / "demo_files"
NOBODY = 65534
"""The user and group id of the unprivileged user "nobody" on Linux (common practice, no source)."""


def one_sentence(message: str) -> bool:
    """A plain sentence: starts with a capital or a quote, ends with a full stop, no code words."""
    return (message[:1].isupper() or message[:1] == "'") and message.endswith(".") and "Error" not in message


def refused(path, match, **options):
    with pytest.raises(ReadingsError, match=match) as caught:
        open_readings(path, **options)
    message = str(caught.value)
    assert one_sentence(message), message
    assert message.count(". ") == 0, f"more than one sentence: {message}"
    return message


def test_missing_file(tmp_path):
    refused(tmp_path / "nowhere.csv", "There is no file")


def test_a_folder(tmp_path):
    refused(tmp_path, "is a folder")


def test_no_permission(tmp_path, monkeypatch, unchanged):
    """Reading refused by the system at the one call that opens the file (simulated, so that it
    happens on every system and for every user)."""
    path = tmp_path / "locked.csv"
    path.write_text("A\n1\n")
    unchanged(path)

    def refuse(*args, **kwargs):
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(open_module, "open", refuse, raising=False)
    message = refused(path, "permission to read 'locked.csv'")
    assert "ask for access" in message


@contextlib.contextmanager
def as_ordinary_user():
    """Act as an ordinary user (nobody) for a moment when the tests run as root, who may read
    every file; only the effective user changes, and it is changed back at once."""
    if os.geteuid() != 0:
        yield
        return
    os.setegid(NOBODY)
    os.seteuid(NOBODY)
    try:
        yield
    finally:
        os.seteuid(0)
        os.setegid(0)


def test_no_permission_for_real():
    """A file whose owner allows nobody to read it; run as root too, by acting as an ordinary user."""
    folder = pathlib.Path(tempfile.mkdtemp(prefix="rankwise-locked-"))
    try:
        folder.chmod(0o755)  # the folder is open to all: only the file itself is locked
        path = folder / "locked.csv"
        path.write_text("A\n1\n")
        path.chmod(0)
        with as_ordinary_user():
            with pytest.raises(PermissionError):
                path.read_bytes()  # the system really refuses this user
            message = refused(path, "You do not have permission to read 'locked.csv'")
        assert "ask for access, or copy the file to your own folder" in message
        path.chmod(0o600)
        assert path.read_text() == "A\n1\n"  # refused, and left as it was
    finally:
        shutil.rmtree(folder)


def test_empty_file(tmp_path, unchanged):
    path = tmp_path / "empty.csv"
    path.write_bytes(b"")
    refused(unchanged(path), "is empty")


@pytest.mark.parametrize("content", [b"\n\n  \n", b"just some words\nand more words\n", b"Name\nAnna\nBert\nCara\n"])
def test_text_without_numbers(tmp_path, unchanged, content):
    path = tmp_path / "words.csv"
    path.write_bytes(content)
    refused(unchanged(path), "no numbers|no readings")


def test_one_column_of_text(tmp_path):
    path = tmp_path / "names.csv"
    path.write_text("Operator\nAnna\nBert\n")
    refused(path, "single column of text")


def test_columns_of_text_only(tmp_path):
    path = tmp_path / "names.csv"
    path.write_text("Operator;Shift\nAnna;early\nBert;late\n")
    refused(path, "no readings")


@pytest.mark.parametrize(
    ("content", "match"),
    [
        (bytes(range(256)) * 40, "not a spreadsheet"),
        (b"%PDF-1.7\n" + bytes(200), "PDF document"),
        (b"\x89PNG\r\n\x1a\n" + bytes(100), "picture"),
        (b"\x7fELF" + bytes(300), "program"),
        (b"1,2\n3,\x00\x01\x02\x03\x04" * 50, "not a spreadsheet"),
    ],
)
def test_binary_junk(tmp_path, unchanged, content, match):
    path = tmp_path / "junk.csv"
    path.write_bytes(content)
    refused(unchanged(path), match)


def test_not_a_workbook_zip(tmp_path, unchanged):
    path = tmp_path / "archive.xlsx"
    with zipfile.ZipFile(path, "w") as archive:
        archive.writestr("notes.txt", "hello")
    refused(unchanged(path), "zip archive, not an Excel workbook")


def test_opendocument_is_named(tmp_path):
    path = tmp_path / "sheet.ods"
    with zipfile.ZipFile(path, "w") as archive:
        archive.writestr("mimetype", "application/vnd.oasis.opendocument.spreadsheet")
        archive.writestr("content.xml", "<x/>")
    refused(path, "OpenDocument")


@pytest.mark.parametrize("cut", [0.3, 0.6, 0.95])
def test_damaged_workbook(tmp_path, unchanged, cut):
    data = (DEMO / "push_out_force_three_presses.xlsx").read_bytes()
    path = tmp_path / "damaged.xlsx"
    path.write_bytes(data[: int(len(data) * cut)])
    refused(unchanged(path), "damaged")


def test_damaged_sheet_inside_a_sound_zip(tmp_path):
    source = DEMO / "push_out_force_three_presses.xlsx"
    path = tmp_path / "broken.xlsx"
    with zipfile.ZipFile(source) as original, zipfile.ZipFile(path, "w") as copy:
        for item in original.infolist():
            data = original.read(item.filename)
            if item.filename == "xl/worksheets/sheet1.xml":
                data = data[: len(data) // 2]
            copy.writestr(item, data)
    refused(path, "damaged")


def test_xlsx_name_on_a_text_file(tmp_path):
    path = tmp_path / "fake.xlsx"
    path.write_text("A,B\n1,2\n")
    refused(path, "damaged")


def test_password_protected_or_old_workbook(tmp_path, unchanged):
    """Encrypted XLSX files and old .xls files are stored in the same compound-file container."""
    path = tmp_path / "locked.xlsx"
    path.write_bytes(open_xlsx.OLE_SIGNATURE + bytes(2000))
    refused(unchanged(path), "password-protected")


def test_workbook_without_numbers(tmp_path, unchanged):
    workbook = openpyxl.Workbook()
    workbook.active.append(["Operator", "Shift"])
    workbook.active.append(["Anna", "early"])
    path = tmp_path / "words.xlsx"
    workbook.save(path)
    refused(unchanged(path), "no readings")


def test_huge_first_line(tmp_path, unchanged):
    path = tmp_path / "huge.csv"
    path.write_bytes(b"1" * (3 << 20))
    refused(unchanged(path), "far too long for readings")


def test_huge_cell_further_down(tmp_path):
    lines = ["A;B"] + [f"{i}.5;{i}.25" for i in range(600)]
    lines[500] = "1.5;" + "9" * 50_000
    path = tmp_path / "huge.csv"
    path.write_text("\n".join(lines) + "\n")
    refused(path, "Row 501 .* 50,000 characters")


def test_zip_bomb_by_packing_ratio(tmp_path, unchanged):
    """A member that unpacks to 20 MB of zeros from a few kB is refused before anything is unpacked."""
    path = tmp_path / "bomb.xlsx"
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as archive:
        archive.writestr("[Content_Types].xml", "<Types/>")
        archive.writestr("xl/workbook.xml", "<workbook/>")
        archive.writestr("xl/worksheets/sheet1.xml", bytes(20_000_000))
    refused(unchanged(path), "would unpack to")


def test_zip_bomb_by_total_size(tmp_path, monkeypatch):
    monkeypatch.setattr(workbook_check, "MAX_UNPACKED_BYTES", 1_000_000)
    path = tmp_path / "big.xlsx"
    with zipfile.ZipFile(path, "w", zipfile.ZIP_STORED) as archive:
        archive.writestr("xl/workbook.xml", os.urandom(1_200_000))
    refused(path, "would unpack to")


def test_wrong_encoding_chosen(tmp_path):
    path = tmp_path / "utf16.csv"
    path.write_bytes("A;B\n1;2\n3;4\n5;6\n".encode("utf-16"))
    refused(path, "cannot be read as utf-8", encoding="utf-8")


def test_zip_of_an_unsupported_version(tmp_path):
    """A damaged header claiming a zip version the reader does not know (found by the fuzzer)."""
    data = bytearray((DEMO / "push_out_force_three_presses.xlsx").read_bytes())
    central = data.rfind(b"PK\x01\x02")
    data[central + 6] = 64  # "version needed to extract" of the last central directory entry
    path = tmp_path / "version.xlsx"
    path.write_bytes(bytes(data))
    refused(path, "damaged")


def test_a_field_longer_than_the_csv_module_takes_is_refused(tmp_path, unchanged):
    """Python's csv module refuses fields over 131,072 characters (csv.field_size_limit(), Python docs)."""
    path = tmp_path / "long.csv"
    path.write_text("A;B\n1,5;" + "9" * 140_000 + "\n2,5;3\n")
    refused(unchanged(path), "holds a cell of more than 131,072 characters")
    deep = tmp_path / "deep.csv"
    deep.write_text("A;B\n" + "".join(f"{i},5;{i}\n" for i in range(400)) + "1,5;" + "9" * 140_000 + "\n")
    refused(unchanged(deep), "more than 131,072 characters|far too long")


def test_a_table_wider_than_a_readings_export_is_refused(tmp_path):
    path = tmp_path / "wide.csv"
    path.write_text(",".join(f"G{j}" for j in range(1_200)) + "\n" + ",".join("1.5" for _ in range(1_200)) + "\n")
    refused(path, "has 1,200 columns, more than a readings export holds")


def test_unique_column_titles_for_sixty_thousand_repeats():
    """Repeated titles get "(2)", "(3)"...; made in one pass (sixty thousand once took two minutes)."""
    from rankwise.readings.layout import unique_headers

    names = unique_headers(["X"] * 60_000 + ["X (2)", ""], 60_002)
    assert names[:3] == ("X", "X (2)", "X (3)")
    assert names[59_999] == "X (60000)"
    assert names[60_000] == "X (2) (2)"
    assert names[60_001] == "Column 60002"
    assert len(set(names)) == len(names)


def test_too_many_lines_are_refused_before_reading(tmp_path, monkeypatch):
    from rankwise.readings import open_csv

    monkeypatch.setattr(open_csv, "MAX_ROWS", 1_000)
    path = tmp_path / "many.csv"
    path.write_text("A\n" + "1.5\n" * 2_000)
    refused(path, "has more than 1,000 lines")


def test_numbers_too_small_or_large_deep_in_a_big_file_are_flagged(tmp_path):
    """Past the sample a number-only column is read by pandas, which would make 2e-400 a 0.0 (and 1e309 inf)."""
    lines = [f"{i % 50 / 10}" for i in range(600)]
    lines[400], lines[500] = "2e-400", "1e309"
    path = tmp_path / "deep.csv"
    path.write_text("Reading\n" + "\n".join(lines) + "\n")
    result = open_readings(path)
    (group,) = result.groups
    assert group.values.size == 598
    assert {(s.row, s.text) for s in group.skipped} == {(402, "2e-400"), (502, "1e309")}
