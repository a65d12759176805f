"""Progress reports and cancellation for long computations.

Long work (exact distributions at large sizes, simulations) calls ``Monitor.step`` now and then;
the window passes a monitor whose ``cancelled`` callable reads a flag set by the Cancel button.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable


class Cancelled(Exception):
    """The user asked to stop a computation before it finished."""


@dataclass(frozen=True)
class Monitor:
    """Reports progress (0..1) and raises ``Cancelled`` when asked to stop.

    Attributes:
        progress: called with the fraction done, or None.
        cancelled: returns True once the user asked to stop, or None.
    """

    progress: Callable[[float], None] | None = None
    cancelled: Callable[[], bool] | None = None

    def step(self, fraction: float) -> None:
        """Report ``fraction`` done; raise ``Cancelled`` if the user asked to stop."""
        if self.cancelled is not None and self.cancelled():
            raise Cancelled("The computation was stopped on request.")
        if self.progress is not None:
            self.progress(min(1.0, max(0.0, float(fraction))))


SILENT = Monitor()
"""A monitor that reports nothing and never cancels."""
