"""Crash-safe file writes and a content-addressed store (files named by their SHA-256).

A write that does not fit (the disk or the owner's quota is full, or the file is larger than the
system allows) raises :class:`StorageFull` and leaves nothing behind: the temporary file is
removed, and the file it was to become is never created, so no row can claim a partial file.
A crash (SIGKILL, power loss) mid-write leaves at most a temporary ``.name.*`` file, which no row
names and :func:`Store.temporary` lists.
"""

from __future__ import annotations

import contextlib
import errno
import hashlib
import os
import tempfile
from pathlib import Path
from typing import Protocol

from service.errors import NotFound, PlumblineError

_NO_ROOM = {errno.ENOSPC, errno.EDQUOT, errno.EFBIG}


class StorageFull(PlumblineError):
    """The archive's disk is full: nothing was written (HTTP 507 Insufficient Storage)."""

    code = "insufficient_storage"
    status = 507


def _no_room(path: Path, exc: OSError) -> StorageFull:
    reason = os.strerror(exc.errno) if exc.errno is not None else str(exc)
    return StorageFull(
        f"the disk is full: the archive could not write {path.name[:16]}… under {path.parent} "
        f"({reason}), so nothing was saved and every pack already archived is unchanged; free "
        "some space or move the store (PLUMBLINE_DATA_DIR, PLUMBLINE_STORE_URL) to a larger disk, "
        "then send the request again"
    )


def write_atomic(path: Path, data: bytes) -> None:
    """Write to a temp file in the same folder, fsync, rename, fsync the folder."""
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", dir=path.parent)
    except OSError as exc:
        if exc.errno in _NO_ROOM:
            raise _no_room(path, exc) from exc
        raise
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(data)
            handle.flush()
            os.fsync(handle.fileno())
        Path(tmp).replace(path)
    except OSError as exc:
        Path(tmp).unlink(missing_ok=True)
        if exc.errno in _NO_ROOM:
            raise _no_room(path, exc) from exc
        raise
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise
    folder = os.open(path.parent, os.O_RDONLY)
    try:
        os.fsync(folder)
    finally:
        os.close(folder)


def write_once(path: Path, data: bytes) -> None:
    """Create a secret file readable by the owner only, or keep the one that is there: when two
    processes start at once, the first writer wins and both then read the same bytes."""
    fd, tmp = tempfile.mkstemp(dir=path.parent, prefix=f".{path.name}.")
    try:
        os.fchmod(fd, 0o600)
        with os.fdopen(fd, "wb") as out:
            out.write(data)
            out.flush()
            os.fsync(out.fileno())
        with contextlib.suppress(FileExistsError):  # another process made it first: use theirs
            os.link(tmp, path)
    finally:
        os.unlink(tmp)
    folder = os.open(path.parent, os.O_RDONLY)
    try:
        os.fsync(folder)
    finally:
        os.close(folder)


class BlobStore(Protocol):
    """What the workflow needs of a store: bytes in by content, bytes out by SHA-256. ``Store``
    (local files) and ``objects.ObjectStore`` (an S3-compatible service) both are one."""

    def put(self, data: bytes) -> str: ...

    def get(self, digest: str) -> bytes: ...

    def discard(self, digest: str) -> None:
        """Remove a file that no row claims (a sealed pack whose sign-off lost); absent is fine."""


class Store:
    """Blobs under ``root/ab/cdef…``; a blob's name is its SHA-256, so it is written once."""

    def __init__(self, root: Path) -> None:
        self.root = root

    def path(self, digest: str) -> Path:
        if len(digest) != 64 or any(c not in "0123456789abcdef" for c in digest):
            raise NotFound(f"no stored file {digest!r}")
        return self.root / digest[:2] / digest[2:]

    def put(self, data: bytes) -> str:
        digest = hashlib.sha256(data).hexdigest()
        target = self.path(digest)
        if not target.exists():
            write_atomic(target, data)
        return digest

    def get(self, digest: str) -> bytes:
        target = self.path(digest)
        try:
            return target.read_bytes()
        except FileNotFoundError:
            raise NotFound(f"no stored file {digest}") from None

    def discard(self, digest: str) -> None:
        self.path(digest).unlink(missing_ok=True)

    def temporary(self) -> list[Path]:
        """Temporary files a write left behind when its process was killed (no row names one)."""
        return sorted(self.root.glob("*/.*")) if self.root.is_dir() else []
