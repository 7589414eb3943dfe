"""Intent `relationship` (being built)."""
