"""Writing, reading and checking a signed record of many characteristics, against the comparison itself.

Run:  .venv/bin/python tests/benchmarks/bench_characteristics_record.py [--counts 20 200]

Invented gauge readings from ``bench_characteristics.invented_columns`` (50 + 50 per characteristic,
existing only for timing), opened as a file with one row per part, compared, and written as an
unsigned record. Prints one table: seconds to compare (the reference), to write, read back and
check the record, each also as a ratio to the comparison, the file's size and the size of its
largest unpacked part (the program data sheet).
"""

from __future__ import annotations

import argparse
import csv
import os
import tempfile
import zipfile
from pathlib import Path

from bench_characteristics import invented_columns, timed

from rankwise.readings import open_characteristics
from rankwise.records import ResultRecord, read_record, verify_record, write_record
from rankwise.stats import run

PER_GROUP = 50


def invented_file(count: int, folder: Path) -> Path:
    """A CSV export with one row per part, a process column and ``count`` characteristic columns."""
    columns = invented_columns(count, PER_GROUP)
    path = folder / f"characteristics_{count}.csv"
    with path.open("w", newline="") as file:
        writer = csv.writer(file)
        writer.writerow(["Part", "Process"] + [f"{name} [mm]" for name, _, _ in columns])
        for process, index in (("old", 1), ("new", 2)):
            for part in range(PER_GROUP):
                writer.writerow([f"{process}-{part + 1}", process] + [f"{column[index][part]:.3f}" for column in columns])
    return path


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--counts", type=int, nargs="+", default=[20, 200])
    arguments = parser.parse_args()
    folder = Path(tempfile.mkdtemp())
    print(f"{'characteristics':>15} {'compare s':>9} {'write s':>8} {'x':>5} {'read s':>7} {'x':>5} "
          f"{'check s':>8} {'x':>5} {'file MB':>8} {'data MB':>8} status")
    for count in arguments.counts:
        table = open_characteristics(invented_file(count, folder))
        analysis = table.to_analysis("old", "new")
        compare, result = timed(lambda: run(analysis))
        record = ResultRecord.now(analysis, table.snapshot("old", "new"), result, None)
        path = folder / f"record_{count}.xlsx"
        write, _ = timed(lambda: write_record(path, record))
        read, back = timed(lambda: read_record(path))
        check, verification = timed(lambda: verify_record(path))
        if back.result != result:
            raise SystemExit("The record did not read back as the comparison's result.")
        with zipfile.ZipFile(path) as archive:
            largest = max(item.file_size for item in archive.infolist())
        print(f"{count:15d} {compare:9.2f} {write:8.2f} {write / compare:5.1f} {read:7.2f} {read / compare:5.1f} "
              f"{check:8.2f} {check / compare:5.1f} {os.path.getsize(path) / 1e6:8.2f} {largest / 1e6:8.2f} "
              f"{verification.status}")
    print(f"load average (1 min) at the end: {os.getloadavg()[0]:.1f}")


if __name__ == "__main__":
    main()
