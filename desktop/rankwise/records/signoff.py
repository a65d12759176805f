"""Who signed a result, in which role, when, and what they decided."""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime

DECISIONS = ("accept the change", "do not accept the change", "collect more data")
"""Decisions offered in the window; any other plain text is accepted as well."""


@dataclass(frozen=True)
class Signature:
    """One signature on a result.

    Attributes:
        name: the person's printed name.
        role: their role ("process technician", "quality engineer").
        decision: the decision in plain words (see ``DECISIONS``).
        comment: free text, may be "".
        signed_at: when they signed, from the clock, with the UTC offset (timezone-aware).
    """

    name: str
    role: str
    decision: str
    comment: str
    signed_at: datetime


@dataclass(frozen=True)
class SignOff:
    """The sign-off block: the person who prepared the result and an optional reviewer.

    Attributes:
        prepared: the first signature (required).
        reviewed: the review / approval signature, or None.
        revision: 1 for the first signed record, 2 for a new revision started from it, and so on.
    """

    prepared: Signature
    reviewed: Signature | None = None
    revision: int = 1
