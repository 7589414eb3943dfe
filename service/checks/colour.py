"""Checks: colour (being built)."""
