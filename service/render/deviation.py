"""Drawers: deviation (being built)."""
