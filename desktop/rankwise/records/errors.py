"""The one error the records layer raises: a plain sentence saying what is wrong and what to do."""

from __future__ import annotations


class RecordError(Exception):
    """A result workbook cannot be written or read as asked.

    The message is one plain sentence for the technician. Nothing has been changed when it is
    raised: an existing workbook is left exactly as it was.
    """
