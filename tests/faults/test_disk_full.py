"""A full disk while a pack is written: the request is answered 507 Insufficient Storage saying the
disk is full, no partial file is left (or claimed), every pack archived before is unchanged, the
service keeps answering, and once there is room again the same request succeeds.

The disk is real and really full: the service runs in its own user and mount namespace
(``unshare --user --map-root-user --mount``, which needs no privilege on a Linux kernel that allows
unprivileged user namespaces) with a small tmpfs mounted over its file store. The test reaches that
filesystem through ``/proc/<pid>/root``, fills it with a file of its own (something else took the
space), and removes that file to make room. Why not the alternatives: ``RLIMIT_FSIZE`` limits one
file's size (EFBIG), not the disk, and would also stop the SQLite file and the log; a loop device or
a plain ``mount`` needs root. The database stays on the ordinary disk: a full disk under the SQLite
file is a separate case (``database or disk is full``, also answered 507).

Without ``unshare`` or user namespaces this test is skipped with a loud reason, unless
``PLUMBLINE_REQUIRE_FAULTS=1``, which turns that into a failure.
"""

from __future__ import annotations

import errno
import hashlib
import json
import shutil
import subprocess
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import consistency
import harness
import httpx
import pytest
import serving

DEMO = serving.ROOT / "sample_requests" / "bus-cooperative-monthly.json"
STORE_BYTES = 2 * 1024 * 1024
"""The tmpfs under the store: room for a few demo-sized packs (about 190 KB each)."""


def _namespaces_work(folder: Path) -> str | None:
    """Why a small tmpfs cannot be mounted in a user namespace here, or None if it can."""
    if shutil.which("unshare") is None:
        return "there is no unshare command (util-linux)"
    folder.mkdir()
    done = subprocess.run(
        ["unshare", "--user", "--map-root-user", "--mount", "sh", "-c",
         f'mount -t tmpfs -o size=64k tmpfs "{folder}" && touch "{folder}/probe"'],
        capture_output=True, text=True, check=False,
    )  # fmt: skip
    if done.returncode != 0:
        return f"a tmpfs cannot be mounted in a user namespace: {done.stderr.strip()}"
    return None


def _variant(n: int) -> bytes:
    """The demo with another title: new definition and PDF bytes each time."""
    definition = json.loads(DEMO.read_bytes())
    definition["report"]["title"] = f"{definition['report']['title']} (copy {n})"
    return json.dumps(definition).encode()


def _fill(path: Path) -> int:
    """Write zeros to ``path`` until the filesystem refuses; returns how many bytes fit."""
    written = 0
    with path.open("wb", buffering=0) as out:
        for size in (64 * 1024, 4096, 1):  # big chunks, then what is left, page by page
            while True:
                try:
                    written += out.write(bytes(size)) or 0
                except OSError as exc:
                    if exc.errno != errno.ENOSPC:
                        raise
                    break
    return written


@pytest.fixture
def server(tmp_path: Path) -> Iterator[tuple[serving.Server, dict[str, str], Path]]:
    why = _namespaces_work(tmp_path / "probe")
    if why is not None:
        harness.missing("PLUMBLINE_REQUIRE_FAULTS", "the full-disk fault test", why)
    store = tmp_path / "files"
    store.mkdir()
    secrets = serving.keys(f"sqlite:///{tmp_path / 'plumbline.db'}")
    prefix = [
        "unshare", "--user", "--map-root-user", "--mount", "sh", "-c",
        f'mount -t tmpfs -o size={STORE_BYTES} tmpfs "{store}" && exec "$@"', "plumbline",
    ]  # fmt: skip
    env = {"PLUMBLINE_WORKERS": "1", "PLUMBLINE_CHART_CACHE": "false"}
    running = serving.Server(tmp_path, env, prefix=prefix).start()
    # the store as the service sees it: the tmpfs in its mount namespace
    yield running, secrets, Path(f"/proc/{running.pid}/root") / store.relative_to("/")
    running.stop()


def test_a_full_disk_is_answered_507_and_loses_nothing(
    server: tuple[serving.Server, dict[str, str], Path],
) -> None:
    running, secrets, store = server
    url = f"sqlite:///{running.data_dir / 'plumbline.db'}"
    assert not (running.data_dir / "files" / "probe").exists()
    with running.client(secrets["author"]) as http:
        kept = []
        for n in range(2):
            created = http.post("/v1/reports", content=_variant(n))
            assert created.status_code == 201, created.text
            kept.append(created.json())
        assert sorted(p.parent.name + p.name for p in store.glob("*/*"))  # on the tmpfs
        before = {p["id"]: http.get(f"/v1/reports/{p['id']}/pdf").content for p in kept}

        filler = store / "other-data"
        assert _fill(filler) > 0  # something else took the rest of the disk

        full = http.post("/v1/reports", content=_variant(9))
        _is_full(full)
        found = consistency.check(url, store)
        assert set(found.packs) == {p["id"] for p in kept}
        assert found.temporary == []  # the interrupted write left no partial file
        for pack_id, pdf in before.items():  # what was archived is there, byte for byte
            again = http.get(f"/v1/reports/{pack_id}/pdf")
            assert again.status_code == 200
            assert again.content == pdf
            assert hashlib.sha256(pdf).hexdigest() == found.packs[pack_id].pdf_sha256

        # a background build on the full disk fails its job with the same reason
        queued = http.post("/v1/reports", params={"wait": "false"}, content=_variant(8))
        assert queued.status_code == 202, queued.text
        job_url = f"/v1/jobs/{queued.json()['id']}"
        serving.wait_for(
            lambda: http.get(job_url).json()["status"] in ("done", "failed"), 120, "the job"
        )
        job = http.get(job_url).json()
        assert job["status"] == "failed", job
        assert job["error"]["code"] == "insufficient_storage"
        assert job["error"]["status"] == 507
        assert "the disk is full" in job["error"]["detail"]
        assert http.get("/v1/health").status_code == 200  # still serving
        assert http.get("/v1/reports").json()["total"] == 2

        filler.unlink()  # room again: the same request now succeeds
        retried = http.post("/v1/reports", content=_variant(9))
        assert retried.status_code == 201, retried.text
    found = consistency.check(url, store)
    assert len(found.packs) == 3
    assert found.temporary == []


def _is_full(response: httpx.Response) -> None:
    assert response.status_code == 507, response.text
    assert response.headers["content-type"].startswith("application/problem+json")
    problem: dict[str, Any] = response.json()
    assert problem["code"] == "insufficient_storage"
    assert "the disk is full" in problem["detail"]
    assert "nothing was saved" in problem["detail"]
    assert "Traceback" not in response.text
