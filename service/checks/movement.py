"""Checks: movement (being built)."""
