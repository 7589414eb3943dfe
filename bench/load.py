"""``python -m bench.load``: a bounded load test of background builds on loopback.

A real server (``plumbline serve`` in its own process, its own data folder) takes ``--clients``
concurrent clients posting small definitions with ``?wait=false`` for ``--seconds``. A ``429`` (the
queue is full) is honoured by waiting its ``Retry-After``. Afterwards every accepted job is waited
for, and the archive is checked: every job id distinct, every job ended *done*, one draft per job and
no draft without a job. Reports the latency of accepting a job (p50, p95, p99, max), the counts of
each status code and of 5xx (target: none), and writes ``load.json``.

``--soak``: a steady rate instead of a burst — ``--rate`` definitions a second, each posted with
``?wait=false`` on a fixed schedule (a slow answer does not slow the schedule) and its job polled
every ``--poll-every`` seconds until it ends, for ``--duration`` seconds. Every ``--sample-every``
seconds it samples the resident memory (RSS, from ``/proc``) of the service and of each of its
descendant processes (the render workers). Reports latency p50/p95/p99 of posts and polls, the
status codes (no 5xx allowed, no transport error), that every job ended done with one draft, and
the memory growth after the warm-up (the first ``--warmup`` seconds), which must stay under
``--max-growth-mb``; writes ``soak.json``.
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

from bench import generate
from service.archive.db import JobRow, PackRow, connect, engine_of
from service.workflow.keys import Role, create


def _free_port() -> int:
    with socket.socket() as sock:
        sock.bind(("127.0.0.1", 0))
        return int(sock.getsockname()[1])


def _definition() -> bytes:
    """A small pack (two charts), so the test measures the service, not one big render."""
    return generate.encoded(generate.sixty(charts=2))


def _start_server(
    folder: Path, workers: int, max_queued: int, env_extra: dict[str, str] | None = None
) -> tuple[subprocess.Popen[bytes], str]:
    port = _free_port()
    env = {
        **os.environ,
        "PLUMBLINE_DATA_DIR": str(folder),
        "PLUMBLINE_WORKERS": str(workers),
        "PLUMBLINE_MAX_QUEUED_JOBS": str(max_queued),
        **(env_extra or {}),
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


def _tally(session: Any) -> tuple[Counter[str], list[str], int]:
    """What the archive holds after a run: jobs by status, the packs jobs name, packs in all."""
    statuses = Counter(session.scalars(select(JobRow.status)).all())
    job_packs = [p for p in session.scalars(select(JobRow.pack_id)).all() if p]
    packs = session.scalar(select(func.count()).select_from(PackRow)) or 0
    return statuses, job_packs, packs


def _archive_url(folder: Path, database_url: str | None) -> str:
    """The archive the server uses: ``database_url`` (an empty PostgreSQL database, say), else a
    new SQLite file in the run's folder."""
    return database_url or f"sqlite:///{folder / 'plumbline.db'}"


def run(
    *,
    clients: int,
    seconds: float,
    workers: int,
    drain_s: float,
    max_queued: int = 100,
    database_url: str | None = None,
) -> dict[str, Any]:
    with tempfile.TemporaryDirectory(prefix="plumbline-load-") as tmp:
        folder = Path(tmp)
        url = _archive_url(folder, database_url)
        sessions = connect(url)
        _, secret = create(
            sessions, name="Load Tester", roles={Role.author}, families={"*"}, expires=None
        )
        process, base = _start_server(folder, workers, max_queued, {"PLUMBLINE_DATABASE_URL": url})
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
                statuses, job_packs, packs = _tally(session)
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


# --- soak: a steady rate for a long time, and memory ------------------------------------------


def _rss_kib(pid: int) -> int:
    """A process's resident set size in KiB (``VmRSS`` of ``/proc/<pid>/status``), 0 if gone."""
    try:
        for line in (Path("/proc") / str(pid) / "status").read_text().splitlines():
            if line.startswith("VmRSS:"):
                return int(line.split()[1])
    except (OSError, ValueError):
        return 0
    return 0


def _descendants(pid: int) -> list[int]:
    """Every live process below ``pid`` (children, their children, ...), from ``/proc``."""
    parents: dict[int, list[int]] = {}
    for entry in Path("/proc").iterdir():
        if not entry.name.isdigit():
            continue
        try:
            stat = (entry / "stat").read_text()
        except OSError:
            continue
        fields = stat[stat.rindex(")") + 2 :].split()
        if fields[0] != "Z":
            parents.setdefault(int(fields[1]), []).append(int(entry.name))
    found, todo = [], [pid]
    while todo:
        for child in parents.get(todo.pop(), []):
            found.append(child)
            todo.append(child)
    return sorted(found)


def memory(pid: int) -> dict[str, Any]:
    """The RSS of the service process and of its descendants, in MiB."""
    service = _rss_kib(pid) / 1024
    workers = {child: _rss_kib(child) / 1024 for child in _descendants(pid)}
    return {
        "service_mb": round(service, 1),
        "workers_mb": round(sum(workers.values()), 1),
        "processes": 1 + len(workers),
        "total_mb": round(service + sum(workers.values()), 1),
    }


def _latency(values: list[float]) -> dict[str, float]:
    return {
        "count": len(values),
        "p50": round(1000 * statistics.median(values), 1) if values else 0.0,
        "p95": round(1000 * _percentile(values, 0.95), 1),
        "p99": round(1000 * _percentile(values, 0.99), 1),
        "max": round(1000 * max(values, default=0.0), 1),
    }


async def _steady(
    base: str,
    secret: str,
    pid: int,
    *,
    rate: float,
    duration: float,
    poll_every: float,
    sample_every: float,
    drain_s: float,
    variants: int,
) -> dict[str, Any]:
    headers = {"Authorization": f"Bearer {secret}", "content-type": "application/json"}
    posts: list[float] = []
    polls: list[float] = []
    codes: Counter[int] = Counter()
    transport: Counter[str] = Counter()
    samples: list[dict[str, Any]] = []
    ended: Counter[str] = Counter()
    accepted: list[str] = []
    # a few distinct packs, posted in turn: each is drawn once, then its charts come from the
    # chart cache, as a month's packs rebuilt with small changes would
    bodies = [generate.encoded(generate.sixty(seed=n, charts=2)) for n in range(variants)]
    # idle connections are dropped before the server drops them (uvicorn: after 5 s), so a request
    # never goes out on a connection the server is closing at that moment
    limits = httpx.Limits(max_connections=64, max_keepalive_connections=32, keepalive_expiry=2.0)
    started = time.monotonic()

    async with httpx.AsyncClient(base_url=base, headers=headers, timeout=60, limits=limits) as http:

        async def send(
            method: str, url: str, into: list[float], **kw: Any
        ) -> httpx.Response | None:
            begun = time.perf_counter()
            try:
                response = await http.request(method, url, **kw)
            except httpx.TransportError as exc:
                transport[type(exc).__name__] += 1
                return None
            into.append(time.perf_counter() - begun)
            codes[response.status_code] += 1
            return response

        async def one(n: int) -> None:
            body = bodies[n % len(bodies)]
            response = await send(
                "POST", "/v1/reports", posts, params={"wait": "false"}, content=body
            )
            if response is None or response.status_code != 202:
                return
            job = str(response.json()["id"])
            accepted.append(job)
            give_up = time.monotonic() + duration + drain_s
            while time.monotonic() < give_up:
                await asyncio.sleep(poll_every)
                polled = await send("GET", f"/v1/jobs/{job}", polls)
                if polled is not None and polled.status_code == 200:
                    status = str(polled.json()["status"])
                    if status in ("done", "failed"):
                        ended[status] += 1
                        return
            ended["unfinished"] += 1

        async def sample() -> None:
            while True:
                at = round(time.monotonic() - started, 1)
                samples.append({"at_s": at, **memory(pid)})
                await asyncio.sleep(sample_every)

        sampler = asyncio.create_task(sample())
        tasks = []
        n = 0
        while (due := started + n / rate) < started + duration:
            await asyncio.sleep(max(0.0, due - time.monotonic()))
            tasks.append(asyncio.create_task(one(n)))
            n += 1
        await asyncio.gather(*tasks)
        sampler.cancel()
        samples.append({"at_s": round(time.monotonic() - started, 1), **memory(pid)})
    return {
        "posted": n,
        "accepted": accepted,
        "posts": posts,
        "polls": polls,
        "codes": codes,
        "transport_errors": dict(transport),
        "ended": dict(ended),
        "samples": samples,
        "elapsed_s": round(time.monotonic() - started, 1),
    }


def growth(samples: list[dict[str, Any]], warmup_s: float) -> dict[str, float]:
    """Memory growth after the warm-up: the last samples' median minus the first sample after
    warm-up (the median of three damps one sample caught mid-render), in MiB, for the service
    and for service and workers together."""
    after = [s for s in samples if s["at_s"] >= warmup_s] or samples[-1:]
    out: dict[str, float] = {}
    for key in ("service_mb", "total_mb"):
        first = statistics.median(s[key] for s in after[:3])
        last = statistics.median(s[key] for s in after[-3:])
        peak = max(s[key] for s in after)
        out[key.replace("_mb", "_growth_mb")] = round(last - first, 1)
        out[key.replace("_mb", "_peak_mb")] = round(peak, 1)
    return out


def soak(
    *,
    duration: float,
    rate: float,
    workers: int,
    poll_every: float = 1.0,
    sample_every: float = 10.0,
    warmup_s: float | None = None,
    drain_s: float = 300.0,
    max_queued: int = 200,
    variants: int = 20,
) -> dict[str, Any]:
    """A steady ``rate`` of definitions a second for ``duration`` seconds against a real server."""
    warmup = duration / 5 if warmup_s is None else warmup_s
    with tempfile.TemporaryDirectory(prefix="plumbline-soak-") as tmp:
        folder = Path(tmp)
        sessions = connect(f"sqlite:///{folder / 'plumbline.db'}")
        _, secret = create(
            sessions, name="Soak Tester", roles={Role.author}, families={"*"}, expires=None
        )
        process, base = _start_server(folder, workers, max_queued)
        try:
            found = asyncio.run(
                _steady(
                    base,
                    secret,
                    process.pid,
                    rate=rate,
                    duration=duration,
                    poll_every=poll_every,
                    sample_every=sample_every,
                    drain_s=drain_s,
                    variants=variants,
                )
            )
            with sessions() as session:
                statuses, job_packs, packs = _tally(session)
        finally:
            process.terminate()
            process.wait(timeout=120)
            engine_of(sessions).dispose()
    codes: Counter[int] = found["codes"]
    accepted: list[str] = found["accepted"]
    return {
        "duration_s": duration,
        "rate_per_s": rate,
        "workers": workers,
        "variants": variants,
        "elapsed_s": found["elapsed_s"],
        "posted": found["posted"],
        "accepted": len(accepted),
        "distinct_jobs": len(set(accepted)),
        "status_codes": {str(k): v for k, v in sorted(codes.items())},
        "server_errors": sum(v for k, v in codes.items() if k >= 500),
        "transport_errors": found["transport_errors"],
        "jobs_ended": found["ended"],
        "jobs_by_status": dict(statuses),
        "drafts": packs,
        "drafts_of_jobs": len(job_packs),
        "distinct_drafts_of_jobs": len(set(job_packs)),
        "post_latency_ms": _latency(found["posts"]),
        "poll_latency_ms": _latency(found["polls"]),
        "all_latency_ms": _latency(found["posts"] + found["polls"]),
        "warmup_s": warmup,
        "memory": growth(found["samples"], warmup),
        "memory_samples": found["samples"],
        "machine": {"cpus": os.cpu_count(), "python": sys.version.split()[0]},
    }


def soak_problems(result: dict[str, Any], max_growth_mb: float) -> list[str]:
    """What is wrong with a soak run (empty when it held steady)."""
    wrong = consistent(result)
    if result["transport_errors"]:
        wrong.append(f"requests failed without an answer: {result['transport_errors']}")
    if result["posted"] != result["accepted"]:
        wrong.append(f"only {result['accepted']} of {result['posted']} posts were accepted")
    for key in ("service_growth_mb", "total_growth_mb"):
        grown = result["memory"][key]
        if grown > max_growth_mb:
            wrong.append(f"memory grew {grown} MB after warm-up ({key}), over {max_growth_mb} MB")
    return wrong


def _soak_main(args: argparse.Namespace) -> int:
    result = soak(
        duration=args.duration,
        rate=args.rate,
        workers=args.workers,
        poll_every=args.poll_every,
        sample_every=args.sample_every,
        warmup_s=args.warmup,
        drain_s=args.drain,
        variants=args.variants,
    )
    result["max_growth_mb"] = args.max_growth_mb
    result["problems"] = soak_problems(result, args.max_growth_mb)
    args.out.mkdir(parents=True, exist_ok=True)
    (args.out / "soak.json").write_text(json.dumps(result, indent=2) + "\n")
    posts, polls, mem = result["post_latency_ms"], result["poll_latency_ms"], result["memory"]
    print(
        f"soak {result['duration_s']:g} s at {result['rate_per_s']:g}/s: {result['posted']} posts, "
        f"{polls['count']} polls, {result['status_codes']}, jobs {result['jobs_by_status']}; "
        f"post p50/p95/p99 {posts['p50']}/{posts['p95']}/{posts['p99']} ms, "
        f"poll p50/p95/p99 {polls['p50']}/{polls['p95']}/{polls['p99']} ms; memory after "
        f"warm-up: service {mem['service_growth_mb']:+} MB (peak {mem['service_peak_mb']}), "
        f"with workers {mem['total_growth_mb']:+} MB (peak {mem['total_peak_mb']}); "
        f"bound {args.max_growth_mb:g} MB"
    )
    for sample in result["memory_samples"]:
        print(
            f"  {sample['at_s']:7.1f} s  service {sample['service_mb']:7.1f} MB  "
            f"workers {sample['workers_mb']:7.1f} MB  ({sample['processes']} processes)"
        )
    for problem in result["problems"]:
        print(f"PROBLEM: {problem}")
    return 1 if result["problems"] else 0


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(prog="python -m bench.load", description=__doc__)
    parser.add_argument("--clients", type=int, default=50)
    parser.add_argument("--seconds", type=float, default=60.0)
    parser.add_argument("--workers", type=int, default=os.cpu_count() or 1)
    parser.add_argument("--drain", type=float, default=600.0, help="seconds to wait for the jobs")
    parser.add_argument("--out", type=Path, default=Path("out/bench"))
    parser.add_argument(
        "--database-url",
        default=None,
        help="an empty archive database for the server (e.g. PostgreSQL); default a new SQLite file",
    )
    soaking = parser.add_argument_group("soak (--soak): a steady rate, with memory sampled")
    soaking.add_argument("--soak", action="store_true", help="run the soak instead of the burst")
    soaking.add_argument("--duration", type=float, default=600.0, help="seconds of steady load")
    soaking.add_argument("--rate", type=float, default=2.0, help="definitions posted a second")
    soaking.add_argument("--poll-every", type=float, default=1.0, help="seconds between polls")
    soaking.add_argument("--sample-every", type=float, default=10.0, help="seconds between RSS")
    soaking.add_argument("--warmup", type=float, default=None, help="default: duration / 5")
    soaking.add_argument("--variants", type=int, default=20, help="distinct packs posted in turn")
    soaking.add_argument("--max-growth-mb", type=float, default=50.0)
    args = parser.parse_args(argv)
    if args.soak:
        return _soak_main(args)
    result = run(
        clients=args.clients,
        seconds=args.seconds,
        workers=args.workers,
        drain_s=args.drain,
        database_url=args.database_url,
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
