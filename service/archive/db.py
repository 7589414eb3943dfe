"""The archive database (SQLAlchemy 2): SQLite by default, any SQLAlchemy URL by configuration.

Only metadata lives here; PDF and definition bytes live in the content-addressed file store and are
referenced by their SHA-256, so a row never claims a file that was not written first.

A database fault is answered as what it is, never as an internal error: a connection lost mid-way
(the server restarted, the backend was terminated, the network dropped) or a database too busy to
take the write lock raises :class:`DatabaseUnavailable` (503), a full disk under a SQLite file
raises :class:`service.archive.files.StorageFull` (507). Either way the transaction was rolled back
by the database, so nothing half-written is left and the same request can simply be sent again.
"""

from __future__ import annotations

import logging
from datetime import UTC, datetime
from pathlib import Path
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
from sqlalchemy.engine import Engine, ExceptionContext, make_url
from sqlalchemy.orm import DeclarativeBase, Mapped, Session, mapped_column, sessionmaker

from service import logs
from service.archive.files import StorageFull
from service.errors import PlumblineError

log = logging.getLogger("plumbline.archive")


class DatabaseUnavailable(PlumblineError):
    """The archive database cannot be used right now: the connection was lost or it is busy."""

    code = "database_unavailable"
    status = 503


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
    """An engine and session factory, the database migrated to the newest schema first.

    Safe to call from several processes at once: the migration takes the database's lock, and a
    database at the newest revision already is left as it is (``service.archive.migrate``).
    """
    from service.archive import migrate  # its Alembic env imports this module's models

    sqlite = make_url(url).get_backend_name() == "sqlite"
    # A server may drop idle connections (a restart, an idle timeout): test each one as it leaves
    # the pool, so only a connection lost in the middle of a request fails that request.
    engine = create_engine(url, future=True, pool_pre_ping=not sqlite)
    if sqlite:
        event.listen(engine, "connect", _sqlite_pragmas)
    event.listen(engine, "handle_error", _translate)
    try:
        migrate.upgrade(engine)
    except BaseException:
        engine.dispose()
        raise
    return sessionmaker(engine, expire_on_commit=False)


def exists(url: str) -> bool:
    """Whether an archive is there to open: a SQLite file that exists, or any server URL."""
    parsed = make_url(url)
    if parsed.get_backend_name() != "sqlite":
        return True
    return bool(parsed.database) and Path(str(parsed.database)).is_file()


_SQLITE_FULL = ("database or disk is full",)
_SQLITE_BUSY = ("database is locked", "database table is locked")


def _translate(context: ExceptionContext) -> None:
    """Raise the product's error for a database fault (``handle_error`` runs for every failed
    statement, commit and connect; SQLAlchemy still invalidates a lost connection afterwards)."""
    if context.is_pre_ping:
        return  # the pool's test of an idle connection: a dead one is replaced, not an error
    original = context.original_exception
    message = str(original).lower()
    sqlite = context.dialect is not None and context.dialect.name == "sqlite"
    if context.is_disconnect:
        what = "the connection to the archive database was lost in the middle of the request"
        incident = logs.incident(log, what, exc=original)
        raise DatabaseUnavailable(
            f"{what} (incident {incident}); nothing was saved, send the request again",
            incident=incident,
        )
    if sqlite and any(text in message for text in _SQLITE_FULL):
        raise StorageFull(
            "the disk holding the archive database is full, so nothing was saved; free some "
            "space (or move PLUMBLINE_DATA_DIR to a larger disk) and send the request again"
        )
    if sqlite and any(text in message for text in _SQLITE_BUSY):
        raise DatabaseUnavailable(
            "the archive database stayed busy with other writes for longer than its wait "
            "limit; nothing was saved, send the request again in a moment"
        )


def _sqlite_pragmas(connection: Any, _record: Any) -> None:
    import sqlite3  # the driver's own error, for the retry below
    import time

    cursor = connection.cursor()
    # WAL is a property of the file, set once. Switching to it needs the file to itself and fails
    # at once ("database is locked"; the busy timeout does not apply) while another connection
    # holds a transaction, so it is asked for only when missing, and retried for up to 5 s.
    for attempt in range(100):
        if cursor.execute("PRAGMA journal_mode").fetchone()[0] == "wal":
            break
        try:
            cursor.execute("PRAGMA journal_mode=WAL")
        except sqlite3.OperationalError:
            if attempt == 99:
                raise
            time.sleep(0.05)
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


class PersonRow(Base):
    """A person who holds one or more keys: separation of duties compares these ids, not names."""

    __tablename__ = "persons"

    id: Mapped[str] = mapped_column(String(40), primary_key=True)
    name: Mapped[str] = mapped_column(String(200))
    created_at: Mapped[datetime] = mapped_column(DateTime(timezone=True))


class KeyRow(Base):
    """An API key: only a salted scrypt hash of its secret is stored."""

    __tablename__ = "keys"

    id: Mapped[str] = mapped_column(String(40), primary_key=True)
    person_id: Mapped[str] = mapped_column(
        ForeignKey("persons.id", name="fk_keys_person_id_persons"), index=True
    )
    """The person who holds the key (several keys may belong to one person)."""
    name: Mapped[str] = mapped_column(String(200))
    roles: Mapped[list[str]] = mapped_column(JSON)
    families: Mapped[list[str]] = mapped_column(JSON)
    kdf: Mapped[str] = mapped_column(String(40))
    salt: Mapped[str] = mapped_column(String(64))
    secret_hash: Mapped[str] = mapped_column(String(128))
    created_at: Mapped[datetime] = mapped_column(DateTime(timezone=True))
    expires_at: Mapped[datetime | None] = mapped_column(DateTime(timezone=True), nullable=True)
    revoked_at: Mapped[datetime | None] = mapped_column(DateTime(timezone=True), nullable=True)


class SessionRow(Base):
    """A signed-in review session; the cookie carries its id, this row decides whether it holds."""

    __tablename__ = "sessions"

    id: Mapped[str] = mapped_column(String(64), primary_key=True)
    """The SHA-256 of the session id the cookie carries (the id itself is not stored)."""
    key_id: Mapped[str] = mapped_column(String(40), index=True)
    created_at: Mapped[datetime] = mapped_column(DateTime(timezone=True))
    expires_at: Mapped[datetime] = mapped_column(DateTime(timezone=True))
    ended_at: Mapped[datetime | None] = mapped_column(DateTime(timezone=True), nullable=True)


class ReviewRow(Base):
    """A pack's review: its authors, what was submitted, and who signed off which hash."""

    __tablename__ = "reviews"

    pack_id: Mapped[str] = mapped_column(ForeignKey("packs.id"), primary_key=True)
    authors: Mapped[list[dict[str, str]]] = mapped_column(JSON)
    """Every key that authored or submitted the pack: ``{"key_id", "name", "person_id"}``."""
    submitted_sha256: Mapped[str | None] = mapped_column(String(64), nullable=True)
    submitted_at: Mapped[datetime | None] = mapped_column(DateTime(timezone=True), nullable=True)
    signed_off_by: Mapped[str | None] = mapped_column(String(40), nullable=True)
    signed_off_name: Mapped[str | None] = mapped_column(String(200), nullable=True)
    signed_off_at: Mapped[datetime | None] = mapped_column(DateTime(timezone=True), nullable=True)
    signed_off_sha256: Mapped[str | None] = mapped_column(String(64), nullable=True)
    superseded_by: Mapped[str | None] = mapped_column(String(40), nullable=True)

    def is_author(self, key_id: str, person_id: str) -> bool:
        """The same key, or another key of the same person (never decided on a name: two people
        may share one, and a look-alike name is not the same person)."""
        return any(a["key_id"] == key_id or a.get("person_id") == person_id for a in self.authors)

    def add_author(self, key_id: str, name: str, person_id: str) -> None:
        if not any(a["key_id"] == key_id for a in self.authors):
            entry = {"key_id": key_id, "name": name, "person_id": person_id}
            self.authors = [*self.authors, entry]


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


class SealRow(Base):
    """The sealed pack of a signed-off draft: the signed PDF/A file in the store, and its verdicts."""

    __tablename__ = "seals"

    pack_id: Mapped[str] = mapped_column(ForeignKey("packs.id"), primary_key=True)
    sha256: Mapped[str] = mapped_column(String(64), index=True)
    bytes: Mapped[int] = mapped_column(Integer)
    signer: Mapped[str] = mapped_column(String(400))
    development_key: Mapped[bool] = mapped_column(Boolean)
    pdfa: Mapped[dict[str, Any]] = mapped_column(JSON)
    """pikepdf's PDF/A verdict on the unsigned file (advisory, not a certification)."""
    record: Mapped[dict[str, Any]] = mapped_column(JSON)
    """The sign-off record attached to the pack as ``review.json``."""
    sealed_at: Mapped[datetime] = mapped_column(DateTime(timezone=True))


class IdempotencyRow(Base):
    """The first answer to a POST with an ``Idempotency-Key``, replayed to retries of it."""

    __tablename__ = "idempotency"

    key_id: Mapped[str] = mapped_column(String(40), primary_key=True)
    """The API key that sent the request (an Idempotency-Key is scoped to its sender)."""
    idempotency_key: Mapped[str] = mapped_column(String(255), primary_key=True)
    method: Mapped[str] = mapped_column(String(10))
    path: Mapped[str] = mapped_column(String(400))
    request_sha256: Mapped[str] = mapped_column(String(64))
    status_code: Mapped[int] = mapped_column(Integer)
    body: Mapped[dict[str, Any]] = mapped_column(JSON)
    location: Mapped[str | None] = mapped_column(String(400), nullable=True)
    created_at: Mapped[datetime] = mapped_column(DateTime(timezone=True))


class JobRow(Base):
    """A pack built in the background: its progress, and the draft or the error it ended with."""

    __tablename__ = "jobs"

    id: Mapped[str] = mapped_column(String(40), primary_key=True)
    key_id: Mapped[str] = mapped_column(String(40), index=True)
    """The API key that posted the definition: only it sees the job."""
    status: Mapped[str] = mapped_column(String(20), index=True)
    """queued, running, done or failed."""
    stage: Mapped[str] = mapped_column(String(40))
    done: Mapped[int] = mapped_column(Integer)
    total: Mapped[int] = mapped_column(Integer)
    definition_sha256: Mapped[str] = mapped_column(String(64))
    pack_id: Mapped[str | None] = mapped_column(String(40), nullable=True)
    error: Mapped[dict[str, Any] | None] = mapped_column(JSON, nullable=True)
    created_at: Mapped[datetime] = mapped_column(DateTime(timezone=True))
    updated_at: Mapped[datetime] = mapped_column(DateTime(timezone=True))


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


def standing_waived_checks(row: PackRow) -> set[tuple[str, str]]:
    """``(check, chart)`` of every check waived by a standing waiver that came with the definition."""
    return {(r["check"], r["chart"]) for r in row.results if r["status"] == "waived"}


def waived_checks(session: Session, row: PackRow) -> set[tuple[str, str]]:
    """``(check, chart)`` waived on the pack's current PDF: a waiver of an earlier draft does not
    carry over to a rebuilt one."""
    rows = session.execute(
        select(WaiverRow.check, WaiverRow.chart).where(
            WaiverRow.pack_id == row.id, WaiverRow.pdf_sha256 == row.pdf_sha256
        )
    )
    return {(check, chart) for check, chart in rows}
