"""`rankwise report` asks every question the window asks; each record it writes says what was asked and verifies."""

import argparse
import os
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest
from pypdf import PdfReader
from scipy import stats

from rankwise.readings import open_readings
from rankwise.records import read_record, verify_record
from rankwise.records.cli import add_record_commands, run_report
from rankwise.stats.analysis import Question
from rankwise.stats.results import CharacteristicsResult, PairedResult, SeveralGroupsResult, TwoGroupResult

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_files"
COATING = DEMO / "coating_before_after_cure.csv"
PRESSES = DEMO / "push_out_force_three_presses.xlsx"
RESULT_TYPES = {Question.TWO_GROUPS: TwoGroupResult, Question.PAIRED: PairedResult, Question.SEVERAL: SeveralGroupsResult,
                Question.CHARACTERISTICS: CharacteristicsResult}


def report(*words):
    top = argparse.ArgumentParser(prog="rankwise")
    add_record_commands(top.add_subparsers(dest="command", required=True))
    return top.parse_args(["report", *map(str, words), "--signed-by", "Ann Lee", "--role", "technician"])


def write(tmp_path, source, *options):
    out = tmp_path / f"{source.stem}-{len(list(tmp_path.iterdir()))}.xlsx"
    assert run_report(report(source, "--out", out, *options)) == 0
    assert verify_record(out).intact
    return read_record(out)


@pytest.mark.parametrize("name", sorted(p.name for p in DEMO.iterdir() if p.suffix in (".csv", ".xlsx")))
def test_without_a_question_report_answers_the_files_suggestion(tmp_path, name):
    record = write(tmp_path, DEMO / name)
    suggested = open_readings(DEMO / name).suggested_question
    assert record.analysis.question is suggested
    assert isinstance(record.result, RESULT_TYPES[suggested])


def test_the_coating_file_is_answered_as_the_same_parts_paired_by_part(tmp_path, capsys):
    record = write(tmp_path, COATING)
    printed = capsys.readouterr().out
    assert "the question the file suggests" in printed
    assert "paired by the part identifier in the column 'Part'" in printed
    assert record.snapshot.parts.column == "Part" and record.snapshot.parts.ids[0] == "C-01"
    # Outside check: scipy.stats.wilcoxon, exact permutation distribution given the ties, on the
    # differences in tenths of a µm (the gauge resolution) of the pairs matched by identifier.
    d = np.rint(np.array(record.result.values_b) * 10) - np.rint(np.array(record.result.values_a) * 10)
    assert record.result.p_value == pytest.approx(
        stats.wilcoxon(d, method=stats.PermutationMethod(n_resamples=np.inf)).pvalue, abs=1e-12)


def test_same_parts_compared_as_two_groups_keep_the_caution_in_the_record(tmp_path, capsys):
    record = write(tmp_path, COATING, "--question", "two-groups")
    assert record.analysis.question is Question.TWO_GROUPS
    assert any(note.startswith("Caution: these readings are the same parts") for note in record.analysis.notes)
    assert "Caution: these readings are the same parts" in capsys.readouterr().out


@pytest.mark.parametrize(("margin", "value"), [("0,5", 0.5), ("0.5", 0.5)])
def test_a_margin_with_a_comma_or_a_point(tmp_path, margin, value):
    record = write(tmp_path, COATING, "--question", "paired", "--margin", margin)
    assert record.analysis.settings.margin == value and record.result.margin == value


def test_one_sided_same_parts(tmp_path):
    record = write(tmp_path, COATING, "--alternative", "b-less")
    assert record.result.alternative == "b-less"


def test_several_groups_against_a_reference(tmp_path):
    record = write(tmp_path, PRESSES, "--reference", "Press 1")
    assert record.analysis.question is Question.SEVERAL
    assert record.analysis.settings.comparison == "against-reference"
    assert {frozenset((c.group_a, c.group_b)) for c in record.result.pairs} == {
        frozenset(("Press 1", "Press 2")), frozenset(("Press 1", "Press 3"))}


def test_two_named_groups_of_a_several_groups_file_are_two_groups(tmp_path):
    record = write(tmp_path, PRESSES, "--groups", "Press 1", "Press 3")
    assert record.analysis.question is Question.TWO_GROUPS
    assert [g.name for g in record.analysis.groups] == ["Press 1", "Press 3"]


@pytest.mark.parametrize(("source", "options", "message"), [
    (DEMO / "long_export.csv", ["--question", "paired"], "cannot be matched part by part"),
    (DEMO / "gauge_sheet_bore_diameter.xlsx", ["--question", "paired"], "has 15 rows"),
    (COATING, ["--margin", "half"], "--margin must be a positive number"),
    (PRESSES, ["--margin", "0.5"], "--margin belongs to the two-groups and paired questions"),
    (COATING, ["--reference", "Before cure"], "--reference belongs to the several-groups question"),
    (PRESSES, ["--reference", "Press 9"], "no group named 'Press 9'"),
    (PRESSES, ["--alternative", "b-greater"], "two-sided only"),
    (COATING, ["--groups", "Before cure"], "--groups needs two names"),
])
def test_an_option_that_does_not_fit_the_question_gets_a_plain_message(tmp_path, capsys, source, options, message):
    out = tmp_path / "result.xlsx"
    assert run_report(report(source, "--out", out, *options)) == 2
    assert message in capsys.readouterr().err
    assert not out.exists()


def test_help_explains_every_choice(capsys):
    with pytest.raises(SystemExit):
        report("--help")
    text = " ".join(capsys.readouterr().out.split())
    for phrase in ("--question", "did the same parts read differently the second time?", "several:",
                   "the question the file suggests", "--margin", "decimal comma or point", "--reference",
                   "instead of every pair of groups", "--paper", "US Letter"):
        assert phrase in text


def test_the_paper_option_draws_the_verdict_on_letter_paper(tmp_path):
    out, pdf = tmp_path / "result.xlsx", tmp_path / "verdict.pdf"
    env = dict(os.environ, QT_QPA_PLATFORM="offscreen")
    made = subprocess.run([sys.executable, "-m", "rankwise", "report", str(COATING), "--out", str(out), "--pdf", str(pdf),
                           "--paper", "letter", "--signed-by", "Ann Lee", "--role", "technician"],
                          capture_output=True, text=True, env=env, cwd=ROOT, check=False)
    assert made.returncode == 0, made.stderr
    page = PdfReader(pdf).pages
    assert len(page) == 1
    # US Letter is 8.5 x 11 in = 612 x 792 points (ANSI/ASME Y14.1).
    assert (round(float(page[0].mediabox.width)), round(float(page[0].mediabox.height))) == (612, 792)
