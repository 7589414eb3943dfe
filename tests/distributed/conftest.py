"""Real services for the distributed builds: a throwaway redis-server, moto's S3 server, the
archive on a throwaway PostgreSQL server (the fixture of ``tests/archive/conftest.py``), and Celery
worker processes started and killed by the tests.

Without redis-server (Debian's ``redis-server`` package) the tests are skipped with a loud reason,
unless ``PLUMBLINE_REQUIRE_DISTRIBUTED=1`` (CI sets it), which turns that into a failure.
"""

from __future__ import annotations

import logging
import os
import shutil
import signal
import subprocess
import sys
import tempfile
import uuid
from collections.abc import Iterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import harness
import pytest
from postgres import fresh_database, postgres_server  # noqa: F401 - a fixture, used by name

from service.archive import db
from service.config import Settings
from service.workflow import keys
from service.workflow.keys import Principal, Role

BUCKET = "plumbline-packs"
RENDER_BUDGET_S = 8.0
VISIBILITY_TIMEOUT_S = 10.0
"""Short, so a build whose worker was killed is delivered again within the test: above the render
budget, as the service requires."""
RESTORE_INTERVAL_S = 1.0


@pytest.fixture(scope="session")
def redis_url() -> Iterator[str]:
    """A redis-server of its own on a free loopback port, nothing kept on disk."""
    folder = Path(tempfile.mkdtemp(prefix="plumbline-redis-"))
    try:
        process, port = harness.start_redis(folder, "distributed build tests")
        try:
            yield f"redis://127.0.0.1:{port}/0"
        finally:
            harness.stop(process, timeout=10)
    finally:
        shutil.rmtree(folder, ignore_errors=True)


AWS_ENV = {
    "AWS_ACCESS_KEY_ID": "plumbline-test",
    "AWS_SECRET_ACCESS_KEY": "plumbline-test-secret",
    "AWS_DEFAULT_REGION": "us-east-1",
}


@pytest.fixture(scope="session")
def s3_endpoint() -> Iterator[str]:
    """moto's S3 server on a free loopback port (its state lives in this test process)."""
    from moto.server import ThreadedMotoServer

    logging.getLogger("werkzeug").setLevel(logging.WARNING)  # one line per request otherwise
    server = ThreadedMotoServer(ip_address="127.0.0.1", port=harness.free_port(), verbose=False)
    server.start()
    host, port = server.get_host_and_port()
    try:
        yield f"http://{host}:{port}"
    finally:
        server.stop()


@pytest.fixture
def bucket() -> str:
    return BUCKET


@pytest.fixture
def s3(s3_endpoint: str, monkeypatch: pytest.MonkeyPatch) -> Any:
    """An S3 client of the test server with the bucket made, and the AWS environment set."""
    import boto3

    for name, value in AWS_ENV.items():
        monkeypatch.setenv(name, value)
    client = boto3.client("s3", endpoint_url=s3_endpoint, region_name="us-east-1")
    client.create_bucket(Bucket=BUCKET)  # the same bucket again is fine in us-east-1
    return client


@pytest.fixture
def postgres_url(request: pytest.FixtureRequest) -> Iterator[str]:
    """A new, empty database on the throwaway PostgreSQL server."""
    with fresh_database(request.getfixturevalue("postgres_server")) as url:
        yield url


@dataclass
class Stack:
    """One test's deployment: the environment every process of it reads, the service side's
    settings and archive, and the workers it started."""

    env: dict[str, str]
    settings: Settings
    sessions: Any
    logs: Path
    workers: list[subprocess.Popen[bytes]] = field(default_factory=list)

    def author(self, name: str = "Ann Author") -> Principal:
        key_id, _ = keys.create(
            self.sessions, name=name, roles={Role.author}, families={"*"}, expires=None
        )
        return keys.principal_for(self.sessions, key_id)

    def start_worker(self, name: str) -> subprocess.Popen[bytes]:
        """A Celery worker process (one build at a time), in its own process group, waited for
        until it says it is ready."""
        log = self.logs / f"{name}.log"
        command = [sys.executable, "-m", "celery", "-A", "service.distributed.app", "worker"]
        command += ["--pool=solo", "--loglevel=INFO", "-n", f"{name}@%h"]
        command += ["--without-gossip", "--without-mingle", "--without-heartbeat"]
        process = harness.start_process(
            command,
            ready=lambda: b" ready." in log.read_bytes(),
            log=log,
            what=f"Celery worker {name}",
            env=self.env,
            start_new_session=True,
        )
        self.workers.append(process)
        return process

    def kill(self, process: subprocess.Popen[bytes]) -> None:
        """SIGKILL the worker and its render process at once, as when its machine is lost."""
        os.killpg(process.pid, signal.SIGKILL)
        process.wait(timeout=10)

    def stop(self, process: subprocess.Popen[bytes]) -> None:
        """Stop the worker, and the render process it left, if any, with its group."""
        harness.stop(process, timeout=20, group=True)

    def log_of(self, name: str) -> str:
        return (self.logs / f"{name}.log").read_text(errors="replace")


@pytest.fixture
def stack(
    redis_url: str,
    s3: Any,
    s3_endpoint: str,
    postgres_url: str,
    *,
    tmp_path: Path,
    monkeypatch: pytest.MonkeyPatch,
) -> Iterator[Stack]:
    import redis

    flush = redis.Redis.from_url(redis_url)
    flush.flushall()  # no message of an earlier test reaches this one's workers
    flush.close()
    prefix = f"t-{uuid.uuid4().hex[:12]}"
    env = {
        **{k: v for k, v in os.environ.items() if not k.startswith("PLUMBLINE_")},
        **AWS_ENV,
        "PLUMBLINE_DATA_DIR": str(tmp_path / "var"),
        "PLUMBLINE_DATABASE_URL": postgres_url,
        "PLUMBLINE_QUEUE_URL": redis_url,
        "PLUMBLINE_STORE_URL": f"s3://{BUCKET}/{prefix}",
        "PLUMBLINE_S3_ENDPOINT_URL": s3_endpoint,
        "PLUMBLINE_RENDER_TIMEOUT_S": str(RENDER_BUDGET_S),
        "PLUMBLINE_QUEUE_VISIBILITY_TIMEOUT_S": str(VISIBILITY_TIMEOUT_S),
        "PLUMBLINE_QUEUE_RESTORE_INTERVAL_S": str(RESTORE_INTERVAL_S),
        "MPLCONFIGDIR": str(tmp_path / "mpl"),
    }
    for name, value in env.items():
        if name.startswith("PLUMBLINE_"):
            monkeypatch.setenv(name, value)
    settings = Settings(
        data_dir=tmp_path / "var", database_url=postgres_url, render_timeout_s=RENDER_BUDGET_S
    )
    sessions = db.connect(postgres_url)
    logs = tmp_path / "logs"
    logs.mkdir()
    built = Stack(env=env, settings=settings, sessions=sessions, logs=logs)
    try:
        yield built
    finally:
        for process in built.workers:
            built.stop(process)
        db.engine_of(sessions).dispose()
