"""Readings: the Qt-free model of groups and cells, value parsing, and opening CSV/XLSX exports."""
