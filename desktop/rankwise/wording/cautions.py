"""The cautions note that accompanies every verdict on screen and on paper."""

CAUTION_SHORT = (
    "This verdict supports, and does not replace, the plant's own procedures. For safety-critical "
    "or regulated characteristics, the control plan, the customer's requirements and the "
    "responsible engineer decide."
)
"""Shown under every verdict in the window, on the workbook's summary and on every printout."""
