"""Drawers: panels (being built)."""
