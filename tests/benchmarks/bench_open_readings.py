"""Benchmark: opening big exports, against pandas.read_csv and the two XLSX readers, in one run.

Run:  .venv/bin/python tests/benchmarks/bench_open_readings.py [--rows 1000000] [--xlsx-rows 100000]

Prints a table of best-of-N times and ratios against the reference measured in the same run:
- a stacked CSV of N rows (part number, press, force, remark) and a wide CSV of N rows
  (two groups): ``open_readings`` against ``pandas.read_csv`` (defaults) on the same file; the
  aim is a ratio of at most about 1.5;
- an XLSX sheet: python-calamine against openpyxl's read-only mode (values only), and
  ``open_readings`` (which uses python-calamine) against openpyxl's read-only mode.
The files are invented data written to a temporary folder.
"""

from __future__ import annotations

import argparse
import tempfile
import time
from pathlib import Path

import numpy as np
import openpyxl
import pandas as pd
import python_calamine

from rankwise.readings import open_readings, workbook_check


def best_time(action, repeats: int) -> float:
    """The shortest of ``repeats`` wall-clock times of ``action()``, in seconds."""
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        action()
        times.append(time.perf_counter() - start)
    return min(times)


def write_stacked_csv(path: Path, rows: int, rng: np.random.Generator) -> None:
    press = rng.choice(["Press 1", "Press 2", "Press 3"], rows)
    force = np.round(rng.normal(18.5, 0.5, rows), 1)
    remark = np.where(rng.random(rows) < 0.01, "re-measured", "")
    frame = pd.DataFrame({"Part no": [f"BS-{i:07d}" for i in range(rows)], "Press": press, "Force (kN)": force, "Remark": remark})
    frame.to_csv(path, index=False)


def write_wide_csv(path: Path, rows: int, rng: np.random.Generator) -> None:
    frame = pd.DataFrame({
        "Wheel A": np.round(rng.lognormal(np.log(0.42), 0.12, rows), 3),
        "Wheel B": np.round(rng.lognormal(np.log(0.36), 0.12, rows), 3),
    })
    frame.to_csv(path, index=False, sep=";", decimal=",")


def write_xlsx(path: Path, rows: int, rng: np.random.Generator) -> None:
    workbook = openpyxl.Workbook(write_only=True)
    sheet = workbook.create_sheet("Readings")
    sheet.append(["Part no", "Press", "Force (kN)"])
    press = rng.choice(["Press 1", "Press 2", "Press 3"], rows)
    force = np.round(rng.normal(18.5, 0.5, rows), 1)
    for i in range(rows):
        sheet.append([f"BS-{i:07d}", str(press[i]), float(force[i])])
    workbook.save(path)


def read_openpyxl(path: Path) -> int:
    workbook = openpyxl.load_workbook(path, read_only=True, data_only=True)
    count = sum(1 for _ in workbook.active.iter_rows(values_only=True))
    workbook.close()
    return count


def read_calamine(path: Path) -> int:
    workbook = python_calamine.CalamineWorkbook.from_path(str(path))
    return len(workbook.get_sheet_by_index(0).to_python(skip_empty_area=False))


def measure_afresh(path: Path) -> None:
    """The checks every workbook gets before a reader sees it (not the copy kept for a second opening)."""
    workbook_check._RECENT.clear()
    workbook_check.check_workbook(path)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rows", type=int, default=1_000_000)
    parser.add_argument("--xlsx-rows", type=int, default=100_000)
    parser.add_argument("--repeats", type=int, default=5)
    options = parser.parse_args()
    rng = np.random.default_rng(1)
    lines = []
    with tempfile.TemporaryDirectory(prefix="rankwise-bench-") as folder:
        folder = Path(folder)
        for name, writer in (("stacked CSV", write_stacked_csv), ("wide CSV", write_wide_csv)):
            path = folder / f"{name.split()[0]}.csv"
            writer(path, options.rows, rng)
            read_kwargs = {"sep": ";", "decimal": ","} if name == "wide CSV" else {}
            reference = best_time(lambda: pd.read_csv(path, **read_kwargs), options.repeats)
            ours = best_time(lambda: open_readings(path), options.repeats)
            lines.append((f"{name}, {options.rows:,} rows", "open_readings", ours, "pandas.read_csv", reference))
        path = folder / "big.xlsx"
        write_xlsx(path, options.xlsx_rows, rng)
        reference = best_time(lambda: read_openpyxl(path), options.repeats)
        calamine = best_time(lambda: read_calamine(path), options.repeats)
        checked = best_time(lambda: measure_afresh(path), options.repeats)
        ours = best_time(lambda: (workbook_check._RECENT.clear(), open_readings(path)), options.repeats)
        lines.append((f"XLSX, {options.xlsx_rows:,} rows", "python-calamine", calamine, "openpyxl read-only", reference))
        lines.append((f"XLSX, {options.xlsx_rows:,} rows", "workbook check", checked, "python-calamine", calamine))
        lines.append((f"XLSX, {options.xlsx_rows:,} rows", "open_readings", ours, "openpyxl read-only", reference))
    print(f"{'file':<26} {'measured':<16} {'time s':>8}   {'reference':<19} {'time s':>8} {'ratio':>6}")
    for label, what, seconds, reference_name, reference_seconds in lines:
        print(f"{label:<26} {what:<16} {seconds:8.3f}   {reference_name:<19} {reference_seconds:8.3f} {seconds / reference_seconds:6.2f}")


if __name__ == "__main__":
    main()
