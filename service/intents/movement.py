"""Intent `movement` (being built)."""
