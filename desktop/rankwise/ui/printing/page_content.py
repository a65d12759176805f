"""What the one-page verdict says, gathered once from a record (no drawing here)."""

from __future__ import annotations

import re
from dataclasses import dataclass
from datetime import datetime

from rankwise.records.signoff import SignOff
from rankwise.stats import PairedResult, PlanResult, SeveralGroupsResult, TwoGroupResult
from rankwise.ui.charts.readings_view import ReadingsView, readings_view
from rankwise.wording import QUESTION_TITLES, KeyNumber, Verdict, describe, describe_question, key_numbers
from rankwise.wording.entries import count_cell
from rankwise.wording.numbers import format_count, with_mark

PER_GROUP_KEY = re.compile(r"^(n|n_dropped|n_censored|n_not_used|n_empty|median|q1|q3|rank_sum|mean_rank)_(a|b|\d+)$")
"""Key numbers that the page shows in its groups table instead of the key-number list."""

KEY_PRIORITY = (
    "p_value", "method", "shift", "shift_ci_low", "shift_ci_high", "u", "critical_u", "w_plus",
    "w_minus", "critical_t", "h", "df", "prob_b_greater", "margin", "equivalence_ci_low",
    "equivalence_ci_high", "n_pairs", "n", "n_zero", "n_a", "n_b", "alpha", "power",
    "spread", "simulated_power", "epsilon_squared", "u_a", "u_b", "p_exact", "p_normal",
)
"""Numbers kept first when the page must leave some out (the rest stay in the workbook)."""


@dataclass(frozen=True)
class GroupRow:
    """One line of the page's groups table."""

    index: int
    name: str
    n: str
    median: str
    quartiles: str
    ranks: str


@dataclass(frozen=True)
class PageContent:
    """Everything printed on the page, as text and numbers.

    Attributes:
        title, question: the heading (characteristic or question title) and the question asked.
        measured: characteristic, unit and limits in one line.
        groups: the groups table; ranks_heading: its last column ("rank sum", "average rank" or "").
        verdict: the worded result; numbers: key numbers for the page, most important first.
        view: the readings to plot, or None; plan: the planning result, or None.
        notes: method and assumption notes; signoff: the sign-off block or None (a draft).
        fingerprint: the record's SHA-256; program_version, library_versions, created_at.
    """

    title: str
    question: str
    measured: str
    groups: tuple[GroupRow, ...]
    ranks_heading: str
    verdict: Verdict
    numbers: tuple[KeyNumber, ...]
    view: ReadingsView | None
    plan: PlanResult | None
    notes: tuple[str, ...]
    signoff: SignOff | None
    fingerprint: str
    program_version: str
    library_versions: tuple[tuple[str, str], ...]
    created_at: datetime | None


def _measured_line(view: ReadingsView | None, analysis) -> str:
    """'Measured: Ra (µm) · LSL 0.70 · USL 1.40 · nominal 1.00' (whatever is known)."""
    characteristic = analysis.settings.characteristic
    unit = next((g.unit for g in analysis.groups if g.unit), "")
    if characteristic:
        parts = [f"Measured: {characteristic}" + (f" ({unit})" if unit else "")]
    else:
        parts = [f"Readings in {unit}" if unit else "Characteristic and unit not given"]
    if view is not None:
        for key, title in (("lsl", "LSL"), ("usl", "USL"), ("nominal", "nominal")):
            value = getattr(view, key)
            if value is not None:
                parts.append(f"{title} {view.format(value)}")
        if view.lsl is None and view.usl is None:
            parts.append("no specification limits given")
    return " · ".join(parts)


def _group_rows(result, analysis, view: ReadingsView | None) -> tuple[tuple[GroupRow, ...], str]:
    """Rows of the groups table and the heading of its rank column."""
    if view is None:
        return (), ""
    if isinstance(result, TwoGroupResult):
        summaries, ranks, heading = (result.summary_a, result.summary_b), (result.rank_sum_a, result.rank_sum_b), "rank sum"
    elif isinstance(result, SeveralGroupsResult):
        summaries, ranks, heading = result.summaries, result.mean_ranks, "average rank"
    elif isinstance(result, PairedResult):
        summaries, ranks, heading = (result.summary_a, result.summary_b), (None, None), ""
    else:
        return (), ""
    rows = []
    for index, (summary, rank) in enumerate(zip(summaries, ranks)):
        rows.append(GroupRow(
            index=index,
            name=summary.name,
            n=count_cell(summary, analysis),
            median=view.format(summary.median),
            quartiles=f"{view.format(summary.q1)} – {view.format(summary.q3)}",
            ranks="" if rank is None else (format_count(rank, mark=view.decimal_mark) if heading == "rank sum"
                                           else with_mark(f"{rank:.2f}", view.decimal_mark)),
        ))
    return tuple(rows), heading


def _page_numbers(result, analysis) -> tuple[KeyNumber, ...]:
    """Key numbers not already in the groups table, the most important first."""
    numbers = [n for n in key_numbers(result, analysis)
               if isinstance(result, PlanResult) or not PER_GROUP_KEY.match(n.key)]
    if isinstance(result, PairedResult):
        numbers = [n for n in numbers if n.key not in ("median_a", "median_b")]
    rank = {key: position for position, key in enumerate(KEY_PRIORITY)}

    def importance(number: KeyNumber) -> tuple[int, float]:
        """Listed keys first; pairwise p-values smallest first; the rest in their own order."""
        if number.key.startswith("p_adjusted_") and number.value is not None:
            return len(rank), number.value
        return rank.get(number.key, len(rank) + 1), 0.0

    return tuple(sorted(numbers, key=importance))


def gather(record, fingerprint: str) -> PageContent:
    """The page's content from ``record`` (analysis, result, signoff, versions) and its fingerprint."""
    analysis, result = record.analysis, record.result
    verdict = describe(result, analysis)
    view = readings_view(result, analysis)
    groups, ranks_heading = _group_rows(result, analysis, view)
    title = analysis.settings.characteristic.strip() or QUESTION_TITLES[analysis.question]
    notes = dict.fromkeys((verdict.method_note, *verdict.assumption_notes, *analysis.notes))
    return PageContent(
        title=title,
        question=describe_question(analysis),
        measured=_measured_line(view, analysis),
        groups=groups,
        ranks_heading=ranks_heading,
        verdict=verdict,
        numbers=_page_numbers(result, analysis),
        view=view,
        plan=result if isinstance(result, PlanResult) else None,
        notes=tuple(note for note in notes if note),
        signoff=record.signoff,
        fingerprint=fingerprint,
        program_version=str(record.program_version),
        library_versions=tuple(getattr(record, "library_versions", ()) or ()),
        created_at=getattr(record, "created_at", None),
    )
