"""Fuzzing whole files in child processes with a memory cap and a time limit.

Every file, hostile or damaged, must give readings (all finite) or one plain sentence; an abort,
a memory blow-up or a hang fails this test instead of taking the test run down (``child_open``).
The corpus: far cell addresses, huge and wide sheets, lying and honest zip bombs, huge cells,
stored non-finite values, hidden and merged layouts, and mutations of every demo file (a fixed
seed, so every run opens the same files). Every input is hashed before and after: opening never
changes a file. Big cases are small zips of crafted XML (``crafted``), cheap to build.
"""

from __future__ import annotations

import hashlib
import io
import random
import zipfile
import zlib
from pathlib import Path

from crafted import (
    column_of, deflated, lying_workbook, number, rows, text, workbook_parts, write_raw_zip, write_workbook, write_zip,
)
from child_open import open_in_child

DEMO = Path(__file__).resolve().parents[2] / "demo_files"
MUTATIONS_PER_DEMO_FILE = 8


def digest(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


def far_and_damaged_addresses(folder: Path) -> list[Path]:
    readings = [[number("A2", "1.5")], [number("A3", "2.5")], [number("A4", "3.5")]]
    cases = {
        "far.xlsx": rows([text("A1", "Reading")], *readings, [number("XFD1048576", "2")]),
        "row_1e9.xlsx": '<row r="1000000000"><c r="A1000000000"><v>1</v></c></row>',
        "row_1e9_implied.xlsx": '<row r="1000000000"><c><v>1</v></c></row>',
        "row_overflow.xlsx": '<row r="1"><c r="A4294967297"><v>1</v></c></row>',
        "column_zzzz.xlsx": '<row r="1"><c r="ZZZZ1"><v>1</v></c></row>',
        "address_junk.xlsx": '<row r="1"><c r="A1B2"><v>1</v></c><c r="&#65;1"><v>2</v></c></row>',
        "address_zero.xlsx": '<row r="1"><c r="A0"><v>1</v></c></row>',
        "prefixed_far.xlsx": '<row r="1"><x:c r="A1"><v>1</v></x:c><x:c r="XFD1048576"><v>2</v></x:c></row>',
        "spaced_far.xlsx": '<row r="1"><c s="1" r = "XFD1048576"><v>2</v></c></row>',
        "quoted_far.xlsx": '<row r="1"><c a=">" r="XFD1048576"><v>2</v></c></row>',
        "many_implied.xlsx": '<row r="2">' + "<c><v>1</v></c>" * 20_000 + "</row>",
        "beyond_rows.xlsx": rows([number("A5000000", "1")], first=5000000),
        "wide_far.xlsx": rows([text("A1", "A"), number("XFD400", "3")], first=400),
    }
    return [write_workbook(folder / name, ("S", data)) for name, data in cases.items()]


def big_and_wide(folder: Path) -> list[Path]:
    tall = "".join(f'<row r="{i}"><c r="A{i}"><v>{i % 97 / 10}</v></c></row>' for i in range(2, 200_002))
    wide_cells = "".join(number(f"{_letters(j)}2", f"{j % 7}.5") for j in range(1, 1_200))
    wide_text = ",".join(f"G{j}" for j in range(1_500)) + "\n" + ",".join("1.5" for _ in range(1_500)) + "\n"
    (folder / "wide.csv").write_text(wide_text)
    (folder / "long_line.csv").write_text("A;B\n1,5;" + "9" * 140_000 + "\n2,5;3\n")
    (folder / "long_field.csv").write_text("A\n" + "1" * 300_000 + "\n")
    return [
        write_workbook(folder / "tall.xlsx", ("S", f'<row r="1">{text("A1", "Reading")}</row>' + tall)),
        write_workbook(folder / "wide.xlsx", ("S", wide_cells)),
        folder / "wide.csv", folder / "long_line.csv", folder / "long_field.csv",
    ]


def _letters(column: int) -> str:
    letters = ""
    while column:
        column, rest = divmod(column - 1, 26)
        letters = chr(65 + rest) + letters
    return letters


def zip_bombs(folder: Path) -> list[Path]:
    sheet = b"<worksheet><sheetData>" + b'<row r="1"><c r="A1"><v>1</v></c></row>' * 600_000 + b"</sheetData></worksheet>"
    lying = lying_workbook(folder / "lying.xlsx", sheet, declared=4000)
    parts = workbook_parts([("S", column_of(["1", "2", "3"]))])
    members = [(name, deflated(data), len(data), zlib.crc32(data)) for name, data in parts.items()]
    packer = zlib.compressobj(9, zlib.DEFLATED, -15)
    zeros = b"".join(packer.compress(bytes(1 << 20)) for _ in range(600)) + packer.flush()
    honest = write_raw_zip(folder / "honest.xlsx", members + [("xl/media/pad.bin", zeros, 600 << 20, 0)])
    for k in range(5):
        parts[f"xl/media/pad{k}.xml"] = b"<a>" + bytes(8_000_000) + b"</a>"
    ratio = write_zip(folder / "ratio.xlsx", parts)
    return [lying, honest, ratio]


def huge_cells(folder: Path) -> list[Path]:
    inline = write_workbook(folder / "inline.xlsx", ("S", column_of(["1", "2", "3"]) + rows([text("B1", "x" * 3_000_000)])))
    parts = workbook_parts([("S", column_of(["1", "2", "3"]) + rows(['<c r="B1" t="s"><v>0</v></c>']))])
    parts["xl/sharedStrings.xml"] = b'<sst><si><t>' + b"y" * 3_000_000 + b"</t></si></sst>"
    shared = write_zip(folder / "shared.xlsx", parts)
    return [inline, shared]


def stored_values(folder: Path) -> list[Path]:
    good = ["1.5", "2.5", "3.5", "4.5", "5.5", "6.5", "7.5", "8.5"]
    odd = ["inf", "nan", "1e309", "2e-400", "1e-310", "-INF", "-2E-400", "0." + "0" * 330 + "1"]
    regular = write_workbook(folder / "stored.xlsx", ("S", column_of(good[:4] + odd + good[4:])))
    implied = '<row r="1"><c t="inlineStr"><is><t>Reading</t></is></c></row>' + "".join(
        f'<row r="{i + 2}"><c><v>{v}</v></c></row>' for i, v in enumerate(good[:4] + odd + good[4:]))
    irregular = write_workbook(folder / "stored_implied.xlsx", ("S", implied))
    return [regular, irregular]


def hidden_and_merged(folder: Path) -> list[Path]:
    hidden = write_workbook(folder / "hidden.xlsx", ("Old", column_of(["100", "200", "300"]), "hidden"),
                            ("Readings", column_of(["1.5", "2.5", "3.5"])), active=1)
    only_hidden = write_workbook(folder / "only_hidden.xlsx", ("Notes", rows([text("A1", "see the data")])),
                                 ("Data", column_of(["1.5", "2.5"]), "hidden"))
    labels = rows([text("A1", "Press"), text("B1", "Force")], [text("A2", "P1"), number("B2", "18.3")],
                  [number("B3", "18.4")], [text("A4", "P2"), number("B4", "19.3")], [number("B5", "18.8")])
    merged = write_workbook(folder / "merged.xlsx", ("M", labels), merged={"M": ["A2:A3", "A4:A5"]})
    overlapping = write_workbook(folder / "overlapping.xlsx", ("M", labels), merged={"M": ["A2:A1048576"] * 3000})
    return [hidden, only_hidden, merged, overlapping]


def mutated_demo_files(folder: Path) -> list[Path]:
    """Each demo file damaged in several ways: bytes flipped, cut short, a stretch repeated, and for
    workbooks, XML parts damaged inside a sound zip."""
    chance = random.Random(20260314)
    made = []
    for source in sorted(DEMO.glob("*.csv")) + sorted(DEMO.glob("*.xlsx")):
        data = source.read_bytes()
        for k in range(MUTATIONS_PER_DEMO_FILE):
            mutated = bytearray(data)
            how = k % 4
            if how == 0:
                for _ in range(chance.randint(1, 12)):
                    mutated[chance.randrange(len(mutated))] = chance.randrange(256)
            elif how == 1:
                mutated = mutated[: chance.randrange(1, len(mutated))]
            elif how == 2:
                start = chance.randrange(len(mutated))
                mutated[start:start] = mutated[start: start + chance.randint(1, 4000)] * chance.randint(2, 50)
            elif source.suffix == ".xlsx":
                mutated = bytearray(_damaged_part(data, chance))
            else:
                line = chance.choice([b"1e309", b"2e-400", b"inf", b"1,002", b"\xff\xfe", b'"' * 3, b";;;;"])
                at = chance.randrange(len(mutated))
                mutated[at:at] = line
            path = folder / f"{source.stem}-{k}{source.suffix}"
            path.write_bytes(bytes(mutated))
            made.append(path)
    return made


def _damaged_part(workbook: bytes, chance: random.Random) -> bytes:
    with zipfile.ZipFile(io.BytesIO(workbook)) as archive:
        parts = {name: archive.read(name) for name in archive.namelist()}
    name = chance.choice(sorted(parts))
    data = bytearray(parts[name])
    for _ in range(chance.randint(1, 6)):
        at = chance.randrange(max(len(data), 1))
        data[at:at + 1] = chance.choice([b"<", b">", b'r="XFD1048576"', b"<c r=\"A99999999\"><v>1</v></c>", b"&", b""])
    parts[name] = bytes(data)
    out = io.BytesIO()
    with zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as archive:
        for part, content in parts.items():
            archive.writestr(part, content)
    return out.getvalue()


def test_every_file_gets_readings_or_a_plain_sentence_in_bounded_memory_and_time(tmp_path):
    groups = {
        "far": far_and_damaged_addresses, "big": big_and_wide, "bombs": zip_bombs, "cells": huge_cells,
        "stored": stored_values, "sheets": hidden_and_merged, "mutated": mutated_demo_files,
    }
    corpus: dict[str, list[Path]] = {}
    for name, make in groups.items():
        folder = tmp_path / name
        folder.mkdir()
        corpus[name] = make(folder)
    paths = [p for made in corpus.values() for p in made]
    before = {p: digest(p) for p in paths}
    outcomes = open_in_child(paths)
    assert {p: digest(p) for p in paths} == before  # no file was changed by opening it
    for path, outcome in outcomes.items():
        if outcome.refused is not None:
            message = outcome.refused
            assert message[:1].isupper() or message[:1] == "'", (path.name, message)
            assert message.endswith(".") and "Error" not in message and "Traceback" not in message, (path.name, message)
        else:
            assert outcome.groups, path.name
            assert all(finite for _, _, finite in outcome.groups), (path.name, outcome.groups)
    by_name = {p.name: outcomes[p] for p in paths}
    for path in corpus["far"] + corpus["bombs"] + corpus["cells"]:
        assert by_name[path.name].refused, f"{path.name} should have been refused"
    assert "far more cells than a readings export holds" in by_name["far.xlsx"].refused
    assert "unpacks to more than its header says" in by_name["lying.xlsx"].refused
    assert "would unpack to" in by_name["honest.xlsx"].refused and "would unpack to" in by_name["ratio.xlsx"].refused
    assert "more than 1,048,576 characters" in by_name["inline.xlsx"].refused
    assert by_name["tall.xlsx"].groups == [["Reading", 200_000, True]]
    assert "more than a readings export holds (at most 1,000)" in by_name["wide.xlsx"].refused
    assert "more than a readings export holds (at most 1,000)" in by_name["wide.csv"].refused
    assert "holds a cell of more than 131,072 characters" in by_name["long_line.csv"].refused
    assert by_name["stored.xlsx"].groups == [["Reading", 8, True]]
    assert by_name["stored_implied.xlsx"].groups == [["Reading", 8, True]]
    assert by_name["hidden.xlsx"].groups == [["Reading", 3, True]]
    assert "only hidden sheets ('Data') might" in by_name["only_hidden.xlsx"].refused
    assert [g[:2] for g in by_name["merged.xlsx"].groups] == [["P1", 2], ["P2", 2]]
    assert "merged cells overlap" in by_name["overlapping.xlsx"].refused
    read = sum(1 for p in corpus["mutated"] if outcomes[p].groups)
    assert read > 0  # some mutations leave a readable file: the readers were really exercised
