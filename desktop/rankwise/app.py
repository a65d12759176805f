"""Command line and start-up: ``rankwise [FILE] [--demo]`` opens the window; ``report`` and ``verify`` run scripted.

Heavy modules (the window, the statistics, the charts) are imported only when they are needed, so
``rankwise verify`` does not start Qt widgets; the window imports what it needs before it appears
(``ui.start_up``), so that nothing loads behind it while it is in use.
"""

from __future__ import annotations

import argparse
import signal
import sys
from collections.abc import Sequence
from pathlib import Path

RECORD_COMMANDS = ("report", "verify")
"""First words that run a scripted command instead of opening the window."""


def window_parser() -> argparse.ArgumentParser:
    """The options of the window start-up, explained in plain words."""
    parser = argparse.ArgumentParser(
        prog="rankwise",
        description="Decide and record whether a production change moved a measured characteristic.",
        epilog=(
            "Scripted use: 'rankwise report INPUT --out RESULT.xlsx ...' writes a signed result "
            "workbook; 'rankwise verify FILE.xlsx' checks that a signed record is unchanged. "
            "Run 'rankwise report --help' or 'rankwise verify --help' for their options."
        ),
    )
    parser.add_argument(
        "file", nargs="?", type=Path,
        help="readings to open (CSV or XLSX export) or a signed result workbook to reopen",
    )
    parser.add_argument("--demo", action="store_true", help="open the demo readings (two grinding wheels, invented data)")
    return parser


def record_parser() -> argparse.ArgumentParser:
    """The scripted commands, added by the records layer."""
    from rankwise.records.cli import add_record_commands

    parser = argparse.ArgumentParser(prog="rankwise", description="Scripted records: write or check a signed result workbook.")
    subparsers = parser.add_subparsers(dest="command", required=True, metavar="COMMAND")
    add_record_commands(subparsers)
    return parser


def run_record_command(argv: Sequence[str]) -> int:
    """Run ``report`` or ``verify``; the PDF of ``report`` is drawn by the window's printing module."""
    from rankwise.records.cli import page_size, run_report, run_verify

    if hasattr(signal, "SIGPIPE"):  # output piped into a reader that stops early (`| head`): end quietly, as
        signal.signal(signal.SIGPIPE, signal.SIG_DFL)  # other command-line tools do, not with a traceback
    args = record_parser().parse_args(list(argv))
    if args.command == "report":
        from rankwise.ui.printing import render_pdf_for_cli

        return run_report(args, render_pdf=lambda path, record: render_pdf_for_cli(path, record, page_size(args)))
    return run_verify(args)


def run_window(args: argparse.Namespace) -> int:
    """Show the window, offer back an unsaved entry, then open the file or demo asked for."""
    from rankwise.memory_pools import limit_memory_pools

    limit_memory_pools()  # before Qt or the window start a thread
    from PySide6.QtCore import QCoreApplication, Qt, QTimer
    from PySide6.QtGui import QGuiApplication
    from PySide6.QtWidgets import QApplication

    QCoreApplication.setOrganizationName("Rankwise")
    QCoreApplication.setApplicationName("Rankwise")
    if QApplication.instance() is None:
        QGuiApplication.setHighDpiScaleFactorRoundingPolicy(Qt.HighDpiScaleFactorRoundingPolicy.PassThrough)
    app = QApplication.instance() or QApplication(sys.argv[:1])
    app.setApplicationDisplayName("Rankwise")

    from rankwise.ui.main_window import MainWindow
    from rankwise.ui.start_up import import_what_the_window_needs

    import_what_the_window_needs()
    window = MainWindow()
    window.show()

    def after_show() -> None:
        from rankwise.ui.recent_files import remove_interrupted_saves_in_the_background

        remove_interrupted_saves_in_the_background()
        window.offer_recovery()
        if args.demo:
            window.open_demo()
        elif args.file is not None:
            window.open_path(args.file)

    QTimer.singleShot(0, after_show)
    return app.exec()


def main(argv: Sequence[str] | None = None) -> int:
    """Entry point of the ``rankwise`` command; returns the exit code."""
    arguments = list(sys.argv[1:] if argv is None else argv)
    if arguments and arguments[0] in RECORD_COMMANDS:
        return run_record_command(arguments)
    return run_window(window_parser().parse_args(arguments))


if __name__ == "__main__":
    raise SystemExit(main())
