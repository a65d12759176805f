"""The window: PySide6 widgets, the grid's table model, charts, dialogs and printing."""
