"""Plain-words wording of results: written once, used by the window, the workbook and the printout."""

from rankwise.wording.cautions import CAUTION_SHORT

__all__ = ["CAUTION_SHORT"]
