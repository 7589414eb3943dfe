"""The archive database (SQLAlchemy 2): SQLite by default, any SQLAlchemy URL by configuration.

Only metadata lives here; PDF and definition bytes live in the content-addressed file store and are
referenced by their SHA-256, so a row never claims a file that was not written first.
"""

from __future__ import annotations

from datetime import UTC, datetime
from typing import Any

from sqlalchemy import JSON, Boolean, DateTime, Integer, String, create_engine, event
from sqlalchemy.engine import Engine
from sqlalchemy.orm import DeclarativeBase, Mapped, mapped_column, sessionmaker


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
