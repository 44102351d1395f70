"""Constants, unit conversion, error classes and validity ranges shared by every layer."""
