"""Checks: series (being built)."""
