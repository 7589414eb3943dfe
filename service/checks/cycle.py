"""Checks: cycle (being built)."""
