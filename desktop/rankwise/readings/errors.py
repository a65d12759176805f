"""The one error the readings layer raises: a plain sentence saying what is wrong and what to do."""

from __future__ import annotations


class ReadingsError(Exception):
    """Readings or a file cannot be used as asked.

    The message is one plain sentence for the technician: what is wrong, and what to do about it.
    Nothing has been changed when it is raised (neither the sheet nor any file).
    """
