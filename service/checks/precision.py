"""Checks: precision (being built)."""
