"""The verdict as the technician reads it: headline, sentences, key numbers, notes, the cautions note.

The panel only displays: the window hands it a worded verdict (``rankwise.wording.describe``) and the
key numbers (``rankwise.wording.key_numbers``). The cautions note sits outside the scrolling part,
so it is visible whatever else is on screen.
"""

from __future__ import annotations

import re
from collections.abc import Sequence

from PySide6.QtCore import Qt, Signal
from PySide6.QtWidgets import (
    QFrame,
    QGridLayout,
    QHBoxLayout,
    QLabel,
    QProgressBar,
    QPushButton,
    QScrollArea,
    QSizePolicy,
    QToolButton,
    QVBoxLayout,
    QWidget,
)

from rankwise.wording import CAUTION_SHORT

KEY_NUMBER_COLUMNS = 2
"""Key numbers are laid out in this many columns; each shows its label with the value under it,
so that a value never shares its width with a long label and always reads whole."""

FIRST_NUMBERS = ("shift", "shift_ci_low", "shift_ci_high", "margin", "equivalence_ci_low", "equivalence_ci_high",
                 "p_value", "method", "n_pairs", "n_a", "n_b", "power", "alpha", "spread")
"""The numbers a technician needs under the verdict, in this order: the shift and its interval (or
the margin), the p-value and how it was found, the readings used (or, for a plan, the parts needed).
Every other number folds behind "More numbers"."""

_READINGS_USED = re.compile(r"n_\d+")
"""Readings used per group when there are several groups (n_1, n_2, ...)."""


def first_numbers(numbers: Sequence) -> tuple[list, list]:
    """The key numbers split into those shown under the verdict (in ``FIRST_NUMBERS`` order) and the rest."""
    order = {key: position for position, key in enumerate(FIRST_NUMBERS)}
    first = [n for n in numbers if n.key in order or _READINGS_USED.fullmatch(n.key)]
    first.sort(key=lambda n: order.get(n.key, len(order)))
    return first, [n for n in numbers if n not in first]


def _wrapping_label(object_name: str, accessible: str) -> QLabel:
    label = QLabel()
    label.setObjectName(object_name)
    label.setWordWrap(True)
    label.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse | Qt.TextInteractionFlag.TextSelectableByKeyboard)
    label.setAccessibleName(accessible)
    label.setSizePolicy(QSizePolicy.Policy.Preferred, QSizePolicy.Policy.Minimum)
    label.setTextFormat(Qt.TextFormat.PlainText)
    label.setFocusPolicy(Qt.FocusPolicy.StrongFocus)  # a tab stop: the verdict can be read and copied by keyboard
    return label


class ResultsPanel(QWidget):
    """Shows one verdict at a time, or why there is none yet, with the cautions note always visible.

    Signals:
        stop_requested(): the user pressed the button that stops a long computation.
        choice_taken(): the user took the choice offered with a problem (see ``offer_choice``).
    """

    stop_requested = Signal()
    choice_taken = Signal()

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setObjectName("resultsPanel")
        self.headline = _wrapping_label("verdictHeadline", "Verdict")
        self.sentences = _wrapping_label("verdictSentences", "Verdict in detail")
        self.method_note = _wrapping_label("methodNote", "How it was found")
        self.notes = _wrapping_label("assumptionNotes", "Notes on the readings and assumptions")
        self.method_note.setTextFormat(Qt.TextFormat.RichText)
        self.notes.setTextFormat(Qt.TextFormat.RichText)
        self.numbers_title = QLabel("Key numbers (hover over a number to see what it means)")
        self.numbers_title.setObjectName("sectionTitle")
        self.numbers_title.setWordWrap(True)
        self._numbers_box, self._numbers_grid = _numbers_grid()
        self.more_button = QToolButton()
        self.more_button.setObjectName("moreNumbers")
        self.more_button.setCheckable(True)
        self.more_button.setToolButtonStyle(Qt.ToolButtonStyle.ToolButtonTextBesideIcon)
        self.more_button.setArrowType(Qt.ArrowType.RightArrow)
        self.more_button.setFocusPolicy(Qt.FocusPolicy.StrongFocus)
        self.more_button.setSizePolicy(QSizePolicy.Policy.Fixed, QSizePolicy.Policy.Fixed)
        self.more_button.toggled.connect(self._show_more)
        self._more_box, self._more_grid = _numbers_grid()
        self._more_box.hide()
        self._number_labels: dict[str, QLabel] = {}
        self._name_labels: dict[str, QLabel] = {}

        self.choice_button = QPushButton()
        self.choice_button.setObjectName("offeredChoice")
        self.choice_button.setSizePolicy(QSizePolicy.Policy.Maximum, QSizePolicy.Policy.Fixed)
        self.choice_button.clicked.connect(self.choice_taken)
        self.choice_button.hide()

        body = QWidget()
        body.setObjectName("resultsBody")
        body_layout = QVBoxLayout(body)
        for widget in (self.headline, self.sentences, self.choice_button, self.numbers_title, self._numbers_box,
                       self.more_button, self._more_box, self.method_note, self.notes):
            body_layout.addWidget(widget)
        body_layout.addStretch(1)
        scroll = QScrollArea()
        scroll.setWidgetResizable(True)
        scroll.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        scroll.setFrameShape(QFrame.Shape.NoFrame)
        scroll.setFocusPolicy(Qt.FocusPolicy.NoFocus)  # the verdict's own texts take the keyboard
        scroll.setWidget(body)

        self.progress = QProgressBar()
        self.progress.setRange(0, 1000)
        self.progress.setAccessibleName("Progress of the calculation")
        self.progress.setFormat("Working out the exact p-value… %p %")
        self.stop_button = QPushButton("Stop the calculation")
        self.stop_button.setAccessibleName("Stop the calculation")
        self.stop_button.setToolTip("Stop this long calculation; the readings stay as they are (Esc).")
        self.stop_button.clicked.connect(self.stop_requested)
        self.busy_strip = QWidget()
        self.busy_strip.setObjectName("busyStrip")
        busy_layout = QHBoxLayout(self.busy_strip)
        busy_layout.setContentsMargins(0, 0, 0, 0)
        busy_layout.addWidget(self.progress, 1)
        busy_layout.addWidget(self.stop_button)
        self.busy_strip.hide()

        self.caution = QLabel(f"<b>Please note.</b> {CAUTION_SHORT}")
        self.caution.setObjectName("cautionNote")
        self.caution.setWordWrap(True)
        self.caution.setAccessibleName("Cautions note")
        self.caution.setTextFormat(Qt.TextFormat.RichText)

        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addWidget(scroll, 1)
        layout.addWidget(self.busy_strip)
        layout.addWidget(self.caution)
        self.show_waiting("Type or paste readings into the sheet, or open a file, to see a verdict here.")

    # -- states ----------------------------------------------------------------------------------
    def show_waiting(self, message: str) -> None:
        """No verdict yet: say what to do next."""
        self._set_headline("No verdict yet", "waiting")
        self.sentences.setText(message)
        self._clear_details()

    def show_problem(self, message: str) -> None:
        """The entry cannot be analysed as it stands: say why in plain words."""
        self._set_headline("No verdict: the readings need attention", "problem")
        self.sentences.setText(message)
        self._clear_details()

    def show_stopped(self) -> None:
        """The long calculation was stopped on request."""
        self.show_busy(False)
        self._set_headline("Calculation stopped", "waiting")
        self.sentences.setText(
            "The calculation was stopped. Change a reading or the question to start it again, "
            "or choose the normal approximation for very large groups."
        )
        self._clear_details()

    def show_working(self, fraction: float = 0.0) -> None:
        """A calculation takes a while: say so (an earlier verdict no longer fits the readings)."""
        self._set_headline("Working out the verdict…", "waiting")
        self.sentences.setText(
            "The calculation runs in the background; you can keep typing. "
            "Press Esc or the stop button to stop it."
        )
        self._clear_details()
        self.show_busy(True, fraction)

    def offer_choice(self, text: str, tip: str) -> None:
        """Under the reason shown, offer one choice in plain words that would let a verdict follow;
        taking it sends ``choice_taken``. Any new state shown withdraws the offer."""
        self.choice_button.setText(text)
        self.choice_button.setAccessibleName(text)
        self.choice_button.setToolTip(tip)
        self.choice_button.show()

    def show_busy(self, busy: bool, fraction: float = 0.0) -> None:
        """Show or hide the progress strip with its stop button."""
        self.busy_strip.setVisible(busy)
        self.progress.setValue(int(round(fraction * 1000)))

    def show_verdict(self, verdict, numbers: Sequence) -> None:
        """Show a worded verdict and its key numbers (each with its plain-words tooltip)."""
        self.show_busy(False)
        self._set_headline(verdict.headline, "verdict")
        self.sentences.setText(" ".join(verdict.sentences))
        self.method_note.setText(f"<b>How it was found:</b> {_escape(verdict.method_note)}" if verdict.method_note else "")
        self.method_note.setVisible(bool(verdict.method_note))
        if verdict.assumption_notes:
            items = "".join(f"<li>{_escape(note)}</li>" for note in verdict.assumption_notes)
            self.notes.setText(f"<b>Notes:</b><ul style='margin-top:2px; margin-left:12px; -qt-list-indent:1'>{items}</ul>")
        else:
            self.notes.setText("")
        self.notes.setVisible(bool(verdict.assumption_notes))
        self._fill_numbers(numbers)

    def keyboard_order(self) -> list[QWidget]:
        """The panel's controls in reading order, for the window's tab order."""
        return [self.headline, self.sentences, self.choice_button, self.more_button, self.method_note, self.notes,
                self.stop_button]

    # -- read by tests and by the window -----------------------------------------------------------
    def number_text(self, key: str) -> str | None:
        """The shown text of key number ``key``, or None when it is not shown."""
        label = self._number_labels.get(key)
        return None if label is None else label.text()

    def number_tooltip(self, key: str) -> str | None:
        """The tooltip of key number ``key``, or None when it is not shown."""
        label = self._number_labels.get(key)
        return None if label is None else label.toolTip()

    # -- helpers ---------------------------------------------------------------------------------
    def _set_headline(self, text: str, state: str) -> None:
        self.choice_button.hide()
        self.headline.setText(text)
        self.headline.setProperty("state", state)
        self.headline.style().unpolish(self.headline)
        self.headline.style().polish(self.headline)

    def _clear_details(self) -> None:
        self.method_note.clear()
        self.method_note.hide()
        self.notes.clear()
        self.notes.hide()
        self._fill_numbers(())

    def _fill_numbers(self, numbers: Sequence) -> None:
        if numbers and [number.key for number in numbers] == list(self._number_labels):
            self._update_numbers(numbers)
            return
        for grid in (self._numbers_grid, self._more_grid):
            while grid.count():
                item = grid.takeAt(0)
                if item.widget() is not None:
                    # Hidden at once: a widget left for later deletion would still be drawn until then.
                    item.widget().hide()
                    item.widget().deleteLater()
        self._number_labels = {}
        self._name_labels = {}
        first, rest = first_numbers(numbers)
        for grid, shown in ((self._numbers_grid, first), (self._more_grid, rest)):
            for position, number in enumerate(shown):
                row, column = divmod(position, KEY_NUMBER_COLUMNS)
                cell, name, value = _number_cell()
                grid.addWidget(cell, row, column, Qt.AlignmentFlag.AlignTop)
                self._number_labels[number.key] = value
                self._name_labels[number.key] = name
        self._number_labels = {number.key: self._number_labels[number.key] for number in numbers}
        self._update_numbers(numbers)
        self.numbers_title.setVisible(bool(numbers))
        self._numbers_box.setVisible(bool(first))
        self.more_button.setVisible(bool(rest))
        self.more_button.setText(f"More n&umbers ({len(rest)})")
        self.more_button.setAccessibleName(f"More numbers: {len(rest)} more")
        self._show_more(self.more_button.isChecked())

    def _show_more(self, shown: bool) -> None:
        """Unfold or fold the numbers after the first few."""
        self._more_box.setVisible(shown and self.more_button.isVisible())
        self.more_button.setArrowType(Qt.ArrowType.DownArrow if shown else Qt.ArrowType.RightArrow)

    def _update_numbers(self, numbers: Sequence) -> None:
        """Same key numbers as shown (typing changed their values): update the texts in place."""
        for number in numbers:
            name, value = self._name_labels[number.key], self._number_labels[number.key]
            name.setText(number.label)
            value.setText(number.text)
            for label in (name, value):
                label.setToolTip(number.tooltip)
            value.setAccessibleName(number.label)
            value.setAccessibleDescription(number.tooltip)


def _numbers_grid() -> tuple[QWidget, QGridLayout]:
    box = QWidget()
    grid = QGridLayout(box)
    grid.setContentsMargins(0, 0, 0, 0)
    grid.setHorizontalSpacing(18)
    grid.setVerticalSpacing(4)
    for column in range(KEY_NUMBER_COLUMNS):
        grid.setColumnStretch(column, 1)
    return box, grid


def _number_cell() -> tuple[QWidget, QLabel, QLabel]:
    """One key number: its label with the value under it."""
    cell = QWidget()
    cell.setObjectName("keyNumber")
    stack = QVBoxLayout(cell)
    stack.setContentsMargins(0, 2, 0, 4)
    stack.setSpacing(0)
    name = QLabel()
    name.setObjectName("numberLabel")
    name.setWordWrap(True)
    value = QLabel()
    value.setObjectName("numberValue")
    value.setWordWrap(True)
    value.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
    stack.addWidget(name)
    stack.addWidget(value)
    return cell, name, value


def _escape(text: str) -> str:
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")
