"""The rank table: every reading combined and sorted, with its group, its rank and its tie block.

It shows why the verdict came out as it did: which readings share a rank (a tie block spans ranks
``first..last`` and each member gets their average), and the rank sum of each group. For the
same-parts question it lists the differences ranked by size with their signs.
"""

from __future__ import annotations

import bisect
import functools
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from itertools import accumulate

import numpy as np

from PySide6.QtCore import QAbstractTableModel, QModelIndex, Qt, Signal
from PySide6.QtGui import QBrush, QColor, QFont
from PySide6.QtWidgets import QLabel, QTableView, QVBoxLayout, QWidget

from rankwise.stats.results import PairedResult, SeveralGroupsResult, TieBlock, TwoGroupResult
from rankwise.ui.background import hand_off
from rankwise.wording.numbers import format_count, format_reading, with_mark
from rankwise.wording.questions import decimals_of

GROUP_NUMBERS = frozenset({0, 2, 3})
PAIR_NUMBERS = frozenset({0, 1, 2, 3, 4})

TIE_TINT = QColor("#e8eef7")
"""Background of alternate tie blocks; the bracket marks and the words carry the meaning too."""

LARGE_RESULT_READINGS = 50_000
"""A result with more readings than this is sorted for the table on a background thread; until that is
done the table stands empty and says so."""


@dataclass(frozen=True)
class RankRow:
    """One row of the rank table, already in words."""

    cells: tuple[str, ...]
    tie_mark: str
    tie_text: str
    block_number: int
    tooltip: str


def _tie_words(block: TieBlock, mark: str) -> str:
    return f"{block.count} tied: ranks {block.first_rank}–{block.last_rank} share {format_count(block.mid_rank, mark)}"


def _bracket(position: int, count: int) -> str:
    if count < 2:
        return ""
    if position == 0:
        return "┌"
    return "└" if position == count - 1 else "│"


class RankRows(Sequence):
    """Rows of the rank table, worded only when they are looked at.

    A 10^6-reading result gives 10^6 rows; sorting and finding the tie blocks is done once with
    numpy arrays, and each row's texts are made when the table (or a test) asks for that row.
    """

    def __init__(self, count: int, make: Callable[[int], RankRow]) -> None:
        self._count = count
        self._make = functools.lru_cache(maxsize=1024)(make)  # a painted row is asked for once per role

    def __len__(self) -> int:
        return self._count

    def __getitem__(self, position):
        if isinstance(position, slice):
            return [self[i] for i in range(*position.indices(self._count))]
        if position < 0:
            position += self._count
        if not 0 <= position < self._count:
            raise IndexError(position)
        return self._make(position)


class _TieCells:
    """The tie column, found when a row is worded: ``keys`` gives each row's key in the table's order
    (ascending, looked up, not kept per row), ``shown`` the keys of the tie blocks the rows show (all
    blocks when None); a row's place in its block comes from one binary search over ``keys``."""

    def __init__(self, keys: Sequence[float], tie_blocks: tuple[TieBlock, ...],
                 shown: np.ndarray | None = None) -> None:
        self._keys = keys
        self._blocks = {block.mid_rank: block for block in tie_blocks}
        self._shown = np.array(sorted(self._blocks), dtype=float) if shown is None else shown  # numbered from 1

    def cells(self, position: int, mark: str) -> tuple[str, str, int]:
        """Bracket mark, words and block number of the row at ``position`` ("", "", 0 without a tie)."""
        key = float(self._keys[position])
        block = self._blocks.get(key)
        if block is None:
            return "", "", 0
        place = position - bisect.bisect_left(self._keys, key)
        number = int(np.searchsorted(self._shown, key, side="left")) + 1
        return _bracket(place, block.count), _tie_words(block, mark), number


class _GroupsInRankOrder(Sequence):
    """The readings of several groups in rank order (ties by group, then entry): one 32-bit index per
    reading is kept; a row's group, entry, reading and rank are looked up in the groups' own arrays."""

    def __init__(self, values: Sequence[Sequence[float]], ranks: Sequence[Sequence[float]]) -> None:
        self._values = [np.asarray(v, dtype=float) for v in values]  # a result's frozen runs: not copied
        self._ranks = [np.asarray(r, dtype=float) for r in ranks]
        self._starts = list(accumulate((len(v) for v in values), initial=0))
        combined = np.concatenate(self._ranks) if self._ranks else np.empty(0)
        # a stable sort by rank keeps tied readings in the order they were joined: by group, then entry
        self._order = np.argsort(combined, kind="stable").astype(np.int32)

    def __len__(self) -> int:
        return int(self._order.size)

    def locate(self, position: int) -> tuple[int, int]:
        """The group and the entry of the row at ``position``."""
        index = int(self._order[position])
        group = bisect.bisect_right(self._starts, index) - 1
        return group, index - self._starts[group]

    def reading(self, position: int) -> float:
        """The reading of the row at ``position``."""
        group, entry = self.locate(position)
        return float(self._values[group][entry])

    def __getitem__(self, position: int) -> float:
        """The rank of the row at ``position``."""
        group, entry = self.locate(position)
        return float(self._ranks[group][entry])


def rows_for_groups(names: tuple[str, ...], values: tuple[tuple[float, ...], ...],
                    ranks: tuple[tuple[float, ...], ...], tie_blocks: tuple[TieBlock, ...],
                    decimals: int | None, mark: str = ".") -> RankRows:
    """Combined sorted readings of independent groups: position, group, reading, rank, tie
    (numbers written with the decimal ``mark``); ordered by rank, then group, then entry."""
    in_order = _GroupsInRankOrder(values, ranks)
    ties = _TieCells(in_order, tie_blocks)

    def make(position: int) -> RankRow:
        group, row = in_order.locate(position)
        rank = in_order[position]
        bracket, words, block_number = ties.cells(position, mark)
        reading = format_reading(in_order.reading(position), decimals, mark)
        rank_text = format_count(rank, mark)
        return RankRow(
            cells=(str(position + 1), names[group], reading, rank_text),
            tie_mark=bracket, tie_text=words, block_number=block_number,
            tooltip=f"{names[group]}, reading {row + 1} of that group: {reading}, rank {rank_text}"
                    + (f"; {words}" if words else ""),
        )

    return RankRows(len(in_order), make)


def rows_for_pairs(result: PairedResult, decimals: int | None, mark: str = ".") -> RankRows:
    """Differences of the same parts, ranked by size: pair, before, after, difference, signed rank
    (numbers written with the decimal ``mark``)."""
    signed = np.asarray(result.signed_ranks, dtype=float)
    differences = np.asarray(result.differences, dtype=float)
    size_of_rank = np.abs(signed)
    order = np.lexsort((np.arange(signed.size), np.abs(differences), size_of_rank))
    sorted_keys = size_of_rank[order]
    tied = np.array(sorted(block.mid_rank for block in result.tie_blocks), dtype=float)
    ties = _TieCells(sorted_keys, result.tie_blocks, shown=tied[np.isin(tied, sorted_keys)])

    def make(position: int) -> RankRow:
        i = int(order[position])
        bracket, words, block_number = ties.cells(position, mark)
        signed_rank = result.signed_ranks[i]
        difference = format_reading(result.differences[i], decimals, mark)
        rank_text = "not ranked (no difference)" if signed_rank == 0 else (
            ("+" if signed_rank > 0 else "−") + format_count(abs(signed_rank), mark))
        return RankRow(
            cells=(str(i + 1), format_reading(result.values_a[i], decimals, mark),
                   format_reading(result.values_b[i], decimals, mark), difference, rank_text),
            tie_mark=bracket, tie_text=words, block_number=block_number,
            tooltip=f"Pair {i + 1}: {result.name_b} minus {result.name_a} = {difference}; signed rank {rank_text}"
                    + (f"; {words}" if words else ""),
        )

    return RankRows(int(order.size), make)


class RankTableModel(QAbstractTableModel):
    """Read-only table of ``RankRow`` s; the last column marks tie blocks with brackets and words."""

    def __init__(self, parent=None) -> None:
        super().__init__(parent)
        self._headers: tuple[str, ...] = ()
        self._rows: Sequence[RankRow] = ()
        self._numeric: frozenset[int] = frozenset()

    def set_rows(self, headers: tuple[str, ...], rows: Sequence[RankRow], numeric_columns: frozenset[int] = frozenset()) -> None:
        """Replace the table's contents; ``numeric_columns`` are right-aligned."""
        self.beginResetModel()
        self._headers = (*headers, "Tie") if headers else ()
        self._rows = rows
        self._numeric = numeric_columns
        self.endResetModel()

    @property
    def headers(self) -> tuple[str, ...]:
        """The column titles shown."""
        return self._headers

    def rowCount(self, parent: QModelIndex = QModelIndex()) -> int:  # noqa: B008, N802 - Qt API
        return 0 if parent.isValid() else len(self._rows)

    def columnCount(self, parent: QModelIndex = QModelIndex()) -> int:  # noqa: B008, N802 - Qt API
        return 0 if parent.isValid() else len(self._headers)

    def headerData(self, section: int, orientation: Qt.Orientation, role: int = Qt.ItemDataRole.DisplayRole):  # noqa: N802
        if role == Qt.ItemDataRole.DisplayRole and orientation == Qt.Orientation.Horizontal and 0 <= section < len(self._headers):
            return self._headers[section]
        return None

    def data(self, index: QModelIndex, role: int = Qt.ItemDataRole.DisplayRole):
        if not index.isValid() or not 0 <= index.row() < len(self._rows):
            return None
        row = self._rows[index.row()]
        last = len(self._headers) - 1
        if role == Qt.ItemDataRole.DisplayRole:
            if index.column() == last:
                return f"{row.tie_mark} {row.tie_text}".strip()
            return row.cells[index.column()]
        if role == Qt.ItemDataRole.ToolTipRole:
            return row.tooltip
        if role == Qt.ItemDataRole.BackgroundRole and row.block_number % 2 == 1:
            return QBrush(TIE_TINT)
        if role == Qt.ItemDataRole.TextAlignmentRole and index.column() in self._numeric:
            return int(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        if role == Qt.ItemDataRole.FontRole and row.block_number and index.column() == last:
            font = QFont()
            font.setItalic(True)
            return font
        return None


@dataclass(frozen=True)
class _Contents:
    """What the table shows for one result: column titles, rows, right-aligned columns, rank sums."""

    headers: tuple[str, ...]
    rows: Sequence[RankRow]
    numeric: frozenset[int]
    sums: str


def _contents(result, analysis) -> _Contents | None:
    """The table's contents for a result of the statistics service (None for a question without
    readings to rank). Sorting the readings is most of the work; it needs no Qt."""
    decimals = decimals_of(analysis)
    mark = analysis.decimal_mark
    if isinstance(result, TwoGroupResult):
        names = (result.name_a, result.name_b)
        rows = rows_for_groups(names, (result.values_a, result.values_b), (result.ranks_a, result.ranks_b),
                               result.tie_blocks, decimals, mark)
        return _Contents(("#", "Group", "Reading", "Rank"), rows, GROUP_NUMBERS,
            f"Rank sums: {result.name_a} {format_count(result.rank_sum_a, mark)} (n = {result.n_a}), "
            f"{result.name_b} {format_count(result.rank_sum_b, mark)} (n = {result.n_b}). "
            f"All ranks together add up to N(N + 1)/2 = {format_count((result.n_a + result.n_b) * (result.n_a + result.n_b + 1) / 2)}."
        )
    if isinstance(result, SeveralGroupsResult):
        names = tuple(summary.name for summary in result.summaries)
        rows = rows_for_groups(names, result.values, result.ranks, result.tie_blocks, decimals, mark)
        parts = ", ".join(
            f"{name} {format_count(total, mark)} (n = {summary.n}, mean rank {with_mark(f'{mean:.2f}', mark)})"
            for name, total, mean, summary in zip(names, result.rank_sums, result.mean_ranks, result.summaries)
        )
        return _Contents(("#", "Group", "Reading", "Rank"), rows, GROUP_NUMBERS, f"Rank sums: {parts}.")
    if isinstance(result, PairedResult):
        rows = rows_for_pairs(result, decimals, mark)
        return _Contents(("Pair", result.name_a, result.name_b, "Difference", "Signed rank"), rows, PAIR_NUMBERS,
            f"Sum of ranks of the positive differences (W+) {format_count(result.w_plus, mark)}, "
            f"of the negative ones (W−) {format_count(result.w_minus, mark)}; "
            f"{_no_difference_words(result)}."
        )
    return None


def _readings_in(result) -> int:
    """How many rows the table would have for ``result``."""
    if isinstance(result, TwoGroupResult):
        return len(result.values_a) + len(result.values_b)
    if isinstance(result, SeveralGroupsResult):
        return sum(len(values) for values in result.values)
    if isinstance(result, PairedResult):
        return len(result.signed_ranks)
    return 0


class RankTable(QWidget):
    """The rank table with the rank sums per group underneath."""

    _contents_ready = Signal(int, object)

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._shown = 0
        """Counts the results shown, so that a large result's table sorted meanwhile is used only if still wanted."""
        self._contents_ready.connect(self._fill)
        self.model = RankTableModel(self)
        self.view = QTableView()
        self.view.setModel(self.model)
        self.view.setAccessibleName("Rank table: all readings combined and sorted")
        self.view.verticalHeader().hide()
        self.view.setAlternatingRowColors(False)
        self.view.setSelectionBehavior(QTableView.SelectionBehavior.SelectRows)
        self.view.horizontalHeader().setResizeContentsPrecision(100)
        self.view.horizontalHeader().setStretchLastSection(True)
        self.sums = QLabel()
        self.sums.setObjectName("rankSums")
        self.sums.setWordWrap(True)
        self.sums.setAccessibleName("Rank sums per group")
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addWidget(self.view, 1)
        layout.addWidget(self.sums)
        self._sized_for: tuple[str, ...] = ()
        self._rows_in_view = 0
        self.clear()

    def keep_rows_in_view(self, rows: int) -> None:
        """The table never shrinks below ``rows`` rows under its header (measured once the style
        sheet has set the fonts, and again when it changes)."""
        self._rows_in_view = rows
        self._fit_minimum_height()

    def _fit_minimum_height(self) -> None:
        if not self._rows_in_view:
            return
        self.view.ensurePolished()
        header = self.view.horizontalHeader().sizeHint().height()
        row = max(self.view.verticalHeader().defaultSectionSize(), self.view.fontMetrics().height() + 8)
        scroll_bar = self.view.horizontalScrollBar().sizeHint().height()
        frame = 2 * self.view.frameWidth() + 6
        self.view.setMinimumHeight(header + int((self._rows_in_view + 0.6) * row) + scroll_bar + frame)
        self.sums.setMinimumHeight(self._sums_height())

    def _sums_height(self) -> int:
        """Height the rank sums need at the label's width (word-wrapped labels do not ask for it)."""
        width = max(self.sums.width(), 200)
        margins = self.sums.contentsMargins()
        return self.sums.heightForWidth(width) if self.sums.hasHeightForWidth() else \
            self.sums.fontMetrics().lineSpacing() * 2 + margins.top() + margins.bottom()

    def resizeEvent(self, event) -> None:  # noqa: N802 - Qt API
        super().resizeEvent(event)
        self.sums.setMinimumHeight(self._sums_height())

    def showEvent(self, event) -> None:  # noqa: N802 - Qt API
        self._fit_minimum_height()
        super().showEvent(event)

    def clear(self, message: str = "The ranks appear here once there is a verdict.") -> None:
        """Empty the table and say why."""
        self._shown += 1
        self.model.set_rows((), [])
        self.sums.setText(message)
        self.sums.setMinimumHeight(self._sums_height())

    def show_result(self, result, analysis) -> None:
        """Fill the table from a result of the statistics service; a large one is sorted on a background
        thread meanwhile (the table stands empty until then)."""
        if _readings_in(result) <= LARGE_RESULT_READINGS:
            contents = _contents(result, analysis)
            if contents is None:
                self.clear("The planning question uses no readings, so there is nothing to rank.")
            else:
                self._shown += 1
                self._fill(self._shown, contents)
            return
        self.clear(f"Ranking {format_count(_readings_in(result))} readings…")
        shown = self._shown

        def sort() -> None:
            contents = _contents(result, analysis)
            try:
                self._contents_ready.emit(shown, contents)
            except RuntimeError:  # the window closed meanwhile
                pass

        hand_off(sort)

    def _fill(self, shown: int, contents: _Contents) -> None:
        if shown != self._shown:
            return  # a newer result (or none) is shown by now
        self.model.set_rows(contents.headers, contents.rows, contents.numeric)
        self.sums.setText(contents.sums)
        self.sums.setMinimumHeight(self._sums_height())
        if self.model.headers != self._sized_for:
            self._sized_for = self.model.headers
            self.view.resizeColumnsToContents()


def _no_difference_words(result: PairedResult) -> str:
    """How many pairs read the same both times, and what the ranking did with them."""
    if result.n_zero == 0:
        return "no pair read the same both times"
    pairs = "1 pair" if result.n_zero == 1 else f"{result.n_zero} pairs"
    treated = "left out before ranking" if result.zero_method == "wilcox" else "kept in the ranking with no sign (Pratt)"
    return f"{pairs} read the same both times, {treated}"
