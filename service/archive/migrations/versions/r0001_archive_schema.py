"""The archive's first schema: packs, keys, reviews, waivers, seals, idempotency and the audit trail.

The audit trail is append-only in the database itself: on SQLite two triggers abort any UPDATE or
DELETE; on PostgreSQL one plpgsql function, fired before UPDATE, DELETE and TRUNCATE (once per
statement, so even a statement that matches no row is refused), raises ``restrict_violation``.

A database made by ``create_all`` before migrations existed is adopted: a table that is there
already is kept as it is, only missing tables (and the triggers) are created.

Revision ID: 0001
Revises:
Create Date: 2026-12-02
"""

from __future__ import annotations

import sqlalchemy as sa
from alembic import op

revision = "0001"
down_revision = None
branch_labels = None
depends_on = None

REFUSAL = "the audit trail is append-only"


def _packs() -> None:
    op.create_table(
        "packs",
        sa.Column("id", sa.String(length=40), nullable=False),
        sa.Column("report_id", sa.String(length=64), nullable=False),
        sa.Column("title", sa.String(length=400), nullable=False),
        sa.Column("period", sa.String(length=400), nullable=False),
        sa.Column("as_of", sa.String(length=40), nullable=False),
        sa.Column("status", sa.String(length=20), nullable=False),
        sa.Column("blocked", sa.Boolean(), nullable=False),
        sa.Column("summary", sa.JSON(), nullable=False),
        sa.Column("results", sa.JSON(), nullable=False),
        sa.Column("unused_waivers", sa.JSON(), nullable=False),
        sa.Column("definition_sha256", sa.String(length=64), nullable=False),
        sa.Column("pdf_sha256", sa.String(length=64), nullable=False),
        sa.Column("pdf_bytes", sa.Integer(), nullable=False),
        sa.Column("created_at", sa.DateTime(timezone=True), nullable=False),
        sa.PrimaryKeyConstraint("id"),
    )
    op.create_index("ix_packs_report_id", "packs", ["report_id"])
    op.create_index("ix_packs_status", "packs", ["status"])


def _keys() -> None:
    op.create_table(
        "keys",
        sa.Column("id", sa.String(length=40), nullable=False),
        sa.Column("name", sa.String(length=200), nullable=False),
        sa.Column("roles", sa.JSON(), nullable=False),
        sa.Column("families", sa.JSON(), nullable=False),
        sa.Column("kdf", sa.String(length=40), nullable=False),
        sa.Column("salt", sa.String(length=64), nullable=False),
        sa.Column("secret_hash", sa.String(length=128), nullable=False),
        sa.Column("created_at", sa.DateTime(timezone=True), nullable=False),
        sa.Column("expires_at", sa.DateTime(timezone=True), nullable=True),
        sa.Column("revoked_at", sa.DateTime(timezone=True), nullable=True),
        sa.PrimaryKeyConstraint("id"),
    )


def _reviews() -> None:
    op.create_table(
        "reviews",
        sa.Column("pack_id", sa.String(length=40), nullable=False),
        sa.Column("authors", sa.JSON(), nullable=False),
        sa.Column("submitted_sha256", sa.String(length=64), nullable=True),
        sa.Column("submitted_at", sa.DateTime(timezone=True), nullable=True),
        sa.Column("signed_off_by", sa.String(length=40), nullable=True),
        sa.Column("signed_off_name", sa.String(length=200), nullable=True),
        sa.Column("signed_off_at", sa.DateTime(timezone=True), nullable=True),
        sa.Column("signed_off_sha256", sa.String(length=64), nullable=True),
        sa.Column("superseded_by", sa.String(length=40), nullable=True),
        sa.ForeignKeyConstraint(["pack_id"], ["packs.id"]),
        sa.PrimaryKeyConstraint("pack_id"),
    )


def _waivers() -> None:
    op.create_table(
        "waivers",
        sa.Column("id", sa.Integer(), autoincrement=True, nullable=False),
        sa.Column("pack_id", sa.String(length=40), nullable=False),
        sa.Column("check", sa.String(length=64), nullable=False),
        sa.Column("chart", sa.String(length=64), nullable=False),
        sa.Column("pdf_sha256", sa.String(length=64), nullable=False),
        sa.Column("reason", sa.String(length=2000), nullable=False),
        sa.Column("by_key_id", sa.String(length=40), nullable=False),
        sa.Column("by_name", sa.String(length=200), nullable=False),
        sa.Column("at", sa.DateTime(timezone=True), nullable=False),
        sa.ForeignKeyConstraint(["pack_id"], ["packs.id"]),
        sa.PrimaryKeyConstraint("id"),
        sa.UniqueConstraint("pack_id", "check", "chart", "pdf_sha256"),
    )
    op.create_index("ix_waivers_pack_id", "waivers", ["pack_id"])


def _seals() -> None:
    op.create_table(
        "seals",
        sa.Column("pack_id", sa.String(length=40), nullable=False),
        sa.Column("sha256", sa.String(length=64), nullable=False),
        sa.Column("bytes", sa.Integer(), nullable=False),
        sa.Column("signer", sa.String(length=400), nullable=False),
        sa.Column("development_key", sa.Boolean(), nullable=False),
        sa.Column("pdfa", sa.JSON(), nullable=False),
        sa.Column("record", sa.JSON(), nullable=False),
        sa.Column("sealed_at", sa.DateTime(timezone=True), nullable=False),
        sa.ForeignKeyConstraint(["pack_id"], ["packs.id"]),
        sa.PrimaryKeyConstraint("pack_id"),
    )
    op.create_index("ix_seals_sha256", "seals", ["sha256"])


def _idempotency() -> None:
    op.create_table(
        "idempotency",
        sa.Column("key_id", sa.String(length=40), nullable=False),
        sa.Column("idempotency_key", sa.String(length=255), nullable=False),
        sa.Column("method", sa.String(length=10), nullable=False),
        sa.Column("path", sa.String(length=400), nullable=False),
        sa.Column("request_sha256", sa.String(length=64), nullable=False),
        sa.Column("status_code", sa.Integer(), nullable=False),
        sa.Column("body", sa.JSON(), nullable=False),
        sa.Column("location", sa.String(length=400), nullable=True),
        sa.Column("created_at", sa.DateTime(timezone=True), nullable=False),
        sa.PrimaryKeyConstraint("key_id", "idempotency_key"),
    )


def _audit() -> None:
    op.create_table(
        "audit",
        sa.Column("seq", sa.Integer(), autoincrement=False, nullable=False),
        sa.Column("at", sa.DateTime(timezone=True), nullable=False),
        sa.Column("key_id", sa.String(length=40), nullable=True),
        sa.Column("name", sa.String(length=200), nullable=False),
        sa.Column("action", sa.String(length=40), nullable=False),
        sa.Column("pack_id", sa.String(length=40), nullable=True),
        sa.Column("content_hash", sa.String(length=64), nullable=True),
        sa.Column("detail", sa.JSON(), nullable=False),
        sa.PrimaryKeyConstraint("seq"),
    )
    op.create_index("ix_audit_pack_id", "audit", ["pack_id"])


TABLES = {
    "packs": _packs,
    "keys": _keys,
    "reviews": _reviews,
    "waivers": _waivers,
    "seals": _seals,
    "idempotency": _idempotency,
    "audit": _audit,
}
"""Each table and how to create it, parents before the tables that refer to them."""

PG_FUNCTION = f"""
CREATE OR REPLACE FUNCTION audit_append_only() RETURNS trigger LANGUAGE plpgsql AS $body$
BEGIN
    RAISE EXCEPTION USING
        MESSAGE = '{REFUSAL}: ' || TG_OP || ' on audit is refused',
        ERRCODE = 'restrict_violation',
        HINT = 'correct a record by appending a new one';
END
$body$
"""


def upgrade() -> None:
    bind = op.get_bind()
    existing = set(sa.inspect(bind).get_table_names())
    for name, create in TABLES.items():
        if name not in existing:
            create()
    if bind.dialect.name == "sqlite":
        for verb in ("UPDATE", "DELETE"):
            op.execute(
                f"CREATE TRIGGER IF NOT EXISTS audit_no_{verb.lower()} BEFORE {verb} ON audit "
                f"BEGIN SELECT RAISE(ABORT, '{REFUSAL}'); END"
            )
    elif bind.dialect.name == "postgresql":
        op.execute(PG_FUNCTION)
        for verb in ("UPDATE", "DELETE", "TRUNCATE"):
            trigger = f"audit_no_{verb.lower()}"
            op.execute(f"DROP TRIGGER IF EXISTS {trigger} ON audit")
            op.execute(
                f"CREATE TRIGGER {trigger} BEFORE {verb} ON audit "
                "FOR EACH STATEMENT EXECUTE FUNCTION audit_append_only()"
            )


def downgrade() -> None:
    bind = op.get_bind()
    for name in reversed(TABLES):
        op.drop_table(name)  # its indexes and triggers go with it
    if bind.dialect.name == "postgresql":
        op.execute("DROP FUNCTION IF EXISTS audit_append_only()")
