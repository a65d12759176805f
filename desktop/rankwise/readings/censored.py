"""Readings below a detection limit ("<0.05") for rank tests: one common limit, ranked as ties below.

With a single common detection limit, every censored reading is known only to lie below it, so
all of them tie with each other and rank below every measured reading: the usual treatment of
censored data in rank tests (Helsel, Statistics for Censored Environmental Data, 2nd ed., 2012,
the chapters on two-group and several-group rank tests). They are handed to the statistics as one
value strictly below the limit and below every measured reading. With several different limits no
such ordering is known, and the user has to choose.
"""

from __future__ import annotations

from collections.abc import Sequence

from rankwise.readings.cells import Cell, CellKind
from rankwise.readings.errors import ReadingsError


def common_limit_value(columns: Sequence[tuple[str, Sequence[Cell]]]) -> tuple[float, int, str] | None:
    """The stand-in value for censored readings, its decimals, and a note; None when nothing is censored.

    ``columns`` holds (group name, cells) for the groups being compared. The stand-in lies one
    resolution step (of the finest decimals typed) below both the limit and the lowest measured
    reading of all the groups.
    """
    censored = [(name, cell) for name, cells in columns for cell in cells if cell.kind is CellKind.CENSORED]
    if not censored:
        return None
    limits = sorted({cell.limit for _, cell in censored})
    if len(limits) > 1:
        shown = ", ".join(f"{limit:g}" for limit in limits)
        raise ReadingsError(
            f"The readings below a detection limit use different limits ({shown}), so they cannot be ranked "
            f"against each other; retype them all as below the highest limit (<{limits[-1]:g}) or remove them."
        )
    limit = limits[0]
    typed = [cell for _, cells in columns for cell in cells if cell.kind in (CellKind.NUMBER, CellKind.CENSORED)]
    decimals = max((cell.decimals or 0) for cell in typed)
    step = 10.0**-decimals
    measured = [cell.value for cell in typed if cell.kind is CellKind.NUMBER]
    stand_in = round(min([limit, *measured]) - step, decimals)
    groups = sorted({name for name, _ in censored}, key=[name for name, _ in columns].index)
    below_measured = [value for value in measured if value < limit]
    if len(censored) == 1:
        counted, ranked = "1 reading", "is ranked below every measured reading"
    else:
        counted, ranked = f"{len(censored)} readings", "are ranked as ties below every measured reading"
    note = (
        f"{counted} written as below the detection limit {limit:g} (in {', '.join(groups)}) {ranked}; "
        f"the shift estimate and its interval treat {'it' if len(censored) == 1 else 'them'} as the value "
        f"{stand_in:g}, one gauge step below the lowest reading and the limit."
    )
    if below_measured:
        note += (
            f" Note: {len(below_measured)} measured reading{'s' if len(below_measured) != 1 else ''} lie below "
            "the limit and still rank above the censored ones."
        )
    return stand_in, decimals, note
