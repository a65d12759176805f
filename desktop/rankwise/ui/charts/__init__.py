"""Charts of readings and results (pyqtgraph): each widget has ``show_result(result, analysis)`` and ``clear()``."""

from rankwise.ui.charts.cumulative_share import CumulativeSharePlot
from rankwise.ui.charts.dot_plot import ReadingsDotPlot
from rankwise.ui.charts.null_distribution import NullDistributionPlot
from rankwise.ui.charts.power_curve import PowerCurvePlot

__all__ = ["CumulativeSharePlot", "NullDistributionPlot", "PowerCurvePlot", "ReadingsDotPlot"]
