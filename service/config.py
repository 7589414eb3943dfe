"""One typed settings object, read once at start-up from ``PLUMBLINE_*`` environment variables."""

from __future__ import annotations

import os
from functools import lru_cache
from pathlib import Path

from pydantic import BaseModel, Field, SecretStr, model_validator
from pydantic_settings import BaseSettings, SettingsConfigDict


class Limits(BaseModel):
    """Size limits on a definition; every one is answered with a ``limit_exceeded`` problem."""

    model_config = {"frozen": True}

    max_payload_bytes: int = Field(10_000_000, ge=1_000)
    max_datasets: int = Field(50, ge=1)
    max_rows: int = Field(200_000, ge=1)
    max_columns: int = Field(64, ge=1)
    max_sections: int = Field(50, ge=1)
    max_charts: int = Field(200, ge=1)
    max_categories: int = Field(60, ge=1)
    max_series: int = Field(8, ge=1)
    max_table_rows: int = Field(200, ge=1)
    max_text_chars: int = Field(5_000, ge=10)
    max_label_chars: int = Field(200, ge=10)


class Settings(BaseSettings):
    model_config = SettingsConfigDict(
        env_prefix="PLUMBLINE_", env_nested_delimiter="__", extra="ignore"
    )

    data_dir: Path = Path("var")
    database_url: str = ""
    workers: int = Field(default_factory=lambda: max(1, os.cpu_count() or 1), ge=1, le=64)
    host: str = "127.0.0.1"
    port: int = Field(8000, ge=0, le=65535)
    limits: Limits = Limits()
    max_queued_jobs: int = Field(200, ge=1, le=100_000)
    """PLUMBLINE_MAX_QUEUED_JOBS: background builds waiting or running in one process; past it a
    new one is refused with 429 and Retry-After."""
    store_url: str = ""
    """PLUMBLINE_STORE_URL: where PDFs and definitions live — unset: files under the data folder;
    ``s3://bucket/prefix``: an S3-compatible object store; ``file:///path``: files there."""
    s3_endpoint_url: str | None = None
    """PLUMBLINE_S3_ENDPOINT_URL: the endpoint of an S3-compatible service that is not AWS."""
    queue_url: str = ""
    """PLUMBLINE_QUEUE_URL: ``redis://host:port/db`` to build on Celery workers
    (``plumbline worker``); unset: in the service's own worker processes."""
    queue_visibility_timeout_s: float | None = Field(None, gt=0)
    """PLUMBLINE_QUEUE_VISIBILITY_TIMEOUT_S: when an unacknowledged build is delivered again;
    default: the render time budget + 120 s."""
    queue_restore_interval_s: float = Field(10.0, gt=0)
    """PLUMBLINE_QUEUE_RESTORE_INTERVAL_S: how often workers look for builds to deliver again."""
    render_timeout_s: float = Field(300.0, gt=0, le=86_400)
    """PLUMBLINE_RENDER_TIMEOUT_S: a render (or seal, or verify) past this is stopped and fails."""
    seal_key: Path | None = None
    """PLUMBLINE_SEAL_KEY: the organisation's signing key (PEM); else a development key is used."""
    seal_cert: Path | None = None
    """PLUMBLINE_SEAL_CERT: the certificate of that key (PEM)."""
    session_secret: SecretStr | None = None
    """PLUMBLINE_SESSION_SECRET: signs the review pages' session cookies; else a random secret is
    made once in the data folder (``web-session.key``)."""
    secure_cookies: bool = False
    """PLUMBLINE_SECURE_COOKIES: mark session cookies Secure (set it when served over HTTPS)."""

    @model_validator(mode="after")
    def _strong_session_secret(self) -> Settings:
        if self.session_secret is not None and len(self.session_secret.get_secret_value()) < 32:
            raise ValueError(
                "PLUMBLINE_SESSION_SECRET must be at least 32 characters; leave it unset to have "
                "a random one made in the data folder"
            )
        return self

    @model_validator(mode="after")
    def _default_database(self) -> Settings:
        if not self.database_url:
            self.database_url = f"sqlite:///{self.data_dir / 'plumbline.db'}"
        return self

    @property
    def store_dir(self) -> Path:
        return self.data_dir / "files"


@lru_cache(maxsize=1)
def get_settings() -> Settings:
    return Settings()
