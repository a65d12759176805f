"""A scatter item whose dots all look the same, so that thousands of them are set at once.

pyqtgraph's ``ScatterPlotItem`` finds each new dot's picture in its symbol atlas dot by dot (a
Python step per dot: about 0.1 s for 4,000 dots, all of it on the window's thread). When no dot has
a look of its own, every dot has the same picture: this item finds it for the first new dot and
gives its place to the others in one numpy step. Drawing, hovering and tooltips are pyqtgraph's.
"""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg

_OWN_LOOK = ("symbol", "pen", "brush")
"""A dot's own symbol, pen and brush are None when it has none (and its size is -1)."""


class SameLookDots(pg.ScatterPlotItem):
    """``ScatterPlotItem`` for dots given no look of their own (only x, y and the item's options)."""

    def updateSpots(self, dataSet=None):  # noqa: N802, N803 - pyqtgraph API
        data = self.data if dataSet is None else dataSet
        if self.opts["pxMode"] and self.opts["useCache"] and _all_same_look(data):
            missing = np.flatnonzero(data["sourceRect"]["w"] == 0)
            if missing.size > 1:
                first = missing[0]
                super().updateSpots(data[first:first + 1])  # finds the first dot's picture (a view: written in place)
                data["sourceRect"][missing[1:]] = data["sourceRect"][first]
        super().updateSpots(dataSet)


def _all_same_look(data: np.ndarray) -> bool:
    """True when no dot in ``data`` has a size, symbol, pen or brush of its own."""
    return bool(np.all(data["size"] == -1)) and all(
        data[field].tolist().count(None) == data.size for field in _OWN_LOOK)
