"""Checks: time_axis (being built)."""
