"""The question picker: what the technician wants to know, in plain words, and its few settings."""

from __future__ import annotations

from dataclasses import dataclass, replace

from PySide6.QtCore import QLocale, Signal
from PySide6.QtWidgets import (
    QButtonGroup,
    QComboBox,
    QDoubleSpinBox,
    QFormLayout,
    QLabel,
    QRadioButton,
    QSizePolicy,
    QVBoxLayout,
    QWidget,
)

from rankwise.stats.analysis import Question, Settings


@dataclass(frozen=True)
class QuestionOption:
    """One entry of the picker: its key, its words, and what it asks of the statistics."""

    key: str
    text: str
    question: Question
    alternative: str = "two-sided"
    wants_margin: bool = False


QUESTION_OPTIONS: tuple[QuestionOption, ...] = (
    QuestionOption("differ", "Do the two groups differ?", Question.TWO_GROUPS),
    QuestionOption("b-higher", "Does B read higher than A?", Question.TWO_GROUPS, "b-greater"),
    QuestionOption("b-lower", "Does B read lower than A?", Question.TWO_GROUPS, "b-less"),
    QuestionOption("paired", "Same parts: before vs after?", Question.PAIRED),
    QuestionOption("several", "Do several groups differ?", Question.SEVERAL),
    QuestionOption("margin", "Same within a margin?", Question.TWO_GROUPS, wants_margin=True),
    QuestionOption("plan", "How many parts to measure?", Question.PLAN),
)
"""The questions offered, in the order shown."""

OPTION_OF_QUESTION = {Question.TWO_GROUPS: "differ", Question.PAIRED: "paired", Question.SEVERAL: "several",
                      Question.PLAN: "plan"}
"""The picker entry that asks each question in its plain form."""

LEVELS = ((0.10, "0.10 (10 %)"), (0.05, "0.05 (5 %)"), (0.01, "0.01 (1 %)"))
PAIRED_DIRECTIONS = (
    ("two-sided", "any change"),
    ("b-greater", "after reads higher"),
    ("b-less", "after reads lower"),
)
POWERS = ((0.8, "8 in 10"), (0.9, "9 in 10"), (0.95, "19 in 20"))
PLAN_DESIGNS = ((False, "two separate groups of parts"), (True, "the same parts, measured twice"),
                ("several", "several separate groups"))
PLAN_DIRECTIONS = (("two-sided", "any change"), ("b-greater", "B reads higher"), ("b-less", "B reads lower"))
"""The planner's directions for two separate groups (the same parts use ``PAIRED_DIRECTIONS``)."""
METHODS = (
    ("auto", "automatically (exact if quick)"),
    ("exact", "always exactly (can be slow)"),
    ("normal", "by the normal approximation"),
)


@dataclass(frozen=True)
class QuestionChoice:
    """What the picker says: the question, its settings, and which groups (sheet columns) it uses.

    Attributes:
        option: the picker entry's key (see ``QUESTION_OPTIONS``).
        question, settings: as handed to the statistics service.
        group_indices: the sheet columns in question order (A first); for planning the two groups
            the plan is for (they lend their names and unit), or () when there are none.
        problem: a plain-words reason the question cannot be asked yet, else "".
        notes: sentences for the analysis's notes (where a plan's starting values came from).
    """

    option: str
    question: Question
    settings: Settings
    group_indices: tuple[int, ...]
    problem: str = ""
    notes: tuple[str, ...] = ()


def _combo(name: str, tooltip: str, items=()) -> QComboBox:
    """A drop-down list named for screen readers, offering ``items`` as (value, text) pairs."""
    box = QComboBox()
    box.setAccessibleName(name)
    box.setToolTip(tooltip)
    for value, text in items:
        box.addItem(text, value)
    return box


def _spin(name: str, tooltip: str, decimals: int = 3) -> QDoubleSpinBox:
    spin = QDoubleSpinBox()
    spin.setAccessibleName(name)
    spin.setToolTip(tooltip)
    spin.setDecimals(decimals)
    spin.setRange(0.0, 1e9)
    spin.setKeyboardTracking(False)
    return spin


class QuestionPanel(QWidget):
    """Plain-words question picker. Emits ``changed`` whenever the question or a setting changes."""

    changed = Signal()

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setObjectName("questionPanel")
        self._group_names: list[str] = []
        self._tolerances: list[float | None] = []
        self._updating = False

        title = QLabel("&What do you want to know?")
        title.setObjectName("panelTitle")
        self._buttons = QButtonGroup(self)
        self._buttons.setExclusive(True)
        layout = QVBoxLayout(self)
        layout.addWidget(title)
        for position, option in enumerate(QUESTION_OPTIONS):
            button = QRadioButton(option.text)
            button.setAccessibleName(option.text)
            button.setObjectName(f"question-{option.key}")
            self._buttons.addButton(button, position)
            layout.addWidget(button)
        self._buttons.button(0).setChecked(True)
        title.setBuddy(self._buttons.button(0))

        self.level = _combo("Significance level", "How small the p-value must be before the verdict says the change moved the readings.",
                            LEVELS)
        self.level.setCurrentIndex(1)
        self.group_a = _combo("Group A (reference)", "The reference: the current process, or the readings before the change.")
        self.group_b = _combo("Group B (changed)", "The changed process, or the readings after the change.")
        self.reference = _combo("Compare", "Several groups: compare every pair, or each group with one reference group.")
        self.direction = _combo("Look for", "Same parts: look for any change, or only for one direction.",
                                PAIRED_DIRECTIONS)
        self.method = _combo("p-value found by", "Exact: from every way the ranks could fall (slow for very large groups). "
                             "Normal approximation: fast, close for large groups.", METHODS)
        self.margin = _spin("Margin", "How far apart A and B may be and still count as the same for this part.")
        self.margin_unit = _combo("Margin given as", "Give the margin in the readings' unit, or as a share of the tolerance width (USL - LSL).")
        self.planned_shift = _spin("Shift worth finding", "The smallest change of the readings that matters, in the readings' unit.")
        self.planned_spread = _spin("Usual spread", "The usual spread of the readings (standard deviation), in the readings' unit.")
        self.power = _combo("Chance to find it", "How often a study of this size should find a shift of that size.", POWERS)
        self.plan_design = _combo("Plan for", "Two separate groups of parts (rank-sum test), the same parts "
                                  "measured before and after (signed-rank test), or several separate groups "
                                  "(Kruskal-Wallis test).", PLAN_DESIGNS)
        self.plan_origin = QLabel()
        self.plan_origin.setObjectName("planOrigin")
        self.plan_origin.setWordWrap(True)
        self.plan_origin.setAccessibleName("Where the starting values came from")
        self.plan_origin.setSizePolicy(QSizePolicy.Policy.Preferred, QSizePolicy.Policy.MinimumExpanding)
        self._plan_sheet = None
        self._typed = {"shift": False, "spread": False}
        self._plan_notes: tuple[str, ...] = ()
        self.planned_shift.setValue(1.0)
        self.planned_spread.setValue(1.0)

        form = QFormLayout()
        form.setFieldGrowthPolicy(QFormLayout.FieldGrowthPolicy.AllNonFixedFieldsGrow)
        form.setRowWrapPolicy(QFormLayout.RowWrapPolicy.WrapAllRows)
        form.setVerticalSpacing(4)
        self._rows: dict[str, tuple[QLabel, QWidget]] = {}
        for key, label_text, widget in (
            ("level", "&Significance level", self.level),
            ("a", "Group &A (reference)", self.group_a),
            ("b", "Group &B (changed)", self.group_b),
            ("reference", "&Compare", self.reference),
            ("direction", "&Look for", self.direction),
            ("method", "p-&value found", self.method),
            ("margin", "&Margin ±", self.margin),
            ("margin_unit", "Margin &given", self.margin_unit),
            ("design", "Plan for", self.plan_design),
            ("shift", "Shift worth finding", self.planned_shift),
            ("spread", "Usual spread (SD)", self.planned_spread),
            ("power", "Chance to find it", self.power),
            ("start", "Starting values", self.plan_origin),
        ):
            label = QLabel(label_text)
            label.setBuddy(widget)
            form.addRow(label, widget)
            self._rows[key] = (label, widget)
        settings_title = QLabel("Settings")
        settings_title.setObjectName("sectionTitle")
        layout.addSpacing(6)
        layout.addWidget(settings_title)
        layout.addLayout(form)
        layout.addStretch(1)

        self._buttons.idToggled.connect(self._on_option_toggled)
        for box in (self.level, self.group_a, self.group_b, self.reference, self.direction, self.method, self.margin_unit,
                    self.power):
            box.currentIndexChanged.connect(self._on_setting_changed)
        self.plan_design.currentIndexChanged.connect(self._on_design_changed)
        for box in (self.group_a, self.group_b):
            box.currentIndexChanged.connect(self._refresh_plan_start)
        self.planned_shift.valueChanged.connect(lambda _value: self._on_plan_value_typed("shift"))
        self.planned_spread.valueChanged.connect(lambda _value: self._on_plan_value_typed("spread"))
        for spin in (self.margin, self.planned_shift, self.planned_spread):
            spin.valueChanged.connect(self._on_setting_changed)
        self.set_groups([], [])
        self._show_rows_for_option()

    # -- what the window tells the panel -------------------------------------------------------
    def set_groups(self, names: list[str], tolerance_widths: list[float | None]) -> None:
        """Offer the sheet's groups (keeping the current choice where the names still exist)."""
        self._updating = True
        try:
            self._group_names = list(names)
            self._tolerances = list(tolerance_widths)
            keep_a, keep_b, keep_ref = self.group_a.currentText(), self.group_b.currentText(), self.reference.currentData()
            self.group_a.clear()
            self.group_b.clear()
            for index, name in enumerate(names):
                self.group_a.addItem(name, index)
                self.group_b.addItem(name, index)
            self.group_a.setCurrentIndex(max(0, self.group_a.findText(keep_a)) if keep_a else 0)
            default_b = 1 if len(names) > 1 else 0
            self.group_b.setCurrentIndex(self.group_b.findText(keep_b) if keep_b and self.group_b.findText(keep_b) >= 0 else default_b)
            self.reference.clear()
            self.reference.addItem("every pair of groups", None)
            for name in names:
                self.reference.addItem(f"each group with {name}", name)
            found = self.reference.findData(keep_ref)
            self.reference.setCurrentIndex(found if found >= 0 else 0)
            self._refresh_margin_units()
        finally:
            self._updating = False

    def set_same_parts_unavailable(self, reason: str) -> None:
        """Offer the same-parts question only where the readings can be paired; ``reason`` says why
        not (shown as the option's tooltip), or "" to offer it."""
        position = next(k for k, option in enumerate(QUESTION_OPTIONS) if option.question is Question.PAIRED)
        button = self._buttons.button(position)
        button.setEnabled(not reason)
        button.setToolTip(reason or "The same parts measured twice: each part's two readings are taken together.")

    def select_question(self, question: Question) -> bool:
        """Tick the plain form of ``question`` (two groups: "do they differ?"); True when that changed the option."""
        key = OPTION_OF_QUESTION[Question(question)]
        changed = self.option.key != key
        self.select_option(key)
        return changed

    def select_option(self, key: str) -> None:
        """Tick the question with ``key`` (see ``QUESTION_OPTIONS``)."""
        for position, option in enumerate(QUESTION_OPTIONS):
            if option.key == key:
                self._buttons.button(position).setChecked(True)
                return
        raise ValueError(f"key must be one of {[o.key for o in QUESTION_OPTIONS]}; got {key!r}.")

    def set_level(self, alpha: float) -> None:
        """Choose the significance level (one of 0.10, 0.05, 0.01)."""
        found = [index for index, (value, _) in enumerate(LEVELS) if abs(value - alpha) < 1e-12]
        if not found:
            raise ValueError(f"alpha must be one of {[v for v, _ in LEVELS]}; got {alpha!r}.")
        self.level.setCurrentIndex(found[0])

    def keyboard_order(self) -> list[QWidget]:
        """The panel's controls in reading order: the questions, then the settings as laid out."""
        return [*self._buttons.buttons(), *(widget for _, widget in self._rows.values())]

    def focus_target(self) -> QWidget:
        """The control that takes the keyboard when the panel is entered (F6): the ticked question."""
        return self._buttons.checkedButton() or self._buttons.button(0)

    # -- what the panel tells the window -------------------------------------------------------
    @property
    def option(self) -> QuestionOption:
        """The ticked question."""
        return QUESTION_OPTIONS[max(0, self._buttons.checkedId())]

    def choice(self) -> QuestionChoice:
        """The question, its settings and the groups it concerns, as the picker shows them now."""
        option = self.option
        settings = Settings(alpha=float(self.level.currentData()), alternative=option.alternative,
                            method=str(self.method.currentData()))
        names = self._group_names
        if option.question is Question.PLAN:
            paired = self.plans_paired
            several = self.plans_several
            direction = "two-sided" if several else str(self.direction.currentData())
            settings = replace(
                settings,
                alternative=direction,
                # the box holds the size of the shift; a plan for a fall looks for it downwards
                planned_shift=-self.planned_shift.value() if direction == "b-less" else self.planned_shift.value(),
                planned_spread=self.planned_spread.value(),
                power=float(self.power.currentData()),
                plan_paired=paired,
                plan_groups=max(3, len(names)) if several else 2,
            )
            problem = "" if self.planned_shift.value() > 0 and self.planned_spread.value() > 0 else (
                "Give the change per part worth finding and the spread of the differences (both above zero)."
                if paired else "Give the shift worth finding and the usual spread of the readings (both above zero)."
            )
            return QuestionChoice(option.key, option.question, settings, self._plan_groups(), problem, self._plan_notes)
        if option.question is Question.SEVERAL:
            reference = self.reference.currentData()
            if reference is not None:
                settings = replace(settings, comparison="against-reference", reference=reference)
            problem = "" if len(names) >= 3 else "Several groups need at least three groups (columns) of readings."
            return QuestionChoice(option.key, option.question, settings, tuple(range(len(names))), problem)
        index_a, index_b = self.group_a.currentData(), self.group_b.currentData()
        if option.question is Question.PAIRED:
            settings = replace(settings, alternative=str(self.direction.currentData()))
        problem = ""
        if len(names) < 2:
            problem = "Two groups are needed: type or paste readings into two columns."
        elif index_a == index_b:
            problem = "Choose two different groups for A and B."
        if option.wants_margin:
            margin, margin_problem = self._margin_in_units(index_a, index_b)
            settings = replace(settings, margin=margin)
            problem = problem or margin_problem
        indices = () if index_a is None or index_b is None else (int(index_a), int(index_b))
        return QuestionChoice(option.key, option.question, settings, indices, problem)

    @property
    def plans_paired(self) -> bool:
        """True when the plan is for the same parts measured twice."""
        return self.plan_design.currentData() is True

    @property
    def plans_several(self) -> bool:
        """True when the plan is for several separate groups (Kruskal-Wallis)."""
        return self.plan_design.currentData() == "several"

    def _plan_groups(self) -> tuple[int, ...]:
        """The sheet columns a plan is for: every group for several groups, else A and B (or none)."""
        if self.plans_several:
            return tuple(range(len(self._group_names))) if len(self._group_names) >= 3 else ()
        index_a, index_b = self.group_a.currentData(), self.group_b.currentData()
        named = index_a is not None and index_b is not None and index_a != index_b
        return (int(index_a), int(index_b)) if named else ()

    def set_plan_sheet(self, sheet) -> None:
        """The readings sheet the planner takes its starting values from (spread from the readings,
        shift from the tolerance; ``rankwise.readings.plan_start``). A new sheet starts afresh;
        values the technician typed for the same sheet are kept."""
        if sheet is not self._plan_sheet:
            self._typed = {"shift": False, "spread": False}
        self._plan_sheet = sheet
        self._refresh_plan_start()

    def _refresh_plan_start(self, *_args) -> None:
        """Fill the planner's shift and spread from the sheet where not typed, and say where each came from."""
        if self._plan_sheet is None:
            return
        from rankwise.readings.plan_start import plan_start
        from rankwise.wording.planning import starting_value_brief, starting_value_notes

        groups = self._plan_sheet.groups
        columns = [groups[index] for index in self._plan_groups() if index < len(groups)]
        start = plan_start(columns, paired=self.plans_paired)
        was_updating, self._updating = self._updating, True
        try:
            if not self._typed["shift"] and start.shift is not None:
                self.planned_shift.setValue(start.shift)
            if not self._typed["spread"] and start.spread is not None:
                self.planned_spread.setValue(start.spread)
        finally:
            self._updating = was_updating
        self._plan_notes = starting_value_notes(
            start, self.planned_shift.value(), self.planned_spread.value(), shift_typed=self._typed["shift"],
            spread_typed=self._typed["spread"], paired=self.plans_paired,
            mark=self.planned_shift.locale().decimalPoint())
        self.plan_origin.setText(starting_value_brief(start, shift_typed=self._typed["shift"],
                                                      spread_typed=self._typed["spread"]))
        self.plan_origin.setToolTip("\n".join(self._plan_notes))

    def _on_plan_value_typed(self, key: str) -> None:
        if not self._updating:
            self._typed[key] = True
            self._refresh_plan_start()

    def to_dict(self) -> dict:
        """The picker's state as plain data (kept in the recovery file)."""
        return {
            "option": self.option.key,
            "alpha": float(self.level.currentData()),
            "group_a": self.group_a.currentText(),
            "group_b": self.group_b.currentText(),
            "reference": self.reference.currentData(),
            "direction": self.direction.currentData(),
            "method": self.method.currentData(),
            "margin": self.margin.value(),
            "margin_unit": self.margin_unit.currentData(),
            "planned_shift": self.planned_shift.value(),
            "planned_spread": self.planned_spread.value(),
            "power": float(self.power.currentData()),
            "plan_paired": self.plans_paired,
            "plan_design": "several" if self.plans_several else self.plans_paired,
            "planned_shift_typed": self._typed["shift"],
            "planned_spread_typed": self._typed["spread"],
        }

    def from_dict(self, state: dict) -> None:
        """Restore a state written by ``to_dict``; unknown or missing entries keep their defaults."""
        self._updating = True
        try:
            keys = [o.key for o in QUESTION_OPTIONS]
            if state.get("option") in keys:
                self.select_option(state["option"])
            for box, key, by_text in (
                (self.level, "alpha", False), (self.group_a, "group_a", True), (self.group_b, "group_b", True),
                (self.reference, "reference", False), (self.direction, "direction", False), (self.method, "method", False),
                (self.margin_unit, "margin_unit", False), (self.power, "power", False),
                (self.plan_design, "plan_paired", False), (self.plan_design, "plan_design", False),
            ):
                if key in state:
                    found = box.findText(state[key]) if by_text else box.findData(state[key])
                    if found >= 0:
                        box.setCurrentIndex(found)
            for spin, key in ((self.margin, "margin"), (self.planned_shift, "planned_shift"), (self.planned_spread, "planned_spread")):
                if isinstance(state.get(key), (int, float)):
                    spin.setValue(float(state[key]))
                    if key != "margin":  # a restored plan keeps its values unless it says they came from the sheet
                        self._typed[key.removeprefix("planned_")] = bool(state.get(f"{key}_typed", True))
        finally:
            self._updating = False
        self._show_rows_for_option()
        self.changed.emit()

    def set_from_analysis(self, analysis) -> None:
        """Show the question and settings of a restored analysis (e.g. from a signed record)."""
        settings = analysis.settings
        names = [group.name for group in analysis.groups]
        option = {
            Question.PAIRED: "paired", Question.SEVERAL: "several", Question.PLAN: "plan",
        }.get(analysis.question)
        if option is None:
            option = "margin" if settings.margin is not None else {
                "b-greater": "b-higher", "b-less": "b-lower"}.get(settings.alternative, "differ")
        state = {
            "option": option, "alpha": settings.alpha, "direction": settings.alternative,
            "reference": settings.reference, "margin_unit": "units", "method": settings.method,
            "plan_paired": settings.plan_paired,
            "plan_design": "several" if settings.plan_groups >= 3 else settings.plan_paired,
        }
        if len(names) >= 2:
            state.update(group_a=names[0], group_b=names[1])
        if settings.margin is not None:
            state["margin"] = settings.margin
        for key in ("planned_shift", "planned_spread", "power"):
            if getattr(settings, key) is not None:
                state[key] = getattr(settings, key)
        self.from_dict(state)

    def set_decimal_mark(self, mark: str) -> None:
        """Show the number boxes (margin, planned shift and spread) with the readings' decimal mark."""
        if mark not in (".", ","):
            raise ValueError(f'mark must be "." or ","; got {mark!r}.')
        locale = QLocale(QLocale.Language.English if mark == "." else QLocale.Language.German)
        locale.setNumberOptions(QLocale.NumberOption.OmitGroupSeparator)
        for spin in (self.margin, self.planned_shift, self.planned_spread):
            if spin.locale().decimalPoint() != mark:
                spin.setLocale(locale)
                spin.setValue(spin.value())  # redraw the shown text in the new mark

    def set_read_only(self, read_only: bool) -> None:
        """Lock the picker (a signed analysis is read-only)."""
        for child in self.findChildren(QWidget):
            child.setEnabled(not read_only)

    # -- handlers ------------------------------------------------------------------------------
    def _margin_in_units(self, index_a, index_b) -> tuple[float | None, str]:
        value = self.margin.value()
        if value <= 0:
            return None, "Give the margin: how far apart A and B may be and still count as the same."
        if self.margin_unit.currentData() != "tolerance":
            return value, ""
        width = self._tolerance_width(index_a, index_b)
        if width is None:
            return None, "A share of the tolerance needs LSL and USL set for group A or B."
        return value / 100.0 * width, ""

    def _tolerance_width(self, index_a, index_b) -> float | None:
        for index in (index_a, index_b):
            if index is not None and index < len(self._tolerances) and self._tolerances[index]:
                return self._tolerances[index]
        return None

    def _refresh_margin_units(self) -> None:
        keep = self.margin_unit.currentData()
        self.margin_unit.clear()
        self.margin_unit.addItem("in the readings' unit", "units")
        if any(width for width in self._tolerances):
            self.margin_unit.addItem("in % of the tolerance width", "tolerance")
        found = self.margin_unit.findData(keep)
        self.margin_unit.setCurrentIndex(found if found >= 0 else 0)

    def _show_rows_for_option(self) -> None:
        question = self.option.question
        plan_several = question is Question.PLAN and self.plans_several
        visible = {
            "level": True,
            "a": question is not Question.SEVERAL and not plan_several,
            "b": question is not Question.SEVERAL and not plan_several,
            "reference": question is Question.SEVERAL,
            "direction": question is Question.PAIRED or (question is Question.PLAN and not self.plans_several),
            "method": question is not Question.PLAN,
            "margin": self.option.wants_margin,
            "margin_unit": self.option.wants_margin,
            "design": question is Question.PLAN,
            "shift": question is Question.PLAN,
            "spread": question is Question.PLAN,
            "power": question is Question.PLAN,
            "start": question is Question.PLAN,
        }
        for key, (label, widget) in self._rows.items():
            label.setVisible(visible[key])
            widget.setVisible(visible[key])
        paired = question is Question.PAIRED or (question is Question.PLAN and self.plans_paired)
        self._rows["a"][0].setText("&Before" if paired else "Group &A (reference)")
        self._rows["b"][0].setText("&After" if paired else "Group &B (changed)")
        plan_paired = question is Question.PLAN and self.plans_paired
        directions = PLAN_DIRECTIONS if question is Question.PLAN and not plan_paired else PAIRED_DIRECTIONS
        for position, (_, text) in enumerate(directions):
            self.direction.setItemText(position, text)
        self._rows["shift"][0].setText("Change per part worth finding" if plan_paired else "Shift worth finding")
        self._rows["spread"][0].setText("Spread of the differences (SD)" if plan_paired else "Usual spread (SD)")
        self.planned_spread.setToolTip(
            "How much the change from before to after scatters from part to part (standard deviation "
            "of the differences), in the readings' unit." if plan_paired else
            "The usual spread of the readings (standard deviation), in the readings' unit.")

    def _on_option_toggled(self, _id: int, checked: bool) -> None:
        if checked:
            self._show_rows_for_option()
            if not self._updating:
                self.changed.emit()

    def _on_design_changed(self, *_args) -> None:
        self._show_rows_for_option()
        self._refresh_plan_start()
        self._on_setting_changed()

    def _on_setting_changed(self, *_args) -> None:
        if not self._updating:
            self.changed.emit()
