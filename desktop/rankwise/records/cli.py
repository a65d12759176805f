"""Scripted commands: ``rankwise report`` writes a signed result workbook, ``rankwise verify`` checks one.

No Qt here: the one-page PDF is drawn by a ``render_pdf(path, record)`` callable that the
application passes in from the window's printing module.
"""

from __future__ import annotations

import argparse
import sys
from collections.abc import Callable
from pathlib import Path

from rankwise.readings import CellKind, ReadingSheet, ReadingsError, open_readings, parse_reading
from rankwise.records.characteristics_cli import add_characteristics_options, run_characteristics_report
from rankwise.records.record import ResultRecord, fingerprint
from rankwise.records.report_outputs import signed_by_the_caller, write_outputs
from rankwise.records.targets import Target, refusal
from rankwise.records.verify import verify_record
from rankwise.records.workbook import is_record_file
from rankwise.stats.analysis import ALTERNATIVES, Question, Settings
from rankwise.stats.service import run
from rankwise.wording import CAUTION_SHORT, QUESTION_TITLES, describe

REPORT_QUESTIONS = (Question.TWO_GROUPS.value, Question.PAIRED.value, Question.SEVERAL.value,
                    Question.CHARACTERISTICS.value)
"""The questions ``report`` answers (planning is asked in the window)."""
PAPER_SIZES = {"a4": "A4", "letter": "Letter"}
"""``--paper`` choices and the page size each one draws."""
EXIT_DONE = 0
EXIT_CHANGED = 1
EXIT_PROBLEM = 2
RenderPdf = Callable[[Path, ResultRecord], None]
"""Draws the one-page verdict of a record into a PDF (on the paper ``page_size(args)`` names)."""


class _ValuesMayStartWithDash(argparse.ArgumentParser):
    """A parser that takes a word starting with "-" as an ordinary value unless it names one of the
    command's options, so ``--signed-by -Ann-`` or a group called "-20 C" need no "=" (a word that
    does name an option, or an abbreviation of one, stays an option)."""

    def _parse_optional(self, arg_string):
        if arg_string.startswith("-") and arg_string != "--" and not self._names_an_option(arg_string):
            return None
        return super()._parse_optional(arg_string)

    def _names_an_option(self, word: str) -> bool:
        name = word.split("=", 1)[0]
        options = self._option_string_actions
        if name in options:
            return True
        return self.allow_abbrev and name.startswith("--") and any(option.startswith(name) for option in options)


def add_record_commands(subparsers: argparse._SubParsersAction) -> None:
    """Add ``report`` and ``verify`` to an argparse parser's sub-commands."""
    report = subparsers.add_parser(
        "report",
        help="answer a question about a readings file and write a signed result workbook",
        description=("Open a readings file (CSV or XLSX export), answer the question it suggests (or the one "
                     "chosen with --question) with a rank test, and write a signed result workbook, and "
                     "optionally the one-page verdict as a PDF. Two groups: Mann-Whitney U; the same parts "
                     "measured twice: Wilcoxon signed-rank, paired by the file's part identifiers; several "
                     "groups: Kruskal-Wallis."),
        epilog=("Exit code 0 when the record was written; 2 with a plain message when something is wrong "
                "(then no file was written or changed). A value that starts with '-' is taken as a value, "
                "e.g. --signed-by -Ann-, unless it is one of the options."),
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    report.__class__ = _ValuesMayStartWithDash
    report.add_argument("input", type=Path, metavar="INPUT", help="the readings file to open (CSV or XLSX)")
    report.add_argument("--out", type=Path, required=True, metavar="RESULT.xlsx",
                        help="where to write the signed result workbook")
    report.add_argument("--pdf", type=Path, metavar="VERDICT.pdf", help="also save the one-page verdict as a PDF here")
    report.add_argument("--signed-by", required=True, metavar="NAME", help="the printed name of the person signing")
    report.add_argument("--role", required=True, metavar="ROLE", help="their role, e.g. 'process technician'")
    report.add_argument("--decision", default="", metavar="TEXT",
                        help="the decision in plain words, e.g. 'accept the change'")
    report.add_argument("--comment", default="", metavar="TEXT", help="a comment to keep with the signature")
    report.add_argument("--alpha", type=float, default=0.05, metavar="A",
                        help="significance level: the accepted chance of a false alarm (default 0.05)")
    report.add_argument("--question", choices=REPORT_QUESTIONS,
                        help="two-groups: did the change move the readings? (two groups of different parts)  "
                             "paired: did the same parts read differently the second time? (before / after, "
                             "paired by the file's part column)  several: do three or more groups read alike?  "
                             "(default: the question the file suggests: paired when its parts are measured "
                             "twice, several for three or more groups, else two-groups)  characteristics: did "
                             "the change move any characteristic? (one row per part, a process column, one "
                             "column per characteristic; see --by, --characteristics, --adjust)")
    report.add_argument("--alternative", choices=ALTERNATIVES, default="two-sided",
                        help="two-sided: does B differ from A?  b-greater: does B read higher?  "
                             "b-less: does B read lower? For the same parts, B is the second reading "
                             "(after). (default two-sided)")
    report.add_argument("--margin", metavar="M",
                        help="ask instead whether A and B are the same within plus or minus M, in the "
                             "readings' unit (two-groups and paired; decimal comma or point, e.g. 0,5)")
    report.add_argument("--groups", nargs="+", metavar="NAME",
                        help="the groups to use: for two-groups and paired, the reference group A (e.g. the "
                             "current process, or before) and then the changed group B; for several, two or "
                             "more groups; default: the file's first two groups, or all of them for several")
    report.add_argument("--reference", metavar="NAME",
                        help="several: compare every group with this one (e.g. the current machine) instead "
                             "of every pair of groups")
    report.add_argument("--paper", choices=PAPER_SIZES, default="a4",
                        help="paper size of the one-page verdict PDF: a4 or letter (US Letter) (default a4)")
    report.add_argument("--force", action="store_true",
                        help="replace RESULT.xlsx or VERDICT.pdf when it already exists (even a signed record); "
                             "the readings file is never written over, and a PDF never over a record")

    add_characteristics_options(report)

    verify = subparsers.add_parser(
        "verify",
        help="check that a signed result workbook is unchanged",
        description=("Recompute a signed result workbook's fingerprint and results from its readings and "
                     "compare every shown value with what was signed."),
        epilog="Exit code 0: intact; 1: changed since it was written (the differences are listed); "
               "2: not a Rankwise record, or unreadable.",
    )
    verify.add_argument("file", type=Path, metavar="FILE", help="the result workbook (.xlsx) to check")


def _problem(message: str) -> int:
    print(f"rankwise: {message}", file=sys.stderr)
    return EXIT_PROBLEM


def run_report(args: argparse.Namespace, render_pdf: RenderPdf | None = None) -> int:
    """Write the signed workbook (and the PDF) for ``args`` from ``report``; returns the exit code.

    Before anything is computed, the outputs are checked (``rankwise.records.targets.refusal``): a
    refusal leaves every file as it was and exits with 2.
    """
    if args.pdf is not None and render_pdf is None:
        return _problem("the PDF cannot be drawn here (the window's printing module is not available); "
                        "leave out --pdf.")
    if not 0.0 < args.alpha < 0.5:
        return _problem(f"--alpha must lie between 0 and 0.5, e.g. 0.05; got {args.alpha}.")
    if not args.signed_by.strip() or not args.role.strip():
        return _problem("--signed-by and --role need a name and a role; they cannot be blank.")
    if args.input.is_file() and is_record_file(args.input):
        return _problem(f"'{args.input}' is a Rankwise result record, not a readings file. To check that it is "
                        f"unchanged since signing, run: rankwise verify \"{args.input}\"")
    targets = [Target(args.out, "the signed record", ".xlsx")]
    if args.pdf is not None:
        targets.append(Target(args.pdf, "the PDF", ".pdf"))
    refused = refusal(args.input, targets, replace=args.force)
    if refused is not None:
        return _problem(refused)
    if args.question == Question.CHARACTERISTICS.value:
        return run_characteristics_report(args, render_pdf, _problem)
    try:
        reading_set = open_readings(args.input)
    except ReadingsError as error:
        return _problem(str(error))
    except Exception as error:  # noqa: BLE001 - any other failure of a reader still gets a plain answer and exit 2
        return _problem(f"'{args.input.name}' could not be read as readings ({type(error).__name__}); check that it is "
                        "a CSV or XLSX export of readings, or open it in a spreadsheet program and save it again.")
    if args.question is None and reading_set.suggested_question is Question.CHARACTERISTICS:
        return run_characteristics_report(args, render_pdf, _problem)
    try:
        sheet = ReadingSheet.from_reading_set(reading_set)
        question = _question(args, reading_set)
        chosen = _chosen_groups(sheet.group_names, args.groups, question)
        settings = _settings(args, question, sheet.group_names)
        if question is Question.PAIRED:
            cannot_pair = sheet.pairing_refusal(chosen)
            if cannot_pair:
                raise ValueError(cannot_pair)
        analysis = sheet.to_analysis(question, settings, groups=chosen)
        result = run(analysis)
    except (ReadingsError, ValueError) as error:
        return _problem(str(error))
    record = signed_by_the_caller(args, analysis, sheet.snapshot(), result)
    not_written = write_outputs(args, record, render_pdf)
    if not_written is not None:
        return _problem(not_written)
    verdict = describe(result, analysis)
    print(f"Question: {QUESTION_TITLES[question]}" + ("" if args.question else " (the question the file suggests)"))
    print(verdict.headline)
    for sentence in verdict.sentences:
        print(f"  {sentence}")
    for note in analysis.notes:
        print(note if note.startswith(("Caution:", "Warning:")) else f"Note: {note}")
    print(f"Caution: {CAUTION_SHORT}")
    print(f"Signed record written to {args.out} (fingerprint {fingerprint(record)}).")
    if args.pdf is not None:
        print(f"One-page verdict written to {args.pdf}.")
    return EXIT_DONE


def page_size(args: argparse.Namespace) -> str:
    """The page size ``--paper`` asks for: "A4" or "Letter"."""
    return PAPER_SIZES[args.paper]


def _question(args: argparse.Namespace, reading_set) -> Question:
    """The question asked, or the file's suggestion; two named groups of a several-groups file are two groups."""
    if args.question is not None:
        return Question(args.question)
    suggested = reading_set.suggested_question
    if suggested is Question.SEVERAL and args.groups is not None and len(args.groups) == 2:
        return Question.TWO_GROUPS
    return suggested


def _settings(args: argparse.Namespace, question: Question, names: list[str]) -> Settings:
    """The settings for ``question``; ``ValueError`` in plain words for an option that does not fit it."""
    margin = None
    if args.margin is not None:
        if question is Question.SEVERAL:
            raise ValueError("--margin belongs to the two-groups and paired questions, not to several groups.")
        margin = _margin(args.margin)
    if args.reference is not None:
        if question is not Question.SEVERAL:
            raise ValueError("--reference belongs to the several-groups question; for two groups, "
                             "name the reference first with --groups.")
        if args.reference not in names:
            raise ValueError(f"the file has no group named {args.reference!r} to use as the reference; "
                             f"its groups are {', '.join(repr(n) for n in names)}.")
    if question is Question.SEVERAL and args.alternative != "two-sided":
        raise ValueError("several groups are compared two-sided only; leave out --alternative.")
    return Settings(alpha=args.alpha, alternative=args.alternative, margin=margin,
                    comparison="against-reference" if args.reference is not None else "all-pairs",
                    reference=args.reference)


def _margin(text: str) -> float:
    """The margin as typed, with a decimal comma or point; ``ValueError`` unless a positive number."""
    cell = parse_reading(text.strip(), decimal="," if "," in text else ".")
    if cell.kind is not CellKind.NUMBER or not cell.value > 0:
        raise ValueError(f"--margin must be a positive number in the readings' unit, e.g. 0.5 or 0,5; got {text!r}.")
    return cell.value


def _chosen_groups(names: list[str], asked: list[str] | None, question: Question) -> list[int]:
    """Indices of the groups to compare; ``ValueError`` in plain words when they are not there."""
    wanted = "two or more" if question is Question.SEVERAL else "two"
    if asked is None:
        if len(names) < 2:
            raise ValueError(f"the file holds {len(names)} group(s); {wanted} are needed to compare.")
        return list(range(len(names))) if question is Question.SEVERAL else [0, 1]
    if question is not Question.SEVERAL and len(asked) != 2:
        raise ValueError(f"--groups needs two names for this question (A, then B); got {len(asked)}.")
    if len(asked) < 2:
        raise ValueError("--groups needs two or more groups for several groups.")
    if len(set(asked)) != len(asked):
        raise ValueError("--groups needs different groups.")
    missing = [name for name in asked if name not in names]
    if missing:
        raise ValueError(f"the file has no group named {', '.join(repr(m) for m in missing)}; "
                         f"its groups are {', '.join(repr(n) for n in names)}.")
    return [names.index(name) for name in asked]


def run_verify(args: argparse.Namespace) -> int:
    """Check ``args.file``; print what was found; 0 intact, 1 changed, 2 not a record or unreadable."""
    verification = verify_record(args.file)
    if verification.status == "not-a-record":
        return _problem(verification.summary)
    print(verification.summary)
    for difference in verification.differences:
        print(f"  - {difference}")
    for note in verification.notes:
        print(f"  Note: {note}")
    if verification.fingerprint:
        print(f"Fingerprint on record: {verification.fingerprint}")
    return EXIT_DONE if verification.intact else EXIT_CHANGED
