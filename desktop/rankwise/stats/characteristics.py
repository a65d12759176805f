"""Many characteristics of one part compared at once: did the change move any of the drawing's dimensions?

Each characteristic gets the full two-group rank comparison (``compare_two``: Mann-Whitney U, exact
given the ties where affordable, Hodges-Lehmann shift with its interval, same-shape check). Because
one characteristic in many can come out significant by chance alone, the p-values are adjusted
for the number compared: Holm (1979, Scand. J. Statist. 6, 65-70) step-down by default, which
keeps the chance of any false alarm at alpha; Benjamini & Hochberg (1995, JRSS B 57, 289-300)
step-up as a choice, which keeps the expected share of false alarms among the alarms at alpha;
or none when asked. The adjustment used is always stated in the result.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence

import numpy as np

from rankwise.stats.analysis import ALTERNATIVES, METHODS
from rankwise.stats.inputs import check_choice, check_level
from rankwise.stats.progress import SILENT, Monitor
from rankwise.stats.results import CharacteristicRow, CharacteristicsResult
from rankwise.stats.several import checked_p_values, holm_adjust
from rankwise.stats.two_groups import compare_two

ADJUSTMENTS = ("holm", "fdr", "none")
"""How the p-values are adjusted for the number of characteristics compared."""

ADJUSTMENT_METHODS = {
    "holm": "Holm (1979) step-down",
    "fdr": "Benjamini-Hochberg (1995) false discovery rate",
    "none": "none",
}
"""The published method behind each adjustment, as the result states it."""

_P_TOLERANCE = 1e-12
"""Adjusted p within this of alpha counts as equal (as for a single comparison)."""


def compare_characteristics(
    characteristics: Sequence[tuple[str, Sequence[float] | np.ndarray, Sequence[float] | np.ndarray]],
    *,
    alternative: str = "two-sided",
    alpha: float = 0.05,
    adjust: str = "holm",
    confidence: float = 0.95,
    margins: Mapping[str, float | None] | Sequence[float | None] | None = None,
    method: str = "auto",
    name_a: str = "A",
    name_b: str = "B",
    monitor: Monitor = SILENT,
) -> CharacteristicsResult:
    """Compare B with the reference A on every characteristic, then adjust the p-values.

    Args:
        characteristics: ``(name, a_values, b_values)`` per characteristic; blanks (None, NaN)
            are dropped and counted per characteristic, never read as zero.
        alternative, alpha, confidence, method: as for ``compare_two``, the same for all.
        adjust: "holm" (Holm 1979, default), "fdr" (Benjamini-Hochberg 1995) or "none".
        margins: equivalence margin per characteristic in its unit (by name, or one per
            characteristic in order; None for none), or None for no margins at all.
        name_a, name_b: the groups' names.
        monitor: progress over the characteristics, and cancellation.

    Raises ``ValueError`` (naming the characteristic where one is at fault) for no
    characteristics, a name given twice, or readings ``compare_two`` refuses; ``Cancelled``.
    """
    check_choice("adjust", adjust, ADJUSTMENTS)
    check_choice("alternative", alternative, ALTERNATIVES)
    check_choice("method", method, METHODS)
    alpha = check_level("alpha", alpha)
    confidence = check_level("confidence", confidence)
    names = [str(item[0]) for item in characteristics]
    if not names:
        raise ValueError("Choose at least one characteristic to compare.")
    twice = sorted({name for name in names if names.count(name) > 1})
    if twice:
        raise ValueError(f"Each characteristic needs its own name; {', '.join(twice)} appears more than once.")
    margin_of = _margins_by_name(names, margins)
    results = []
    for index, (name, a_values, b_values) in enumerate(characteristics):
        monitor.step(index / len(names))
        try:
            result = compare_two(
                a_values, b_values, alternative=alternative, alpha=alpha, confidence=confidence,
                method=method, margin=margin_of[str(name)], name_a=name_a, name_b=name_b,
                monitor=_share_of(monitor, index, len(names)),
            )
        except ValueError as error:
            raise ValueError(f"{name}: {error}") from error
        results.append(result)
    monitor.step(1.0)
    adjusted = adjust_p_values([result.p_value for result in results], adjust)
    rows = tuple(
        CharacteristicRow(name=name, result=result, p_adjusted=float(p), significant=bool(p <= alpha + _P_TOLERANCE))
        for name, result, p in zip(names, results, adjusted)
    )
    return CharacteristicsResult(
        name_a=name_a, name_b=name_b, rows=rows, adjust=adjust, adjust_method=ADJUSTMENT_METHODS[adjust],
        alternative=alternative, alpha=alpha, confidence=confidence,
        warnings=_warnings(len(rows), adjust, alpha),
    )


def adjust_p_values(p_values: Sequence[float] | np.ndarray, adjust: str) -> np.ndarray:
    """Adjusted p-values in the order given: "holm", "fdr" (Benjamini-Hochberg) or "none"."""
    check_choice("adjust", adjust, ADJUSTMENTS)
    if adjust == "holm":
        return holm_adjust(p_values)
    if adjust == "fdr":
        return benjamini_hochberg_adjust(p_values)
    return np.asarray(p_values, dtype=float).copy()


def benjamini_hochberg_adjust(p_values: Sequence[float] | np.ndarray) -> np.ndarray:
    """Benjamini & Hochberg (1995) step-up adjusted p-values, in the order given.

    Sorted ascending, the i-th smallest (1-based) becomes min over j >= i of min(1, m p_(j) / j);
    the running minimum from the largest down keeps the adjusted values in the raw ones' order.
    """
    p = checked_p_values(p_values)
    if p.size == 0:
        return p.copy()
    order = np.argsort(p, kind="mergesort")
    scaled = np.minimum(1.0, p.size * p[order] / np.arange(1, p.size + 1))
    stepped = np.minimum.accumulate(scaled[::-1])[::-1]
    adjusted = np.empty_like(p)
    adjusted[order] = stepped
    return adjusted


def _margins_by_name(names: list[str], margins) -> dict[str, float | None]:
    """The margin of each characteristic by name (None for none)."""
    if margins is None:
        return dict.fromkeys(names)
    if isinstance(margins, Mapping):
        unknown = sorted(set(map(str, margins)) - set(names))
        if unknown:
            raise ValueError(f"A margin is given for {', '.join(unknown)}, which is not among the characteristics compared.")
        return {name: margins.get(name) for name in names}
    margins = list(margins)
    if len(margins) != len(names):
        raise ValueError(f"Give one margin per characteristic ({len(names)}), or None; got {len(margins)}.")
    return dict(zip(names, margins))


def _share_of(monitor: Monitor, index: int, count: int) -> Monitor:
    """A monitor for characteristic ``index`` of ``count``: its progress as a share of the whole."""
    if monitor.progress is None:
        return monitor
    report = monitor.progress
    return Monitor(progress=lambda fraction: report((index + fraction) / count), cancelled=monitor.cancelled)


def _warnings(count: int, adjust: str, alpha: float) -> tuple[str, ...]:
    """Plain-words notes about the comparison as a whole."""
    if adjust == "none" and count > 1:
        return (
            f"The p-values are not adjusted for the {count} characteristics compared: of the characteristics "
            f"that did not move, about {alpha * 100:g} in 100 will still show a difference by chance.",
        )
    return ()
