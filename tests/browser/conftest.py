"""A real Plumbline server (uvicorn in its own process, its own SQLite file and file store) and
Debian's Chromium, headless, driven by Playwright. Playwright's own browser downloads are never
used: the system's /usr/bin/chromium is launched by path.

Without Chromium (or Playwright) the browser tests are skipped with a loud reason, unless
PLUMBLINE_REQUIRE_BROWSER=1 (as CI sets it), when they fail instead.
"""

from __future__ import annotations

import os
import shutil
import socket
import subprocess
import sys
import time
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import httpx
import pytest

CHROMIUM = Path("/usr/bin/chromium")
CHROMIUM_ARGS = [
    "--no-sandbox",
    "--disable-gpu",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
    "--no-first-run",
]
ROOT = Path(__file__).parents[2]
# The application factory with the review pages installed (``install`` is a no-op when the
# factory has done it already), served by uvicorn as ``plumbline serve`` serves it.
SERVE = (
    "import sys, uvicorn\n"
    "from service import web\n"
    "from service.app import create_app\n"
    "app = create_app()\n"
    "web.install(app)\n"
    "uvicorn.run(app, host='127.0.0.1', port=int(sys.argv[1]), log_level='info')\n"
)


def _missing(reason: str) -> None:
    if os.environ.get("PLUMBLINE_REQUIRE_BROWSER") == "1":
        pytest.fail(f"PLUMBLINE_REQUIRE_BROWSER=1 but {reason}")
    pytest.skip(f"BROWSER TESTS NOT RUN: {reason} (apt-get install chromium chromium-driver)")


def _free_port() -> int:
    with socket.socket() as sock:
        sock.bind(("127.0.0.1", 0))
        return int(sock.getsockname()[1])


@pytest.fixture(scope="module")
def browser() -> Iterator[Any]:
    """Module-scoped: Playwright's sync API keeps an event loop running in the main thread while
    it is open, which would break any later test that calls ``asyncio.run`` (pyHanko does)."""
    if not CHROMIUM.exists() and shutil.which("chromium") is None:
        _missing(f"{CHROMIUM} is not installed")
    try:
        from playwright.sync_api import sync_playwright
    except ImportError:
        _missing("the playwright package is not installed")
    with sync_playwright() as playwright:
        launched = playwright.chromium.launch(executable_path=str(CHROMIUM), args=CHROMIUM_ARGS)
        yield launched
        launched.close()


@pytest.fixture(scope="module")
def server(tmp_path_factory: pytest.TempPathFactory) -> Iterator[dict[str, Any]]:
    data_dir = Path(tmp_path_factory.mktemp("browser-data"))
    port = _free_port()
    env = {**os.environ, "PLUMBLINE_DATA_DIR": str(data_dir), "PLUMBLINE_WORKERS": "1"}
    log = (data_dir / "server.log").open("wb")
    process = subprocess.Popen(
        [sys.executable, "-c", SERVE, str(port)],
        env=env,
        cwd=ROOT,
        stdout=log,
        stderr=subprocess.STDOUT,
    )
    base = f"http://127.0.0.1:{port}"
    deadline = time.monotonic() + 60
    while True:
        try:
            if httpx.get(f"{base}/v1/health", timeout=1).status_code == 200:
                break
        except httpx.TransportError:
            pass
        if process.poll() is not None or time.monotonic() > deadline:
            process.kill()
            process.wait(timeout=10)
            log.close()
            raise RuntimeError((data_dir / "server.log").read_text())
        time.sleep(0.2)
    try:
        yield {"base": base, "data_dir": data_dir}
    finally:
        process.terminate()
        process.wait(timeout=30)
        log.close()
