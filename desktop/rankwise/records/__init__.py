"""Records: the signed result workbook (write, read back, verify) and its content fingerprint."""

from rankwise.records.errors import RecordError
from rankwise.records.record import ResultRecord, fingerprint
from rankwise.records.signoff import DECISIONS, SignOff, Signature
from rankwise.records.verify import Verification, verify_record
from rankwise.records.workbook import build_workbook, read_record, write_record

__all__ = [
    "DECISIONS",
    "RecordError",
    "ResultRecord",
    "SignOff",
    "Signature",
    "Verification",
    "build_workbook",
    "fingerprint",
    "read_record",
    "verify_record",
    "write_record",
]
