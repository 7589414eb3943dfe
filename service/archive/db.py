"""The archive database (SQLAlchemy 2): SQLite by default, any SQLAlchemy URL by configuration.

Only metadata lives here; PDF and definition bytes live in the content-addressed file store and are
referenced by their SHA-256, so a row never claims a file that was not written first.
"""

from __future__ import annotations

from datetime import UTC, datetime
from typing import Any

from sqlalchemy import (
    JSON,
    Boolean,
    DateTime,
    ForeignKey,
    Integer,
    String,
    UniqueConstraint,
    create_engine,
    event,
    select,
)
from sqlalchemy.engine import Engine
from sqlalchemy.orm import DeclarativeBase, Mapped, Session, mapped_column, sessionmaker


class Base(DeclarativeBase):
    pass


class PackRow(Base):
    __tablename__ = "packs"

    id: Mapped[str] = mapped_column(String(40), primary_key=True)
    report_id: Mapped[str] = mapped_column(String(64), index=True)
    title: Mapped[str] = mapped_column(String(400))
    period: Mapped[str] = mapped_column(String(400))
    as_of: Mapped[str] = mapped_column(String(40))
    status: Mapped[str] = mapped_column(String(20), index=True)
    blocked: Mapped[bool] = mapped_column(Boolean)
    summary: Mapped[dict[str, Any]] = mapped_column(JSON)
    results: Mapped[list[dict[str, Any]]] = mapped_column(JSON)
    unused_waivers: Mapped[list[str]] = mapped_column(JSON)
    definition_sha256: Mapped[str] = mapped_column(String(64))
    pdf_sha256: Mapped[str] = mapped_column(String(64))
    pdf_bytes: Mapped[int] = mapped_column(Integer)
    created_at: Mapped[datetime] = mapped_column(DateTime(timezone=True))


def now() -> datetime:
    return datetime.now(UTC)


def connect(url: str) -> sessionmaker[Any]:
    """An engine and session factory; the schema is created if missing."""
    engine = create_engine(url, future=True)
    if engine.dialect.name == "sqlite":
        event.listen(engine, "connect", _sqlite_pragmas)
    Base.metadata.create_all(engine)
    return sessionmaker(engine, expire_on_commit=False)


def _sqlite_pragmas(connection: Any, _record: Any) -> None:
    cursor = connection.cursor()
    cursor.execute("PRAGMA journal_mode=WAL")
    cursor.execute("PRAGMA synchronous=FULL")  # a signed-off record must survive power loss
    cursor.execute("PRAGMA foreign_keys=ON")
    cursor.close()


def engine_of(factory: sessionmaker[Any]) -> Engine:
    bind = factory.kw["bind"]
    assert isinstance(bind, Engine)
    return bind


# --- review and sign-off workflow -------------------------------------------------------------
# Keys, reviews, waivers and the audit trail. A pack's lifecycle state stays in ``packs.status``
# (one source of truth; the API already shows it); ``reviews`` holds who authored, submitted and
# signed off which content hash.


class KeyRow(Base):
    """An API key: only a salted scrypt hash of its secret is stored."""

    __tablename__ = "keys"

    id: Mapped[str] = mapped_column(String(40), primary_key=True)
    name: Mapped[str] = mapped_column(String(200))
    roles: Mapped[list[str]] = mapped_column(JSON)
    families: Mapped[list[str]] = mapped_column(JSON)
    kdf: Mapped[str] = mapped_column(String(40))
    salt: Mapped[str] = mapped_column(String(64))
    secret_hash: Mapped[str] = mapped_column(String(128))
    created_at: Mapped[datetime] = mapped_column(DateTime(timezone=True))
    expires_at: Mapped[datetime | None] = mapped_column(DateTime(timezone=True), nullable=True)
    revoked_at: Mapped[datetime | None] = mapped_column(DateTime(timezone=True), nullable=True)


class ReviewRow(Base):
    """A pack's review: its authors, what was submitted, and who signed off which hash."""

    __tablename__ = "reviews"

    pack_id: Mapped[str] = mapped_column(ForeignKey("packs.id"), primary_key=True)
    authors: Mapped[list[dict[str, str]]] = mapped_column(JSON)
    """Every key that authored or submitted the pack: ``{"key_id": …, "name": …}``."""
    submitted_sha256: Mapped[str | None] = mapped_column(String(64), nullable=True)
    submitted_at: Mapped[datetime | None] = mapped_column(DateTime(timezone=True), nullable=True)
    signed_off_by: Mapped[str | None] = mapped_column(String(40), nullable=True)
    signed_off_name: Mapped[str | None] = mapped_column(String(200), nullable=True)
    signed_off_at: Mapped[datetime | None] = mapped_column(DateTime(timezone=True), nullable=True)
    signed_off_sha256: Mapped[str | None] = mapped_column(String(64), nullable=True)
    superseded_by: Mapped[str | None] = mapped_column(String(40), nullable=True)

    def is_author(self, key_id: str, name: str) -> bool:
        """The same key, or a key in the same person's name (one person holding two keys)."""
        folded = name.casefold()
        return any(a["key_id"] == key_id or a["name"].casefold() == folded for a in self.authors)

    def add_author(self, key_id: str, name: str) -> None:
        if not self.is_author(key_id, name):
            self.authors = [*self.authors, {"key_id": key_id, "name": name}]


class WaiverRow(Base):
    """A reviewer's waiver of one failed check on one chart of one exact draft (its PDF hash)."""

    __tablename__ = "waivers"
    __table_args__ = (UniqueConstraint("pack_id", "check", "chart", "pdf_sha256"),)

    id: Mapped[int] = mapped_column(Integer, primary_key=True, autoincrement=True)
    pack_id: Mapped[str] = mapped_column(ForeignKey("packs.id"), index=True)
    check: Mapped[str] = mapped_column(String(64))
    chart: Mapped[str] = mapped_column(String(64))
    pdf_sha256: Mapped[str] = mapped_column(String(64))
    reason: Mapped[str] = mapped_column(String(2000))
    by_key_id: Mapped[str] = mapped_column(String(40))
    by_name: Mapped[str] = mapped_column(String(200))
    at: Mapped[datetime] = mapped_column(DateTime(timezone=True))


class AuditRow(Base):
    """One append-only audit record; ``seq`` is assigned as max + 1 in the writer's transaction."""

    __tablename__ = "audit"

    seq: Mapped[int] = mapped_column(Integer, primary_key=True, autoincrement=False)
    at: Mapped[datetime] = mapped_column(DateTime(timezone=True))
    key_id: Mapped[str | None] = mapped_column(String(40), nullable=True)
    name: Mapped[str] = mapped_column(String(200))
    action: Mapped[str] = mapped_column(String(40))
    pack_id: Mapped[str | None] = mapped_column(String(40), index=True, nullable=True)
    content_hash: Mapped[str | None] = mapped_column(String(64), nullable=True)
    detail: Mapped[dict[str, Any]] = mapped_column(JSON)


@event.listens_for(AuditRow.__table__, "after_create")
def _append_only(_table: Any, connection: Any, **_kw: Any) -> None:
    """On SQLite the database itself refuses to rewrite or remove an audit record."""
    if connection.dialect.name != "sqlite":
        return
    for verb in ("UPDATE", "DELETE"):
        connection.exec_driver_sql(
            f"CREATE TRIGGER IF NOT EXISTS audit_no_{verb.lower()} BEFORE {verb} ON audit "
            "BEGIN SELECT RAISE(ABORT, 'the audit trail is append-only'); END"
        )


def utc(moment: datetime) -> datetime:
    """A stored time as an aware UTC time (SQLite hands back naive values)."""
    return moment.replace(tzinfo=UTC) if moment.tzinfo is None else moment.astimezone(UTC)


def review_of(session: Session, pack_id: str) -> ReviewRow:
    """The pack's review row, added to the session if it has none yet."""
    review = session.get(ReviewRow, pack_id)
    if review is None:
        review = ReviewRow(pack_id=pack_id, authors=[])
        session.add(review)
    return review


def failed_checks(row: PackRow) -> set[tuple[str, str]]:
    """``(check, chart)`` of every check that failed on the pack."""
    return {(r["check"], r["chart"]) for r in row.results if r["status"] == "failed"}


def waived_checks(session: Session, row: PackRow) -> set[tuple[str, str]]:
    """``(check, chart)`` waived on the pack's current PDF: a waiver of an earlier draft does not
    carry over to a rebuilt one."""
    rows = session.execute(
        select(WaiverRow.check, WaiverRow.chart).where(
            WaiverRow.pack_id == row.id, WaiverRow.pdf_sha256 == row.pdf_sha256
        )
    )
    return {(check, chart) for check, chart in rows}
