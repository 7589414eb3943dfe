"""The throwaway PostgreSQL server of ``tests/postgres.py``, for the fault tests too."""

from __future__ import annotations

from postgres import Server, fresh_database, postgres_server

__all__ = ["Server", "fresh_database", "postgres_server"]
