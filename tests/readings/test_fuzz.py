"""Fuzzing the readers: whatever the bytes, the answer is readings or a ReadingsError, never a crash.

Small example counts keep this quick in CI; hypothesis keeps the failing examples it finds.
"""

import io
import math
import pathlib
import zipfile

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from rankwise.readings import CellKind, ReadingSet, ReadingsError, open_readings, parse_reading
from rankwise.readings.columns import RawColumn, parse_column

DEMO = pathlib.Path(__file__).resolve().parents[2] / "demo_files"
QUICK = settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])


def open_or_refuse(path):
    """Open ``path``; only a ReadingsError may stop it, and a result must be well formed."""
    try:
        result = open_readings(path)
    except ReadingsError as error:
        assert str(error).endswith("."), str(error)
        return None
    assert isinstance(result, ReadingSet)
    for group in result.groups:
        assert np.isfinite(group.values).all()
        assert len(group.cells) >= group.values.size
    return result


@QUICK
@given(content=st.binary(min_size=0, max_size=3000), suffix=st.sampled_from([".csv", ".txt", ".xlsx"]))
def test_any_bytes(tmp_path, content, suffix):
    path = tmp_path / f"fuzz{suffix}"
    path.write_bytes(content)
    open_or_refuse(path)
    assert path.read_bytes() == content


CSV_ALPHABET = st.sampled_from(list("0123456789") * 4 + list(",;.\t|\"'\n\r -+eE<>µaxyz ") + ["\u2212", "\u00a0", "n/a", "scrap"])


@QUICK
@given(text=st.lists(CSV_ALPHABET, max_size=400).map("".join), encoding=st.sampled_from(["utf-8", "utf-8-sig", "utf-16", "cp1252"]))
def test_csv_like_text(tmp_path, text, encoding):
    path = tmp_path / "fuzz.csv"
    try:
        data = text.encode(encoding)
    except UnicodeEncodeError:
        data = text.encode("utf-8")
    path.write_bytes(data)
    open_or_refuse(path)
    assert path.read_bytes() == data


@QUICK
@given(
    rows=st.lists(
        st.lists(st.one_of(st.floats(-1e6, 1e6).map(lambda v: f"{v:.3f}"), st.sampled_from(["", "n/a", "A", "B"])), min_size=1, max_size=4),
        min_size=1, max_size=30,
    ),
    delimiter=st.sampled_from([",", ";", "\t"]),
)
def test_tables_of_numbers_and_labels(tmp_path, rows, delimiter):
    path = tmp_path / "table.csv"
    path.write_text("\n".join(delimiter.join(row) for row in rows) + "\n", encoding="utf-8")
    open_or_refuse(path)


WORKBOOK = (DEMO / "push_out_force_three_presses.xlsx").read_bytes()


@QUICK
@given(flips=st.lists(st.tuples(st.integers(0, len(WORKBOOK) - 1), st.integers(0, 255)), min_size=1, max_size=8))
def test_damaged_workbooks(tmp_path, flips):
    data = bytearray(WORKBOOK)
    for position, value in flips:
        data[position] = value
    path = tmp_path / "damaged.xlsx"
    path.write_bytes(bytes(data))
    open_or_refuse(path)
    assert path.read_bytes() == bytes(data)


def _members():
    with zipfile.ZipFile(io.BytesIO(WORKBOOK)) as archive:
        return {name: archive.read(name) for name in archive.namelist()}


MEMBERS = _members()


@QUICK
@given(
    name=st.sampled_from(sorted(MEMBERS)),
    cut=st.floats(0.0, 1.0),
    junk=st.binary(max_size=40),
)
def test_workbooks_with_a_damaged_part(tmp_path, name, cut, junk):
    """A sound zip around broken XML: the workbook reader must refuse it plainly."""
    path = tmp_path / "part.xlsx"
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as archive:
        for member, data in MEMBERS.items():
            if member == name:
                data = data[: int(len(data) * cut)] + junk
            archive.writestr(member, data)
    open_or_refuse(path)


@settings(max_examples=300, deadline=None)
@given(text=st.text(max_size=60), decimal=st.sampled_from(["auto", ".", ","]), unit=st.sampled_from(["", "µm", "N"]))
def test_parse_reading_never_fails_and_keeps_the_text(text, decimal, unit):
    cell = parse_reading(text, decimal=decimal, unit=unit)
    assert cell.text == text
    assert (cell.value is not None) == (cell.kind is CellKind.NUMBER)
    if cell.kind is CellKind.NUMBER:
        assert math.isfinite(cell.value)
        assert cell.decimals is not None and cell.decimals >= 0
    if cell.kind in (CellKind.NOTE, CellKind.INVALID):
        assert cell.reason


NUMBER_TEXT = st.one_of(
    st.decimals(min_value=-10**6, max_value=10**6, allow_nan=False, places=4).map(str),
    st.integers(-10**9, 10**9).map(str),
    st.sampled_from(["", "1,234", "1.234,5", "0,4,2", "<0.05", "scrap", " 12 ", "+.5", "5.", "1e3", "-0"]),
)


@settings(max_examples=150, deadline=None)
@given(texts=st.lists(NUMBER_TEXT, max_size=40), decimal=st.sampled_from([".", ","]))
def test_the_column_fast_path_agrees_with_cell_by_cell_reading(texts, decimal):
    """Reading a whole column at once gives what parse_reading gives for each cell (the reference)."""
    column = np.empty(len(texts), dtype=object)
    column[:] = texts
    parsed = parse_column(RawColumn("x", column), decimal)
    for row, text in enumerate(texts):
        cell = parse_reading(text, decimal=decimal)
        if cell.kind is CellKind.NUMBER:
            assert parsed.values[row] == cell.value, text
        else:
            assert math.isnan(parsed.values[row]), text
        assert parsed.cell(row) == cell
    expected = [parse_reading(t, decimal=decimal).decimals for t in texts]
    expected = [d for d in expected if d is not None]
    assert parsed.decimals == (max(expected) if expected else None)


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(
    numbers=st.lists(
        st.tuples(st.floats(-1e5, 1e5, allow_nan=False), st.integers(0, 6)), min_size=260, max_size=300
    ),
    decimal=st.sampled_from([".", ","]),
)
def test_numbers_read_straight_from_a_long_file_equal_cell_by_cell_reading(tmp_path, numbers, decimal):
    """Past the sample, pandas' C parser reads the numbers; parse_reading (exact decimal reading) is the reference."""
    texts = [f"{value:.{places}f}".replace(".", decimal) for value, places in numbers]
    path = tmp_path / "long.csv"
    path.write_text("Readings\n" + "\n".join(texts) + "\n")
    result = open_readings(path, decimal=decimal)
    expected = [parse_reading(text, decimal=decimal).value for text in texts]
    assert result.groups[0].values.tolist() == expected
