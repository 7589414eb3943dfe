"""``GET /v1/ready``: 200 when the database, the store, the render workers and (if configured)
the build queue answer; 503 naming the one that does not. ``/v1/health`` only says the process is alive."""

from __future__ import annotations

import shutil
from pathlib import Path

import harness
import httpx
from ops_server import Start


def test_ready_when_everything_answers(start_server: Start) -> None:
    server = start_server()
    answer = httpx.get(f"{server.base}/v1/ready")
    assert answer.status_code == 200
    assert answer.json() == {
        "status": "ready",
        "checks": {"database": "ok", "store": "ok", "workers": "ok"},
    }


def test_not_ready_when_the_sqlite_folder_is_removed(start_server: Start, tmp_path: Path) -> None:
    folder = tmp_path / "archive"
    folder.mkdir()
    server = start_server(database_url=f"sqlite:///{folder / 'plumbline.db'}")
    assert httpx.get(f"{server.base}/v1/ready").status_code == 200
    shutil.rmtree(folder)
    answer = httpx.get(f"{server.base}/v1/ready")
    assert answer.status_code == 503
    problem = answer.json()
    assert problem["code"] == "not_ready"
    assert problem["checks"]["store"] == "ok"
    assert "is not there" in problem["checks"]["database"]
    assert "database:" in problem["detail"]
    assert httpx.get(f"{server.base}/v1/health").status_code == 200  # alive, not ready


def test_not_ready_when_the_store_cannot_be_written(start_server: Start) -> None:
    server = start_server()
    store = server.data_dir / "files"
    shutil.rmtree(store, ignore_errors=True)
    store.write_text("a file where the store's folder was")
    answer = httpx.get(f"{server.base}/v1/ready")
    assert answer.status_code == 503
    checks = answer.json()["checks"]
    assert checks["database"] == "ok"
    assert checks["store"] != "ok"
    store.unlink()
    assert httpx.get(f"{server.base}/v1/ready").status_code == 200  # back once it is


def test_not_ready_when_the_queue_stops(start_server: Start, tmp_path: Path) -> None:
    redis, port = harness.start_redis(tmp_path, "the queue readiness test")
    try:
        server = start_server(PLUMBLINE_QUEUE_URL=f"redis://127.0.0.1:{port}/0")
        answer = httpx.get(f"{server.base}/v1/ready", timeout=30)
        assert answer.status_code == 200, answer.text
        assert answer.json()["checks"]["queue"] == "ok"
        redis.terminate()
        redis.wait(timeout=10)
        answer = httpx.get(f"{server.base}/v1/ready", timeout=30)
        assert answer.status_code == 503
        checks = answer.json()["checks"]
        assert checks["queue"] != "ok"
        assert checks["database"] == "ok"
    finally:
        if redis.poll() is None:
            redis.kill()
            redis.wait(timeout=10)
