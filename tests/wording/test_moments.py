"""Dates and times are written as people write them, with the offset (common practice, no source)."""

from datetime import datetime, timedelta, timezone

from rankwise.wording.moments import written_moment


def test_moment_with_offset_and_no_iso_t():
    moment = datetime(2026, 11, 30, 7, 45, 12, tzinfo=timezone(timedelta(hours=-5)))
    assert written_moment(moment) == "30 Nov 2026, 07:45:12 (UTC-05:00)"
    assert written_moment(moment, seconds=False) == "30 Nov 2026, 07:45 (UTC-05:00)"


def test_moment_without_offset_says_local_time():
    assert written_moment(datetime(2026, 12, 2, 0, 56, 36)) == "2 Dec 2026, 00:56:36 (local time)"
