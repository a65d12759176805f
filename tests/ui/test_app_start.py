"""Start-up and command dispatch: the window, the demo, and the scripted record commands."""

from __future__ import annotations

import os
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest

from rankwise import app

ROOT = Path(__file__).resolve().parents[2]


def _run_python(code: str, tmp_path: Path, *args: str, timeout: int = 60) -> subprocess.CompletedProcess:
    """Run ``code`` in a fresh interpreter, offscreen, with its own settings and data folders."""
    environment = dict(os.environ, QT_QPA_PLATFORM="offscreen")
    for variable in ("XDG_CONFIG_HOME", "XDG_DATA_HOME", "XDG_STATE_HOME", "XDG_CACHE_HOME"):
        environment[variable] = str(tmp_path / variable.lower())
    return subprocess.run([sys.executable, "-c", textwrap.dedent(code), *args], cwd=tmp_path,
                          env=environment, capture_output=True, text=True, timeout=timeout, check=False)


_START_AND_REPORT = """
    import sys
    from PySide6.QtCore import QTimer
    from PySide6.QtWidgets import QApplication

    application = QApplication(sys.argv[:1])
    waited = []

    def report():
        windows = [w for w in application.topLevelWidgets() if w.objectName() == "rankwiseMainWindow"]
        waited.append(1)
        if windows and (windows[0].sheet.row_count > 0 or len(waited) > 300 or "--empty" in sys.argv):
            window = windows[0]
            print("VISIBLE", window.isVisible())
            print("GROUPS", "|".join(window.sheet.group_names))
            print("TITLE", window.windowTitle())
            application.quit()
        else:
            QTimer.singleShot(100, report)

    QTimer.singleShot(100, report)
    from rankwise.app import main
    sys.exit(main([a for a in sys.argv[1:] if a != "--empty"]))
"""


def test_no_arguments_opens_an_empty_sheet(tmp_path):
    """`rankwise` shows the window with an empty sheet of two groups, A and B."""
    done = _run_python(_START_AND_REPORT, tmp_path, "--empty")
    assert done.returncode == 0, done.stderr
    assert "VISIBLE True" in done.stdout
    assert "GROUPS A|B" in done.stdout


def test_demo_option_opens_the_demo_readings(tmp_path):
    """`rankwise --demo` opens the two grinding wheels' readings."""
    done = _run_python(_START_AND_REPORT, tmp_path, "--demo")
    assert done.returncode == 0, done.stderr
    assert "GROUPS Wheel A (current)|Wheel B (new)" in done.stdout
    assert "TITLE two_wheels_roughness.csv" in done.stdout


def test_file_argument_opens_that_file(tmp_path):
    """`rankwise FILE` opens a readings file with the open dialog's automatic choices."""
    path = ROOT / "demo_files" / "coating_before_after_cure.csv"
    done = _run_python(_START_AND_REPORT, tmp_path, str(path))
    assert done.returncode == 0, done.stderr
    assert "GROUPS Before cure|After cure" in done.stdout


def test_help_names_the_options_in_plain_words(capsys):
    """`rankwise --help` explains the file argument, --demo and the scripted commands."""
    with pytest.raises(SystemExit) as stopped:
        app.main(["--help"])
    assert stopped.value.code == 0
    shown = capsys.readouterr().out
    assert "--demo" in shown and "report" in shown and "verify" in shown


def test_verify_dispatches_to_the_records_command(tmp_path):
    """`python -m rankwise verify` on a file that is not a record ends with exit code 2 and a plain message."""
    junk = tmp_path / "not-a-record.csv"
    junk.write_text("a;b\n1;2\n", encoding="utf-8")
    environment = dict(os.environ, QT_QPA_PLATFORM="offscreen")
    done = subprocess.run([sys.executable, "-m", "rankwise", "verify", str(junk)], env=environment,
                          capture_output=True, text=True, timeout=60, check=False)
    assert done.returncode == 2, done.stdout + done.stderr
    assert "Traceback" not in done.stderr


def test_report_help_comes_from_the_records_layer(capsys):
    """`rankwise report --help` lists the report options (signed-by, role, out)."""
    with pytest.raises(SystemExit) as stopped:
        app.main(["report", "--help"])
    assert stopped.value.code == 0
    shown = capsys.readouterr().out
    assert "--signed-by" in shown and "--out" in shown


def test_main_window_constructs_with_no_arguments(qtbot):
    """`rankwise.ui.MainWindow()` gives a window with an empty sheet and the cautions note."""
    from rankwise.ui import MainWindow
    from rankwise.wording import CAUTION_SHORT

    window = MainWindow()
    qtbot.addWidget(window)
    assert window.sheet.group_names == ["A", "B"] and window.sheet.row_count == 0
    assert CAUTION_SHORT in window.results_panel.caution.text()


def test_report_dispatch_writes_the_workbook_and_the_pdf(tmp_path):
    """`python -m rankwise report` writes the signed workbook and, through the window's printing, the PDF."""
    from pypdf import PdfReader

    out, pdf = tmp_path / "wheels.xlsx", tmp_path / "wheels.pdf"
    environment = dict(os.environ, QT_QPA_PLATFORM="offscreen")
    done = subprocess.run(
        [sys.executable, "-m", "rankwise", "report", str(ROOT / "demo_files" / "two_wheels_roughness.csv"),
         "--out", str(out), "--pdf", str(pdf), "--signed-by", "T. Example", "--role", "process technician"],
        env=environment, capture_output=True, text=True, timeout=120, check=False)
    assert done.returncode == 0, done.stdout + done.stderr
    assert out.is_file() and len(PdfReader(str(pdf)).pages) == 1
