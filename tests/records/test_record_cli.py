"""The scripted commands: report writes a signed workbook, verify checks one; exit codes and messages."""

import argparse
import os
import subprocess
import sys
from pathlib import Path

import pytest
from openpyxl import load_workbook

from rankwise.records import read_record
from rankwise.records.cli import add_record_commands, run_report, run_verify

ROOT = Path(__file__).resolve().parents[2]

# Invented demo-style readings (surface roughness, µm, gauge resolution 0.01): not real measurements.
INVENTED_CSV = "Wheel A,Wheel B,=Wheel C\n0.42,0.45,0.40\n0.40,0.47,0.41\n0.43,0.44,0.39\n0.41,0.48,0.40\n0.42,0.46,0.42\n0.44,0.47,0.41\nn/a,0.45,0.40\n"


def parser():
    top = argparse.ArgumentParser(prog="rankwise")
    add_record_commands(top.add_subparsers(dest="command", required=True))
    return top


@pytest.fixture
def readings(tmp_path):
    path = tmp_path / "wheels.csv"
    path.write_text(INVENTED_CSV, encoding="utf-8")
    return path


def report(*words):
    return parser().parse_args(["report", *map(str, words)])


def test_report_writes_a_signed_record_that_verifies_intact(readings, tmp_path, capsys):
    out = tmp_path / "result.xlsx"
    code = run_report(report(readings, "--out", out, "--signed-by", "Ann Lee", "--role", "process technician",
                             "--decision", "accept the change", "--question", "two-groups"))
    assert code == 0
    printed = capsys.readouterr().out
    assert "Wheel B reads higher than Wheel A" in printed
    record = read_record(out)
    assert record.signoff.prepared.name == "Ann Lee"
    assert record.signoff.prepared.signed_at.utcoffset() is not None
    assert [g.name for g in record.analysis.groups] == ["Wheel A", "Wheel B"]
    assert run_verify(parser().parse_args(["verify", str(out)])) == 0
    assert readings.read_text(encoding="utf-8") == INVENTED_CSV  # the opened file is never changed


def test_named_groups_are_compared_in_the_order_given(readings, tmp_path):
    out = tmp_path / "result.xlsx"
    code = run_report(report(readings, "--out", out, "--signed-by", "Ann Lee", "--role", "technician",
                             "--groups", "=Wheel C", "Wheel B", "--alternative", "b-greater", "--alpha", "0.01"))
    assert code == 0
    record = read_record(out)
    assert [g.name for g in record.analysis.groups] == ["=Wheel C", "Wheel B"]
    assert record.analysis.settings.alpha == 0.01
    assert record.result.alternative == "b-greater"


def test_a_signed_record_is_kept_unless_forced(readings, tmp_path, capsys):
    out = tmp_path / "result.xlsx"
    arguments = [readings, "--out", out, "--signed-by", "Ann Lee", "--role", "technician"]
    assert run_report(report(*arguments)) == 0
    before = out.read_bytes()
    assert run_report(report(*arguments)) == 2
    assert "--force" in capsys.readouterr().err
    assert out.read_bytes() == before
    assert run_report(report(*arguments, "--force")) == 0


@pytest.mark.parametrize(("extra", "message"), [
    (["--groups", "Wheel A", "Wheel Z"], "no group named 'Wheel Z'"),
    (["--alpha", "0.7"], "--alpha must lie between 0 and 0.5"),
    (["--pdf", "verdict.pdf"], "PDF cannot be drawn here"),
])
def test_bad_requests_give_a_plain_message_and_exit_code_2(readings, tmp_path, capsys, extra, message):
    out = tmp_path / "result.xlsx"
    code = run_report(report(readings, "--out", out, "--signed-by", "A", "--role", "B", *extra))
    assert code == 2
    assert message in capsys.readouterr().err
    assert not out.exists()


def test_a_missing_input_file_gives_exit_code_2(tmp_path, capsys):
    code = run_report(report(tmp_path / "nothing.csv", "--out", tmp_path / "r.xlsx", "--signed-by", "A", "--role", "B"))
    assert code == 2
    assert capsys.readouterr().err.startswith("rankwise: ")


def test_the_pdf_is_drawn_by_the_callable_the_application_passes(readings, tmp_path):
    drawn = []
    out, pdf = tmp_path / "result.xlsx", tmp_path / "verdict.pdf"
    code = run_report(report(readings, "--out", out, "--pdf", pdf, "--signed-by", "A", "--role", "B"),
                      render_pdf=lambda path, record: drawn.append((path, record.signoff.prepared.name)))
    assert code == 0
    assert drawn == [(pdf, "A")]


def test_verify_exit_codes(readings, tmp_path, capsys):
    out = tmp_path / "result.xlsx"
    run_report(report(readings, "--out", out, "--signed-by", "Ann Lee", "--role", "technician"))
    book = load_workbook(out)
    book["Readings as entered"]["B12"].value = 0.52
    edited = tmp_path / "edited.xlsx"
    book.save(edited)
    capsys.readouterr()
    assert run_verify(parser().parse_args(["verify", str(edited)])) == 1
    assert "cell B12" in capsys.readouterr().out
    assert run_verify(parser().parse_args(["verify", str(readings)])) == 2
    assert "not a Rankwise record" in capsys.readouterr().err


def test_help_explains_each_option_in_plain_words(capsys):
    with pytest.raises(SystemExit):
        parser().parse_args(["report", "--help"])
    text = " ".join(capsys.readouterr().out.split())
    for phrase in ("--signed-by", "printed name", "does B read higher?", "significance level", "--force"):
        assert phrase in text


def test_the_commands_run_through_python_dash_m(readings, tmp_path):
    out = tmp_path / "result.xlsx"
    env = dict(os.environ, QT_QPA_PLATFORM="offscreen")
    made = subprocess.run([sys.executable, "-m", "rankwise", "report", str(readings), "--out", str(out),
                           "--signed-by", "Ann Lee", "--role", "technician"],
                          capture_output=True, text=True, env=env, cwd=ROOT, check=False)
    assert made.returncode == 0, made.stderr
    checked = subprocess.run([sys.executable, "-m", "rankwise", "verify", str(out)],
                             capture_output=True, text=True, env=env, cwd=ROOT, check=False)
    assert checked.returncode == 0, checked.stdout + checked.stderr
    assert "intact" in checked.stdout


def test_output_piped_into_a_reader_that_stops_early_ends_quietly(readings, tmp_path):
    """`rankwise report … | head -1`: the reader goes away before the summary is printed; the record is
    written (it comes first) and the command ends as other tools do, with no traceback."""
    out = tmp_path / "result.xlsx"
    env = dict(os.environ, QT_QPA_PLATFORM="offscreen")
    command = subprocess.Popen([sys.executable, "-m", "rankwise", "report", str(readings), "--out", str(out),
                                "--signed-by", "Ann Lee", "--role", "technician"],
                               stdout=subprocess.PIPE, stderr=subprocess.PIPE, env=env, cwd=ROOT)
    command.stdout.close()  # the reader is gone before anything is printed
    _, errors = command.communicate(timeout=300)
    assert b"Traceback" not in errors and b"BrokenPipe" not in errors, errors.decode()
    assert read_record(out).signoff.prepared.name == "Ann Lee"
