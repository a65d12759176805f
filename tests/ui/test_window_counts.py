"""One count of the entries, the same on screen, in the signed workbook and on the one-page verdict.

The readings are pasted into the real window; the expected counts are counted by hand from the
cells typed (common practice, no source): a note is never a blank, empty cells above a group's
first entry are not counted, a reading below a detection limit is a reading used.
"""

from __future__ import annotations

import re
import unicodedata
from datetime import datetime, timezone

import openpyxl
import pypdf

from window_support import answers, screenshot, wait_for_verdict, window  # noqa: F401 - pytest fixtures

from rankwise.records import Signature
from rankwise.ui.signoff_dialog import SignOffDialog

COLUMN_A = ["", "", "0.42", "scrap", "", "<0.05", "0.44", "4.3", "0.45", "0.43", "0.41"]
"""Two empty cells above the first entry, a note, an empty cell between entries, a reading below a
detection limit and a reading ten times the others (a slipped decimal point?)."""
COLUMN_B = ["0.47", "0.48", "n/a", "0.50", "0.49", "0.52", "0.51"]

COUNTS = {  # counted by hand from the cells above
    "Readings used, A": 7,  # six measured readings and "<0.05"
    "Below a detection limit, A": 1,
    "Entries not used, A": 1,  # row 4 "scrap"
    "Empty cells between entries, A": 1,  # row 5; rows 1 and 2 lie above the first entry
    "Readings used, B": 6,
    "Entries not used, B": 1,  # row 3 "n/a"
}
NOTES = ("A, row 4: Text note 'scrap', not a reading.", "B, row 3: Text note 'n/a', not a reading.")
WORDS_FOR_TEXT_AS_BLANK = re.compile(r"blank entr|blanks left out|\+\d+ blank", re.IGNORECASE)


def _paste(window, column: int, texts: list[str]) -> None:
    window.grid.move_to(0, column)
    window.grid.paste_text("\n".join(texts) + "\n")


def _flat(text: str) -> str:
    return re.sub(r"\s+", " ", unicodedata.normalize("NFKC", text))


def test_screen_workbook_and_page_show_the_same_counts(qtbot, window, answers, monkeypatch, tmp_path):
    _paste(window, 0, COLUMN_A)
    _paste(window, 1, COLUMN_B)
    qtbot.waitUntil(lambda: not window.runner.busy and window.last_result is not None
                    and window.last_result.summary_b.n == 6, timeout=60000)
    panel = window.results_panel

    # On screen: the key numbers, and each entry not used named once in the notes.
    keys = {"n_a": "Readings used, A", "n_censored_a": "Below a detection limit, A",
            "n_not_used_a": "Entries not used, A", "n_empty_a": "Empty cells between entries, A",
            "n_b": "Readings used, B", "n_not_used_b": "Entries not used, B"}
    for key, label in keys.items():
        assert panel.number_text(key) == str(COUNTS[label]), key
    assert panel.number_text("n_dropped_a") is None and panel.number_text("n_empty_b") is None
    notes = _flat(panel.notes.text())
    for note in NOTES:
        assert notes.count(note) == 1, note
    assert notes.count("row 8: 4.3 is about 10 times the other readings: a slipped decimal point?") == 1
    assert notes.count("scrap") == 1 and not WORDS_FOR_TEXT_AS_BLANK.search(notes)
    status = window.status_counts.text()
    assert "A: 7 readings (1 below a limit), 1 not used" in status and "B: 6 readings, 1 not used" in status
    screenshot(window, "window-counts")

    # In the signed workbook: the verdict sheet's key numbers and the readings sheet's counts.
    signature = Signature("T. Example", "process technician", "accept the change", "",
                          datetime(2026, 3, 2, 9, 30, tzinfo=timezone.utc))
    monkeypatch.setattr(SignOffDialog, "ask", classmethod(lambda cls, parent=None, **kw: signature))
    answers.save_path = tmp_path / "counts.xlsx"
    assert window.records.sign_and_save(), answers.problems
    book = openpyxl.load_workbook(answers.save_path)
    verdict = {row[0]: row[1] for row in book["Verdict"].iter_rows(values_only=True) if row[0]}
    for label, count in COUNTS.items():
        assert verdict[label] == count, label
    assert "Below a detection limit, B" not in verdict and "Blanks left out, A" not in verdict
    workbook_text = " ".join(str(value) for sheet in book.worksheets if sheet.sheet_state == "visible"
                             for row in sheet.iter_rows(values_only=True) for value in row if value is not None)
    for note in NOTES:
        assert _flat(workbook_text).count(note) == 1, note
    assert not WORDS_FOR_TEXT_AS_BLANK.search(workbook_text)
    readings = book["Readings as entered"]
    by_label = {readings.cell(row, 1).value: (readings.cell(row, 2).value, readings.cell(row, 3).value)
                for row in range(8, 11)}
    assert by_label == {"Readings used": (7, 6), "Entries not used": (1, 1), "Below a detection limit": (1, 0)}

    # On paper: the groups table and the notes of the one-page verdict (text read back with pypdf).
    answers.save_path = tmp_path / "counts.pdf"
    assert window.records.save_pdf() == answers.save_path
    page = _flat(pypdf.PdfReader(answers.save_path).pages[0].extract_text())
    assert "7 (1 below a limit; 1 not used)" in page and "6 (1 not used)" in page
    for note in NOTES:
        assert page.count(note) == 1, note
    assert not WORDS_FOR_TEXT_AS_BLANK.search(page)


def test_the_first_edit_after_opening_shows_the_counts_as_they_are_now(qtbot, window):
    """The status line's note about the opened file ("34 readings in 2 groups") hides the counts
    beneath it; typing a reading clears it, so the line never shows counts the sheet no longer has."""
    from window_support import PATIENCE_MS, type_column

    window.open_demo()
    wait_for_verdict(qtbot, window)
    status = window.statusBar()
    assert status.currentMessage().startswith("Opened two_wheels_roughness.csv: 34 readings in 2 groups")
    assert not window.status_counts.isVisible()
    type_column(qtbot, window.grid, 2, ["3,1"])
    qtbot.waitUntil(lambda: "3: 1 reading" in window.status_counts.text(), timeout=PATIENCE_MS)
    assert status.currentMessage() == "" and window.status_counts.isVisible()
