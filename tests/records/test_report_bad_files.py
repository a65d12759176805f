"""`rankwise report` answers every bad file with exit code 2 and one plain message, run as a separate
process so that a reader failure would show as a wrong exit code, not a stopped test run."""

import os
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]
FAR_SHEET = (
    '<?xml version="1.0" encoding="UTF-8"?><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">'
    '<sheetData><row r="1"><c r="A1"><v>1</v></c></row><row r="1048576"><c r="XFD1048576"><v>2</v></c></row>'
    "</sheetData></worksheet>"
)


def far_workbook(path: Path) -> Path:
    """One cell at A1 and one at XFD1048576: a reader would make room for 17 billion cells."""
    import openpyxl
    import zipfile

    book = openpyxl.Workbook()
    book.active["A1"] = 1
    plain = path.with_suffix(".plain.xlsx")
    book.save(plain)
    with zipfile.ZipFile(plain) as source, zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as target:
        for item in source.infolist():
            data = source.read(item.filename)
            target.writestr(item.filename, FAR_SHEET if item.filename == "xl/worksheets/sheet1.xml" else data)
    return path


@pytest.mark.parametrize("kind", ["far.xlsx", "long_line.csv", "bomb.xlsx"])
def test_report_exits_2_with_a_plain_message(tmp_path, kind):
    path = tmp_path / kind
    if kind == "far.xlsx":
        far_workbook(path)
    elif kind == "long_line.csv":
        path.write_text("A;B\n1,5;" + "9" * 140_000 + "\n")
    else:
        import zipfile

        with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as archive:
            archive.writestr("xl/workbook.xml", "<workbook/>")
            archive.writestr("xl/worksheets/sheet1.xml", bytes(30_000_000))
    env = dict(os.environ, PYTHONPATH=str(ROOT / "desktop"))
    done = subprocess.run([sys.executable, "-m", "rankwise", "report", str(path), "--out", str(tmp_path / "out.xlsx"),
                           "--signed-by", "Ann Lee", "--role", "technician"],
                          capture_output=True, text=True, env=env, cwd=ROOT, check=False, timeout=300)
    assert done.returncode == 2, done.stderr[-2000:]
    message = done.stderr.strip()
    assert message.startswith("rankwise: ") and message.endswith(".") and "Traceback" not in message, message
    assert not (tmp_path / "out.xlsx").exists()


@pytest.mark.parametrize("kind", ["far.xlsx", "bomb.xlsx"])
def test_verify_says_not_a_record_before_reading_a_hostile_workbook(tmp_path, kind):
    path = tmp_path / kind
    if kind == "far.xlsx":
        far_workbook(path)
    else:
        import zipfile

        with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as archive:
            archive.writestr("xl/workbook.xml", "<workbook/>")
            archive.writestr("xl/sharedStrings.xml", b"<sst>" + bytes(30_000_000) + b"</sst>")
    env = dict(os.environ, PYTHONPATH=str(ROOT / "desktop"))
    done = subprocess.run([sys.executable, "-m", "rankwise", "verify", str(path)],
                          capture_output=True, text=True, env=env, cwd=ROOT, check=False, timeout=300)
    assert done.returncode == 2, done.stderr[-2000:]
    assert "not a Rankwise record" in done.stderr or "cannot be read" in done.stderr, done.stderr
