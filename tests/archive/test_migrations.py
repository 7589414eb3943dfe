"""The archive's migrations on a real SQLite file and a real PostgreSQL server: an empty database
reaches head with exactly the schema the models describe, downgrades to nothing and back, and
``connect()`` is harmless when repeated or run by several processes at once."""

from __future__ import annotations

import json
import subprocess
import sys
import threading
import time
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import pytest
from alembic.autogenerate import compare_metadata
from alembic.migration import MigrationContext
from sqlalchemy import (
    Column,
    Engine,
    MetaData,
    String,
    Table,
    create_engine,
    inspect,
    select,
    text,
)

from service.archive import migrate
from service.archive.db import Base, KeyRow, connect, engine_of, now
from service.workflow import keys
from service.workflow.keys import Role

REPO = Path(__file__).resolve().parents[2]
TABLES = {
    "packs",
    "keys",
    "reviews",
    "waivers",
    "seals",
    "idempotency",
    "jobs",
    "audit",
    "sessions",
    "persons",
}


@pytest.fixture
def engine(database_url: str) -> Iterator[Engine]:
    made = create_engine(database_url)
    yield made
    made.dispose()


def drift(engine: Engine, metadata: MetaData = Base.metadata) -> list[Any]:
    """What Alembic's autogenerate would change to make the database match ``metadata``."""
    with engine.connect() as connection:
        context = MigrationContext.configure(
            connection, opts={"compare_type": True, "compare_server_default": True}
        )
        return list(compare_metadata(context, metadata))


def tables(engine: Engine) -> set[str]:
    return set(inspect(engine).get_table_names()) - {"alembic_version"}


def triggers(engine: Engine) -> set[str]:
    with engine.connect() as connection:
        if engine.dialect.name == "sqlite":
            query = "SELECT name FROM sqlite_master WHERE type = 'trigger'"
        else:
            query = "SELECT tgname FROM pg_trigger WHERE NOT tgisinternal"
        return set(connection.scalars(text(query)))


def expected_triggers(engine: Engine) -> set[str]:
    verbs = ["update", "delete"] + (["truncate"] if engine.dialect.name == "postgresql" else [])
    return {f"audit_no_{verb}" for verb in verbs}


def test_an_empty_database_migrates_to_exactly_the_models(engine: Engine) -> None:
    assert migrate.current(engine) is None
    migrate.upgrade(engine)
    assert migrate.current(engine) == migrate.head() == "0004"
    assert tables(engine) == TABLES
    assert drift(engine) == []
    assert triggers(engine) == expected_triggers(engine)


def test_the_comparison_would_catch_a_model_change_without_a_migration(engine: Engine) -> None:
    """The empty drift above is not vacuous: a column added to a model only is reported."""
    migrate.upgrade(engine)
    changed = MetaData()
    for table in Base.metadata.sorted_tables:
        table.to_metadata(changed)
    changed.tables["packs"].append_column(Column("owner", String(200), nullable=True))
    differences = drift(engine, changed)
    assert [(d[0], d[2], d[3].name) for d in differences] == [("add_column", "packs", "owner")]


def test_downgrade_to_base_and_upgrade_again(engine: Engine) -> None:
    migrate.upgrade(engine)
    migrate.downgrade(engine, "base")
    assert migrate.current(engine) is None
    assert tables(engine) == set()
    assert triggers(engine) == set()
    if engine.dialect.name == "postgresql":
        with engine.connect() as connection:
            left = connection.scalar(
                text("SELECT count(*) FROM pg_proc WHERE proname = 'audit_append_only'")
            )
        assert left == 0
    migrate.upgrade(engine)
    assert migrate.current(engine) == migrate.head()
    assert drift(engine) == []
    assert triggers(engine) == expected_triggers(engine)


def test_connect_twice_keeps_the_data_and_one_version_row(database_url: str) -> None:
    first = connect(database_url)
    key_id, _ = keys.create(
        first, name="Ines Operator", roles={Role.author}, families={"hollin-vale"}, expires=None
    )
    second = connect(database_url)
    with second() as session:
        assert session.scalars(select(KeyRow.id)).all() == [key_id]
        versions = session.scalars(text("SELECT version_num FROM alembic_version")).all()
    assert versions == [migrate.head()]
    for factory in (first, second):
        engine_of(factory).dispose()


CHILD = """
import sys
from service.archive import db, migrate
print("ready", flush=True)
sys.stdin.readline()
db.engine_of(db.connect(sys.argv[1])).dispose()
"""


@pytest.mark.parametrize("attempt", range(2))
def test_processes_starting_at_once_migrate_once(
    database_url: str, engine: Engine, attempt: int
) -> None:
    """Four processes import everything, say so, and are then told to ``connect()`` at once."""
    children = [
        subprocess.Popen(
            [sys.executable, "-c", CHILD, database_url],
            cwd=REPO,
            stdin=subprocess.PIPE,
            stdout=subprocess.PIPE,
            stderr=subprocess.PIPE,
            text=True,
        )
        for _ in range(4)
    ]
    for child in children:
        assert child.stdout is not None
        assert child.stdout.readline() == "ready\n"
    for child in children:
        assert child.stdin is not None
        child.stdin.write("go\n")
        child.stdin.flush()
    outcomes = [child.communicate(timeout=60)[1] for child in children]
    assert outcomes == [""] * 4
    assert [child.returncode for child in children] == [0] * 4
    assert migrate.current(engine) == migrate.head()
    assert drift(engine) == []
    assert triggers(engine) == expected_triggers(engine)


def test_connect_waits_for_a_migration_in_progress(database_url: str) -> None:
    engine = engine_of(connect(database_url))
    finished: list[float] = []

    def open_archive() -> None:
        engine_of(connect(database_url)).dispose()
        finished.append(time.monotonic())

    with migrate.locked(engine):  # another process's migration, as far as connect() can tell
        waiter = threading.Thread(target=open_archive)
        waiter.start()
        waiter.join(timeout=1.0)
        assert waiter.is_alive()
        assert finished == []
        released = time.monotonic()
    waiter.join(timeout=10)
    engine.dispose()
    assert len(finished) == 1
    assert finished[0] >= released


def test_a_database_from_before_migrations_is_adopted(engine: Engine, database_url: str) -> None:
    """A database made by ``create_all`` of the first five tables (the archive before seals and
    idempotency existed) keeps its rows and gains the missing tables and the triggers."""
    early = [Base.metadata.tables[name] for name in ("packs", "reviews", "waivers", "audit")]
    keys_now = Base.metadata.tables["keys"]  # the keys table then had no person_id
    columns = (c._copy() for c in keys_now.columns if c.name != "person_id")
    Table("keys", MetaData(), *columns).create(engine)
    Base.metadata.create_all(engine, tables=early)
    with engine.begin() as connection:
        connection.execute(
            text(
                "INSERT INTO audit (seq, at, name, action, detail) "
                "VALUES (1, :at, 'command line', 'key.created', '{}')"
            ),
            {"at": now()},
        )
    sessions = connect(database_url)
    engine_of(sessions).dispose()
    assert migrate.current(engine) == migrate.head()
    assert tables(engine) == TABLES
    assert drift(engine) == []
    assert triggers(engine) == expected_triggers(engine)
    with engine.connect() as connection:
        assert connection.scalar(text("SELECT action FROM audit")) == "key.created"


def test_a_database_from_a_newer_version_is_refused_clearly(
    engine: Engine, database_url: str
) -> None:
    migrate.upgrade(engine)
    with engine.begin() as connection:
        connection.execute(text("UPDATE alembic_version SET version_num = '0999'"))
    with pytest.raises(migrate.SchemaMismatch, match="newer version of Plumbline") as caught:
        connect(database_url)
    assert "0999" in caught.value.message
    assert caught.value.status == 500


def test_existing_keys_and_authors_gain_persons(engine: Engine) -> None:
    """Each key made before persons gets a person; keys whose names were equal ignoring case
    (until then "the same person") share one, and recorded authors gain their key's person."""
    migrate.upgrade(engine, "0003")
    key = (
        "INSERT INTO keys (id, name, roles, families, kdf, salt, secret_hash, created_at) "
        "VALUES (:id, :name, '[]', '[]', 'k', 's', 'h', :at)"
    )
    pack = (
        "INSERT INTO packs (id, report_id, title, period, as_of, status, blocked, summary, "
        "results, unused_waivers, definition_sha256, pdf_sha256, pdf_bytes, created_at) VALUES "
        "('pk_1', 'r', 't', 'p', 'a', 'draft', false, '{}', '[]', '[]', 'd', 'p', 1, :at)"
    )
    authors = '[{"key_id": "key_ann", "name": "Ann Author"}, {"key_id": "key_ann2", "name": "ann author"}]'
    with engine.begin() as connection:
        for key_id, name in [
            ("key_ann", "Ann Author"),
            ("key_ann2", "ann author"),
            ("key_rui", "Rui"),
        ]:
            connection.execute(text(key), {"id": key_id, "name": name, "at": now()})
        connection.execute(text(pack), {"at": now()})
        connection.execute(
            text("INSERT INTO reviews (pack_id, authors) VALUES ('pk_1', :authors)"),
            {"authors": authors},
        )
    migrate.upgrade(engine)
    assert drift(engine) == []
    with engine.connect() as connection:
        person = dict(connection.execute(text("SELECT id, person_id FROM keys")).all())
        names = dict(connection.execute(text("SELECT id, name FROM persons")).all())
        recorded = connection.scalar(text("SELECT authors FROM reviews"))
    assert person["key_ann"] == person["key_ann2"] != person["key_rui"]
    assert names == {person["key_ann"]: "Ann Author", person["key_rui"]: "Rui"}
    recorded = json.loads(recorded) if isinstance(recorded, str) else recorded
    assert [a["person_id"] for a in recorded] == [person["key_ann"]] * 2
    migrate.downgrade(engine, "0003")
    with engine.connect() as connection:
        recorded = connection.scalar(text("SELECT authors FROM reviews"))
    recorded = json.loads(recorded) if isinstance(recorded, str) else recorded
    assert recorded == json.loads(authors)
