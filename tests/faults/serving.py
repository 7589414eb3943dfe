"""A real ``plumbline serve`` for the fault tests: started, killed with SIGKILL, started again.

The server gets its own data folder (SQLite file and file store, unless told otherwise) and the
keys are made in its archive before it starts. ``prefix`` runs it under another command (for
example ``unshare`` with a small filesystem mounted over its store).
"""

from __future__ import annotations

import os
import signal
import subprocess
import time
from dataclasses import dataclass, field
from pathlib import Path

import harness
import httpx

from service.archive.db import connect, engine_of
from service.workflow.keys import Role, create

ROOT = Path(__file__).parents[2]
PEOPLE: dict[str, tuple[str, set[Role]]] = {
    "author": ("Ann Author", {Role.author}),
    "reviewer": ("Rui Reviewer", {Role.reviewer}),
    "approver": ("Pat Approver", {Role.approver}),
}
"""Invented people, one key each, every report family."""


def keys(url: str) -> dict[str, str]:
    """Make one key per person in the archive at ``url``; returns their secrets."""
    sessions = connect(url)
    try:
        return {
            who: create(sessions, name=name, roles=roles, families={"*"}, expires=None)[1]
            for who, (name, roles) in PEOPLE.items()
        }
    finally:
        engine_of(sessions).dispose()


@dataclass
class Server:
    data_dir: Path
    env: dict[str, str]
    prefix: list[str] = field(default_factory=list)
    process: subprocess.Popen[bytes] | None = None
    base: str = ""
    starts: int = 0

    def start(self, timeout: float = 60) -> Server:
        port = harness.free_port()
        self.starts += 1
        env = {
            **os.environ,
            "MPLBACKEND": "Agg",
            "PLUMBLINE_DATA_DIR": str(self.data_dir),
            **self.env,
        }
        log = self.data_dir / f"server-{self.starts}.log"
        self.process = harness.serve(port, log=log, env=env, prefix=self.prefix, timeout=timeout)
        self.base = f"http://127.0.0.1:{port}"
        return self

    def log(self) -> str:
        return (self.data_dir / f"server-{self.starts}.log").read_text(errors="replace")

    @property
    def pid(self) -> int:
        assert self.process is not None
        return self.process.pid

    def kill(self) -> int:
        """SIGKILL the service process (not its workers); returns its exit status."""
        assert self.process is not None
        self.process.send_signal(signal.SIGKILL)
        return self.process.wait(timeout=30)

    def stop(self) -> None:
        if self.process is not None:
            harness.stop(self.process)

    def client(self, secret: str) -> httpx.Client:
        return httpx.Client(
            base_url=self.base, timeout=120, headers={"Authorization": f"Bearer {secret}"}
        )


def children(pid: int) -> list[int]:
    """The live child processes of ``pid`` (from /proc)."""
    found = []
    for entry in Path("/proc").iterdir():
        if not entry.name.isdigit():
            continue
        try:
            stat = (entry / "stat").read_text()
        except OSError:
            continue
        fields = stat[stat.rindex(")") + 2 :].split()
        if int(fields[1]) == pid and fields[0] != "Z":
            found.append(int(entry.name))
    return sorted(found)


def render_workers(pid: int) -> list[int]:
    """The service's render worker processes: spawned multiprocessing children."""
    workers = []
    for child in children(pid):
        try:
            command = (Path("/proc") / str(child) / "cmdline").read_bytes()
        except OSError:
            continue
        if b"spawn_main" in command:
            workers.append(child)
    return workers


def alive(pid: int) -> bool:
    try:
        stat = (Path("/proc") / str(pid) / "stat").read_text()
    except OSError:
        return False
    return stat[stat.rindex(")") + 2] != "Z"


def wait_for(condition: object, timeout: float, what: str) -> None:
    deadline = time.monotonic() + timeout
    while time.monotonic() < deadline:
        if callable(condition) and condition():
            return
        time.sleep(0.05)
    raise AssertionError(f"timed out after {timeout:g} s waiting for {what}")
