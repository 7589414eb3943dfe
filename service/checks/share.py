"""Checks: share (being built)."""
