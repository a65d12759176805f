"""A result on record: what was asked, the readings as entered, the result, who signed, and when."""

from __future__ import annotations

import platform
from dataclasses import dataclass, field
from datetime import datetime
from typing import Any

import numpy
import openpyxl
import scipy

import rankwise
from rankwise.readings import ReadingsError, SheetSnapshot
from rankwise.records.canonical import decode, encode
from rankwise.records.characteristics_nulls import (
    encoded_without_null_distributions,
    with_null_distributions,
    with_null_placeholders,
)
from rankwise.records.errors import RecordError
from rankwise.records.signoff import SignOff
from rankwise.stats.analysis import Analysis
from rankwise.stats.results import CharacteristicsResult, Result

RECORD_FORMAT = 2
"""Newest version of the stored form; raised when the meaning of the stored data changes.
2: a many-characteristics record leaves out each characteristic's null distribution, rebuilt from
the stored ranks when read (``characteristics_nulls``). Records of a single question are the same
in forms 1 and 2, so they are still written as form 1; both forms are read."""

KNOWN_FORMATS = (1, 2)


def stored_format(record: ResultRecord) -> int:
    """The form ``record`` is written in: 2 for a many-characteristics record, 1 for any other."""
    return 2 if isinstance(record.result, CharacteristicsResult) else 1


def current_library_versions() -> tuple[tuple[str, str], ...]:
    """Versions of the libraries that computed and wrote a result (python, numpy, scipy, openpyxl)."""
    return (
        ("python", platform.python_version()),
        ("numpy", numpy.__version__),
        ("scipy", scipy.__version__),
        ("openpyxl", openpyxl.__version__),
    )


@dataclass(frozen=True)
class ResultRecord:
    """Everything a signed result workbook holds.

    Attributes:
        analysis: the question, the groups' readings and the settings.
        snapshot: the readings sheet exactly as entered (every cell's text and what it was read as).
        result: the statistics service's answer to ``analysis``.
        signoff: the sign-off block, or None for an unsigned draft.
        program_version: Rankwise's version that wrote the record.
        library_versions: (name, version) of python, numpy, scipy and openpyxl.
        created_at: when the record was written (timezone-aware).
        signed_fingerprint: the fingerprint the workbook carries, for a record read back from one
            (so a reprint shows what was signed even if a later version lays the sheets out
            differently); None for a record not yet written. Not part of the stored data.
    """

    analysis: Analysis
    snapshot: SheetSnapshot
    result: Result
    signoff: SignOff | None
    program_version: str
    library_versions: tuple[tuple[str, str], ...]
    created_at: datetime
    signed_fingerprint: str | None = field(default=None, compare=False)

    @classmethod
    def now(cls, analysis: Analysis, snapshot: SheetSnapshot, result: Result,
            signoff: SignOff | None) -> ResultRecord:
        """A record written now, by this program and these libraries."""
        return cls(analysis=analysis, snapshot=snapshot, result=result, signoff=signoff,
                   program_version=rankwise.__version__,
                   library_versions=current_library_versions(),
                   created_at=datetime.now().astimezone())

    @property
    def is_signed(self) -> bool:
        """True when at least the first signature is present."""
        return self.signoff is not None


def record_to_data(record: ResultRecord, record_format: int | None = None) -> dict[str, Any]:
    """The record as plain JSON data: the stored form that the fingerprint covers, in the form it is
    written in (or in ``record_format``, to compare with a record read back from an older form)."""
    record_format = stored_format(record) if record_format is None else record_format
    return {
        "record_format": record_format,
        "analysis": encode(record.analysis, Analysis),
        "snapshot": record.snapshot.to_dict(),
        "result": (encoded_without_null_distributions(record.result) if record_format >= 2
                   else encode(record.result, Result)),
        "signoff": encode(record.signoff, SignOff | None),
        "program_version": record.program_version,
        "library_versions": [list(pair) for pair in record.library_versions],
        "created_at": encode(record.created_at, datetime),
    }


def record_from_data(data: Any) -> ResultRecord:
    """The record from its stored form; ``RecordError`` when it is damaged or from a later format."""
    if not isinstance(data, dict) or data.get("record_format") not in KNOWN_FORMATS:
        raise RecordError(
            "The record's program data are in a form this version of Rankwise does not know; "
            "open it with the version that wrote it."
        )
    try:
        snapshot = SheetSnapshot.from_dict(data["snapshot"])
        versions = tuple((str(name), str(version)) for name, version in data["library_versions"])
        program_version = data["program_version"]
    except (ReadingsError, KeyError, TypeError, ValueError) as error:
        raise RecordError("The readings stored in the record are damaged and cannot be read back.") from error
    return ResultRecord(
        analysis=decode(with_later_fields(data.get("analysis")), Analysis),
        snapshot=snapshot,
        result=_stored_result(data),
        signoff=decode(data.get("signoff"), SignOff | None),
        program_version=decode(program_version, str),
        library_versions=versions,
        created_at=decode(data.get("created_at"), datetime),
    )


def _stored_result(data: dict[str, Any]) -> Result:
    """The stored result; in form 2 with the characteristics' null distributions rebuilt."""
    if data["record_format"] < 2:
        return decode(data.get("result"), Result)
    result = decode(with_null_placeholders(data.get("result")), Result)
    if not isinstance(result, CharacteristicsResult):
        return result
    try:
        return with_null_distributions(result)
    except (ValueError, TypeError, IndexError) as error:
        raise RecordError("The ranks stored in the record are damaged: the results cannot be read back.") from error


_LATER_ANALYSIS_FIELDS = {"decimal_mark": ".", "characteristics": [], "entries": []}
_LATER_SETTINGS_FIELDS = {"plan_paired": False, "adjust": "holm", "plan_groups": 2}
"""Fields added to the analysis after records were first written, with the value an older record meant."""


def with_later_fields(analysis: Any) -> Any:
    """The stored analysis with the fields an older record lacks filled in as it meant them (numbers
    written with a decimal point, planning for two separate groups, no characteristics list, Holm's
    adjustment, no count of the sheet's entries, plans for two groups); the stored data stay unchanged."""
    if not isinstance(analysis, dict):
        return analysis
    completed = {**_LATER_ANALYSIS_FIELDS, **analysis}
    settings = completed.get("settings")
    if isinstance(settings, dict):
        completed["settings"] = {**_LATER_SETTINGS_FIELDS, **settings}
    return completed


def fingerprint(record: ResultRecord) -> str:
    """SHA-256 (hex) over the canonical form of the readings, settings, result and sign-off, and of
    what the result workbook's visible sheets show: the fingerprint its workbook carries."""
    if record.signed_fingerprint:
        return record.signed_fingerprint
    from rankwise.records.workbook import record_fingerprint  # the workbook module builds on this one

    return record_fingerprint(record)
