"""What the HTTP routes and the review pages share: the archive, the store, the render workers and
the background jobs, with the steps that need a worker process (build a draft, sign off and seal,
verify). Built once by the composition root (``service.app``); neither edge builds its own.
"""

from __future__ import annotations

from collections import OrderedDict
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from sqlalchemy import text
from sqlalchemy.orm import sessionmaker
from starlette.concurrency import run_in_threadpool

from service.archive import db
from service.archive.db import PackRow, SealRow
from service.archive.files import BlobStore
from service.config import Settings
from service.errors import InvalidRequest, PlumblineError
from service.runner.jobs import Jobs
from service.runner.workers import Workers
from service.seal.verify import VerifyReport
from service.workflow import drafts, sealing
from service.workflow.keys import FailureLimit, Principal

PROBE = b"plumbline readiness probe\n"
"""Written to and read back from the store by ``GET /v1/ready`` (content-addressed: one file)."""


class NotReady(PlumblineError):
    """A part the service needs cannot be used now (``GET /v1/ready`` says which)."""

    code = "not_ready"
    status = 503


@dataclass
class Services:
    settings: Settings
    sessions: sessionmaker[Any]
    store: BlobStore
    workers: Workers
    jobs: Jobs
    known_keys: OrderedDict[bytes, str] = field(default_factory=OrderedDict)
    """SHA-256 of a secret already checked with scrypt → its key id (most recent last)."""
    auth_failures: FailureLimit = field(default_factory=FailureLimit)
    """Failed authentications per client address (the API's keys and the pages' sign-in)."""

    def probe_database(self) -> None:
        """The database answers ``SELECT 1`` (and a SQLite file is still there)."""
        engine = db.engine_of(self.sessions)
        where = engine.url.database
        # an open connection keeps a removed SQLite file usable; a new one would not find it
        sqlite_file = engine.dialect.name == "sqlite" and where not in (None, "", ":memory:")
        if sqlite_file and not Path(str(where)).is_file():
            raise NotReady(f"the SQLite file {where} is not there (PLUMBLINE_DATABASE_URL)")
        with engine.connect() as connection:
            connection.execute(text("SELECT 1"))

    def probe_store(self) -> None:
        """The store takes a write and gives it back."""
        digest = self.store.put(PROBE)
        if self.store.get(digest) != PROBE:
            raise NotReady("the store gave back different bytes than were written")

    def probe_workers(self) -> None:
        """Every render worker is alive (one that died is being replaced)."""
        missing = self.workers.missing()
        if missing:
            raise NotReady(
                f"{missing} of {self.workers.size} render workers stopped and are being replaced"
            )

    async def build_draft(self, principal: Principal, raw: bytes) -> PackRow:
        """Build the definition in a worker and store the draft, ``principal`` its author."""
        built = await self.workers.build_now(raw, self.settings.limits)
        return await run_in_threadpool(
            drafts.create,
            sessions=self.sessions,
            store=self.store,
            built=built,
            definition=raw,
            author=principal,
        )

    async def check(self, raw: bytes) -> dict[str, Any]:
        """Validate a definition and run its checks in a worker, under the render budget."""
        return await self.workers.check(raw, self.settings.limits)

    async def sign_off_and_seal(
        self, principal: Principal, pack_id: str, content_sha256: str
    ) -> SealRow:
        """Sign off and seal a pack, sealing in a worker process (the API and the pages)."""
        if not content_sha256:
            raise InvalidRequest("name the SHA-256 of the draft PDF that was reviewed")
        return await run_in_threadpool(
            sealing.sign_off_and_seal,
            sessions=self.sessions,
            store=self.store,
            principal=principal,
            pack_id=pack_id,
            content_sha256=content_sha256,
            sealer=self.workers.sealer(self.settings),
        )

    async def verify(self, pdf: bytes, principal: Principal | None = None) -> VerifyReport:
        """Verify a sealed pack in a worker, trusting the organisation's certificate when one is
        configured and the development certificate when there is one, then look it up in the
        archive."""
        from service.seal import keys

        settings = self.settings
        roots: list[bytes] = []
        if settings.seal_cert is not None:
            roots.append(settings.seal_cert.read_bytes())
        development = keys.development_certificate(settings.data_dir / "keys")
        if development is not None:
            roots.append(development)
        report = await self.workers.verify(pdf, roots, settings.limits)
        await run_in_threadpool(sealing.compare_with_archive, report, self.sessions, principal)
        return report


__all__ = ["PROBE", "NotReady", "Services"]
