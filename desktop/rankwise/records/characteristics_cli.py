"""``rankwise report INPUT --question characteristics``: many characteristics of one part, one signed record.

The file holds one row per part, a process column (``--by``) and one column per characteristic;
``--groups A B`` names the reference and the changed process, ``--characteristics`` chooses some,
``--adjust`` says how the p-values are adjusted for the number compared.
"""

from __future__ import annotations

import argparse
from collections.abc import Callable
from pathlib import Path

from rankwise.readings import ReadingsError, open_characteristics
from rankwise.records.record import ResultRecord, fingerprint
from rankwise.records.report_outputs import signed_by_the_caller, write_outputs
from rankwise.stats.analysis import Settings
from rankwise.stats.characteristics import ADJUSTMENTS
from rankwise.stats.service import run
from rankwise.wording import CAUTION_SHORT, QUESTION_TITLES, describe
from rankwise.wording.characteristics import COLUMNS, summary_lines

_SHOWN = ("Characteristic", "Unit", "Shift B - A", "Interval", "Adjusted p", "Outcome", "Limit")
"""The summary's columns printed per characteristic on the terminal."""


def add_characteristics_options(report: argparse.ArgumentParser) -> None:
    """The options only the characteristics question takes."""
    report.add_argument("--by", metavar="COLUMN",
                        help="characteristics: the column naming the process of each part (e.g. Die); "
                             "default: the column with a few labels, each on several rows")
    report.add_argument("--characteristics", nargs="+", metavar="NAME",
                        help="characteristics: the ones to compare (column titles, with or without the unit); "
                             "default: every numeric column")
    report.add_argument("--adjust", choices=ADJUSTMENTS, default="holm",
                        help="characteristics: how the p-values are adjusted for the number compared: holm "
                             "(Holm 1979, default), fdr (Benjamini-Hochberg 1995) or none")
    report.add_argument("--margin-share", type=float, metavar="S",
                        help="characteristics: also ask whether each characteristic with both limits stays "
                             "the same within plus or minus S times its tolerance width (e.g. 0.1)")


def run_characteristics_report(args: argparse.Namespace, render_pdf: Callable[[Path, ResultRecord], None] | None,
                               problem: Callable[[str], int]) -> int:
    """Open, compare, write the record (and the PDF), print the summary; returns the exit code."""
    if args.margin is not None:
        return problem("--margin is one number in one unit; with many characteristics use --margin-share, "
                       "a share of each characteristic's tolerance width.")
    if args.margin_share is not None and not 0.0 < args.margin_share < 1.0:
        return problem(f"--margin-share must lie between 0 and 1, e.g. 0.1; got {args.margin_share}.")
    try:
        table = open_characteristics(args.input, by=args.by)
        if args.groups is not None and len(args.groups) != 2:
            raise ReadingsError(f"--groups needs two processes (A the reference, then B); got {len(args.groups)}.")
        if args.groups is None and len(table.processes) < 2:
            raise ReadingsError(f"column '{table.process_column}' names only {len(table.processes)} process; "
                                "two are needed.")
        group_a, group_b = args.groups if args.groups is not None else table.processes[:2]
        settings = Settings(alpha=args.alpha, alternative=args.alternative, adjust=args.adjust)
        analysis = table.to_analysis(group_a, group_b, names=args.characteristics, settings=settings,
                                     margin_share=args.margin_share)
        result = run(analysis)
    except (ReadingsError, ValueError) as error:
        return problem(str(error))
    names = [item.name for item in analysis.characteristics]
    record = signed_by_the_caller(args, analysis, table.snapshot(group_a, group_b, names=names), result)
    not_written = write_outputs(args, record, render_pdf)
    if not_written is not None:
        return problem(not_written)
    _print_summary(record, args)
    return 0


def _print_summary(record: ResultRecord, args: argparse.Namespace) -> None:
    analysis, result = record.analysis, record.result
    verdict = describe(result, analysis)
    print(f"Question: {QUESTION_TITLES[analysis.question]}"
          + ("" if args.question else " (the question the file suggests)"))
    print(verdict.headline)
    for sentence in verdict.sentences:
        print(f"  {sentence}")
    at = [COLUMNS.index(name) for name in _SHOWN]
    for line in summary_lines(result, analysis):
        name, unit, shift, interval, p, outcome, limit = (line.texts[i] for i in at)
        unit = f" {unit}" if unit else ""
        print(f"  {name}: {outcome}; shift {shift}{unit} ({interval}); adjusted p {p}" + (f"; {limit}" if limit else ""))
    for note in verdict.assumption_notes:
        print(f"Note: {note}")
    print(f"Caution: {CAUTION_SHORT}")
    print(f"Signed record written to {args.out} (fingerprint {fingerprint(record)}).")
    if args.pdf is not None:
        print(f"One-page verdict written to {args.pdf}.")
