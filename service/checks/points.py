"""Checks: points (being built)."""
