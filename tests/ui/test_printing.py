"""The one-page verdict: always exactly one page on A4 and Letter, saying what the record says.

Page counts and page sizes are read back with pypdf (an outside PDF parser). The readings below
are invented for these tests (shaped like gauge readings, with ties); every result is computed by
the statistics service itself.
"""

from __future__ import annotations

import os
import re
import shutil
import subprocess
import sys
import textwrap
import unicodedata
from datetime import datetime, timedelta, timezone
from pathlib import Path

import pypdf
import pytest
from PySide6.QtPrintSupport import QPrinter

from rankwise.readings import GroupColumn, ReadingSheet
from rankwise.records import ResultRecord, SignOff, Signature, fingerprint
from rankwise.stats import Question, Settings
from rankwise.stats.paired import compare_paired
from rankwise.stats.planning import plan_group_size
from rankwise.stats.several import compare_several
from rankwise.stats.two_groups import compare_two
from rankwise.ui.printing import print_verdict, write_verdict_pdf
from rankwise.wording import CAUTION_SHORT, describe

SCREENSHOTS = Path(__file__).resolve().parents[1] / "screenshots"
POINTS = {"A4": (595, 842), "Letter": (612, 792)}
"""Page sizes in PostScript points: ISO 216 A4 (210 x 297 mm) and ANSI Letter (8.5 x 11 in)."""
LONG_COMMENT = " ".join(["Trial run on the second shift with the new nozzle set; the gauge was "
                         "checked against the master ring before and after the run."] * 14)
CLOCK = datetime(2026, 11, 30, 14, 5, 9, tzinfo=timezone(timedelta(hours=1)))


def sheet_of(columns: dict[str, list[str]], unit="µm", lsl=None, usl=None, nominal=None) -> ReadingSheet:
    """A readings sheet typed cell by cell, as a technician would."""
    sheet = ReadingSheet([GroupColumn(name, unit, lsl, usl, nominal) for name in columns])
    for group, texts in enumerate(columns.values()):
        for row, text in enumerate(texts):
            sheet.set_text(group, row, text)
    return sheet


def signed(comment="Readings inside the limits.", reviewed=True) -> SignOff:
    prepared = Signature("Dana Whitfield", "process technician", "accept the change", comment, CLOCK)
    reviewer = Signature("Rui Castellanos", "quality engineer", "accept the change", comment,
                         CLOCK + timedelta(hours=2)) if reviewed else None
    return SignOff(prepared, reviewer)


def paired_record(signoff=None, method="auto") -> ResultRecord:
    """Coating thickness before and after a cure (invented readings)."""
    sheet = sheet_of({"before cure": "12.4 12.9 13.1 12.2 12.8 13.0 12.6 12.9 13.3 12.5".split(),
                      "after cure": "12.9 13.1 13.4 12.6 12.8 13.5 12.9 13.4 13.6 12.7".split()},
                     lsl=11.5, usl=14.5, nominal=13.0)
    analysis = sheet.to_analysis(Question.PAIRED, Settings(characteristic="Coating thickness"))
    a, b = analysis.groups
    result = compare_paired(a.values, b.values, name_a=a.name, name_b=b.name, method=method)
    return ResultRecord.now(analysis, sheet.snapshot(), result, signoff if signoff is not None else signed())


def two_group_record(alternative="two-sided", margin=None, signoff=None) -> ResultRecord:
    """Surface roughness from two grinding wheels (invented readings at 0.01 µm resolution)."""
    sheet = sheet_of({"Wheel A (current)": "0.82 0.85 0.85 0.88 0.90 0.91 0.91 0.93 0.87 0.86".split(),
                      "Wheel B (new supplier)": "0.88 0.92 0.95 0.95 0.97 0.99 1.02 0.91 0.94".split()},
                     lsl=0.60, usl=1.20)
    settings = Settings(characteristic="Roughness Ra", alternative=alternative, margin=margin)
    analysis = sheet.to_analysis(Question.TWO_GROUPS, settings)
    a, b = analysis.groups
    result = compare_two(a.values, b.values, name_a=a.name, name_b=b.name, alternative=alternative, margin=margin)
    return ResultRecord.now(analysis, sheet.snapshot(), result, signoff if signoff is not None else signed())


def several_record(groups: int, name_length: int, signoff=None) -> ResultRecord:
    """Push-out force from several presses (invented readings; whole newtons, so ties occur)."""
    columns = {}
    for g in range(groups):
        name = f"Press {g + 1} with the reworked ejector and the nozzle set from lot {g + 7}"
        name = (name + " " + "x" * name_length)[:name_length] if name_length > len(name) else name[:name_length]
        columns[name] = [str(212 + (3 * g + 7 * r) % 19 + g) for r in range(9)]
    sheet = sheet_of(columns, unit="N", lsl=180, usl=260)
    analysis = sheet.to_analysis(Question.SEVERAL, Settings(characteristic="Push-out force"))
    result = compare_several({group.name: group.values for group in analysis.groups})
    return ResultRecord.now(analysis, sheet.snapshot(), result, signoff if signoff is not None else signed())


def plan_record() -> ResultRecord:
    """How many parts to detect a shift of 0.05 µm with spread 0.08 µm (planning, no readings)."""
    sheet = sheet_of({"current wheel": [], "new wheel": []})
    settings = Settings(characteristic="Roughness Ra", planned_shift=0.05, planned_spread=0.08, power=0.9)
    analysis = sheet.to_analysis(Question.PLAN, settings)
    result = plan_group_size(0.05, 0.08, power=0.9)
    return ResultRecord.now(analysis, sheet.snapshot(), result, signed(reviewed=False))


def page_text(path: Path) -> str:
    """The page's text as pypdf extracts it, with spacing and ligatures normalised."""
    text = pypdf.PdfReader(path).pages[0].extract_text()
    return re.sub(r"\s+", " ", unicodedata.normalize("NFKC", text))


def check_one_page(path: Path, page_size: str) -> None:
    reader = pypdf.PdfReader(path)
    assert len(reader.pages) == 1
    box = reader.pages[0].mediabox
    assert (round(float(box.width)), round(float(box.height))) == POINTS[page_size]


CASES = {
    "two-groups": lambda: two_group_record(),
    "two-groups-b-higher": lambda: two_group_record("b-greater"),
    "two-groups-equivalence-long-comment": lambda: two_group_record(margin=0.05, signoff=signed(LONG_COMMENT)),
    "paired": lambda: paired_record(),
    "paired-normal-unsigned-review": lambda: paired_record(signed(reviewed=False), method="normal"),
    "two-groups-of-several": lambda: several_record(2, 12),
    "8-groups-80-character-names": lambda: several_record(8, 80),
    "12-groups-long-comment": lambda: several_record(12, 80, signed(LONG_COMMENT)),
    "40-groups-long-comment": lambda: several_record(40, 80, signed(LONG_COMMENT)),
    "long-comment": lambda: paired_record(signed(LONG_COMMENT)),
    "plan": plan_record,
}


@pytest.mark.parametrize("page_size", ["A4", "Letter"])
@pytest.mark.parametrize("case", list(CASES))
def test_every_record_prints_on_exactly_one_page_with_nothing_cut_off(qapp, tmp_path, case, page_size):
    record = CASES[case]()
    path = tmp_path / f"{case}-{page_size}.pdf"
    plan = write_verdict_pdf(path, record, page_size)
    check_one_page(path, page_size)
    assert plan.fits, f"{case} on {page_size} needed more room than the page has: {plan}"
    assert plan.used_height <= plan.available_height


def test_tick_labels_show_the_step_with_just_enough_decimals():
    from rankwise.ui.printing.page_chart import nice_ticks, tick_text

    assert [tick_text(t, nice_ticks(0, 110)) for t in nice_ticks(0, 110)] == ["0", "25", "50", "75", "100"]
    assert [tick_text(t, nice_ticks(12.0, 13.2)) for t in nice_ticks(12.0, 13.2)] == \
        ["12.00", "12.25", "12.50", "12.75", "13.00"]
    assert [tick_text(t, nice_ticks(0.0, 1.0)) for t in nice_ticks(0.0, 1.0)] == ["0.0", "0.2", "0.4", "0.6", "0.8", "1.0"]


def test_long_names_and_comments_make_the_page_more_compact_not_longer(qapp, tmp_path):
    roomy = write_verdict_pdf(tmp_path / "roomy.pdf", paired_record(), "A4")
    crowded = write_verdict_pdf(tmp_path / "crowded.pdf", several_record(12, 80, signed(LONG_COMMENT)), "A4")
    assert roomy.fit.scale == 1.0
    assert crowded.fit.scale < roomy.fit.scale


def test_the_page_carries_verdict_caution_signatures_fingerprint_and_version(qapp, tmp_path):
    record = paired_record()
    path = tmp_path / "verdict.pdf"
    write_verdict_pdf(path, record, "A4")
    text = page_text(path)
    verdict = describe(record.result, record.analysis)
    for expected in (verdict.headline, CAUTION_SHORT, "Dana Whitfield", "Rui Castellanos",
                     "quality engineer", "30 Nov 2026, 14:05:09 (UTC+01:00)", fingerprint(record),
                     f"Rankwise {record.program_version}", "Coating thickness", "before cure", "after cure",
                     "LSL 11.5", "USL 14.5", "Signature", "page 1 of 1"):
        assert re.sub(r"\s+", " ", expected) in text, expected
    assert "T14:05" not in text  # dates as people write them, not in the ISO 'T' form


def test_an_unsigned_draft_says_so_and_leaves_lines_to_sign_by_hand(qapp, tmp_path):
    record = ResultRecord.now(paired_record().analysis, paired_record().snapshot, paired_record().result, None)
    path = tmp_path / "draft.pdf"
    write_verdict_pdf(path, record, "Letter")
    text = page_text(path)
    assert "DRAFT · not signed" in text
    assert "Printed name" in text and "Signature" in text


def test_the_pdf_declares_pdf_a_1b(qapp, tmp_path):
    path = tmp_path / "archive.pdf"
    write_verdict_pdf(path, paired_record(), "A4")
    xmp = pypdf.PdfReader(path).xmp_metadata
    assert xmp is not None
    raw = path.read_bytes()
    assert b'pdfaid:part="1"' in raw and b'pdfaid:conformance="B"' in raw
    assert b"/OutputIntents" in raw


def test_a_failed_write_leaves_the_old_file_untouched_and_no_temporary_file(qapp, tmp_path):
    path = tmp_path / "verdict.pdf"
    path.write_bytes(b"the earlier printout")
    broken = ResultRecord.now(paired_record().analysis, paired_record().snapshot, "not a result", None)
    with pytest.raises(ValueError):
        write_verdict_pdf(path, broken, "A4")
    assert path.read_bytes() == b"the earlier printout"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["verdict.pdf"]


def test_a_new_pdf_gets_ordinary_permissions_and_a_replaced_one_keeps_its_own(qapp, tmp_path):
    umask = os.umask(0)
    os.umask(umask)
    fresh = tmp_path / "fresh.pdf"
    write_verdict_pdf(fresh, paired_record(), "A4")
    assert fresh.stat().st_mode & 0o777 == 0o666 & ~umask
    shared = tmp_path / "shared.pdf"
    shared.write_bytes(b"old")
    shared.chmod(0o640)
    write_verdict_pdf(shared, paired_record(), "A4")
    assert shared.stat().st_mode & 0o777 == 0o640
    check_one_page(shared, "A4")


def test_wrong_paper_and_missing_folder_are_refused_in_plain_words(qapp, tmp_path):
    with pytest.raises(ValueError, match="page_size must be one of A4, Letter"):
        write_verdict_pdf(tmp_path / "x.pdf", paired_record(), "A3")
    with pytest.raises(ValueError, match="existing folder"):
        write_verdict_pdf(tmp_path / "no such folder" / "x.pdf", paired_record(), "A4")


@pytest.mark.parametrize("page_size", ["A4", "Letter"])
def test_printing_on_paper_uses_one_sheet(qapp, tmp_path, page_size):
    printer = QPrinter(QPrinter.PrinterMode.HighResolution)
    printer.setOutputFormat(QPrinter.OutputFormat.PdfFormat)
    printer.setOutputFileName(str(tmp_path / "printed.pdf"))
    from rankwise.ui.printing.pdf import page_layout

    printer.setPageLayout(page_layout(page_size))
    plan = print_verdict(printer, several_record(8, 80, signed(LONG_COMMENT)))
    assert plan.fits
    check_one_page(tmp_path / "printed.pdf", page_size)
    with pytest.raises(ValueError, match="printer must be a QPrinter"):
        print_verdict("printer", paired_record())


def test_the_command_line_renders_without_a_running_application(tmp_path):
    script = textwrap.dedent(f"""
        import sys
        sys.path.insert(0, {str(Path(__file__).parent)!r})
        from test_printing import paired_record
        from rankwise.ui.printing import render_pdf_for_cli
        from PySide6.QtGui import QGuiApplication
        assert QGuiApplication.instance() is None
        plan = render_pdf_for_cli({str(tmp_path / 'cli.pdf')!r}, paired_record(), "Letter")
        print("fits" if plan.fits else "spills")
    """)
    environment = {**os.environ, "QT_QPA_PLATFORM": "offscreen"}
    completed = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True,
                               env=environment, timeout=120, check=False)
    assert completed.returncode == 0, completed.stderr
    assert completed.stdout.strip().endswith("fits")
    check_one_page(tmp_path / "cli.pdf", "Letter")


@pytest.mark.skipif(shutil.which("pdftoppm") is None, reason="pdftoppm (poppler-utils) renders the pages to look at")
@pytest.mark.parametrize("case", ["two-groups", "paired", "8-groups-80-character-names", "12-groups-long-comment", "plan"])
def test_rendered_pages_are_saved_for_looking_at(qapp, tmp_path, case):
    SCREENSHOTS.mkdir(exist_ok=True)
    for page_size in ("A4", "Letter"):
        path = tmp_path / f"verdict-{case}-{page_size}.pdf"
        write_verdict_pdf(path, CASES[case](), page_size)
        stem = SCREENSHOTS / path.stem
        subprocess.run(["pdftoppm", "-png", "-r", "60", str(path), str(stem)], check=True, timeout=60)
        assert sorted(SCREENSHOTS.glob(f"{path.stem}*.png")) == [SCREENSHOTS / f"{path.stem}-1.png"]


def comma_record() -> ResultRecord:
    """The roughness readings typed with decimal commas on a sheet that reads commas (invented readings)."""
    columns = {"Wheel A (current)": "0,82 0,85 0,85 0,88 0,90 0,91 0,91 0,93 0,87 0,86".split(),
               "Wheel B (new supplier)": "0,88 0,92 0,95 0,95 0,97 0,99 1,02 0,91 0,94".split()}
    sheet = ReadingSheet([GroupColumn(name, "µm", 0.6, 1.2, None) for name in columns], decimal=",")
    for group, texts in enumerate(columns.values()):
        for row, text in enumerate(texts):
            sheet.set_text(group, row, text)
    analysis = sheet.to_analysis(Question.TWO_GROUPS, Settings(characteristic="Roughness Ra"))
    a, b = analysis.groups
    result = compare_two(a.values, b.values, name_a=a.name, name_b=b.name)
    return ResultRecord.now(analysis, sheet.snapshot(), result, signed())


def test_a_page_typed_with_decimal_commas_writes_every_number_with_commas(qapp, tmp_path):
    from rankwise.ui.printing.page_chart import tick_text
    from rankwise.ui.printing.page_content import gather

    record = comma_record()
    assert record.analysis.decimal_mark == ","
    content = gather(record, fingerprint(record))
    shown = [content.question, content.measured, content.verdict.headline, *content.verdict.sentences,
             *content.notes, *(n.text for n in content.numbers),
             *(f"{g.median} {g.quartiles} {g.ranks}" for g in content.groups)]
    assert [text for text in shown if re.search(r"\d\.\d", text)] == []
    assert "LSL 0,60" in content.measured
    assert tick_text(0.8, [0.6, 0.8, 1.0], ",") == "0,8"
    path = tmp_path / "comma.pdf"
    write_verdict_pdf(path, record, "A4")
    assert "LSL 0,60" in page_text(path)
