"""The keyboard reaches every pane: F6 / Shift+F6 walk the question, the sheet, the verdict, the
rank table and the charts, in that order, as in most desktop programs with several panes."""

from __future__ import annotations

from PySide6.QtCore import Qt
from PySide6.QtGui import QKeySequence, QShortcut
from PySide6.QtWidgets import QApplication, QWidget

PANE_NAMES = ("question", "sheet", "verdict", "ranks", "charts")
"""The panes F6 walks, in order."""


class WindowKeyboard:
    """Mixin of ``MainWindow``: F6 and Shift+F6 give the keyboard to the next or previous pane."""

    def _build_pane_keys(self) -> None:
        for sequence, step in (("F6", +1), ("Shift+F6", -1)):
            shortcut = QShortcut(QKeySequence(sequence), self)
            shortcut.setContext(Qt.ShortcutContext.WindowShortcut)
            shortcut.activated.connect(lambda step=step: self.focus_pane(step=step))

    def _set_tab_order(self) -> None:
        """Tab reads the window like a page: the question and its settings, the sheet (Ctrl+Tab
        leaves it), the verdict, then the ranks and charts."""
        panel = self.results_panel
        chain = [*self.question_panel.keyboard_order(), self.grid, *panel.keyboard_order(),
                 self.tabs.tabBar(), self.rank_table.view]
        for before, after in zip(chain, chain[1:]):
            QWidget.setTabOrder(before, after)

    def _pane_boxes(self) -> dict[str, QWidget]:
        """Each pane's outer widget: the keyboard is "in" a pane when it is on that widget or inside it."""
        return {"question": self.question_panel, "sheet": self.grid, "verdict": self.results_panel,
                "ranks": self.rank_table, "charts": self.tabs}

    def current_pane(self) -> str | None:
        """The pane holding the keyboard, or None (the menu bar, the status line)."""
        focused = QApplication.focusWidget()
        if focused is None:
            return None
        boxes = self._pane_boxes()
        for name in ("question", "sheet", "verdict", "ranks"):  # the charts' box holds the rank table too
            if focused is boxes[name] or boxes[name].isAncestorOf(focused):
                return name
        return "charts" if focused is self.tabs or self.tabs.isAncestorOf(focused) else None

    def _pane_available(self, name: str) -> bool:
        if name == "ranks":
            return self.tabs.isTabVisible(self.tabs.indexOf(self.rank_table))
        if name == "charts":
            return any(self.tabs.isTabVisible(self.tabs.indexOf(chart)) for chart in self.charts)
        return True

    def focus_pane(self, name: str | None = None, step: int = +1) -> str:
        """Give the keyboard to pane ``name``, or to the next (``step`` +1) or previous (-1) pane
        from the one holding it now; returns the pane's name."""
        if name is None:
            here = self.current_pane()
            position = PANE_NAMES.index(here) if here is not None else (-1 if step > 0 else 0)
            for _ in PANE_NAMES:
                position = (position + step) % len(PANE_NAMES)
                if self._pane_available(PANE_NAMES[position]):
                    break
            name = PANE_NAMES[position]
        target = self._pane_target(name)
        self.reveal(target)
        target.setFocus(Qt.FocusReason.ShortcutFocusReason)
        return name

    def _pane_target(self, name: str) -> QWidget:
        """The control that takes the keyboard when a pane is entered."""
        if name == "question":
            return self.question_panel.focus_target()
        if name == "sheet":
            return self.grid
        if name == "verdict":
            return self.results_panel.headline
        if name == "ranks":
            self.tabs.setCurrentWidget(self.rank_table)
            return self.rank_table.view
        if self.tabs.currentWidget() is self.rank_table:
            charts = [chart for chart in self.charts if self.tabs.isTabVisible(self.tabs.indexOf(chart))]
            if charts:
                self.tabs.setCurrentWidget(charts[0])
        return self.tabs.tabBar()
