"""Checks that nothing a technician reads is cut off or covered, used at several window sizes and at
200 % scaling (in a child process, see ``scaled_window.py``)."""

from __future__ import annotations

from PySide6.QtWidgets import QAbstractButton, QLabel, QTabBar, QWidget

from rankwise.ui.elided_label import ElidedLabel


def _label_cut(label: QLabel) -> str | None:
    if isinstance(label, ElidedLabel):  # ends in "…" by design when narrow; the whole text is its tooltip
        return None if label.toolTip() == label.text() else "shortened without its whole text in the tooltip"
    if label.wordWrap():
        needed = label.heightForWidth(label.width()) if label.hasHeightForWidth() else label.sizeHint().height()
        if needed > label.height() + 1:
            return f"needs {needed} px of height, has {label.height()}"
        return None
    hint = label.sizeHint()
    if hint.width() > label.width() + 1:
        return f"needs {hint.width()} px of width, has {label.width()}"
    return None


def _tabs_cut(bar: QTabBar) -> str | None:
    shown = [i for i in range(bar.count()) if bar.isTabVisible(i)]
    for index in shown:
        rect = bar.tabRect(index)
        if rect.left() < 0 or rect.right() > bar.width() or rect.width() < bar.tabSizeHint(index).width() - 1:
            return f"tab {bar.tabText(index)!r} is not wholly in view"
    return None


def cut_off_texts(root: QWidget) -> list[str]:
    """Every visible label, button and tab bar under ``root`` whose text does not fit its room."""
    found = []
    for widget in root.findChildren(QWidget):
        if not widget.isVisible() or widget.objectName().startswith("qt_"):
            continue
        problem = None
        if isinstance(widget, QLabel) and widget.text():
            problem = _label_cut(widget)
        elif isinstance(widget, QAbstractButton) and widget.text():
            if widget.sizeHint().width() > widget.width() + 1:
                problem = f"needs {widget.sizeHint().width()} px of width, has {widget.width()}"
        elif isinstance(widget, QTabBar):
            problem = _tabs_cut(widget)
        if problem:
            text = widget.text() if hasattr(widget, "text") else type(widget).__name__
            found.append(f"{type(widget).__name__} {widget.objectName()!r} {text[:40]!r}: {problem}")
    return found


def wholly_in_view(widget: QWidget) -> bool:
    """True when no part of ``widget`` is scrolled away or covered by its parents' edges."""
    seen = widget.visibleRegion().boundingRect()
    return widget.isVisible() and seen.height() >= widget.height() - 1 and seen.width() >= widget.width() - 1


def rank_rows_in_view(window) -> int:
    """How many rank-table rows show whole."""
    view = window.rank_table.view
    height = view.viewport().height()
    return sum(1 for row in range(view.model().rowCount())
               if 0 <= view.rowViewportPosition(row) and view.rowViewportPosition(row) + view.rowHeight(row) <= height)


def window_problems(window) -> list[str]:
    """What a technician could not read in the window as it stands (after a verdict is shown)."""
    problems = cut_off_texts(window)
    panel = window.results_panel
    for name, label in (("verdict", panel.headline), ("verdict sentences", panel.sentences), ("cautions note", panel.caution)):
        if not wholly_in_view(label):
            problems.append(f"the {name} is not wholly in view")
    if window.tabs.currentWidget() is window.rank_table and rank_rows_in_view(window) < 5:
        problems.append(f"only {rank_rows_in_view(window)} rank rows in view")
    return problems
