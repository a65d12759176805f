"""Rebuild the demo files. All data are INVENTED (fixed random seed), in scenarios of our own.

Run:  .venv/bin/python demo_files/make_demo_files.py
Readings are rounded to a realistic gauge resolution so that ties occur, as on a real gauge.
"""

from __future__ import annotations

import csv
import datetime as dt
import io
import os
import tempfile
from pathlib import Path

import numpy as np
from openpyxl import Workbook
from openpyxl.styles import Font

HERE = Path(__file__).resolve().parent
SEED = 20260302
INVENTED = "INVENTED demo data, not real measurements"


def write_atomically(path: Path, data: bytes) -> None:
    """Write beside the target, then replace it."""
    handle, temporary = tempfile.mkstemp(prefix=f".{path.name}.", dir=path.parent)
    with os.fdopen(handle, "wb") as stream:
        stream.write(data)
    os.chmod(temporary, 0o644)
    os.replace(temporary, path)


def csv_bytes(rows: list[list[str]], delimiter: str) -> bytes:
    buffer = io.StringIO()
    csv.writer(buffer, delimiter=delimiter, lineterminator="\r\n").writerows(rows)
    return buffer.getvalue().encode("utf-8-sig")


def workbook_bytes(workbook: Workbook) -> bytes:
    buffer = io.BytesIO()
    workbook.save(buffer)
    return buffer.getvalue()


def two_wheels_roughness(rng: np.random.Generator) -> None:
    """Ra after finish grinding, current wheel A against new wheel B (B reads lower): semicolon, decimal comma."""
    wheel_a = np.round(rng.lognormal(np.log(0.42), 0.12, 18), 2)
    wheel_b = np.round(rng.lognormal(np.log(0.35), 0.12, 16), 2)
    comma = lambda value: f"{value:.2f}".replace(".", ",")  # noqa: E731
    rows = [
        [f"Surface roughness Ra (µm) after finish grinding, shaft seat - {INVENTED}", ""],
        ["Gauge: stylus instrument, resolution 0,01 µm", ""],
        ["", ""],
        ["Wheel A (current) [µm]", "Wheel B (new) [µm]"],
    ]
    for row in range(max(wheel_a.size, wheel_b.size)):
        rows.append([comma(wheel_a[row]) if row < wheel_a.size else "", comma(wheel_b[row]) if row < wheel_b.size else ""])
    write_atomically(HERE / "two_wheels_roughness.csv", csv_bytes(rows, ";"))


def push_out_force_three_presses(rng: np.random.Generator) -> None:
    """Push-out force of a pressed-in bearing from three presses: stacked, title block, part numbers, remarks."""
    workbook = Workbook()
    sheet = workbook.active
    sheet.title = "Force readings"
    sheet.append(["Push-out force, bearing seat (kN)"])
    sheet["A1"].font = Font(bold=True, size=14)
    sheet.append([INVENTED])
    sheet.append(["Date", dt.date(2026, 3, 2)])
    sheet.append(["Operator", "T. Example (invented)"])
    sheet.append([])
    sheet.append(["Part no", "Press", "Push-out force (kN)", "Remark"])
    centres = {"Press 1": 18.4, "Press 2": 18.6, "Press 3": 19.5}
    number = 0
    rows = []
    for press, centre in centres.items():
        for force in np.round(rng.normal(centre, 0.45, 12), 1):
            number += 1
            rows.append([f"BS-26-{number:04d}", press, float(force), ""])
    rows[7][2], rows[7][3] = "scrap", "part cracked on pressing, no reading"
    rows[15][3] = "re-measured"
    for row in rows:
        sheet.append(row)
    sheet.column_dimensions["A"].width = 14
    sheet.column_dimensions["C"].width = 20
    sheet.column_dimensions["D"].width = 36
    notes = workbook.create_sheet("About")
    notes.append([INVENTED])
    notes.append(["Three presses, twelve parts each; press 3 was set up with a new die."])
    write_atomically(HERE / "push_out_force_three_presses.xlsx", workbook_bytes(workbook))


def coating_before_after_cure(rng: np.random.Generator) -> None:
    """Coating thickness on the same parts before and after the cure (paired): comma, decimal point."""
    before = np.round(rng.normal(24.0, 0.8, 14), 1)
    after = np.round(before - rng.normal(0.6, 0.35, 14), 1)
    rows = [[f"# {INVENTED}: coating thickness (µm) on the same 14 parts before and after the cure", "", ""]]
    rows.append(["Part", "Before cure (µm)", "After cure (µm)"])
    for number, (b, a) in enumerate(zip(before, after), start=1):
        rows.append([f"C-{number:02d}", f"{b:.1f}", f"{a:.1f}"])
    write_atomically(HERE / "coating_before_after_cure.csv", csv_bytes(rows, ","))


def long_export(rng: np.random.Generator) -> None:
    """A long stacked export from two lines (a few thousand rows) with time stamps, operators, gaps and notes."""
    rows = [[f"# {INVENTED}: spindle runout (mm) export", "", "", ""], ["Time", "Line", "Runout (mm)", "Operator"]]
    start = dt.datetime(2026, 2, 2, 6, 0)
    operators = ["Operator 1", "Operator 2", "Operator 3"]
    for number in range(3000):
        line = "Line 1" if number % 2 == 0 else "Line 2"
        runout = rng.gamma(4.0, 0.003 if line == "Line 1" else 0.0034)
        text = f"{runout:.3f}"
        if number % 997 == 13:
            text = "n/a"
        elif number % 1499 == 700:
            text = ""
        stamp = (start + dt.timedelta(minutes=3 * number)).strftime("%Y-%m-%d %H:%M")
        rows.append([stamp, line, text, operators[(number // 40) % 3]])
    write_atomically(HERE / "long_export.csv", csv_bytes(rows, ","))


def gauge_sheet_bore(rng: np.random.Generator) -> None:
    """A gauge-sheet-like workbook: bore diameter before and after a tool change, limits in the title block."""
    workbook = Workbook()
    sheet = workbook.active
    sheet.title = "Gauge sheet"
    sheet.append(["Bore diameter 25 H7 (mm)", None, INVENTED])
    sheet.append(["LSL", 25.000])
    sheet.append(["USL", 25.021])
    sheet.append(["Checked with", "bore gauge, 0.001 mm"])
    sheet.append([])
    sheet.append(["No.", "Before tool change", "After tool change"])
    before = np.round(rng.normal(25.008, 0.0035, 15), 3)
    after = np.round(rng.normal(25.012, 0.0035, 13), 3)
    for number in range(15):
        sheet.append([number + 1, float(before[number]), float(after[number]) if number < after.size else None])
    for row in sheet.iter_rows(min_row=7, min_col=2, max_col=3):
        for cell in row:
            cell.number_format = "0.000"
    write_atomically(HERE / "gauge_sheet_bore_diameter.xlsx", workbook_bytes(workbook))


HOUSING_CHARACTERISTICS = (
    # title, nominal, tolerance (+/-) or None, LSL, USL, decimals, mean, spread, shift of the new die
    ("Bore diameter [mm]", 32.0, 0.012, None, None, 3, 32.001, 0.003, 0.0),
    ("Bore depth [mm]", 18.0, 0.05, None, None, 2, 18.0, 0.012, 0.02),
    ("Flange thickness [mm]", 6.0, 0.1, None, None, 2, 6.0, 0.02, 0.0),
    ("Hole pitch [mm]", 48.0, 0.05, None, None, 2, 48.0, 0.01, 0.0),
    ("Face flatness [mm]", None, None, 0.0, 0.05, 3, 0.018, 0.005, 0.009),
    ("Runout [mm]", None, None, 0.0, 0.03, 3, 0.01, 0.003, 0.0),
    ("Roughness Ra [µm]", None, None, 0.0, 1.6, 2, 0.8, 0.08, 0.0),
    ("Hardness [HB]", 95.0, 10.0, None, None, 0, 96.0, 3.0, -4.0),
    ("Mass [g]", 412.0, 3.0, None, None, 1, 412.2, 0.6, 0.0),
    ("Wall thickness [mm]", 4.0, 0.15, None, None, 2, 4.0, 0.03, 0.0),
    ("Thread depth [mm]", 12.0, 0.3, None, None, 1, 12.0, 0.06, 0.0),
    ("Port diameter [mm]", 10.0, 0.015, None, None, 3, 10.0, 0.003, -0.004),
)
"""The pump housing's drawing characteristics; the new die moves depth, flatness, hardness and the port."""


def housing_two_dies(rng: np.random.Generator) -> None:
    """Twelve characteristics of a die-cast pump housing, 25 parts from the old die and 25 from the new one.

    Nominal and tolerance (or LSL/USL) stand in rows above the column titles; a few readings are
    blank or "n/a" (counted per characteristic, never zero).
    """
    text = lambda value, places: "" if value is None else f"{value:.{places}f}"  # noqa: E731
    rows = [
        [f"Pump housing PH-220, die-cast: old die against new die - {INVENTED}"] + [""] * 13,
        ["Coordinate measuring machine export, 25 parts per die"] + [""] * 13,
        ["nominal", ""] + [text(c[1], c[5]) for c in HOUSING_CHARACTERISTICS],
        ["tolerance", ""] + [text(c[2], c[5]) for c in HOUSING_CHARACTERISTICS],
        ["LSL", ""] + [text(c[3], c[5]) for c in HOUSING_CHARACTERISTICS],
        ["USL", ""] + [text(c[4], c[5]) for c in HOUSING_CHARACTERISTICS],
        ["Part", "Die"] + [c[0] for c in HOUSING_CHARACTERISTICS],
    ]
    columns = []
    for title, _, _, _, _, places, mean, spread, shift in HOUSING_CHARACTERISTICS:
        old, new = rng.normal(mean, spread, 25), rng.normal(mean + shift, spread, 25)
        columns.append([text(v, places) for v in np.concatenate([old, new])])
    columns[4][7] = ""
    columns[4][31] = "n/a"
    columns[8][40] = ""
    columns[8][44] = ""
    for part in range(50):
        die = "old die" if part < 25 else "new die"
        rows.append([f"PH-{part + 1:04d}", die] + [column[part] for column in columns])
    write_atomically(HERE / "housing_two_dies.csv", csv_bytes(rows, ","))


def main() -> None:
    rng = np.random.default_rng(SEED)
    two_wheels_roughness(rng)
    push_out_force_three_presses(rng)
    coating_before_after_cure(rng)
    long_export(rng)
    gauge_sheet_bore(rng)
    housing_two_dies(np.random.default_rng(SEED + 13))


if __name__ == "__main__":
    main()
