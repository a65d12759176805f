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
