"""The rank sheet: every reading of the question, combined and sorted, with its rank and tie block."""

from __future__ import annotations

from collections.abc import Sequence

from openpyxl.worksheet.worksheet import Worksheet

from rankwise.records.sheet_cells import column_width, fit_row_height, put, put_paragraph, reading_format, set_print_setup
from rankwise.stats.analysis import Analysis
from rankwise.stats.results import (
    PairedResult,
    PlanResult,
    Result,
    SeveralGroupsResult,
    TieBlock,
    TwoGroupResult,
)
from rankwise.wording.numbers import format_count
from rankwise.wording.questions import decimals_of, unit_of

RANK_FORMAT = "0.0"
HEADING_ROW = 3
"""Row of the table's column headings, repeated at the top of every printed page."""


def ranks_sheet_title(result: Result) -> str:
    """The sheet's name: "Ranks", or for a plan the power table that takes its place."""
    return "Power by group size" if isinstance(result, PlanResult) else "Ranks"


def fill_ranks_sheet(sheet: Worksheet, result: Result, analysis: Analysis) -> None:
    """Write the rank table that fits the question."""
    for letter, width in zip("ABCDE", (10, 16, 24, 12, 64)):
        sheet.column_dimensions[letter].width = width
    set_print_setup(sheet, title_row=HEADING_ROW)
    if isinstance(result, TwoGroupResult):
        _combined(sheet, (result.name_a, result.name_b), (result.values_a, result.values_b),
                  (result.ranks_a, result.ranks_b), result.tie_blocks, analysis)
    elif isinstance(result, SeveralGroupsResult):
        _combined(sheet, tuple(s.name for s in result.summaries), result.values, result.ranks,
                  result.tie_blocks, analysis)
    elif isinstance(result, PairedResult):
        _paired(sheet, result, analysis)
    elif isinstance(result, PlanResult):
        _power(sheet, result)
    else:
        raise ValueError(f"result must be a result of the statistics service; got {type(result).__name__}.")


def _headings(sheet: Worksheet, headings: Sequence[str]) -> None:
    """The table's column headings, bold and wrapped, in the row repeated on every printed page."""
    for column, heading in enumerate(headings, start=1):
        put(sheet, HEADING_ROW, column, heading, bold=True, wrap=True)
        fit_row_height(sheet, HEADING_ROW, heading, column_width(sheet, column))


def _tie_text(rank: float, blocks: dict[float, TieBlock], mark: str) -> str:
    """ "tied: ranks 3 to 5 share 4", or "" for a reading without ties."""
    block = blocks.get(rank)
    if block is None:
        return ""
    return (f"tied: {block.count} readings share ranks {block.first_rank} to {block.last_rank}, "
            f"each gets {format_count(block.mid_rank, mark=mark)}")


def _combined(sheet: Worksheet, names: Sequence[str], values: Sequence[Sequence[float]],
              ranks: Sequence[Sequence[float]], tie_blocks: Sequence[TieBlock], analysis: Analysis) -> None:
    """All readings combined and sorted, each with its group, rank and tie block; then rank sums."""
    value_format = reading_format(decimals_of(analysis), unit_of(analysis))
    name_room = min(40, max(map(len, names), default=0) + 2)
    sheet.column_dimensions["A"].width = max(10, name_room)  # also the rank sums' group column
    sheet.column_dimensions["C"].width = max(24, name_room)
    put_paragraph(sheet, 1, 1, 5, "All readings ranked together, lowest first; tied readings share the average "
                                  "of the ranks they span.", bold=True)
    _headings(sheet, ("Place", "Reading", "Group", "Rank", "Tie block"))
    rows = [(rank, group, value) for group, (group_values, group_ranks) in enumerate(zip(values, ranks))
            for value, rank in zip(group_values, group_ranks)]
    rows.sort(key=lambda item: (item[0], item[1]))
    blocks = {block.mid_rank: block for block in tie_blocks}
    row = 4
    for place, (rank, group, value) in enumerate(rows, start=1):
        put(sheet, row, 1, place)
        put(sheet, row, 2, value, value_format)
        put(sheet, row, 3, names[group], indent=True)
        put(sheet, row, 4, rank, RANK_FORMAT)
        put(sheet, row, 5, _tie_text(rank, blocks, analysis.decimal_mark), indent=True)
        row += 1
    row += 1
    for column, heading in enumerate(("Group", "Readings", "Rank sum", "Average rank"), start=1):
        put(sheet, row, column, heading, bold=True)
    for name, group_ranks in zip(names, ranks):
        row += 1
        total = float(sum(group_ranks))
        put(sheet, row, 1, name)
        put(sheet, row, 2, len(group_ranks))
        put(sheet, row, 3, total, RANK_FORMAT)
        put(sheet, row, 4, total / len(group_ranks) if group_ranks else None, "0.00")
    sheet.freeze_panes = "A4"


def _paired(sheet: Worksheet, result: PairedResult, analysis: Analysis) -> None:
    """Each part's two readings, its change, and the change's signed rank; then the rank sums."""
    decimals = decimals_of(analysis)
    value_format = reading_format(decimals, unit_of(analysis))
    sheet.column_dimensions["D"].width = 24
    sheet.column_dimensions["E"].width = 14
    put_paragraph(sheet, 1, 1, 5, "Each part's change, ranked by size (ignoring its sign); the rank then takes "
                                  "the change's sign.", bold=True)
    _headings(sheet, ("Part", result.name_a, result.name_b, f"Change, {result.name_b} minus {result.name_a}",
                      "Signed rank"))
    row = 4
    for part, (a, b, d, rank) in enumerate(
            zip(result.values_a, result.values_b, result.differences, result.signed_ranks), start=1):
        put(sheet, row, 1, part)
        put(sheet, row, 2, a, value_format)
        put(sheet, row, 3, b, value_format)
        put(sheet, row, 4, d, value_format)
        put(sheet, row, 5, rank, RANK_FORMAT)
        row += 1
    row += 1
    for label, total in (("Rank sum of rises", result.w_plus), ("Rank sum of falls", result.w_minus)):
        put(sheet, row, 1, label, bold=True)
        put(sheet, row, 3, total, RANK_FORMAT)
        row += 1
    if result.tie_blocks:
        row += 1
        put(sheet, row, 1, "Tied sizes of change", bold=True)
        for column, heading in enumerate(("Size of change", "Parts", "Ranks", "Shared rank"), start=2):
            put(sheet, row + 1, column, heading, bold=True)
        for block in result.tie_blocks:
            row += 1
            put(sheet, row + 1, 2, block.value, value_format)
            put(sheet, row + 1, 3, block.count)
            put(sheet, row + 1, 4, f"{block.first_rank} to {block.last_rank}")
            put(sheet, row + 1, 5, block.mid_rank, RANK_FORMAT)


def _power(sheet: Worksheet, result: PlanResult) -> None:
    """The planning curve: predicted chance of detecting the change against parts per group."""
    put_paragraph(sheet, 1, 1, 5, "Predicted chance of detecting the change, by parts per group.", bold=True)
    _headings(sheet, ("Parts, first group", "Parts, second group", "Chance of detecting"))
    for row, point in enumerate(result.power_curve, start=4):
        put(sheet, row, 1, point.n_a)
        put(sheet, row, 2, point.n_b)
        put(sheet, row, 3, point.power, "0%")
