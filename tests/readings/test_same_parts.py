"""The same parts measured twice: recognised on opening, paired by part identifier, never by position."""

import csv
import itertools
import random
from pathlib import Path

import numpy as np
import pytest
from scipy import stats

from rankwise.readings import ReadingSheet, open_readings
from rankwise.readings.snapshot import SheetSnapshot
from rankwise.stats.analysis import Question
from rankwise.stats.service import run

DEMO = Path(__file__).resolve().parents[2] / "demo_files"
COATING = DEMO / "coating_before_after_cure.csv"


def coating_pairs():
    """The coating demo file's (invented) readings: part -> (before, after), read with the csv module."""
    with open(COATING, encoding="utf-8-sig", newline="") as stream:
        rows = list(csv.reader(stream))
    header = rows.index(next(row for row in rows if row and row[0] == "Part"))
    return {row[0]: (row[1], row[2]) for row in rows[header + 1:] if row and row[0]}


def write_stacked(path, rows, header=("Stage", "Part", "Coating (µm)")):
    with open(path, "w", encoding="utf-8", newline="") as stream:
        writer = csv.writer(stream)
        writer.writerow(header)
        writer.writerows(rows)
    return path


def stacked_rows(pairs, seed):
    rows = [(stage, part, text) for part, (before, after) in pairs.items()
            for stage, text in (("Before cure", before), ("After cure", after))]
    random.Random(seed).shuffle(rows)
    return rows


def brute_force(d):
    """All 2^n sign flips of the mid-ranks of |d| (scipy.stats.rankdata): two-sided exact p, doubling the
    smaller tail; and the pseudo-median as the median of every Walsh average (d_i + d_j) / 2, i <= j."""
    d = np.asarray(d, float)
    d = d[d != 0]
    ranks = stats.rankdata(np.abs(d))
    observed = ranks[d > 0].sum()
    sums = np.array([ranks[np.array(signs, bool)].sum() for signs in itertools.product((0, 1), repeat=d.size)])
    p = min(1.0, 2 * min(np.mean(sums <= observed + 1e-9), np.mean(sums >= observed - 1e-9)))
    walsh = [(d[i] + d[j]) / 2 for i in range(d.size) for j in range(i, d.size)]
    return p, float(np.median(walsh))


@pytest.mark.parametrize(("name", "question"), [
    ("coating_before_after_cure.csv", Question.PAIRED),
    ("two_wheels_roughness.csv", Question.TWO_GROUPS),
    ("long_export.csv", Question.TWO_GROUPS),
    ("gauge_sheet_bore_diameter.xlsx", Question.TWO_GROUPS),
    ("push_out_force_three_presses.xlsx", Question.SEVERAL),
])
def test_every_demo_file_suggests_its_question(name, question):
    assert open_readings(DEMO / name).suggested_question is question


def test_the_coating_file_is_recognised_as_the_same_parts_paired_by_its_part_column():
    opened = open_readings(COATING)
    assert opened.pairing.part_column == "Part"
    assert opened.pairing.paired == 14 and opened.pairing.unpaired == ()
    assert opened.found == "14 parts measured twice, in 'Before cure' and in 'After cure'; paired by the column 'Part'."
    assert [g.part_ids[:2] for g in opened.groups] == [("C-01", "C-02"), ("C-01", "C-02")]


def test_a_shuffled_stacked_export_gives_the_wide_files_p_value_and_pseudo_median(tmp_path):
    pairs = coating_pairs()
    wide = ReadingSheet.from_reading_set(open_readings(COATING)).to_analysis(Question.PAIRED)
    expected = run(wide)
    for seed in (1, 2):
        path = write_stacked(tmp_path / f"stacked{seed}.csv", stacked_rows(pairs, seed))
        opened = open_readings(path)
        assert opened.suggested_question is Question.PAIRED
        assert opened.source.layout == "stacked" and opened.pairing.part_column == "Part"
        names = opened.group_names
        sheet = ReadingSheet.from_reading_set(opened)
        result = run(sheet.to_analysis(Question.PAIRED, groups=[names.index("Before cure"), names.index("After cure")]))
        assert result.p_value == expected.p_value
        assert result.shift == expected.shift
    # Outside checks on the pairs matched by identifier (in tenths of a µm, the gauge's resolution).
    d = np.array([round(float(after) * 10) - round(float(before) * 10) for before, after in pairs.values()])
    reference = stats.wilcoxon(d, method=stats.PermutationMethod(n_resamples=np.inf))  # exact given the ties
    assert expected.p_value == pytest.approx(reference.pvalue, abs=1e-12)
    p, pseudo_median = brute_force(d)
    assert expected.p_value == pytest.approx(p, abs=1e-12)
    assert expected.shift == pytest.approx(pseudo_median / 10, abs=1e-12)


def test_position_never_pairs_a_stacked_export(tmp_path):
    """Reversing one stage's rows pairs every part wrongly by position; by identifier nothing changes."""
    pairs = coating_pairs()
    rows = [("Before cure", part, before) for part, (before, _) in pairs.items()]
    rows += [("After cure", part, after) for part, (_, after) in reversed(pairs.items())]
    sheet = ReadingSheet.from_reading_set(open_readings(write_stacked(tmp_path / "reversed.csv", rows)))
    result = run(sheet.to_analysis(Question.PAIRED))
    assert result.p_value == run(ReadingSheet.from_reading_set(open_readings(COATING)).to_analysis(Question.PAIRED)).p_value
    assert sheet.parts.ids == tuple(pairs)


def test_parts_measured_once_are_named_and_left_out(tmp_path):
    pairs = coating_pairs()
    rows = [row for row in stacked_rows(pairs, 3) if row[:2] not in {("After cure", "C-05"), ("Before cure", "C-11")}]
    opened = open_readings(write_stacked(tmp_path / "gaps.csv", rows))
    assert opened.pairing.paired == 12
    assert set(opened.pairing.unpaired) == {("C-05", "Before cure"), ("C-11", "After cure")}
    analysis = ReadingSheet.from_reading_set(opened).to_analysis(Question.PAIRED)
    result = run(analysis)
    assert result.n_pairs == 12 and result.n_dropped == 2
    note = next(note for note in analysis.notes if "one stage only" in note)
    assert "C-05 (only 'Before cure')" in note and "C-11 (only 'After cure')" in note
    kept = {part: pair for part, pair in pairs.items() if part not in ("C-05", "C-11")}
    d = np.array([round(float(a) * 10) - round(float(b) * 10) for b, a in kept.values()])
    assert result.p_value == pytest.approx(stats.wilcoxon(d, method=stats.PermutationMethod(n_resamples=np.inf)).pvalue,
                                           abs=1e-12)  # scipy.stats.wilcoxon, exact permutation given the ties


def test_a_part_repeated_within_one_stage_is_named_and_not_paired(tmp_path):
    pairs = coating_pairs()
    rows = stacked_rows(pairs, 4) + [("Before cure", "C-07", pairs["C-08"][0])]
    opened = open_readings(write_stacked(tmp_path / "repeat.csv", rows))
    assert opened.pairing is None and opened.suggested_question is Question.TWO_GROUPS
    assert "'C-07' appears more than once in 'Before cure'" in opened.pairing_problem
    assert opened.pairing_problem in opened.notes
    assert "C-07" in ReadingSheet.from_reading_set(opened).pairing_refusal([0, 1])


def test_a_stacked_export_of_different_parts_is_two_groups_and_refuses_pairing_by_position():
    opened = open_readings(DEMO / "long_export.csv")
    sheet = ReadingSheet.from_reading_set(opened)
    assert opened.pairing is None
    assert "cannot be matched part by part" in sheet.pairing_refusal([0, 1])


def test_a_row_count_is_not_a_part_identifier():
    """The gauge sheet's 'No.' column counts rows 1, 2, 3...: pairing by it would pair by position."""
    opened = open_readings(DEMO / "gauge_sheet_bore_diameter.xlsx")
    assert opened.pairing is None and all(g.part_ids is None for g in opened.groups)
    assert "15 rows" in ReadingSheet.from_reading_set(opened).pairing_refusal([0, 1])


def test_part_numbers_of_different_parts_are_kept_but_not_paired():
    opened = open_readings(DEMO / "push_out_force_three_presses.xlsx")
    assert opened.pairing is None
    assert opened.groups[0].part_ids[0] == "BS-26-0001"
    assert len(opened.groups[0].part_ids) == opened.groups[0].values.size


def test_a_numbered_part_column_names_the_parts(tmp_path):
    path = tmp_path / "springs.csv"
    rows = [(str(k), before, after) for k, (before, after) in enumerate(coating_pairs().values(), start=1)]
    write_stacked(path, rows, header=("Spring no.", "Before", "After"))
    opened = open_readings(path)
    assert opened.found == "14 springs measured twice, in 'Before' and in 'After'; paired by the column 'Spring no.'."


def test_the_parts_of_each_row_survive_a_snapshot_and_row_edits():
    sheet = ReadingSheet.from_reading_set(open_readings(COATING))
    restored = ReadingSheet.from_snapshot(SheetSnapshot.from_dict(sheet.snapshot().to_dict()))
    assert restored.parts == sheet.parts
    sheet.delete_rows(0)
    assert sheet.parts.ids[0] == "C-02"
    sheet.insert_rows(1)
    assert sheet.parts.ids[:3] == ("C-02", "", "C-03")
    sheet.undo()
    sheet.undo()
    assert sheet.parts == restored.parts


def test_a_typed_sheet_pairs_by_row_only_with_equal_rows():
    sheet = ReadingSheet()
    sheet.add_group("Before")
    sheet.add_group("After")
    sheet.paste_block(0, 0, [["5.1", "5.3"], ["5.0", "5.2"], ["4.9", ""]])
    assert "3 rows" in sheet.pairing_refusal([0, 1]) and "2 rows" in sheet.pairing_refusal([0, 1])
    sheet.set_text(1, 2, "5.0")
    assert sheet.pairing_refusal([0, 1]) == ""
    assert any("each row of the sheet is taken as one part" in n for n in sheet.to_analysis(Question.PAIRED).notes)


def test_same_parts_compared_as_separate_groups_carry_a_caution():
    analysis = ReadingSheet.from_reading_set(open_readings(COATING)).to_analysis(Question.TWO_GROUPS)
    assert any(note.startswith("Caution: these readings are the same parts") for note in analysis.notes)


def test_several_groups_warn_of_a_single_reading_and_leave_out_an_empty_group():
    sheet = ReadingSheet()
    for name in ("Press 1", "Press 2", "Press 3", "Press 4"):
        sheet.add_group(name)
    sheet.paste_block(0, 0, [["18.1", "18.4", "19.0"], ["18.3", "", ""], ["18.2", "", ""]])
    sheet.set_text(1, 1, "18.6")
    analysis = sheet.to_analysis(Question.SEVERAL)
    assert [g.name for g in analysis.groups] == ["Press 1", "Press 2", "Press 3"]
    assert any("'Press 3' has a single reading" in note for note in analysis.notes)
    assert "The group 'Press 4' has no readings and was left out of the comparison." in analysis.notes
