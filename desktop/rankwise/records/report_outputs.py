"""What ``rankwise report`` writes once a result is found, whatever the question: the record
signed by the person named on the command line, the workbook and, when asked, the one-page PDF."""

from __future__ import annotations

import argparse
from collections.abc import Callable
from datetime import datetime
from pathlib import Path

from rankwise.records.errors import RecordError
from rankwise.records.record import ResultRecord
from rankwise.records.signoff import SignOff, Signature
from rankwise.records.workbook import write_record


def signed_by_the_caller(args: argparse.Namespace, analysis, snapshot, result) -> ResultRecord:
    """The record of ``result``, prepared and signed now by ``--signed-by`` in ``--role``."""
    signature = Signature(name=args.signed_by.strip(), role=args.role.strip(), decision=args.decision.strip(),
                          comment=args.comment.strip(), signed_at=datetime.now().astimezone())
    return ResultRecord.now(analysis, snapshot, result, SignOff(prepared=signature))


def write_outputs(args: argparse.Namespace, record: ResultRecord,
                  render_pdf: Callable[[Path, ResultRecord], object]) -> str | None:
    """Write the workbook to ``--out`` (replacing was allowed before) and the PDF to ``--pdf``;
    the problem in plain words when either could not be written, else None."""
    try:
        write_record(args.out, record, overwrite_signed=True)
    except RecordError as error:
        return str(error)
    if args.pdf is not None:
        try:
            render_pdf(args.pdf, record)
        except (OSError, ValueError) as error:
            return f"the signed record was written to '{args.out}', but the PDF was not: {error}"
    return None
