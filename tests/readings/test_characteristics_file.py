"""Opening a file of many characteristics: process and part columns, units, limits, missing readings."""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest
from openpyxl import Workbook

from rankwise.readings import ReadingsError, open_characteristics
from rankwise.stats import Question, Settings

DEMO = Path(__file__).resolve().parents[2] / "demo_files" / "housing_two_dies.csv"


def test_the_demo_file_is_understood():
    table = open_characteristics(DEMO)
    assert table.process_column == "Die" and table.processes == ("old die", "new die")
    assert table.part_column == "Part" and table.parts[0] == "PH-0001" and len(table.parts) == 50
    assert len(table.characteristics) == 12
    bore = table.characteristic("Bore diameter")
    assert (bore.header, bore.unit, bore.decimals) == ("Bore diameter [mm]", "mm", 3)
    # nominal 32.000 and tolerance 0.012 stand in the rows above the titles: limits nominal -/+ tolerance
    assert (bore.nominal, bore.lsl, bore.usl) == (32.0, pytest.approx(31.988), pytest.approx(32.012))
    assert bore.tolerance_width == pytest.approx(0.024)
    flatness = table.characteristic("face flatness [mm]")
    assert (flatness.nominal, flatness.lsl, flatness.usl) == (None, 0.0, 0.05)
    assert table.characteristic("Hardness").unit == "HB"
    assert any("title block" in note for note in table.notes)


def test_missing_readings_are_counted_per_characteristic_never_zero():
    table = open_characteristics(DEMO)
    flatness = table.characteristic("Face flatness")
    assert table.missing("Face flatness", "old die") == 1  # a blank cell
    assert table.missing("Face flatness", "new die") == 1  # "n/a"
    assert [cell.text for cell in flatness.skipped] == ["n/a"]
    assert table.missing("Mass", "new die") == 2 and table.missing("Mass", "old die") == 0
    assert table.missing("Bore diameter", "new die") == 0
    assert not np.any(flatness.values == 0.0)
    analysis = table.to_analysis("old die", "new die")
    mass = next(item for item in analysis.characteristics if item.name == "Mass")
    assert len(mass.b.values) == 25 and sum(math.isnan(v) for v in mass.b.values) == 2
    assert "Face flatness, new die: 1 entry not used as readings: entry 7 'n/a'." in analysis.notes


def test_the_file_is_never_changed():
    before = DEMO.read_bytes()
    open_characteristics(DEMO)
    assert DEMO.read_bytes() == before


def test_to_analysis_chooses_groups_characteristics_and_margins():
    table = open_characteristics(DEMO)
    analysis = table.to_analysis("old die", "new die", names=["Hardness", "Bore depth"],
                                 settings=Settings(adjust="fdr"), margins={"Hardness": 2.0}, margin_share=0.25)
    assert analysis.question is Question.CHARACTERISTICS
    assert [g.name for g in analysis.groups] == ["old die", "new die"]
    assert [item.name for item in analysis.characteristics] == ["Hardness", "Bore depth"]
    hardness, depth = analysis.characteristics
    assert hardness.margin == 2.0
    assert depth.margin == pytest.approx(0.25 * 0.1)  # a quarter of the width 18.05 - 17.95
    assert (depth.a.unit, depth.a.lsl, depth.a.usl, depth.a.decimals) == ("mm", 17.95, 18.05, 2)
    assert analysis.settings.adjust == "fdr"
    rows_old = table.rows_of("old die")
    assert depth.a.values == tuple(table.characteristic("Bore depth").values[rows_old].tolist())


@pytest.mark.parametrize("call, message", [
    (lambda t: t.to_analysis("old die", "old die"), "two different"),
    (lambda t: t.to_analysis("old die", "die 3"), "die 3"),
    (lambda t: t.to_analysis("old die", "new die", names=["Volume"]), "Volume"),
    (lambda t: t.to_analysis("old die", "new die", names=[]), "at least one"),
    (lambda t: t.to_analysis("old die", "new die", names=["Mass"], margins={"Runout": 0.01}), "Runout"),
])
def test_wrong_choices_are_refused_in_plain_words(call, message):
    with pytest.raises(ReadingsError, match=message):
        call(open_characteristics(DEMO))


def _write_workbook(path: Path, rows) -> Path:
    workbook = Workbook()
    for row in rows:
        workbook.active.append(row)
    workbook.save(path)
    return path


def test_a_workbook_with_limit_rows_below_the_titles(tmp_path):
    path = _write_workbook(tmp_path / "lots.xlsx", [
        ["Serial", "Lot", "Length (mm)", "Torque (Nm)", "Remark"],
        ["LSL", None, 9.9, 1.0, None],
        ["USL", None, 10.1, 2.0, None],
        [101, "lot 1", 10.01, 1.52, "ok"],
        [102, "lot 1", 10.02, None, "ok"],
        [103, "lot 2", 10.05, 1.61, "recheck"],
        [104, "lot 2", 10.04, 1.58, "ok"],
    ])
    table = open_characteristics(path)
    assert table.process_column == "Lot" and table.processes == ("lot 1", "lot 2")
    assert table.part_column == "Serial"
    assert [c.name for c in table.characteristics] == ["Length", "Torque"]
    torque = table.characteristic("Torque")
    assert (torque.unit, torque.lsl, torque.usl) == ("Nm", 1.0, 2.0)
    assert table.missing("Torque", "lot 1") == 1
    assert any("Remark" in note for note in table.notes)


def test_the_process_column_can_be_named_and_a_missing_one_is_explained(tmp_path):
    path = tmp_path / "two.csv"
    path.write_text("Part,Shift,Line,Gap [mm]\nP1,day,L1,0.31\nP2,day,L2,0.30\nP3,night,L1,0.33\nP4,night,L2,0.35\n",
                    encoding="utf-8")
    assert open_characteristics(path, by="line").processes == ("L1", "L2")
    with pytest.raises(ReadingsError, match="no column 'Operator'"):
        open_characteristics(path, by="Operator")
    lonely = tmp_path / "no_process.csv"
    lonely.write_text("Gap [mm],Width [mm]\n0.31,5.1\n0.30,5.2\n", encoding="utf-8")
    with pytest.raises(ReadingsError, match="no column naming the process"):
        open_characteristics(lonely)


def test_every_cell_is_read_as_parse_reading_reads_it():
    """The shortcut for plain numbers gives the very cell that parse_reading gives (the readings' own rule)."""
    from rankwise.readings import parse_reading

    table = open_characteristics(DEMO)
    for column in table.characteristics:
        for cell in column.cells:
            assert cell == parse_reading(cell.text, decimal=".", unit=column.unit)


def test_the_analysis_comes_from_the_readings_as_entered():
    from rankwise.readings.characteristics import analysis_from_snapshot

    table = open_characteristics(DEMO)
    analysis = table.to_analysis("old die", "new die", names=["Mass", "Runout"], margin_share=0.1)
    snapshot = table.snapshot("old die", "new die", names=["Mass", "Runout"])
    assert [g.name for g in snapshot.groups] == ["Mass: old die", "Mass: new die", "Runout: old die", "Runout: new die"]
    rebuilt = analysis_from_snapshot(snapshot, ["Mass", "Runout"], "old die", "new die",
                                     margins=[item.margin for item in analysis.characteristics])
    assert rebuilt == analysis


def test_only_the_many_characteristics_demo_suggests_that_question():
    """The other demo files keep their own questions (one characteristic each)."""
    from rankwise.readings import open_readings

    demo = DEMO.parent
    suggested = {path.name: open_readings(path).suggested_question
                 for path in sorted(demo.iterdir()) if path.suffix in (".csv", ".xlsx")}
    assert suggested.pop("housing_two_dies.csv") is Question.CHARACTERISTICS
    assert Question.CHARACTERISTICS not in suggested.values()
