"""Intent `distribution` (being built)."""
