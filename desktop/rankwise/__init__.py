"""Rankwise: decide and record whether a production change moved a measured characteristic."""

__version__ = "0.1.0"
