"""Checks: uncertainty (being built)."""
