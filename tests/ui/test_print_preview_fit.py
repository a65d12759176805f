"""The print preview of the one-page verdict, on a 1024 x 700 shop-floor screen and at 200 % scaling
(2048 x 1400 at QT_SCALE_FACTOR=2): it opens inside the screen, every tool of its toolbar shows (none
behind the overflow arrow), and the whole page is in view with the "fit page" zoom.

Each screen runs in a child process (the scale is fixed when Qt starts): this file is also that
child. The window's own Print preview command builds the dialog; only ``dialogs.show_print_preview``
is replaced, by a function that shows the same dialog without waiting for it to close.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys
import tempfile
from pathlib import Path

import pytest

SCREENS = {"1024x700": (1024, 700, "1"), "200-percent": (2048, 1400, "2")}


def _screen_config(folder: Path, width: int, height: int) -> Path:
    config = folder / "screen.json"
    config.write_text(json.dumps({"synchronousWindowSystemEvents": False, "windowFrameMargins": False,
                                  "screens": [{"name": "shop-floor", "x": 0, "y": 0, "width": width,
                                               "height": height, "logicalDpi": 96, "logicalBaseDpi": 96,
                                               "dpr": 1}]}), encoding="utf-8")
    return config


@pytest.mark.parametrize("screen", list(SCREENS))
def test_the_print_preview_fits_the_screen_shows_its_whole_toolbar_and_the_whole_page(tmp_path, screen):
    from window_support import SCREENSHOTS

    width, height, scale = SCREENS[screen]
    SCREENSHOTS.mkdir(parents=True, exist_ok=True)
    environment = dict(os.environ, QT_SCALE_FACTOR=scale,
                       QT_QPA_PLATFORM=f"offscreen:configfile={_screen_config(tmp_path, width, height)}",
                       PYTHONPATH=os.pathsep.join(sys.path),
                       PYTHONFAULTHANDLER="1")  # a crash of the child prints where it happened (seen once, at 200 %)
    finished = subprocess.run([sys.executable, __file__, str(SCREENSHOTS / f"print-preview-{screen}.png")],
                              env=environment, capture_output=True, text=True, timeout=300)
    assert finished.returncode == 0, finished.stderr
    report = json.loads(finished.stdout.strip().splitlines()[-1])
    assert report["scale"] == float(scale)
    assert report["inside_screen"], report
    assert report["hidden_tools"] == [] and not report["overflow_arrow"], report
    assert report["zoom_mode"] == "FitInView" and report["fit_page_checked"], report
    assert report["page_in_view"], report


def _child(picture: Path) -> int:
    """Open the demo, ask for the print preview, and report what the preview looks like as JSON."""
    from PySide6.QtCore import QRect, QTimer
    from PySide6.QtGui import QAction
    from PySide6.QtPrintSupport import QPrintPreviewWidget
    from PySide6.QtWidgets import QApplication, QGraphicsView, QToolBar, QToolButton

    app = QApplication(sys.argv[:1])
    from rankwise.ui import dialogs
    from rankwise.ui.main_window import MainWindow
    from rankwise.ui.recovery import RecoveryFile

    report: dict[str, object] = {"scale": app.primaryScreen().devicePixelRatio()}
    window = MainWindow(recovery=RecoveryFile(Path(tempfile.mkdtemp()) / "recovery.json"))
    shown: list = []

    def show_without_waiting(parent, printer, paint) -> None:
        preview = dialogs.print_preview_dialog(parent, printer, paint)
        preview.show()
        shown.append((preview, printer, paint))  # the printer lives as long as the preview (exec() would keep it)

    dialogs.show_print_preview = show_without_waiting
    window.show()
    window.open_demo()

    def ask_for_preview() -> None:
        if window.runner.busy or window.last_result is None:
            QTimer.singleShot(100, ask_for_preview)
            return
        window.records.print_preview_action.trigger()
        QTimer.singleShot(0, look)

    def look(tries: list[int] = [0]) -> None:  # noqa: B006 - counts the looks
        preview = shown[0][0]
        page = preview.findChild(QPrintPreviewWidget)
        view = page.findChild(QGraphicsView)
        if (page.pageCount() < 1 or not view.isVisible()) and tries[0] < 600:
            tries[0] += 1
            QTimer.singleShot(100, look)
            return
        app.processEvents()
        free = preview.screen().availableGeometry()
        report["inside_screen"] = free.contains(preview.frameGeometry())
        toolbar = preview.findChild(QToolBar)
        inside = toolbar.rect()
        hidden = []
        for action in toolbar.actions():
            if action.isSeparator() or not action.isVisible():
                continue
            tool = toolbar.widgetForAction(action)
            if tool is None or not tool.isVisible() or not inside.contains(QRect(tool.mapTo(toolbar, tool.rect().topLeft()), tool.size())):
                hidden.append(action.objectName() or action.text() or type(tool).__name__)
        report["hidden_tools"] = hidden
        report["overflow_arrow"] = any(button.objectName() == "qt_toolbar_ext_button" and button.isVisible()
                                       for button in toolbar.findChildren(QToolButton))
        report["zoom_mode"] = page.zoomMode().name
        fit_page = next(action for action in preview.findChildren(QAction) if action.objectName() == "fitPageAction")
        report["fit_page_checked"] = fit_page.isChecked()
        scene_page = view.scene().itemsBoundingRect()
        report["page_in_view"] = view.viewport().rect().contains(view.mapFromScene(scene_page).boundingRect().adjusted(8, 8, -8, -8))
        preview.grab().scaled(preview.size()).save(str(picture))
        print(json.dumps(report))
        preview.close()
        app.quit()

    QTimer.singleShot(0, ask_for_preview)
    app.exec()
    return 0


if __name__ == "__main__":
    raise SystemExit(_child(Path(sys.argv[1])))
