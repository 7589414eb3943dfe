"""Checks: estimates (being built)."""
