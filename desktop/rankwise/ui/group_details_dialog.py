"""A small dialog for one group's name, unit, specification limits (LSL/USL) and nominal."""

from __future__ import annotations

from dataclasses import dataclass

from PySide6.QtWidgets import QDialog, QDialogButtonBox, QFormLayout, QLabel, QLineEdit, QVBoxLayout, QWidget


@dataclass(frozen=True)
class GroupDetails:
    """What the dialog returns; limits are None when left blank."""

    name: str
    unit: str
    lsl: float | None
    usl: float | None
    nominal: float | None


def _number_or_none(text: str, what: str) -> float | None:
    cleaned = text.strip().replace(",", ".")
    if not cleaned:
        return None
    try:
        return float(cleaned)
    except ValueError:
        raise ValueError(f"{what} must be a number such as 0.80, or left blank; got {text.strip()!r}.") from None


class GroupDetailsDialog(QDialog):
    """Edit a group's details; the readings layer checks them (LSL below USL, a unique name)."""

    def __init__(self, parent: QWidget | None, details: GroupDetails) -> None:
        super().__init__(parent)
        self.setWindowTitle(f"Details of {details.name}")
        self.setMinimumWidth(460)
        self.name = QLineEdit(details.name)
        self.unit = QLineEdit(details.unit)
        self.lsl = QLineEdit("" if details.lsl is None else f"{details.lsl:g}")
        self.usl = QLineEdit("" if details.usl is None else f"{details.usl:g}")
        self.nominal = QLineEdit("" if details.nominal is None else f"{details.nominal:g}")
        form = QFormLayout()
        for label, widget, hint in (
            ("Group name", self.name, "The name shown above the column, in the verdict and on the record."),
            ("Unit", self.unit, "The unit of the readings, e.g. µm, N, mm."),
            ("Lower limit (LSL)", self.lsl, "Lower specification limit; leave blank when there is none."),
            ("Upper limit (USL)", self.usl, "Upper specification limit; leave blank when there is none."),
            ("Nominal", self.nominal, "The nominal (target) value; leave blank when there is none."),
        ):
            widget.setAccessibleName(label)
            widget.setToolTip(hint)
            form.addRow(label, widget)
        self.problem = QLabel()
        self.problem.setWordWrap(True)
        self.problem.setObjectName("dialogProblem")
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Ok | QDialogButtonBox.StandardButton.Cancel)
        buttons.accepted.connect(self._check_and_accept)
        buttons.rejected.connect(self.reject)
        layout = QVBoxLayout(self)
        layout.addLayout(form)
        layout.addWidget(self.problem)
        layout.addWidget(buttons)
        self._details: GroupDetails | None = None

    def details(self) -> GroupDetails:
        """The details as typed; raises ValueError with a plain message when a limit is not a number."""
        return GroupDetails(
            name=self.name.text().strip(),
            unit=self.unit.text().strip(),
            lsl=_number_or_none(self.lsl.text(), "The lower limit (LSL)"),
            usl=_number_or_none(self.usl.text(), "The upper limit (USL)"),
            nominal=_number_or_none(self.nominal.text(), "The nominal"),
        )

    def _check_and_accept(self) -> None:
        try:
            self._details = self.details()
        except ValueError as error:
            self.problem.setText(f"⚠ {error}")
            return
        self.accept()

    @classmethod
    def ask(cls, parent: QWidget | None, details: GroupDetails) -> GroupDetails | None:
        """Show the dialog; the edited details, or None when cancelled."""
        dialog = cls(parent, details)
        return dialog._details if dialog.exec() == QDialog.DialogCode.Accepted else None
