"""Server-side review sessions.

- ``sessions``: a signed-in review session, found by the SHA-256 of the id its cookie carries,
  ended at sign-out, when its key is revoked, or at its expiry.

A key is still found by its id, the non-secret part of the secret before the dot, so no column is
needed for that: keys issued before this revision keep working unchanged.

Revision ID: 0003
Revises: 0002
Create Date: 2026-12-03
"""

from __future__ import annotations

import sqlalchemy as sa
from alembic import op

revision = "0003"
down_revision = "0002"
branch_labels = None
depends_on = None


def upgrade() -> None:
    op.create_table(
        "sessions",
        sa.Column("id", sa.String(length=64), nullable=False),
        sa.Column("key_id", sa.String(length=40), nullable=False),
        sa.Column("created_at", sa.DateTime(timezone=True), nullable=False),
        sa.Column("expires_at", sa.DateTime(timezone=True), nullable=False),
        sa.Column("ended_at", sa.DateTime(timezone=True), nullable=True),
        sa.PrimaryKeyConstraint("id"),
    )
    op.create_index("ix_sessions_key_id", "sessions", ["key_id"])


def downgrade() -> None:
    op.drop_index("ix_sessions_key_id", table_name="sessions")
    op.drop_table("sessions")
