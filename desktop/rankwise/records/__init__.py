"""Records: the signed result workbook (write, read back, verify) and its content fingerprint."""

from rankwise.records.errors import RecordError
from rankwise.records.record import ResultRecord, fingerprint
from rankwise.records.signoff import DECISIONS, SignOff, Signature
from rankwise.records.workbook import build_workbook, read_record, write_record

__all__ = [
    "DECISIONS",
    "RecordError",
    "ResultRecord",
    "SignOff",
    "Signature",
    "build_workbook",
    "fingerprint",
    "read_record",
    "write_record",
]
