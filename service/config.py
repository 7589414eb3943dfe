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
    max_periods: int | None = Field(None, ge=1)
    """The periods a time series may span from its first row to its last, counting the ones
    without a row (every check and chart works period by period); default twice ``max_rows``."""

    @property
    def periods_limit(self) -> int:
        return self.max_periods or 2 * self.max_rows


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
    max_waiting_requests: int = Field(32, ge=0, le=100_000)
    """PLUMBLINE_MAX_WAITING_REQUESTS: requests that wait for their answer (``POST /v1/reports``,
    ``POST /v1/check``) and wait for a worker in one process; past it a new one is refused with
    429 and Retry-After (a malformed definition is answered 422 first, without waiting)."""
    max_header_bytes: int = Field(16_384, ge=4_096, le=1_048_576)
    """PLUMBLINE_MAX_HEADER_BYTES: a request's line and header block; past it the request is
    answered 431 with a problem document (``headers_too_large``) and not read further."""
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
    fan_out_charts: bool = True
    """PLUMBLINE_FAN_OUT_CHARTS: with a queue, a build offers its chart groups to idle workers and
    draws the rest itself; off: each build draws all its charts on its own worker."""
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
    render_workers: int | None = Field(None, ge=1, le=64)
    """PLUMBLINE_RENDER_WORKERS: processes that draw one pack's charts. Unset: every core for the
    command line, 1 inside the service (its ``workers`` already build packs side by side). The
    bytes never depend on it."""
    chart_cache: bool = True
    """PLUMBLINE_CHART_CACHE: keep drawn chart groups, keyed by the SHA-256 of everything they
    draw, so a pack whose charts did not change is not drawn again (verification never uses it)."""
    chart_cache_dir: Path | None = None
    """PLUMBLINE_CHART_CACHE_DIR: where; default ``chart-cache`` in the data folder."""
    chart_cache_max_bytes: int = Field(256 * 1024 * 1024, ge=1)
    """PLUMBLINE_CHART_CACHE_MAX_BYTES: the cache is pruned, least recently used first, to this."""
    worker_memory_mb: int = Field(4096, ge=0, le=1_048_576)
    """PLUMBLINE_WORKER_MEMORY_MB: the address space each render worker may use (RLIMIT_AS); a
    job past it fails with ``render_memory`` and its worker is replaced. 0: no limit."""
    log_format: str = Field("json", pattern=r"^(json|text)$")
    """PLUMBLINE_LOG_FORMAT: ``json`` (one object a line on standard error) or ``text``."""
    log_level: str = Field("info", pattern=r"^(?i:debug|info|warning|error|critical)$")
    """PLUMBLINE_LOG_LEVEL: the least severe level logged (debug, info, warning, error)."""
    shutdown_grace_s: float = Field(30.0, ge=0, le=3600)
    """PLUMBLINE_SHUTDOWN_GRACE_S: on SIGTERM, how long running background builds may take to
    finish; the ones still running then are failed, saying to post them again."""

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
