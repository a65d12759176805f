"""The open dialog for a file of many characteristics: what was found, which two processes, which characteristics."""

from __future__ import annotations

from dataclasses import dataclass

from PySide6.QtCore import Qt
from PySide6.QtWidgets import (
    QComboBox,
    QDialog,
    QDialogButtonBox,
    QFormLayout,
    QHBoxLayout,
    QLabel,
    QListWidget,
    QListWidgetItem,
    QPushButton,
    QVBoxLayout,
    QWidget,
)

from rankwise.readings.characteristics import CharacteristicsTable
from rankwise.wording.characteristics import ADJUST_NAMES, CHARACTERISTICS_FOUND
from rankwise.wording.numbers import format_reading


@dataclass(frozen=True)
class CharacteristicsChoice:
    """What the technician chose: A (reference), B (changed), the characteristics, the adjustment."""

    group_a: str
    group_b: str
    names: tuple[str, ...]
    adjust: str


class CharacteristicsDialog(QDialog):
    """Shows the processes and characteristics found and lets the technician choose."""

    def __init__(self, parent: QWidget | None, table: CharacteristicsTable) -> None:
        super().__init__(parent)
        self.table = table
        self.choice: CharacteristicsChoice | None = None
        self.setWindowTitle("Compare processes on many characteristics")
        self.resize(720, 560)
        layout = QVBoxLayout(self)
        intro = QLabel(CHARACTERISTICS_FOUND + "\n" + " ".join(table.notes))
        intro.setWordWrap(True)
        layout.addWidget(intro)
        form = QFormLayout()
        self.group_a, self.group_b, self.adjust = QComboBox(), QComboBox(), QComboBox()
        self.group_a.addItems(table.processes)
        self.group_b.addItems(table.processes)
        if len(table.processes) > 1:
            self.group_b.setCurrentIndex(1)
        for key, name in ADJUST_NAMES.items():
            self.adjust.addItem(name if key != "none" else "none (only when each characteristic stands alone)", key)
        form.addRow(f"&A, the reference ({table.process_column}):", self.group_a)
        form.addRow(f"&B, the changed process ({table.process_column}):", self.group_b)
        form.addRow("Adjust the p-values for the number compared by:", self.adjust)
        layout.addLayout(form)
        list_label = QLabel("&Characteristics to compare (unit, limits, readings missing in A / B):")
        layout.addWidget(list_label)
        self.list = QListWidget()
        list_label.setBuddy(self.list)
        for column in table.characteristics:
            item = QListWidgetItem()
            item.setData(Qt.ItemDataRole.UserRole, column.name)
            item.setFlags(item.flags() | Qt.ItemFlag.ItemIsUserCheckable)
            item.setCheckState(Qt.CheckState.Checked)
            self.list.addItem(item)
        layout.addWidget(self.list, 1)
        buttons_row = QHBoxLayout()
        for text, state in (("Select &all", Qt.CheckState.Checked), ("Select &none", Qt.CheckState.Unchecked)):
            button = QPushButton(text)
            button.clicked.connect(lambda _=False, s=state: self._check_all(s))
            buttons_row.addWidget(button)
        buttons_row.addStretch(1)
        layout.addLayout(buttons_row)
        self.problem = QLabel("")
        self.problem.setWordWrap(True)
        layout.addWidget(self.problem)
        self.buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Ok | QDialogButtonBox.StandardButton.Cancel)
        self.buttons.button(QDialogButtonBox.StandardButton.Ok).setText("&Compare")
        self.buttons.accepted.connect(self.accept)
        self.buttons.rejected.connect(self.reject)
        layout.addWidget(self.buttons)
        self.group_a.currentIndexChanged.connect(self._describe_items)
        self.group_b.currentIndexChanged.connect(self._describe_items)
        self._describe_items()

    def _check_all(self, state: Qt.CheckState) -> None:
        for row in range(self.list.count()):
            self.list.item(row).setCheckState(state)

    def _describe_items(self) -> None:
        """Each characteristic's line: name, unit, limits, and the readings missing in the chosen processes."""
        a, b = self.group_a.currentText(), self.group_b.currentText()
        for row, column in enumerate(self.table.characteristics):
            limits = [f"{label} {format_reading(value, column.decimals)}" for label, value in
                      (("LSL", column.lsl), ("USL", column.usl), ("nominal", column.nominal)) if value is not None]
            missing = f"missing {self.table.missing(column.name, a)} / {self.table.missing(column.name, b)}" if a and b else ""
            parts = [column.name + (f" ({column.unit})" if column.unit else ""), ", ".join(limits) or "no limits", missing]
            self.list.item(row).setText(" · ".join(part for part in parts if part))

    def selected_names(self) -> tuple[str, ...]:
        return tuple(self.list.item(row).data(Qt.ItemDataRole.UserRole) for row in range(self.list.count())
                     if self.list.item(row).checkState() == Qt.CheckState.Checked)

    def accept(self) -> None:
        a, b = self.group_a.currentText(), self.group_b.currentText()
        names = self.selected_names()
        if a == b:
            self.problem.setText("Choose two different processes: A the reference and B the changed process.")
            return
        if not names:
            self.problem.setText("Choose at least one characteristic to compare.")
            return
        self.choice = CharacteristicsChoice(a, b, names, self.adjust.currentData())
        super().accept()

    @classmethod
    def ask(cls, parent: QWidget | None, table: CharacteristicsTable) -> CharacteristicsChoice | None:
        """Show the dialog; the choice, or None when the technician cancelled."""
        dialog = cls(parent, table)
        return dialog.choice if dialog.exec() == QDialog.DialogCode.Accepted else None
