"""Intent `share` (being built)."""
