"""Drawers: scatter (being built)."""
