"""Intent `relative_change` (being built)."""
