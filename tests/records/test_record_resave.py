"""A record opened and saved unchanged by a spreadsheet program is re-saved, not changed: LibreOffice
Calc (run headless in a child process) and openpyxl. An edit made after such a re-save is still found."""

import dataclasses
import shutil
import subprocess
from pathlib import Path

import pytest
from openpyxl import load_workbook

from rankwise.records import write_record
from rankwise.records.readings_sheet import FIRST_ENTRY_ROW
from rankwise.records.verify import verify_record
from rankwise.stats.service import run

from record_builders import paired_record, plan_record, several_record

SOFFICE = shutil.which("soffice")


def plan_by_the_service():
    """Noether's plan (record_builders) as the window computes it, with the simulated power."""
    record = plan_record()
    return dataclasses.replace(record, result=run(record.analysis))


BUILDERS = {
    "paired": paired_record,
    "paired-comma": lambda: paired_record(comma=True),
    "several": several_record,
    "plan": plan_by_the_service,
}
LIBREOFFICE_TIMEOUT_S = 600


def resave_with_libreoffice(paths, folder):
    """Open and save each workbook unchanged with LibreOffice Calc, in a child process with a time
    limit and a private profile; returns the re-saved copies."""
    out = folder / "resaved"
    out.mkdir()
    profile = (folder / "profile").as_uri()
    done = subprocess.run([SOFFICE, f"-env:UserInstallation={profile}", "--headless", "--norestore",
                           "--convert-to", "xlsx", "--outdir", str(out), *map(str, paths)],
                          capture_output=True, text=True, timeout=LIBREOFFICE_TIMEOUT_S, check=False)
    copies = [out / Path(path).name for path in paths]
    assert all(copy.exists() for copy in copies), done.stdout + done.stderr
    return copies


@pytest.fixture(scope="module")
def written(tmp_path_factory):
    folder = tmp_path_factory.mktemp("resave")
    paths = {}
    for name, build in BUILDERS.items():
        paths[name] = folder / f"{name}.xlsx"
        write_record(paths[name], build())
    return folder, paths


@pytest.fixture(scope="module")
def libreoffice_copies(written, tmp_path_factory):
    if SOFFICE is None:
        pytest.skip("LibreOffice Calc (soffice) is not installed; resources/install.sh --test installs it")
    folder, paths = written
    copies = resave_with_libreoffice(list(paths.values()), tmp_path_factory.mktemp("libreoffice"))
    return dict(zip(paths, copies))


@pytest.mark.parametrize("name", list(BUILDERS))
def test_a_record_resaved_by_libreoffice_is_intact_and_said_to_be_resaved(libreoffice_copies, written, name):
    copy = libreoffice_copies[name]
    assert copy.read_bytes() != written[1][name].read_bytes()  # really another file
    verification = verify_record(copy)
    assert verification.status == "intact", verification.differences
    assert any("saved again by another program (LibreOffice" in note for note in verification.notes), \
        verification.notes


def test_an_edit_after_a_libreoffice_resave_is_still_found_and_named_once(libreoffice_copies, tmp_path):
    book = load_workbook(libreoffice_copies["paired"])
    # 2.48 is the fourth reading of the first group, Hollander & Wolfe (1999), 2nd ed., p. 39.
    book["Readings as entered"].cell(row=FIRST_ENTRY_ROW + 3, column=2).value = 2.49
    edited = tmp_path / "edited.xlsx"
    book.save(edited)
    verification = verify_record(edited)
    assert verification.status == "changed"
    assert verification.differences == (
        f"Sheet 'Readings as entered', cell B{FIRST_ENTRY_ROW + 3}: showed 2.48 when signed, now shows 2.49.",)


@pytest.mark.parametrize("name", list(BUILDERS))
def test_a_record_resaved_by_openpyxl_is_intact_and_said_to_be_resaved(written, tmp_path, name):
    copy = tmp_path / f"{name}.xlsx"
    load_workbook(written[1][name]).save(copy)
    verification = verify_record(copy)
    assert verification.status == "intact", verification.differences
    assert any("saved again by another program (" in note for note in verification.notes), verification.notes


@pytest.mark.parametrize("name", list(BUILDERS))
def test_a_record_as_rankwise_wrote_it_carries_no_resave_note(written, name):
    verification = verify_record(written[1][name])
    assert verification.status == "intact", verification.differences
    assert not any("saved again" in note for note in verification.notes)
