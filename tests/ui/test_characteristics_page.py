"""The one-page summary verdict of many characteristics: one page on A4 and Letter, up to 40 lines,
then how many more are in the workbook; cautions and sign-off always on it (pages read back with pypdf)."""

from __future__ import annotations

import shutil
import subprocess
from dataclasses import replace
from pathlib import Path

import pypdf
import pytest

from rankwise.readings import open_characteristics
from rankwise.records import ResultRecord
from rankwise.stats import Settings, run
from rankwise.ui.printing import write_verdict_pdf
from rankwise.wording import CAUTION_SHORT

from test_printing import SCREENSHOTS, check_one_page, page_text, signed

DEMO = Path(__file__).resolve().parents[2] / "demo_files" / "housing_two_dies.csv"


def housing_record(copies: int = 1) -> ResultRecord:
    """The demo housing (invented readings); ``copies`` > 1 repeats its characteristics under longer
    numbered names, to fill the page beyond its 40 lines."""
    table = open_characteristics(DEMO)
    analysis = table.to_analysis("old die", "new die", settings=Settings(adjust="holm"))
    if copies > 1:
        items = tuple(replace(item, name=f"{item.name}, drawing zone {copy + 1} of the housing")
                      for copy in range(copies) for item in analysis.characteristics)
        analysis = replace(analysis, characteristics=items)
    return ResultRecord.now(analysis, table.snapshot("old die", "new die"), run(analysis), signed())


@pytest.fixture(scope="module")
def records():
    return {"12": housing_record(), "60": housing_record(5)}


@pytest.mark.parametrize("page_size", ["A4", "Letter"])
@pytest.mark.parametrize("case", ["12", "60"])
def test_one_page_with_every_line_up_to_forty(qapp, tmp_path, records, case, page_size):
    path = tmp_path / f"characteristics-{case}-{page_size}.pdf"
    plan = write_verdict_pdf(path, records[case], page_size)
    check_one_page(path, page_size)
    assert plan.fits and plan.used_height <= plan.available_height
    text = page_text(path)
    assert CAUTION_SHORT in text
    assert "Prepared by" in text and "Reviewed and approved by" in text
    assert "shown to move from old die to new die" in text
    if case == "12":
        assert "Port diameter (mm)" in text and "more characteristics" not in text
        assert text.count("moved up") == 2 and text.count("moved down") == 2
    else:
        # 40 lines: three copies of the twelve, then the fourth copy's first four (all 25 / 25 readings);
        # each copy has face flatness at 24 / 24 and mass at 25 / 23 readings used
        assert (text.count("25 / 25"), text.count("24 / 24"), text.count("25 / 23")) == (34, 3, 3)
        assert "and 20 more characteristics, in the signed workbook" in text


@pytest.mark.skipif(shutil.which("pdftoppm") is None, reason="pdftoppm (poppler-utils) renders the pages to look at")
def test_rendered_summary_pages_are_saved_for_looking_at(qapp, tmp_path, records):
    SCREENSHOTS.mkdir(exist_ok=True)
    for case, record in records.items():
        for page_size in ("A4", "Letter"):
            path = tmp_path / f"characteristics-{case}-{page_size}.pdf"
            write_verdict_pdf(path, record, page_size)
            subprocess.run(["pdftoppm", "-png", "-r", "60", str(path), str(SCREENSHOTS / path.stem)], check=True,
                           timeout=60)
            assert (SCREENSHOTS / f"{path.stem}-1.png").exists()


@pytest.mark.parametrize("page_size", ["A4", "Letter"])
def test_every_outcome_stands_whole_in_its_column(qapp, tmp_path, page_size):
    """The outcome column once cut "same within the margin" to "same within the m…"; the page writes short
    forms ("same within margin", "up, in margin"), and "not shown overall" (a move seen only on its
    own) fits as it is. With a margin of 30 % of the tolerance the housing has 8 characteristics the same
    within it, and face flatness (up) and port diameter (down) moved by less than it."""
    from rankwise.wording.characteristics import (
        MOVED_DOWN_WITHIN,
        MOVED_UP_WITHIN,
        NOT_AFTER_ADJUSTMENT,
        SAME_WITHIN,
        SHORT_OUTCOMES,
    )

    table = open_characteristics(DEMO)
    within = table.to_analysis("old die", "new die", settings=Settings(adjust="holm"), margin_share=0.3)
    record = ResultRecord.now(within, table.snapshot("old die", "new die"), run(within), signed())
    path = tmp_path / f"within-{page_size}.pdf"
    write_verdict_pdf(path, record, page_size)
    text = page_text(path)
    outcomes = text.split("Outcome", 1)[1].split("Characteristics compared")[0]
    assert "…" not in outcomes
    assert (outcomes.count(SHORT_OUTCOMES[SAME_WITHIN]), outcomes.count(SHORT_OUTCOMES[MOVED_UP_WITHIN]),
            outcomes.count(SHORT_OUTCOMES[MOVED_DOWN_WITHIN])) == (8, 1, 1)
    alone = replace(record, result=replace(record.result, rows=tuple(
        replace(row, significant=False) if row.name == "Bore depth" else row for row in record.result.rows)))
    path = tmp_path / f"alone-{page_size}.pdf"
    write_verdict_pdf(path, alone, page_size)
    assert NOT_AFTER_ADJUSTMENT in page_text(path)
