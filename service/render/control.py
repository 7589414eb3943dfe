"""Drawers: control (being built)."""
