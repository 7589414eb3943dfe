"""Checks: layout (being built)."""
