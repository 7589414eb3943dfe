"""Checks: distribution (being built)."""
