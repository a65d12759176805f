"""A column's cells made all at once (equal entries sharing one cell) are the cells made row by row."""

import numpy as np
import pytest

from rankwise.readings.columns import RawColumn, parse_column

TEXTS = ["0,42", "", "n/a", "0,42", "<0,05", "1,5", "0,4,2", "", "-0", "0", "12 µm", "0,420", "1,5"]


@pytest.mark.parametrize("typed", [False, True])
def test_cells_of_many_rows_are_the_cells_of_each_row(typed):
    texts = np.array(TEXTS * 3, dtype=object)
    numbers = None
    if typed:  # as a file that stored some numbers as numbers: the sign of -0 must survive
        numbers = np.full(texts.size, np.nan)
        numbers[::4] = [-0.0 if i % 2 else 0.42 for i in range(numbers[::4].size)]
    parsed = parse_column(RawColumn("force kN", texts, numbers), ",")
    rows = np.array([12, 0, 3, 5, 1, 2, 38, 11, 4, 7, 8, 9, 10, 6, 13, 25])
    together = parsed.cells(rows)
    one_by_one = tuple(parsed.cell(int(row)) for row in rows)
    assert together == one_by_one
    assert [str(cell.value) for cell in together] == [str(cell.value) for cell in one_by_one]  # -0.0 stays -0.0



def test_a_stored_minus_zero_keeps_its_sign_beside_an_equal_text():
    parsed = parse_column(RawColumn("gap mm", np.array(["0", "0", "0"], dtype=object), np.array([0.0, -0.0, 0.0])), ".")
    assert [str(cell.value) for cell in parsed.cells(np.arange(3))] == [str(parsed.cell(row).value) for row in range(3)]


PLAIN = ["0,42", "", "1,5", "12,125", "-3", "0,4", "+0,5", ",25", "7,"]


@pytest.mark.parametrize("texts", [PLAIN * 3, PLAIN + ["n/a"] + PLAIN, PLAIN[:2] + ["1" + "0" * 320 + ",5"] + PLAIN])
@pytest.mark.parametrize("decimal", [",", "."])
def test_a_column_read_a_chunk_at_a_time_reads_as_in_one_go(monkeypatch, texts, decimal):
    """The reference is the same column read as one chunk (the last entry of the last chunk, a text
    that is no plain number in a middle chunk, the most decimals in a later chunk)."""
    import rankwise.readings.columns as columns

    raw = RawColumn("force kN", np.array([t.replace(",", decimal) for t in texts], dtype=object))
    whole = parse_column(raw, decimal)
    for size in (1, 2, 3, 7):
        monkeypatch.setattr(columns, "CONVERT_CHUNK", size)
        chunked = parse_column(raw, decimal)
        assert np.array_equal(chunked.values, whole.values, equal_nan=True)
        assert (chunked.odd_rows, chunked.text_decimals) == (whole.odd_rows, whole.text_decimals)


def test_a_cell_far_too_long_is_found_in_any_chunk(monkeypatch, tmp_path):
    import rankwise.readings.open_csv as open_csv
    from rankwise.readings import ReadingsError

    monkeypatch.setattr(open_csv, "CONVERT_CHUNK", 2)
    long = "1" * (open_csv.MAX_CELL_CHARACTERS + 1)
    for row in range(5):
        column = np.array(["1"] * 5, dtype=object)
        column[row] = long
        with pytest.raises(ReadingsError, match=f"Row {row + 2} of 'x.csv' holds a cell"):
            open_csv.check_cell_lengths(tmp_path / "x.csv", {0: column}, 1)
    open_csv.check_cell_lengths(tmp_path / "x.csv", {0: np.array(["1" * open_csv.MAX_CELL_CHARACTERS] * 5, dtype=object)}, 1)
