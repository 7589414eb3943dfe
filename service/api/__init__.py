"""The HTTP service (FastAPI). Knows the workflow; no other stage imports it."""
