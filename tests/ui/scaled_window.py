"""Run in a child process with QT_SCALE_FACTOR=2 on a 2048 x 1400 offscreen screen: open the demo,
check the window (``layout_checks``), the open dialog and the many-characteristics window fit the screen, save screenshots, and print
what was found as JSON. The print preview at this scale is checked by ``test_print_preview_fit.py``."""

from __future__ import annotations

import json
import sys
import tempfile
import time
from pathlib import Path

from PySide6.QtCore import QTimer
from PySide6.QtWidgets import QApplication

sys.path.insert(0, str(Path(__file__).resolve().parent))
from layout_checks import window_problems  # noqa: E402


def _inside(screen_rect, rect) -> bool:
    return screen_rect.contains(rect.topLeft()) and screen_rect.contains(rect.bottomRight())


def main(shots: Path) -> int:
    app = QApplication(sys.argv[:1])
    from rankwise.readings import open_characteristics, open_readings
    from rankwise.ui.characteristics_dialog import CharacteristicsChoice
    from rankwise.ui.characteristics_window import CharacteristicsWindow
    from rankwise.ui.main_window import MainWindow
    from rankwise.ui.open_dialog import OpenReadingsDialog
    from rankwise.ui.recovery import RecoveryFile

    report: dict[str, object] = {"scale": app.primaryScreen().devicePixelRatio()}
    window = MainWindow(recovery=RecoveryFile(Path(tempfile.mkdtemp()) / "recovery.json"))
    window.show()
    window.open_demo()
    free = window.screen().availableGeometry()

    def check() -> None:
        if window.runner.busy or window.last_result is None:
            QTimer.singleShot(100, check)
            return
        app.processEvents()
        report["window_inside_screen"] = _inside(free, window.frameGeometry())
        report["window_problems"] = window_problems(window)
        window.grab().save(str(shots / "window-200-percent.png"))
        demo = Path(window.source_path)
        dialog = OpenReadingsDialog(window, demo, open_readings(demo))
        dialog.show()
        app.processEvents()
        button = dialog.load_button
        corner = button.mapToGlobal(button.rect().bottomRight())
        report["dialog_inside_screen"] = _inside(free, dialog.frameGeometry()) and free.contains(corner)
        dialog.grab().save(str(shots / "open-dialog-200-percent.png"))
        dialog.reject()
        housing = demo.parent / "housing_two_dies.csv"
        table = open_characteristics(housing)
        summary = CharacteristicsWindow(window, table, CharacteristicsChoice(
            table.processes[0], table.processes[1], tuple(c.name for c in table.characteristics), "holm"))
        summary.show()
        waited = time.monotonic()
        while summary.result is None and time.monotonic() - waited < 120:  # the comparison, on its worker
            app.processEvents()
            time.sleep(0.01)
        report["characteristics_compared"] = summary.result is not None
        app.processEvents()
        report["characteristics_inside_screen"] = _inside(free, summary.frameGeometry())
        report["characteristics_texts_cut"] = [
            label.text()[:40] for label in (summary.headline, summary.sentences, summary.caution)
            if label.height() < label.heightForWidth(label.width())]
        summary.grab().save(str(shots / "characteristics-200-percent.png"))
        summary.stop()
        summary.reject()
        print(json.dumps(report))
        app.quit()

    QTimer.singleShot(0, check)
    app.exec()
    return 0


if __name__ == "__main__":
    raise SystemExit(main(Path(sys.argv[1])))
