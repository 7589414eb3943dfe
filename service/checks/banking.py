"""Checks: banking (being built)."""
