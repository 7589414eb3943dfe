"""A content-addressed cache of drawn chart groups, in a folder.

An entry is named by the SHA-256 of everything that decides the group's bytes: each final chart
plan's JSON with sorted keys (a plan carries every value, label and note the chart draws), the
group's composition (which plans, in order), ``STYLE_VERSION`` and the versions of Plumbline,
matplotlib and fontTools. A changed input therefore has a different name and can never meet a
stale entry. The value is the group's PDF bytes and the label-layout reports measured while
drawing it.

An entry file is ``MAGIC``, the SHA-256 of the rest, and the rest (a JSON header line, then the
PDF). A file whose hash does not match, or whose header names another key, is deleted and the
group drawn again: a damaged entry is never served. Entries are written atomically
(``archive.files.write_atomic``); a hit touches the file, and after each write the folder is
pruned least-recently-used first (by mtime) to stay under its byte bound.
"""

from __future__ import annotations

import contextlib
import hashlib
import json
import os
from dataclasses import asdict
from importlib.metadata import version
from pathlib import Path

import service
from service.archive.files import write_atomic
from service.intents.plan import ChartPlan
from service.render.measured import LayoutReport
from service.render.options import RenderOptions

MAGIC = b"plumbline-chart-group 1\n"
_DIGEST_LEN = 64


#: The libraries that write the bytes, read once (they cannot change under a running process).
LIBRARIES = {"matplotlib": version("matplotlib"), "fonttools": version("fonttools")}
#: ... and those that lay out and join the pack around the charts.
PACK_LIBRARIES = {**LIBRARIES, "reportlab": version("reportlab"), "pikepdf": version("pikepdf")}


def key(plans: list[ChartPlan]) -> str:
    """The SHA-256 naming a group of plans drawn together, in this order."""
    identity = {
        "style": service.STYLE_VERSION,  # read at each call: a bump misses every older entry
        "plumbline": service.__version__,
        "libraries": LIBRARIES,
        "plans": [plan.model_dump(mode="json") for plan in plans],
    }
    text = json.dumps(identity, sort_keys=True, separators=(",", ":"), ensure_ascii=False)
    return hashlib.sha256(text.encode()).hexdigest()


def pack_key(content: object, charts: list[bytes]) -> str:
    """The SHA-256 naming a whole assembled pack: everything its pages show (``content``: plain
    values, the report's text, tables, check results and status line) and the bytes of its drawn
    chart groups. A pack whose every input is the same is the same file, so it need not be laid
    out again; any change, a single character of the appendix, names another entry."""
    identity = {
        "style": service.STYLE_VERSION,
        "plumbline": service.__version__,
        "libraries": PACK_LIBRARIES,
        "content": content,
        "charts": [hashlib.sha256(chart).hexdigest() for chart in charts],
    }
    text = json.dumps(identity, sort_keys=True, separators=(",", ":"), ensure_ascii=False)
    return hashlib.sha256(f"pack:{text}".encode()).hexdigest()


class ChartCache:
    """Drawn chart groups (and assembled packs) under ``root/ab/cdef…`` (see the module
    docstring); a pack entry is stored like a group with no layout reports."""

    def __init__(self, root: Path, *, max_bytes: int) -> None:
        self.root = root
        self.max_bytes = max_bytes

    @classmethod
    def of(cls, options: RenderOptions) -> ChartCache | None:
        """The cache ``options`` name, or None when they name none."""
        if options.cache_dir is None:
            return None
        return cls(options.cache_dir, max_bytes=options.cache_max_bytes)

    def path(self, digest: str) -> Path:
        return self.root / digest[:2] / digest[2:]

    def get(self, digest: str) -> tuple[bytes, list[LayoutReport]] | None:
        """The cached group, or None when it is absent or damaged (a damaged file is removed)."""
        target = self.path(digest)
        try:
            data = target.read_bytes()
        except (FileNotFoundError, NotADirectoryError):
            return None
        found = _decode(data, digest)
        if found is None:
            target.unlink(missing_ok=True)
            return None
        with contextlib.suppress(FileNotFoundError):
            os.utime(target)  # most recently used
        return found

    def put(self, digest: str, pdf: bytes, reports: list[LayoutReport]) -> None:
        header = json.dumps(
            {"key": digest, "pdf_bytes": len(pdf), "reports": [asdict(r) for r in reports]},
            sort_keys=True,
            separators=(",", ":"),
        ).encode()
        body = header + b"\n" + pdf
        write_atomic(self.path(digest), MAGIC + hashlib.sha256(body).hexdigest().encode() + body)
        self.prune()

    def prune(self) -> int:
        """Remove least recently used entries until the folder is under its bound; bytes freed."""
        entries: list[tuple[float, int, Path]] = []
        try:
            folders = list(os.scandir(self.root))
        except FileNotFoundError:
            return 0
        for folder in folders:
            if not folder.is_dir() or len(folder.name) != 2:
                continue
            for entry in os.scandir(folder.path):
                if entry.name.startswith("."):
                    continue  # another process's write in progress
                with contextlib.suppress(FileNotFoundError):
                    stat = entry.stat()
                    entries.append((stat.st_mtime, stat.st_size, Path(entry.path)))
        total = sum(size for _, size, _ in entries)
        freed = 0
        for _, size, path in sorted(entries):
            if total - freed <= self.max_bytes:
                break
            path.unlink(missing_ok=True)
            freed += size
        return freed


def _decode(data: bytes, digest: str) -> tuple[bytes, list[LayoutReport]] | None:
    if not data.startswith(MAGIC):
        return None
    stated = data[len(MAGIC) : len(MAGIC) + _DIGEST_LEN]
    body = data[len(MAGIC) + _DIGEST_LEN :]
    if hashlib.sha256(body).hexdigest().encode() != stated:
        return None
    header, _, pdf = body.partition(b"\n")
    try:
        meta = json.loads(header)
        if meta["key"] != digest or meta["pdf_bytes"] != len(pdf):
            return None
        reports = [LayoutReport(**r) for r in meta["reports"]]
    except (ValueError, KeyError, TypeError):
        return None
    return pdf, reports


__all__ = ["LIBRARIES", "MAGIC", "PACK_LIBRARIES", "ChartCache", "key", "pack_key"]
