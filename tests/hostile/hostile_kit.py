"""Helpers of the hostile-input tests (named apart from ``conftest`` so test modules can import it):
a loopback listener that records every request it gets (so a test can show that nothing was
fetched), a file listing to compare before and after, and PDF text read back with ``pdftotext``."""

from __future__ import annotations

import http.server
import re
import subprocess
import tempfile
import threading
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass, field
from pathlib import Path

_SPACE = re.compile(r"\s+")


def listing(root: Path, *, skip: tuple[str, ...] = ()) -> set[str]:
    """Every file and folder under ``root`` (relative paths), leaving out the ``skip`` folders."""
    out: set[str] = set()
    for path in root.rglob("*"):
        relative = path.relative_to(root).as_posix()
        if any(relative == s or relative.startswith(f"{s}/") for s in skip):
            continue
        out.add(relative)
    return out


def squeezed(text: str) -> str:
    """Text with every run of white space removed: lines wrap wherever the layout chose."""
    return _SPACE.sub("", text)


def pdf_text(pdf: bytes) -> str:
    """The text of a PDF as poppler's ``pdftotext`` reads it (an independent parser), in reading
    order and then in the order of the content streams (``-raw``): a wrapped table cell or a
    rotated axis label reads whole in one of the two."""
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "read.pdf"
        path.write_bytes(pdf)
        texts = [
            subprocess.run(
                ["pdftotext", *mode, "-enc", "UTF-8", str(path), "-"],
                capture_output=True,
                check=True,
                timeout=60,
            ).stdout.decode("utf-8")
            for mode in ([], ["-raw"])
        ]
    return "\n\f\n".join(texts)


@dataclass
class Listener:
    """An HTTP server on 127.0.0.1 that answers 200 to everything and remembers each request."""

    base: str
    seen: list[str] = field(default_factory=list)

    def url(self, path: str) -> str:
        return f"{self.base}/{path.lstrip('/')}"


@contextmanager
def listening() -> Iterator[Listener]:
    found = Listener(base="")

    class Handler(http.server.BaseHTTPRequestHandler):
        def _answer(self) -> None:
            found.seen.append(f"{self.command} {self.path}")
            body = b"route,on_time\nFetched,1\n"
            self.send_response(200)
            self.send_header("Content-Type", "text/csv")
            self.send_header("Content-Length", str(len(body)))
            self.end_headers()
            self.wfile.write(body)

        do_GET = do_POST = do_HEAD = _answer  # noqa: N815 (the standard library's names)

        def log_message(self, format: str, *args: object) -> None:
            del format, args

    server = http.server.ThreadingHTTPServer(("127.0.0.1", 0), Handler)
    found.base = f"http://127.0.0.1:{server.server_address[1]}"
    thread = threading.Thread(target=server.serve_forever, name="fetch-listener", daemon=True)
    thread.start()
    try:
        yield found
    finally:
        server.shutdown()
        server.server_close()
