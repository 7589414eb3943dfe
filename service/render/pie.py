"""Drawers: pie (being built)."""
