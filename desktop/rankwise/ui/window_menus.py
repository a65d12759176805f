"""The window's menus: File, Edit, Question, Record and Help, with their shortcuts."""

from __future__ import annotations

from PySide6.QtCore import Qt
from PySide6.QtGui import QAction, QKeySequence

import rankwise
from rankwise.ui import dialogs
from rankwise.ui.recent_files import forget_all, recent_files


class WindowMenus:
    """Mixin of ``MainWindow``: builds the menu bar; each action calls one of the window's methods."""

    def make_action(self, text: str, handler, shortcut=None, tip: str = "") -> QAction:
        """A menu action calling ``handler()``, with an optional shortcut and a plain-words tip."""
        action = QAction(text, self)
        if shortcut is not None:
            action.setShortcut(QKeySequence(shortcut))
        if tip:
            action.setStatusTip(tip)
            action.setToolTip(tip)
        action.triggered.connect(lambda _checked=False: handler())
        return action

    def _build_menus(self) -> None:
        bar = self.menuBar()
        file_menu = bar.addMenu("&File")
        self.new_action = self.make_action("&New sheet", self.new_sheet, QKeySequence.StandardKey.New, "Start an empty sheet.")
        self.open_action = self.make_action("&Open readings…", self.ask_and_open, QKeySequence.StandardKey.Open,
                                        "Open a CSV or XLSX export, or a signed result workbook.")
        self.recent_menu = file_menu.addMenu("Open &recent")
        self.save_action = self.make_action("&Save readings as typed…", self.save_readings, QKeySequence.StandardKey.Save,
                                         "Save the readings exactly as typed (CSV or XLSX), to finish later.")
        self.quit_action = self.make_action("&Quit", self.close, QKeySequence.StandardKey.Quit)
        file_menu.insertAction(self.recent_menu.menuAction(), self.new_action)
        file_menu.insertAction(self.recent_menu.menuAction(), self.open_action)
        file_menu.addAction(self.save_action)
        file_menu.addSeparator()
        file_menu.addAction(self.records.print_preview_action)
        file_menu.addAction(self.records.print_action)
        file_menu.addAction(self.records.pdf_action)
        file_menu.addSeparator()
        file_menu.addAction(self.quit_action)
        self.recent_menu.aboutToShow.connect(self._fill_recent_menu)

        edit = bar.addMenu("&Edit")
        self.undo_action = self.make_action("&Undo", self.undo, QKeySequence.StandardKey.Undo)
        self.redo_action = self.make_action("&Redo", self.redo, QKeySequence.StandardKey.Redo)
        edit.addAction(self.undo_action)
        edit.addAction(self.redo_action)
        edit.addSeparator()
        for text, handler, shortcut, tip in (
            ("Cu&t", self.grid.cut_selection, QKeySequence.StandardKey.Cut, ""),
            ("&Copy", self.grid.copy_selection, QKeySequence.StandardKey.Copy, ""),
            ("&Paste", self.grid.paste_from_clipboard, QKeySequence.StandardKey.Paste, "Paste a block copied from any spreadsheet."),
            ("C&lear cells", self.grid.clear_selected_cells, QKeySequence.StandardKey.Delete, ""),
            ("&Insert rows above", self.grid.insert_rows_above, "Ctrl+Shift++", ""),
            ("&Delete rows", self.grid.delete_selected_rows, "Ctrl+-", ""),
        ):
            action = self.make_action(text, handler, shortcut, tip)
            action.setShortcutContext(Qt.ShortcutContext.WidgetShortcut)
            self.grid.addAction(action)
            edit.addAction(action)
            if text == "C&lear cells":
                edit.addSeparator()
        edit.addSeparator()
        edit.addAction(self.make_action("&Add a group", self.add_group, "Ctrl+Shift+N"))
        edit.addAction(self.make_action("Group &details (name, unit, limits)…", self.edit_group_details, "Ctrl+G"))
        edit.addAction(self.make_action("Move group &left", lambda: self.move_group(-1), "Ctrl+Shift+Left"))
        edit.addAction(self.make_action("Move group &right", lambda: self.move_group(+1), "Ctrl+Shift+Right"))
        edit.addAction(self.make_action("Re&move group", self.remove_group))
        decimal_menu = edit.addMenu("Decimal &separator")
        for text, separator in (("Decide from the readings", "auto"), ("Point (0.42)", "."), ("Comma (0,42)", ",")):
            decimal_menu.addAction(self.make_action(text, lambda s=separator: self.set_decimal(s)))
        self.below_highest_action = self.make_action(
            "Treat readings below different detection &limits as below the highest",
            lambda: self.set_mixed_limits("below-highest" if self.below_highest_action.isChecked() else "ask"),
            tip="When readings are written below different limits (<0.05, <0.10), count them all, and any "
                "measured reading under the highest limit, as below the highest limit.")
        self.below_highest_action.setCheckable(True)
        edit.addAction(self.below_highest_action)

        question_menu = bar.addMenu("&Question")
        from rankwise.ui.question_panel import QUESTION_OPTIONS

        for number, option in enumerate(QUESTION_OPTIONS, start=1):
            question_menu.addAction(self.make_action(option.text, lambda key=option.key: self.choose_question(key),
                                                     f"Ctrl+{number}"))
        question_menu.addSeparator()
        self.stop_action = self.make_action("&Stop the calculation", self.runner.cancel, "Esc")
        self.stop_action.setEnabled(False)
        question_menu.addAction(self.stop_action)

        record_menu = bar.addMenu("&Record")
        for action in self.records.menu_actions():
            record_menu.addAction(action) if action is not None else record_menu.addSeparator()

        help_menu = bar.addMenu("&Help")
        help_menu.addAction(self.make_action("Open the &demo readings", self.open_demo, None,
                                         "Surface roughness from two grinding wheels (invented data)."))
        help_menu.addAction(self.make_action("&About Rankwise", self._show_about))

    def _fill_recent_menu(self) -> None:
        self.recent_menu.clear()
        files = recent_files()
        if not files:
            self.recent_menu.addAction("(no files opened yet)").setEnabled(False)
        for path in files:
            self.recent_menu.addAction(str(path), lambda p=path: self.open_path(p, show_dialog=True))
        if files:
            self.recent_menu.addSeparator()
            self.recent_menu.addAction("Clear this list", forget_all)

    def _show_about(self) -> None:
        dialogs.show_message(
            self, "About Rankwise",
            f"Rankwise {rankwise.__version__}: decide and record whether a production change moved a "
            "measured characteristic, with rank-based tests (Mann-Whitney U, Wilcoxon signed-rank, "
            "Kruskal-Wallis).",
        )
