"""The archive's schema migrations (Alembic), run from code: no ``alembic.ini`` is needed.

``upgrade`` brings a database to the newest revision under an exclusive lock, so two processes
starting at once cannot both create the schema: on SQLite the migration runs inside
``BEGIN IMMEDIATE`` (the database's write lock, taken before anything is read), on PostgreSQL
inside a transaction holding ``pg_advisory_xact_lock`` (PostgreSQL's DDL is transactional, so a
failed migration leaves nothing behind). The second process waits, then finds the schema at head
and does nothing. Other databases migrate without a lock.

The revisions live in ``migrations/versions`` (shipped as package data). A revision is a frozen
record of the schema at that step: it never imports the model classes, and a test compares the
migrated database with ``db.Base.metadata``, so a model change without a revision fails. To draft
the next one from a model change (then read and edit it; name the file ``rNNNN_<what>.py``)::

    python -c "from alembic import command; from service.archive import migrate; \
    command.revision(migrate.config(url='sqlite:///var/plumbline.db'), 'what changed', \
    autogenerate=True, rev_id='0002')"
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from contextlib import contextmanager
from pathlib import Path

from alembic import command
from alembic.config import Config
from alembic.migration import MigrationContext
from alembic.script import ScriptDirectory
from alembic.util import CommandError
from sqlalchemy import Connection, text
from sqlalchemy.engine import Engine

from service.errors import PlumblineError

MIGRATIONS = Path(__file__).with_name("migrations")

LOCK_KEY = 0x504C_4D49_4752  # any constant bigint; ASCII "PLMIGR": Plumbline's migration lock
"""The PostgreSQL advisory lock that serialises migrations of one database."""


class SchemaMismatch(PlumblineError):
    """The database's schema revision is one this version of Plumbline does not know."""

    code = "schema_mismatch"


def config(connection: Connection | None = None, *, url: str | None = None) -> Config:
    """An Alembic configuration built in code, bound to an open connection (or a URL)."""
    cfg = Config()
    cfg.set_main_option("script_location", str(MIGRATIONS))
    if url is not None:
        cfg.set_main_option("sqlalchemy.url", url.replace("%", "%%"))
    if connection is not None:
        cfg.attributes["connection"] = connection
    return cfg


def head() -> str:
    """The newest revision this version of Plumbline ships."""
    revision = ScriptDirectory.from_config(config()).get_current_head()
    assert revision is not None
    return revision


def current(engine: Engine) -> str | None:
    """The database's revision, ``None`` for a database never migrated."""
    with engine.connect() as connection:
        return MigrationContext.configure(connection).get_current_revision()


def upgrade(engine: Engine, revision: str = "head") -> None:
    """Migrate the database up to ``revision``; harmless when it is there already."""
    with locked(engine) as connection:
        _run(lambda: command.upgrade(config(connection), revision), engine)


def downgrade(engine: Engine, revision: str) -> None:
    """Migrate the database down to ``revision`` (``"base"``: an empty database)."""
    with locked(engine) as connection:
        _run(lambda: command.downgrade(config(connection), revision), engine)


@contextmanager
def locked(engine: Engine) -> Iterator[Connection]:
    """A connection in a transaction that holds the database's migration lock; committed when
    the block ends, rolled back if it raises."""
    with engine.connect() as connection:
        if engine.dialect.name == "sqlite":
            # The sqlite3 module starts no transaction before DDL; begin one that takes the write
            # lock now. A second writer waits for it (the driver's busy timeout, 5 s by default).
            connection.exec_driver_sql("BEGIN IMMEDIATE")
        elif engine.dialect.name == "postgresql":
            connection.execute(text("SELECT pg_advisory_xact_lock(:key)"), {"key": LOCK_KEY})
        yield connection
        connection.commit()


def _run(step: Callable[[], None], engine: Engine) -> None:
    try:
        step()
    except CommandError as exc:
        where = engine.url.render_as_string(hide_password=True)
        raise SchemaMismatch(
            f"the archive database {where} cannot be migrated: {exc}; it was probably written by "
            "a newer version of Plumbline: run that version, or restore a backup of the database"
        ) from exc
