"""Drawers: distribution (being built)."""
