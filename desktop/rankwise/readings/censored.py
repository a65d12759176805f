"""Readings below a detection limit ("<0.05") for rank tests: ranked as ties below the measured ones.

With a single common detection limit, every censored reading is known only to lie below it, so
all of them tie with each other and rank below every measured reading: the usual treatment of
censored data in rank tests (Helsel, Statistics for Censored Environmental Data, 2nd ed., 2012,
the chapters on two-group and several-group rank tests). They are handed to the statistics as one
value strictly below the limit and below every measured reading.

With several different limits no such ordering is known, and the user decides (the sheet's
``mixed_limits`` setting):

- "ask" (the default): no analysis; ``MixedLimitsError`` names the limits in plain words.
- "below-highest": every censored reading counts as below the highest limit. A measured reading
  below the highest limit cannot be ordered against a reading known only to be below that limit,
  so it is censored at the highest limit too: it also counts as below the highest limit. The
  censored readings and these measured ones tie below every measured reading at or above the
  highest limit. This is censoring at the highest limit, the treatment Helsel (2012) recommends
  for rank tests with several limits (from memory).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from rankwise.readings.cells import Cell, CellKind
from rankwise.readings.errors import ReadingsError

MIXED_LIMIT_CHOICES = ("ask", "below-highest")
"""How readings below different detection limits are treated: ask the user, or all as below the highest."""


class MixedLimitsError(ReadingsError):
    """Readings are written below different detection limits and the sheet says to ask first.

    Attributes:
        limits: the different limits, lowest first.
        shown: each limit written with the decimals it was typed with ("0.10").
    """

    def __init__(self, limits: Sequence[float], shown: Sequence[str]) -> None:
        self.limits = tuple(limits)
        self.shown = tuple(shown)
        super().__init__(
            f"The readings below a detection limit use different limits ({', '.join(self.shown)}), so they "
            f"cannot be ranked against each other as they stand. Choose to treat them all as below the highest "
            f"limit (<{self.shown[-1]}), or retype or remove them."
        )


@dataclass(frozen=True)
class Censoring:
    """How the censored readings of an analysis are handed to the statistics.

    Attributes:
        stand_in: the one value every censored reading is replaced by.
        decimals: the decimals of ``stand_in``.
        note: plain words saying what was done, for the analysis notes.
        censor_below: measured readings below this value are replaced by ``stand_in`` as well
            (the highest limit when mixed limits are treated as below it), else None.
    """

    stand_in: float
    decimals: int
    note: str
    censor_below: float | None = None

    def stands_in_for(self, cell: Cell) -> bool:
        """True when ``stand_in`` replaces this cell: a censored reading, or a measured one censored too."""
        if cell.kind is CellKind.CENSORED:
            return True
        return cell.kind is CellKind.NUMBER and self.censor_below is not None and cell.value < self.censor_below


def check_mixed_limits(choice: str) -> str:
    """``choice`` when it is one of ``MIXED_LIMIT_CHOICES``, else ``ValueError``."""
    if choice not in MIXED_LIMIT_CHOICES:
        raise ValueError(f"mixed_limits must be one of {', '.join(MIXED_LIMIT_CHOICES)}; got {choice!r}.")
    return choice


def censoring_for(columns: Sequence[tuple[str, Sequence[Cell]]], mixed_limits: str = "ask") -> Censoring | None:
    """The treatment of the censored readings of these groups; None when nothing is censored.

    ``columns`` holds (group name, cells) for the groups being compared. The stand-in lies one
    resolution step (of the finest decimals typed) below the limit and below every measured reading
    that keeps its value. Mixed limits raise ``MixedLimitsError`` unless ``mixed_limits`` is
    "below-highest" (see the module docstring).
    """
    check_mixed_limits(mixed_limits)
    censored = [(name, cell) for name, cells in columns for cell in cells if cell.kind is CellKind.CENSORED]
    if not censored:
        return None
    limits = sorted({cell.limit for _, cell in censored})
    shown = [_limit_as_typed(limit, [cell for _, cell in censored]) for limit in limits]
    if len(limits) > 1 and mixed_limits == "ask":
        raise MixedLimitsError(limits, shown)
    limit = limits[-1]
    order = [name for name, _ in columns]
    typed = [cell for _, cells in columns for cell in cells if cell.kind in (CellKind.NUMBER, CellKind.CENSORED)]
    decimals = max((cell.decimals or 0) for cell in typed)
    step = 10.0**-decimals
    measured = [(name, cell.value) for name, cells in columns for cell in cells if cell.kind is CellKind.NUMBER]
    below_limit = [(name, value) for name, value in measured if value < limit]
    if len(limits) == 1:
        stand_in = round(min([limit, *(value for _, value in measured)]) - step, decimals)
        return Censoring(stand_in, decimals, _one_limit_note(censored, order, limit, stand_in, len(below_limit)))
    stand_in = round(limit - step, decimals)
    note = _mixed_limits_note(censored, order, shown, stand_in, below_limit)
    return Censoring(stand_in, decimals, note, censor_below=limit)


def _limit_as_typed(limit: float, censored: Sequence[Cell]) -> str:
    """The limit with the most decimals it was typed with ("<0.10" gives "0.10")."""
    decimals = max((cell.decimals or 0) for cell in censored if cell.limit == limit)
    return f"{limit:.{decimals}f}"


def _groups_named(names: Sequence[str], order: list[str]) -> str:
    return ", ".join(sorted(set(names), key=order.index))


def _readings(count: int) -> str:
    return f"{count} reading{'s' if count != 1 else ''}"


def _one_limit_note(censored: list, order: list[str], limit: float, stand_in: float, below_measured: int) -> str:
    groups = _groups_named([name for name, _ in censored], order)
    one = len(censored) == 1
    ranked = "is ranked below every measured reading" if one else "are ranked as ties below every measured reading"
    note = (
        f"{_readings(len(censored))} written as below the detection limit {limit:g} (in {groups}) {ranked}; "
        f"the shift estimate and its interval treat {'it' if one else 'them'} as the value "
        f"{stand_in:g}, one gauge step below the lowest reading and the limit."
    )
    if below_measured:
        note += (
            f" Note: {below_measured} measured reading{'s' if below_measured != 1 else ''} lie below "
            "the limit and still rank above the censored ones."
        )
    return note


def _mixed_limits_note(censored: list, order: list[str], limits: list[str], stand_in: float,
                       below_limit: list[tuple[str, float]]) -> str:
    highest = limits[-1]
    shown = ", ".join(limits)
    groups = _groups_named([name for name, _ in censored], order)
    note = (
        f"{_readings(len(censored))} were written below different detection limits ({shown}, in {groups}); "
        f"as chosen, all are treated as below the highest limit {highest}."
    )
    if below_limit:
        measured_groups = _groups_named([name for name, _ in below_limit], order)
        count = len(below_limit)
        note += (
            f" {_readings(count)} measured below {highest} (in {measured_groups}) cannot be ordered against "
            f"them, so {'it is' if count == 1 else 'they are'} treated as below {highest} too."
        )
    tied = len(censored) + len(below_limit)
    note += (
        f" These {tied} readings rank as ties below every measured reading at or above {highest}; "
        f"the shift estimate and its interval treat them as the value {stand_in:g}, one gauge step below {highest}."
    )
    return note
