"""`report` never destroys a file: not its input, not one output with the other, not an existing
file without --force, never a record with a PDF; refusals exit 2 and leave every byte as it was.
New files follow the umask, a replaced file keeps its mode; values may start with "-"."""

import argparse
import hashlib
import os
import stat

import pytest
from openpyxl import Workbook

from rankwise.records import read_record
from rankwise.records.atomic import write_atomically
from rankwise.records.cli import add_record_commands, run_report

# Invented demo-style readings (surface roughness, µm): not real measurements.
INVENTED_CSV = "Wheel A,-20 C\n0.42,0.45\n0.40,0.47\n0.43,0.44\n0.41,0.48\n0.42,0.46\n0.44,0.47\n"


def parser():
    top = argparse.ArgumentParser(prog="rankwise")
    add_record_commands(top.add_subparsers(dest="command", required=True))
    return top


def report(*words):
    return parser().parse_args(["report", *map(str, words)])


def fake_pdf(path, record):
    """Stands in for the window's PDF drawing: writes atomically as the real one does."""
    write_atomically(path, lambda temporary: temporary.write_bytes(b"%PDF-1.4 verdict of " +
                                                                    record.signoff.prepared.name.encode()))


def hashes(folder):
    """SHA-256 (hashlib) of every file in ``folder`` by name, links included as what they point to."""
    return {path.name: hashlib.sha256(path.read_bytes()).hexdigest() for path in sorted(folder.iterdir())
            if path.is_file()}


@pytest.fixture
def folder(tmp_path):
    (tmp_path / "wheels.csv").write_text(INVENTED_CSV, encoding="utf-8")
    code = run_report(report(tmp_path / "wheels.csv", "--out", tmp_path / "signed.xlsx", "--signed-by", "Ann Lee",
                             "--role", "technician"))
    assert code == 0
    export = Workbook()
    export.active.append(["Wheel A", "Wheel B"])
    for a, b in ((0.42, 0.45), (0.40, 0.47), (0.43, 0.44), (0.41, 0.48)):
        export.active.append([a, b])
    export.save(tmp_path / "export.xlsx")
    (tmp_path / "old-verdict.pdf").write_bytes(b"%PDF-1.4 an earlier verdict")
    (tmp_path / "damaged.xlsx").write_bytes((tmp_path / "signed.xlsx").read_bytes()[:3000])
    os.symlink(tmp_path / "signed.xlsx", tmp_path / "link-to-signed.xlsx")
    os.symlink(tmp_path / "export.xlsx", tmp_path / "link-to-export.xlsx")
    os.link(tmp_path / "export.xlsx", tmp_path / "hard-link-to-export.xlsx")
    return tmp_path


REFUSED = [
    # (input, --out, --pdf, --force, words of the message)
    ("export.xlsx", "export.xlsx", None, True, "readings file being read"),
    ("export.xlsx", "link-to-export.xlsx", None, True, "readings file being read"),
    ("export.xlsx", "hard-link-to-export.xlsx", None, True, "readings file being read"),
    ("link-to-export.xlsx", "export.xlsx", None, True, "readings file being read"),
    ("wheels.csv", "new.xlsx", "wheels.csv", True, "readings file being read"),
    ("wheels.csv", "new.xlsx", "new.xlsx", True, "both go to"),
    ("wheels.csv", "signed.xlsx", "signed.xlsx", True, "both go to"),
    ("wheels.csv", "new.xlsx", "signed.xlsx", True, "never written over a record"),
    ("wheels.csv", "new.xlsx", "link-to-signed.xlsx", True, "never written over a record"),
    ("wheels.csv", "signed.xlsx", None, False, "--force"),
    ("wheels.csv", "link-to-signed.xlsx", None, False, "--force"),
    ("wheels.csv", "damaged.xlsx", None, False, "already exists"),
    ("wheels.csv", "export.xlsx", None, False, "already exists"),
    ("wheels.csv", "new.xlsx", "old-verdict.pdf", False, "already exists"),
    ("wheels.csv", "new.xlsx", "verdict.xlsx", True, "ending .pdf"),
    ("wheels.csv", "new.pdf", None, True, "ending .xlsx"),
    ("wheels.csv", "no-such-folder/new.xlsx", None, True, "does not exist"),
    ("signed.xlsx", "new.xlsx", None, True, "rankwise verify"),
]


@pytest.mark.parametrize(("source", "out", "pdf", "force", "words"), REFUSED)
def test_refusals_exit_2_in_plain_words_and_leave_every_file_as_it_was(folder, capsys, source, out, pdf, force,
                                                                       words):
    before = hashes(folder)
    arguments = [folder / source, "--out", folder / out, "--signed-by", "Bo Park", "--role", "quality engineer"]
    if pdf is not None:
        arguments += ["--pdf", folder / pdf]
    if force:
        arguments.append("--force")
    code = run_report(report(*arguments), render_pdf=fake_pdf)
    error = capsys.readouterr().err
    assert code == 2
    assert words in error, error
    assert error.startswith("rankwise: ") and "Traceback" not in error and ".tmp" not in error
    assert hashes(folder) == before
    assert os.path.islink(folder / "link-to-signed.xlsx") and os.path.islink(folder / "link-to-export.xlsx")


def test_a_signed_record_given_as_input_is_explained_and_verify_offered(folder, capsys):
    code = run_report(report(folder / "signed.xlsx", "--out", folder / "new.xlsx", "--signed-by", "A", "--role", "B"))
    assert code == 2
    error = capsys.readouterr().err
    assert "is a Rankwise result record, not a readings file" in error
    assert f'rankwise verify "{folder / "signed.xlsx"}"' in error
    assert "group" not in error


def test_force_replaces_an_existing_record_and_pdf_keeping_their_modes_and_links(folder):
    os.chmod(folder / "signed.xlsx", 0o640)
    os.chmod(folder / "old-verdict.pdf", 0o604)
    code = run_report(report(folder / "wheels.csv", "--out", folder / "link-to-signed.xlsx", "--pdf",
                             folder / "old-verdict.pdf", "--signed-by", "Bo Park", "--role", "quality engineer",
                             "--force"), render_pdf=fake_pdf)
    assert code == 0
    assert os.path.islink(folder / "link-to-signed.xlsx")  # the link stays; the file it points to is replaced
    assert read_record(folder / "signed.xlsx").signoff.prepared.name == "Bo Park"
    assert stat.S_IMODE(os.stat(folder / "signed.xlsx").st_mode) == 0o640
    assert (folder / "old-verdict.pdf").read_bytes().endswith(b"Bo Park")
    assert stat.S_IMODE(os.stat(folder / "old-verdict.pdf").st_mode) == 0o604


@pytest.mark.parametrize("umask", [0o022, 0o077, 0o002])
def test_new_files_follow_the_umask(folder, umask):
    previous = os.umask(umask)
    try:
        code = run_report(report(folder / "wheels.csv", "--out", folder / "new.xlsx", "--pdf", folder / "new.pdf",
                                 "--signed-by", "A", "--role", "B"), render_pdf=fake_pdf)
    finally:
        os.umask(previous)
    assert code == 0
    for name in ("new.xlsx", "new.pdf"):
        assert stat.S_IMODE(os.stat(folder / name).st_mode) == 0o666 & ~umask, name
    assert not [path for path in folder.iterdir() if path.name.startswith(".")]  # no temporary file left


def test_a_failed_pdf_names_the_users_files_never_a_temporary_one(folder, capsys):
    def failing(path, record):
        def write(temporary):
            raise OSError(28, "No space left on device", str(temporary))
        try:
            write_atomically(path, write)
        except OSError as error:
            raise OSError(f"The PDF could not be written to {path}: {error.strerror}.") from error

    code = run_report(report(folder / "wheels.csv", "--out", folder / "new.xlsx", "--pdf", folder / "new.pdf",
                             "--signed-by", "A", "--role", "B"), render_pdf=failing)
    error = capsys.readouterr().err
    assert code == 2
    assert str(folder / "new.xlsx") in error and str(folder / "new.pdf") in error
    assert ".tmp" not in error and "No space left on device" in error
    assert not (folder / "new.pdf").exists()
    assert not [path for path in folder.iterdir() if path.name.startswith(".")]


def test_names_roles_and_groups_may_start_with_a_dash(folder):
    code = run_report(report(folder / "wheels.csv", "--out", folder / "new.xlsx", "--signed-by", "-Ann-",
                             "--role", "-QE", "--decision", "-accept", "--comment", "--see sheet 2",
                             "--groups", "-20 C", "Wheel A"))
    assert code == 0
    record = read_record(folder / "new.xlsx")
    prepared = record.signoff.prepared
    assert (prepared.name, prepared.role, prepared.decision, prepared.comment) == ("-Ann-", "-QE", "-accept",
                                                                                   "--see sheet 2")
    assert [group.name for group in record.analysis.groups] == ["-20 C", "Wheel A"]


def test_an_option_word_still_counts_as_an_option():
    with pytest.raises(SystemExit):
        report("in.csv", "--out", "r.xlsx", "--signed-by", "--role", "B")  # --signed-by lacks its value
    assert report("in.csv", "--out", "r.xlsx", "--signed-by", "A", "--role", "B", "--for").force  # abbreviation
