"""What the window needs soon after it appears, imported before it does.

The statistics (scipy.stats) and the charts (pyqtgraph) take most of a second to import. Imported
on a thread once the window ran, they kept it from drawing for up to 150 ms at a time: Python runs
one thread of a process at a time, and a compiled module being loaded does not let go of its turn.
Imported first, they cost the same second before the window appears and none after.
"""

from __future__ import annotations


def import_what_the_window_needs() -> None:
    """Import the statistics service, the charts and what suggests an opened file's question (call
    before the window is shown)."""
    import rankwise.readings.same_parts  # noqa: F401 - imported for their side effect: loaded once, here
    import rankwise.stats.service  # noqa: F401
    import rankwise.ui.charts  # noqa: F401
