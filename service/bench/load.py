"""``python -m service.bench.load``: a bounded load test of background builds on loopback.

A real server (``plumbline serve`` in its own process, its own data folder) takes ``--clients``
concurrent clients posting small definitions with ``?wait=false`` for ``--seconds``. A ``429`` (the
queue is full) is honoured by waiting its ``Retry-After``. Afterwards every accepted job is waited
for, and the archive is checked: every job id distinct, every job ended *done*, one draft per job and
no draft without a job. Reports the latency of accepting a job (p50, p95, p99, max), the counts of
each status code and of 5xx (target: none), and writes ``load.json``.
"""

from __future__ import annotations

import argparse
import asyncio
import json
import os
import socket
import statistics
import subprocess
import sys
import tempfile
import time
from collections import Counter
from pathlib import Path
from typing import Any

import httpx
from sqlalchemy import func, select

from service.archive.db import JobRow, PackRow, connect, engine_of
from service.bench import generate
from service.workflow.keys import Role, create


def _free_port() -> int:
    with socket.socket() as sock:
        sock.bind(("127.0.0.1", 0))
        return int(sock.getsockname()[1])


def _definition() -> bytes:
    """A small pack (two charts), so the test measures the service, not one big render."""
    return generate.encoded(generate.sixty(charts=2))


def _start_server(
    folder: Path, workers: int, max_queued: int
) -> tuple[subprocess.Popen[bytes], str]:
    port = _free_port()
    env = {
        **os.environ,
        "PLUMBLINE_DATA_DIR": str(folder),
        "PLUMBLINE_WORKERS": str(workers),
        "PLUMBLINE_MAX_QUEUED_JOBS": str(max_queued),
    }
    with (folder / "server.log").open("wb") as log:
        process = subprocess.Popen(
            [sys.executable, "-m", "service.cli", "serve", "--port", str(port)],
            env=env,
            stdout=log,
            stderr=subprocess.STDOUT,
        )
    base = f"http://127.0.0.1:{port}"
    deadline = time.monotonic() + 60
    while time.monotonic() < deadline:
        try:
            if httpx.get(f"{base}/v1/health", timeout=1).status_code == 200:
                return process, base
        except httpx.TransportError:
            pass
        time.sleep(0.2)
    process.kill()
    raise RuntimeError((folder / "server.log").read_text())


async def _client(
    base: str,
    secret: str,
    body: bytes,
    until: float,
    *,
    latencies: list[float],
    codes: Counter[int],
) -> list[str]:
    accepted: list[str] = []
    headers = {"Authorization": f"Bearer {secret}", "content-type": "application/json"}
    async with httpx.AsyncClient(base_url=base, headers=headers, timeout=60) as http:
        while time.monotonic() < until:
            started = time.perf_counter()
            response = await http.post("/v1/reports", params={"wait": "false"}, content=body)
            latencies.append(time.perf_counter() - started)
            codes[response.status_code] += 1
            if response.status_code == 202:
                accepted.append(str(response.json()["id"]))
            elif response.status_code == 429:
                await asyncio.sleep(min(2.0, float(response.headers.get("Retry-After", "1"))))
    return accepted


async def _load(base: str, secret: str, clients: int, seconds: float) -> dict[str, Any]:
    body = _definition()
    latencies: list[float] = []
    codes: Counter[int] = Counter()
    until = time.monotonic() + seconds
    runs = [
        _client(base, secret, body, until, latencies=latencies, codes=codes) for _ in range(clients)
    ]
    accepted = [job for found in await asyncio.gather(*runs) for job in found]
    return {"accepted": accepted, "latencies": latencies, "codes": codes}


def _percentile(values: list[float], share: float) -> float:
    ordered = sorted(values)
    return ordered[min(len(ordered) - 1, int(share * len(ordered)))] if ordered else 0.0


def run(
    *, clients: int, seconds: float, workers: int, drain_s: float, max_queued: int = 100
) -> dict[str, Any]:
    with tempfile.TemporaryDirectory(prefix="plumbline-load-") as tmp:
        folder = Path(tmp)
        sessions = connect(f"sqlite:///{folder / 'plumbline.db'}")
        _, secret = create(
            sessions, name="Load Tester", roles={Role.author}, families={"*"}, expires=None
        )
        process, base = _start_server(folder, workers, max_queued)
        try:
            found = asyncio.run(_load(base, secret, clients, seconds))
            accepted: list[str] = found["accepted"]
            deadline = time.monotonic() + drain_s
            with sessions() as session:
                while time.monotonic() < deadline:
                    open_ = session.scalar(
                        select(func.count())
                        .select_from(JobRow)
                        .where(JobRow.status.in_(("queued", "running")))
                    )
                    if not open_:
                        break
                    time.sleep(0.5)
                    session.expire_all()
                statuses = Counter(session.scalars(select(JobRow.status)).all())
                job_packs = [p for p in session.scalars(select(JobRow.pack_id)).all() if p]
                packs = session.scalar(select(func.count()).select_from(PackRow)) or 0
        finally:
            process.terminate()
            process.wait(timeout=60)
            engine_of(sessions).dispose()
    latencies = found["latencies"]
    codes: Counter[int] = found["codes"]
    return {
        "clients": clients,
        "seconds": seconds,
        "workers": workers,
        "requests": len(latencies),
        "status_codes": {str(k): v for k, v in sorted(codes.items())},
        "server_errors": sum(v for k, v in codes.items() if k >= 500),
        "accepted": len(accepted),
        "distinct_jobs": len(set(accepted)),
        "jobs_by_status": dict(statuses),
        "drafts": packs,
        "drafts_of_jobs": len(job_packs),
        "distinct_drafts_of_jobs": len(set(job_packs)),
        "accept_latency_ms": {
            "p50": round(1000 * statistics.median(latencies), 1) if latencies else 0.0,
            "p95": round(1000 * _percentile(latencies, 0.95), 1),
            "p99": round(1000 * _percentile(latencies, 0.99), 1),
            "max": round(1000 * max(latencies, default=0.0), 1),
        },
        "machine": {"cpus": os.cpu_count(), "python": sys.version.split()[0]},
    }


def consistent(result: dict[str, Any]) -> list[str]:
    """What is wrong with a run's outcome (empty when nothing was lost, duplicated or failed)."""
    wrong = []
    if result["server_errors"]:
        wrong.append(f"{result['server_errors']} answers were 5xx")
    if result["distinct_jobs"] != result["accepted"]:
        wrong.append("a job id was given twice")
    if result["jobs_by_status"].get("done", 0) != result["accepted"]:
        wrong.append(f"not every accepted job ended done: {result['jobs_by_status']}")
    if not result["drafts"] == result["drafts_of_jobs"] == result["distinct_drafts_of_jobs"]:
        wrong.append("drafts and jobs do not match one to one")
    return wrong


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(prog="python -m service.bench.load", description=__doc__)
    parser.add_argument("--clients", type=int, default=50)
    parser.add_argument("--seconds", type=float, default=60.0)
    parser.add_argument("--workers", type=int, default=os.cpu_count() or 1)
    parser.add_argument("--drain", type=float, default=600.0, help="seconds to wait for the jobs")
    parser.add_argument("--out", type=Path, default=Path("out/bench"))
    args = parser.parse_args(argv)
    result = run(
        clients=args.clients, seconds=args.seconds, workers=args.workers, drain_s=args.drain
    )
    result["problems"] = consistent(result)
    args.out.mkdir(parents=True, exist_ok=True)
    (args.out / "load.json").write_text(json.dumps(result, indent=2) + "\n")
    latency = result["accept_latency_ms"]
    print(
        f"{result['clients']} clients × {result['seconds']:g} s: {result['requests']} requests "
        f"{result['status_codes']}, {result['accepted']} jobs accepted, "
        f"{result['jobs_by_status']}; accept latency p50 {latency['p50']} ms, "
        f"p95 {latency['p95']} ms, p99 {latency['p99']} ms (target p95 ≤ 100 ms)"
    )
    for problem in result["problems"]:
        print(f"PROBLEM: {problem}")
    return 1 if result["problems"] else 0


if __name__ == "__main__":
    raise SystemExit(main())
