"""rankwise report --question characteristics: one signed record for many characteristics, checked by verify."""

import argparse
import os
import subprocess
import sys
from pathlib import Path

import pypdf
import pytest

from rankwise.records import read_record
from rankwise.records.cli import add_record_commands, run_report, run_verify
from rankwise.stats import CharacteristicsResult, Question

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_files" / "housing_two_dies.csv"
SIGN = ("--signed-by", "Ann Lee", "--role", "quality engineer")


def parser():
    top = argparse.ArgumentParser(prog="rankwise")
    add_record_commands(top.add_subparsers(dest="command", required=True))
    return top


def report(*words):
    return parser().parse_args(["report", *map(str, words)])


def test_report_writes_one_record_for_the_chosen_characteristics(tmp_path, capsys):
    out = tmp_path / "housing.xlsx"
    before = DEMO.read_bytes()
    code = run_report(report(DEMO, "--question", "characteristics", "--by", "Die", "--groups", "old die", "new die",
                             "--adjust", "fdr", "--characteristics", "Hardness", "Mass [g]", "Bore depth",
                             "--out", out, *SIGN))
    assert code == 0
    printed = capsys.readouterr().out
    assert "2 of 3 characteristics were shown to move from old die to new die" in printed
    assert "Hardness: moved down" in printed and "Mass: no change shown" in printed
    assert "Benjamini-Hochberg (1995)" in printed and "Caution:" in printed
    record = read_record(out)
    assert record.analysis.question is Question.CHARACTERISTICS
    assert isinstance(record.result, CharacteristicsResult) and record.result.adjust == "fdr"
    assert [row.name for row in record.result.rows] == ["Hardness", "Mass", "Bore depth"]
    assert run_verify(parser().parse_args(["verify", str(out)])) == 0
    assert DEMO.read_bytes() == before


@pytest.mark.parametrize("words, message", [
    (("--by", "Operator"), "no column 'Operator'"),
    (("--groups", "old die", "die 9"), "die 9"),
    (("--groups", "old die"), "two processes"),
    (("--characteristics", "Volume"), "no characteristic 'Volume'"),
    (("--margin", "0.1"), "--margin-share"),
    (("--margin-share", "2"), "between 0 and 1"),
])
def test_wrong_choices_are_refused_and_nothing_is_written(tmp_path, capsys, words, message):
    out = tmp_path / "housing.xlsx"
    code = run_report(report(DEMO, "--question", "characteristics", *words, "--out", out, *SIGN))
    assert code == 2
    assert message in capsys.readouterr().err
    assert not out.exists()


def test_the_command_line_writes_the_one_page_summary(tmp_path):
    out, pdf = tmp_path / "housing.xlsx", tmp_path / "housing.pdf"
    environment = {**os.environ, "PYTHONPATH": str(ROOT / "desktop"), "QT_QPA_PLATFORM": "offscreen"}
    done = subprocess.run([sys.executable, "-m", "rankwise.app", "report", str(DEMO), "--question", "characteristics",
                           "--out", str(out), "--pdf", str(pdf), "--paper", "letter", *SIGN],
                          capture_output=True, text=True, timeout=600, env=environment)
    assert done.returncode == 0, done.stderr
    assert "4 of 12 characteristics were shown to move" in done.stdout
    pages = pypdf.PdfReader(pdf).pages
    assert len(pages) == 1 and round(float(pages[0].mediabox.width)) == 612
    verified = subprocess.run([sys.executable, "-m", "rankwise.app", "verify", str(out)], capture_output=True,
                              text=True, timeout=600, env=environment)
    assert verified.returncode == 0, verified.stdout + verified.stderr
