"""Rankwise: decide and record whether a production change moved a measured characteristic."""

__version__ = "0.2.0"
