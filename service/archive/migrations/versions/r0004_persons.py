"""Persons: every key belongs to a person, and separation of duties compares persons.

- ``persons``: one row per person who holds keys.
- ``keys.person_id``: the key's person (not null; several keys may share one).
- ``reviews.authors``: each author entry gains the ``person_id`` of its key.

Existing keys get one person each, except that keys whose names were equal ignoring case (the
rule that decided "the same person" until this revision) share one, so a pack's author is still
refused wherever the old rule refused them.

Revision ID: 0004
Revises: 0003
Create Date: 2026-12-03
"""

from __future__ import annotations

import uuid
from datetime import UTC, datetime
from typing import Any

import sqlalchemy as sa
from alembic import op

revision = "0004"
down_revision = "0003"
branch_labels = None
depends_on = None

persons = sa.table(
    "persons",
    sa.column("id", sa.String()),
    sa.column("name", sa.String()),
    sa.column("created_at", sa.DateTime(timezone=True)),
)
keys = sa.table(
    "keys",
    sa.column("id", sa.String()),
    sa.column("name", sa.String()),
    sa.column("created_at", sa.DateTime(timezone=True)),
    sa.column("person_id", sa.String()),
)
reviews = sa.table("reviews", sa.column("pack_id", sa.String()), sa.column("authors", sa.JSON()))


def upgrade() -> None:
    op.create_table(
        "persons",
        sa.Column("id", sa.String(length=40), nullable=False),
        sa.Column("name", sa.String(length=200), nullable=False),
        sa.Column("created_at", sa.DateTime(timezone=True), nullable=False),
        sa.PrimaryKeyConstraint("id"),
    )
    with op.batch_alter_table("keys") as batch:
        batch.add_column(sa.Column("person_id", sa.String(length=40), nullable=True))
    person_of = _persons_for_existing_keys(op.get_bind())
    _authors_with_persons(op.get_bind(), person_of)
    with op.batch_alter_table("keys") as batch:
        batch.alter_column("person_id", existing_type=sa.String(length=40), nullable=False)
        batch.create_index("ix_keys_person_id", ["person_id"])
        batch.create_foreign_key("fk_keys_person_id_persons", "persons", ["person_id"], ["id"])


def _persons_for_existing_keys(connection: sa.Connection) -> dict[str, str]:
    person_of: dict[str, str] = {}
    by_name: dict[str, str] = {}
    rows = connection.execute(sa.select(keys.c.id, keys.c.name, keys.c.created_at))
    for key_id, name, created_at in sorted(rows, key=lambda r: (str(r[2]), r[0])):
        folded = name.casefold()
        if folded not in by_name:
            by_name[folded] = f"person_{uuid.uuid4().hex[:16]}"
            at = created_at if created_at is not None else datetime.now(UTC)
            connection.execute(
                persons.insert().values(id=by_name[folded], name=name, created_at=at)
            )
        person_of[key_id] = by_name[folded]
        statement = keys.update().where(keys.c.id == key_id).values(person_id=by_name[folded])
        connection.execute(statement)
    return person_of


def _authors_with_persons(connection: sa.Connection, person_of: dict[str, str]) -> None:
    for pack_id, authors in connection.execute(sa.select(reviews.c.pack_id, reviews.c.authors)):
        changed: list[dict[str, Any]] = [
            a | {"person_id": person_of.get(a["key_id"], a["key_id"])} for a in authors or []
        ]
        statement = reviews.update().where(reviews.c.pack_id == pack_id).values(authors=changed)
        connection.execute(statement)


def downgrade() -> None:
    connection = op.get_bind()
    for pack_id, authors in connection.execute(sa.select(reviews.c.pack_id, reviews.c.authors)):
        plain = [{k: v for k, v in a.items() if k != "person_id"} for a in authors or []]
        connection.execute(
            reviews.update().where(reviews.c.pack_id == pack_id).values(authors=plain)
        )
    with op.batch_alter_table("keys") as batch:
        batch.drop_constraint("fk_keys_person_id_persons", type_="foreignkey")
        batch.drop_index("ix_keys_person_id")
        batch.drop_column("person_id")
    op.drop_table("persons")
