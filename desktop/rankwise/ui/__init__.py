"""The window: PySide6 widgets, the grid's table model, charts, dialogs and printing."""

__all__ = ["MainWindow"]


def __getattr__(name: str):
    """``rankwise.ui.MainWindow``, imported on first use so that ``rankwise.ui.printing`` stays light."""
    if name == "MainWindow":
        from rankwise.ui.main_window import MainWindow

        return MainWindow
    raise AttributeError(f"module 'rankwise.ui' has no attribute {name!r}")
