"""What the tests start and what they need, in one place (named apart from ``conftest`` so test
modules can import it): a free loopback port, a process started and waited for until it is ready,
``plumbline serve`` started that way, an app served by uvicorn in a thread of the test process, and
require-or-skip for the tools a folder of tests needs.

Waiting is always bounded: a process that exits, or is not ready in time, fails the test with what
it printed. A missing tool skips its tests with a loud reason, unless its ``PLUMBLINE_REQUIRE_*``
variable is ``1`` (``.ci/run`` sets them), which turns the skip into a failure.
"""

from __future__ import annotations

import contextlib
import os
import shutil
import signal
import socket
import subprocess
import sys
import threading
import time
from collections.abc import Callable, Iterator, Mapping, Sequence
from contextlib import contextmanager
from pathlib import Path
from typing import Any, NoReturn

import httpx
import pytest
import uvicorn
from fastapi import FastAPI

ROOT = Path(__file__).parents[1]
"""The checkout: the working folder of every process the tests start."""

LOOPBACK = "127.0.0.1"


def free_port() -> int:
    """A TCP port on the loopback interface that nothing listens on at this moment."""
    with socket.socket() as sock:
        sock.bind((LOOPBACK, 0))
        return int(sock.getsockname()[1])


def missing(env_var: str, what: str, reason: str, install: str = "") -> NoReturn:
    """Skip the test loudly because ``reason``, or fail it when ``env_var`` is ``1``."""
    if os.environ.get(env_var) == "1":
        pytest.fail(f"{env_var}=1 but {reason}", pytrace=False)
    pytest.skip(f"!!! {what} NOT RUN: {reason}" + (f"; {install}" if install else ""))


def require_or_skip(
    available: bool | str | None, env_var: str, what: str, reason: str, install: str = ""
) -> None:
    """Go on if ``available`` is true (a condition, or a path such as ``shutil.which`` returns);
    otherwise skip loudly (``what`` NOT RUN: ``reason``; ``install``) or, with ``env_var=1``, fail."""
    if not available:
        missing(env_var, what, reason, install)


def require_tool(name: str, env_var: str, what: str, install: str = "") -> str:
    """The path of the command ``name`` on PATH, or skip/fail as ``require_or_skip``."""
    found = shutil.which(name)
    if found is None:
        missing(env_var, what, f"there is no {name} on PATH", install)
    return found


def answers(url: str) -> Callable[[], bool]:
    """A readiness probe: ``url`` answers 200."""

    def probe() -> bool:
        try:
            return httpx.get(url, timeout=1).status_code == 200
        except httpx.TransportError:
            return False

    return probe


def accepts(port: int) -> Callable[[], bool]:
    """A readiness probe: something accepts TCP connections on the loopback ``port``."""

    def probe() -> bool:
        try:
            with socket.create_connection((LOOPBACK, port), timeout=1):
                return True
        except OSError:
            return False

    return probe


def stop(process: subprocess.Popen[bytes], timeout: float = 30, *, group: bool = False) -> int:
    """Ask ``process`` to stop (SIGTERM), then kill it (SIGKILL) if it has not within ``timeout``;
    ``group``: signal its whole process group (one started with ``start_new_session``), so the
    processes it started go with it."""

    def send(signum: signal.Signals) -> None:
        with contextlib.suppress(ProcessLookupError):
            if group:
                os.killpg(process.pid, signum)
            else:
                process.send_signal(signum)

    if process.poll() is None:
        send(signal.SIGTERM)
        try:
            process.wait(timeout=timeout)
        except subprocess.TimeoutExpired:
            send(signal.SIGKILL)
    if group:
        send(signal.SIGKILL)  # whatever it left behind in its group
    return process.wait(timeout=timeout)


def start_process(
    command: Sequence[str],
    *,
    ready: Callable[[], bool],
    log: Path,
    what: str,
    env: Mapping[str, str] | None = None,
    timeout: float = 60,
    start_new_session: bool = False,
) -> subprocess.Popen[bytes]:
    """Start ``command`` in the checkout with its output in ``log``, and wait until ``ready()``.

    If it exits first or is not ready within ``timeout`` seconds it is stopped and the test fails,
    saying which and showing the output."""
    with log.open("ab") as out:
        process = subprocess.Popen(
            list(command),
            cwd=ROOT,
            env=dict(os.environ if env is None else env),
            stdout=out,
            stderr=subprocess.STDOUT,
            start_new_session=start_new_session,
        )
    deadline = time.monotonic() + timeout
    while not ready():
        status = process.poll()
        if status is not None or time.monotonic() > deadline:
            if status is None:
                stop(process, timeout=10, group=start_new_session)
            why = f"exited with status {status}" if status is not None else "was not ready"
            output = log.read_text(errors="replace")
            pytest.fail(
                f"{what} {why} within {timeout:g} s; its output ({log}):\n{output}", pytrace=False
            )
        time.sleep(0.1)
    return process


def serve(
    port: int,
    *,
    log: Path,
    env: Mapping[str, str] | None = None,
    prefix: Sequence[str] = (),
    timeout: float = 60,
) -> subprocess.Popen[bytes]:
    """``plumbline serve`` on the loopback ``port`` (run under ``prefix``, if any), waited for until
    ``/v1/health`` answers."""
    command = [*prefix, sys.executable, "-m", "service.cli", "serve", "--port", str(port)]
    return start_process(
        command,
        ready=answers(f"http://{LOOPBACK}:{port}/v1/health"),
        log=log,
        what="plumbline serve",
        env=env,
        timeout=timeout,
    )


def start_redis(folder: Path, what: str) -> tuple[subprocess.Popen[bytes], int]:
    """A redis-server of its own on a free loopback port, nothing kept on disk, its log in
    ``folder``; skips ``what`` (or fails, with ``PLUMBLINE_REQUIRE_DISTRIBUTED=1``) without one."""
    binary = require_tool(
        "redis-server",
        "PLUMBLINE_REQUIRE_DISTRIBUTED",
        what,
        "install Debian's redis-server package (apt-get install redis-server) to run them",
    )
    port = free_port()
    command = [binary, "--port", str(port), "--bind", LOOPBACK, "--save", "", "--appendonly", "no"]
    command += ["--dir", str(folder)]
    process = start_process(
        command, ready=accepts(port), log=folder / "redis.log", what="redis-server"
    )
    return process, port


@contextmanager
def serving_app(
    app: FastAPI, *, timeout: float = 30, **config: Any
) -> Iterator[tuple[FastAPI, str]]:
    """``app`` served by uvicorn on a free loopback port in a thread of the test process (so a test
    can reach its database); yields it and its base URL. ``config`` goes to ``uvicorn.Config`` (e.g.
    ``ssl_keyfile`` and ``ssl_certfile`` serve it over HTTPS)."""
    port = free_port()
    server = uvicorn.Server(
        uvicorn.Config(app, host=LOOPBACK, port=port, log_level="warning", lifespan="on", **config)
    )
    thread = threading.Thread(target=server.run, name="test-server", daemon=True)
    thread.start()
    deadline = time.monotonic() + timeout
    while not server.started:
        if not thread.is_alive() or time.monotonic() > deadline:
            server.should_exit = True
            pytest.fail(f"the app's test server did not start within {timeout:g} s", pytrace=False)
        time.sleep(0.05)
    scheme = "https" if config.get("ssl_certfile") else "http"
    try:
        yield app, f"{scheme}://{LOOPBACK}:{port}"
    finally:
        server.should_exit = True
        thread.join(timeout=60)
