"""Dates and times as people write them, with the offset from UTC, never in the ISO 'T' form:
"30 Nov 2026, 07:45:12 (UTC-05:00)"."""

from __future__ import annotations

from datetime import datetime


def written_moment(moment: datetime, *, seconds: bool = True) -> str:
    """``moment`` as a person writes it, with its UTC offset ("local time" when it has none)."""
    clock = f"{moment:%H:%M:%S}" if seconds else f"{moment:%H:%M}"
    offset = moment.strftime("%z")
    zone = f"UTC{offset[:3]}:{offset[3:]}" if offset else "local time"
    return f"{moment.day} {moment:%b %Y}, {clock} ({zone})"
