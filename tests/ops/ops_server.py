"""A real ``plumbline serve`` process for the operations tests, with its own data folder, SQLite
file and environment, and its standard error kept in a file to read back."""

from __future__ import annotations

import signal
import subprocess
import time
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

import httpx

ROOT = Path(__file__).parents[2]
DEMO = ROOT / "sample_requests" / "bus-cooperative-monthly.json"


@dataclass
class Server:
    process: subprocess.Popen[bytes]
    base: str
    port: int
    data_dir: Path
    log: Path
    key: str
    """The secret of an author key of every report family (invented person)."""

    def client(self, **headers: str) -> httpx.Client:
        return httpx.Client(
            base_url=self.base,
            timeout=120,
            headers={"Authorization": f"Bearer {self.key}", **headers},
        )

    def lines(self) -> list[str]:
        return self.log.read_text(errors="replace").splitlines()

    def stop(self, timeout: float = 60) -> int:
        if self.process.poll() is None:
            self.process.send_signal(signal.SIGTERM)
        return self.process.wait(timeout=timeout)


Start = Callable[..., Server]


def wait_for_job(http: httpx.Client, location: str, timeout: float = 120) -> dict[str, object]:
    deadline = time.monotonic() + timeout
    while time.monotonic() < deadline:
        job = http.get(location).json()
        if job["status"] in ("done", "failed"):
            return dict(job)
        time.sleep(0.2)
    raise AssertionError(f"the job at {location} did not end within {timeout} s")
