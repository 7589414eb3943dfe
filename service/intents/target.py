"""Intent `target` (being built)."""
