"""Alembic's entry point for the archive's migrations, configured in code by ``migrate.config``.

Run by ``service.archive.migrate`` with an open connection in ``config.attributes`` (the caller
holds the transaction and the migration lock); a bare ``sqlalchemy.url`` is accepted too.
"""

from __future__ import annotations

from alembic import context
from sqlalchemy import Connection, create_engine

from service.archive.db import Base

config = context.config


def _migrate(connection: Connection) -> None:
    context.configure(
        connection=connection,
        target_metadata=Base.metadata,  # for autogenerate only; revisions never read it
        render_as_batch=connection.dialect.name == "sqlite",  # SQLite alters tables by copying
    )
    with context.begin_transaction():
        context.run_migrations()


given = config.attributes.get("connection")
if isinstance(given, Connection):
    _migrate(given)
else:
    engine = create_engine(config.get_main_option("sqlalchemy.url") or "")
    try:
        with engine.begin() as connection:
            _migrate(connection)
    finally:
        engine.dispose()
