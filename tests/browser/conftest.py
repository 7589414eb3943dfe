"""A real Plumbline server (uvicorn in its own process, its own SQLite file and file store) and
Debian's Chromium, headless, driven by Playwright. Playwright's own browser downloads are never
used: the system's /usr/bin/chromium is launched by path.

Without Chromium (or Playwright) the browser tests are skipped with a loud reason, unless
PLUMBLINE_REQUIRE_BROWSER=1 (as CI sets it), when they fail instead.
"""

from __future__ import annotations

import os
import shutil
import sys
from collections.abc import Iterator
from pathlib import Path
from typing import Any, NoReturn

import harness
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


def _missing(reason: str) -> NoReturn:
    harness.missing(
        "PLUMBLINE_REQUIRE_BROWSER",
        "browser tests",
        reason,
        "install Debian's chromium package (apt-get install chromium) to run them",
    )


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
    port = harness.free_port()
    env = {**os.environ, "PLUMBLINE_DATA_DIR": str(data_dir), "PLUMBLINE_WORKERS": "1"}
    base = f"http://127.0.0.1:{port}"
    process = harness.start_process(
        [sys.executable, "-c", SERVE, str(port)],
        ready=harness.answers(f"{base}/v1/health"),
        log=data_dir / "server.log",
        what="the review pages' server",
        env=env,
    )
    try:
        yield {"base": base, "data_dir": data_dir}
    finally:
        harness.stop(process)
