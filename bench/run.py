"""Run the benchmark: Plumbline's full pipeline against the plain-library floor, side by side.

Every measurement is one fresh child process (``python -m bench.run --child …``), so its
peak RSS is its own and "cold" includes starting Python and importing the stack. The parent reads
the child's wall time and its CPU time (user + sys, its own and that of any processes it waited
for, e.g. pool workers) from ``os.wait4``; the child reports its own peak RSS (``VmHWM``), the
largest of its workers', what it drew and the time of the work alone (after imports). Each side
runs ``repeat`` times, the sides interleaved; the median is reported.

Modes are rows of ``MODES``; a side is a function in ``SIDES``. A new mode (a process pool, a chart
cache) is a new side and a new row.
"""

from __future__ import annotations

import argparse
import cProfile
import importlib.util
import io
import json
import os
import platform
import pstats
import resource
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from bench import generate

# ---------------------------------------------------------------------------------------------
# Sides: what one child process does. Each takes the definition's bytes and the limits' name and
# returns the finished PDF, plus the (start, end) of the window to time as "work" when that is not
# the whole call (a warm re-render times only its second render).

Timed = tuple[bytes, float | None]
"""The PDF, and the seconds of the measured part when the side measures a part itself."""


@dataclass(frozen=True)
class Where:
    """What a side is told besides the definition: which limits, and a folder for a chart cache."""

    limits: str = "default"
    cache: Path | None = None


def _limits(name: str) -> Any:
    from service.config import Limits

    return generate.big_limits() if name == "big" else Limits()


def _plumbline(raw: bytes, where: Where, **options: Any) -> bytes:
    """The full pipeline (validation, checks, render, assembly) and PDF/A preparation."""
    from service import pipeline, seal

    if options:
        from service.render.options import RenderOptions

        built = pipeline.build(raw, _limits(where.limits), options=RenderOptions(**options))
    else:
        built = pipeline.build(raw, _limits(where.limits))
    return seal.seal_unsigned(built.pdf, raw)


def side_floor(raw: bytes, where: Where) -> Timed:
    from bench import floor

    return floor.build(raw).pdf, None


def side_plumbline(raw: bytes, where: Where) -> Timed:
    """One process draws every chart, no cache: Plumbline's default."""
    return _plumbline(raw, where), None


def side_plumbline_pool(raw: bytes, where: Where) -> Timed:
    """Charts drawn over a process pool of one worker per core (this process included).

    The pool is shut down before the side returns, so its workers' CPU and peak RSS are counted."""
    from service.render import pool

    pdf = _plumbline(raw, where, workers=max(1, os.cpu_count() or 1))
    pool.shutdown()
    return pdf, None


def side_plumbline_cached(raw: bytes, where: Where) -> Timed:
    """A fresh process, the chart cache already holding this pack's charts (a re-render, e.g.
    verification's, or the sign-off render of a reviewed pack)."""
    if where.cache is None:
        raise ValueError("the cached side needs a cache folder (--cache)")
    return _plumbline(raw, where, cache_dir=where.cache), None


def _needs(module: str) -> Callable[[], str | None]:
    def why_not() -> str | None:
        try:
            found = importlib.util.find_spec(module)
        except ModuleNotFoundError:
            found = None
        return None if found is not None else f"{module} is not in this build yet"

    return why_not


def _always() -> str | None:
    return None


SIDES: dict[str, Callable[[bytes, Where], Timed]] = {
    "floor": side_floor,
    "plumbline": side_plumbline,
    "plumbline-pool": side_plumbline_pool,
    "plumbline-cached": side_plumbline_cached,
}


@dataclass(frozen=True)
class Mode:
    name: str
    pack: str  # a key of generate.PACKS
    side: str  # Plumbline's side (a key of SIDES)
    target: float | None  # Plumbline / floor, at most
    metric: str = "wall"  # "wall": the whole cold process; "work": the side's own timed part
    limits: str = "default"
    relative_to: str | None = None  # another mode whose Plumbline wall this one is compared to
    relative_target: float | None = None
    rss_target_mb: float | None = None
    prime: bool = False  # run Plumbline's side once, unmeasured, first (fills a cache)
    available: Callable[[], str | None] = field(default=_always)


MODES: tuple[Mode, ...] = (
    Mode("cold-1-worker", "sixty", "plumbline", target=1.0),
    Mode(
        "cold-pool",
        "sixty",
        "plumbline-pool",
        target=0.6,
        available=_needs("service.render.pool"),
    ),
    Mode(
        "rerender-cached",
        "sixty",
        "plumbline-cached",
        target=0.15,
        prime=True,
        available=_needs("service.render.cache"),
    ),
    Mode(
        "million-rows",
        "million",
        "plumbline",
        target=None,
        limits="big",
        relative_to="cold-1-worker",
        relative_target=2.0,
        rss_target_mb=600.0,
    ),
    Mode(
        "long-trend",
        "long_trend",
        "plumbline",
        target=None,
        limits="big",
        relative_to="cold-1-worker",
        relative_target=2.0,
        rss_target_mb=600.0,
    ),
)


# ---------------------------------------------------------------------------------------------
# The child process.


def placed_charts(pdf: bytes) -> tuple[int, int]:
    """(form XObjects placed on the pages, pages): the same count for both sides' files."""
    import pikepdf

    with pikepdf.open(io.BytesIO(pdf)) as doc:
        forms = 0
        for page in doc.pages:
            resources = page.obj.get("/Resources")
            xobjects = resources.get("/XObject") if resources is not None else None
            if xobjects is None:
                continue
            forms += sum(obj.get("/Subtype") == pikepdf.Name.Form for _key, obj in xobjects.items())
        return forms, len(doc.pages)


def child(side: str, pack: Path, where: Where, result: Path, pdf_out: Path | None) -> None:
    started = time.perf_counter()
    raw = pack.read_bytes()
    pdf, part = SIDES[side](raw, where)
    work = time.perf_counter() - started
    charts, pages = placed_charts(pdf)
    if pdf_out is not None:
        pdf_out.write_bytes(pdf)
    facts = {"work": part if part is not None else work, "charts": charts, "pages": pages}
    memory = {"rss_mb": peak_rss_mb(), "rss_children_mb": _children_rss_mb()}
    result.write_text(json.dumps(facts | memory | {"bytes": len(pdf)}))


def peak_rss_mb() -> float:
    """This process's own peak RSS since it started (``VmHWM``).

    Not ``ru_maxrss`` from ``wait4``: Linux carries the parent's high-water mark across fork and
    exec into the child's, so every child of a big parent reads as at least the parent's size."""
    for line in Path("/proc/self/status").read_text().splitlines():
        if line.startswith("VmHWM:"):
            return int(line.split()[1]) / 1024
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024  # kilobytes on Linux


def _children_rss_mb() -> float:
    """The largest peak RSS of any process this one waited for (pool workers), 0 if none."""
    return resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss / 1024


def profile_child(side: str, pack: Path, where: Where, out: Path, top: int = 40) -> None:
    raw = pack.read_bytes()
    profiler = cProfile.Profile()
    started = time.perf_counter()
    profiler.enable()
    SIDES[side](raw, where)
    profiler.disable()
    total = time.perf_counter() - started
    buffer = io.StringIO()
    stats = pstats.Stats(profiler, stream=buffer)
    rows = []
    for (filename, line, name), (_cc, calls, _tt, cum, _callers) in stats.stats.items():  # type: ignore[attr-defined]
        rows.append((cum, calls, f"{_short(filename)}:{line}({name})"))
    rows.sort(reverse=True)
    lines = [f"# {side} on {pack.name}: {total:.2f} s under cProfile (cumulative, top {top})"]
    lines.append(f"{'cumulative s':>12} {'share':>6} {'calls':>9}  function")
    lines += [
        f"{cum:12.3f} {cum / total:6.1%} {calls:9d}  {where}" for cum, calls, where in rows[:top]
    ]
    out.write_text("\n".join(lines) + "\n")


_ROOT = f"{Path(__file__).resolve().parents[1]}/"  # this checkout: paths shown from here


def _short(filename: str) -> str:
    for marker in ("site-packages/", _ROOT, "lib/python3"):
        if marker in filename:
            return filename.split(marker, 1)[1]
    return filename


# ---------------------------------------------------------------------------------------------
# The parent.

#: The packs ``--profile`` profiles, and the file each profile goes to.
PROFILES = (
    ("sixty", "profile-60.txt"),
    ("million", "profile-1m.txt"),
    ("long_trend", "profile-long-trend.txt"),
)


@dataclass(frozen=True)
class Sample:
    wall: float
    cpu: float
    rss_mb: float
    rss_children_mb: float
    work: float
    charts: int
    pages: int
    bytes: int


def measure(
    side: str, pack: Path, limits: str, pdf_out: Path | None = None, cache: Path | None = None
) -> Sample:
    """One fresh child process running ``side`` on ``pack``."""
    with tempfile.TemporaryDirectory() as folder:
        result = Path(folder) / "result.json"
        command = [sys.executable, "-m", "bench.run", "--child", side, str(pack)]
        command += ["--limits", limits, "--result", str(result)]
        if pdf_out is not None:
            command += ["--pdf", str(pdf_out)]
        if cache is not None:
            command += ["--cache", str(cache)]
        started = time.perf_counter()
        process = subprocess.Popen(command)
        _pid, status, usage = os.wait4(process.pid, 0)
        wall = time.perf_counter() - started
        process.returncode = os.waitstatus_to_exitcode(status)
        if process.returncode != 0:
            raise RuntimeError(f"the {side} side failed on {pack.name} (exit {process.returncode})")
        facts = json.loads(result.read_text())
    return Sample(
        wall=wall,
        cpu=usage.ru_utime + usage.ru_stime,
        rss_mb=facts["rss_mb"],
        rss_children_mb=facts["rss_children_mb"],
        work=facts["work"],
        charts=facts["charts"],
        pages=facts["pages"],
        bytes=facts["bytes"],
    )


def summarise(samples: list[Sample]) -> dict[str, Any]:
    def median(name: str) -> float:
        return round(float(statistics.median(getattr(s, name) for s in samples)), 3)

    last = samples[-1]
    return {
        "wall_s": median("wall"),
        "cpu_s": median("cpu"),
        "rss_mb": median("rss_mb"),
        "rss_children_mb": median("rss_children_mb"),
        "work_s": median("work"),
        "charts": last.charts,
        "pages": last.pages,
        "bytes": last.bytes,
        "samples_wall_s": [round(s.wall, 3) for s in samples],
    }


def machine() -> dict[str, Any]:
    from importlib.metadata import version

    libraries = ("matplotlib", "pandas", "numpy", "reportlab", "pikepdf", "pydantic")
    return {
        "cpu_count": os.cpu_count(),
        "python": platform.python_version(),
        "platform": platform.platform(),
        **{name: version(name) for name in libraries},
    }


def run_mode(
    mode: Mode, packs: dict[str, Path], out: Path, repeat: int, floors: dict[str, list[Sample]]
) -> dict[str, Any]:
    """Plumbline's side ``repeat`` times; the floor on the same pack ``repeat`` times, once per
    pack (``floors`` keeps its samples for the next mode on that pack)."""
    pack = packs[mode.pack]
    cache = None
    if mode.prime:
        cache = out / "cache" / mode.name
        shutil.rmtree(cache, ignore_errors=True)
        cache.mkdir(parents=True)
        measure(mode.side, pack, mode.limits, cache=cache)
    theirs = floors.setdefault(mode.pack, [])
    ours: list[Sample] = []
    for attempt in range(repeat):
        keep = attempt == 0
        if len(theirs) < repeat:
            pdf = out / f"floor-{mode.pack}.pdf" if keep else None
            theirs.append(measure("floor", pack, mode.limits, pdf))
        pdf = out / f"plumbline-{mode.name}.pdf" if keep else None
        ours.append(measure(mode.side, pack, mode.limits, pdf, cache))
    plumbline, floor = summarise(ours), summarise(theirs)
    key = "work_s" if mode.metric == "work" else "wall_s"
    ratio = round(plumbline[key] / floor[key], 3)
    return {
        "pack": mode.pack,
        "metric": key,
        "plumbline": plumbline,
        "floor": floor,
        "ratio": ratio,
        "cpu_ratio": round(plumbline["cpu_s"] / floor["cpu_s"], 3),
        "targets": {
            "ratio_at_most": mode.target,
            "relative_to": mode.relative_to,
            "relative_at_most": mode.relative_target,
            "rss_mb_below": mode.rss_target_mb,
        },
    }


def judge(result: dict[str, Any], results: dict[str, Any]) -> None:
    """Fill in the comparisons with another mode and whether each target is met."""
    targets = result["targets"]
    met: dict[str, bool] = {}
    if targets["ratio_at_most"] is not None:
        met["ratio"] = result["ratio"] <= targets["ratio_at_most"]
    other = results.get(targets["relative_to"] or "")
    if other is not None and "plumbline" in other:
        relative = result["plumbline"]["wall_s"] / other["plumbline"]["wall_s"]
        result["relative"] = round(relative, 3)
        if targets["relative_at_most"] is not None:
            met["relative"] = relative <= targets["relative_at_most"]
    if targets["rss_mb_below"] is not None:
        met["rss"] = result["plumbline"]["rss_mb"] < targets["rss_mb_below"]
    result["met"] = met


def plot(results: dict[str, Any], path: Path) -> None:
    from matplotlib.figure import Figure

    bars: list[tuple[str, float, float | None]] = []
    for name, result in results.items():
        if "ratio" not in result:
            continue
        bars.append((f"{name}\nvs floor", result["ratio"], result["targets"]["ratio_at_most"]))
        if "relative" in result:
            other = result["targets"]["relative_to"]
            bars.append(
                (f"{name}\nvs {other}", result["relative"], result["targets"]["relative_at_most"])
            )
    figure = Figure(figsize=(max(4.0, 1.3 * len(bars) + 1.5), 3.2), layout="constrained")
    ax = figure.add_subplot()
    xs = list(range(len(bars)))
    ax.bar(xs, [b[1] for b in bars], color="#1f5f8b", width=0.6)
    for x, (_label, value, target) in zip(xs, bars, strict=True):
        ax.text(x, value, f"{value:.2f}×", ha="center", va="bottom", fontsize=8)
        if target is not None:
            ax.plot([x - 0.4, x + 0.4], [target, target], color="#b3261e", linewidth=1.5)
    ax.set_xticks(xs, [b[0] for b in bars], fontsize=7)
    ax.set_ylabel("ratio (lower is faster); red: target")
    ax.axhline(1.0, color="#777777", linewidth=0.6, linestyle="--")
    figure.savefig(path, dpi=120)


def table(results: dict[str, Any], skipped: dict[str, str]) -> str:
    head = (
        f"{'mode':<16}{'plumbline s':>12}{'floor s':>9}{'ratio':>7}{'target':>8}{'cpu ratio':>10}"
    )
    head += f"{'RSS MB':>8}{'relative':>9}  met"
    lines = [head]
    for name, r in results.items():
        target = r["targets"]["ratio_at_most"]
        relative = r.get("relative")
        met = ", ".join(f"{k} {'yes' if v else 'NO'}" for k, v in r["met"].items())
        key = r["metric"]
        lines.append(
            f"{name:<16}{r['plumbline'][key]:>12.2f}{r['floor'][key]:>9.2f}{r['ratio']:>7.2f}"
            f"{'≤' + format(target, '.2f') if target is not None else '-':>8}{r['cpu_ratio']:>10.2f}"
            f"{r['plumbline']['rss_mb']:>8.0f}{format(relative, '.2f') if relative else '-':>9}  {met}"
        )
    lines += [f"{name:<16}skipped: {why}" for name, why in skipped.items()]
    return "\n".join(lines) + "\n"


def write_packs(
    folder: Path, seed: int, charts: int, rows: int, wanted: set[str]
) -> dict[str, Path]:
    folder.mkdir(parents=True, exist_ok=True)
    makers: dict[str, Callable[[], dict[str, Any]]] = {
        "sixty": lambda: generate.sixty(seed, charts),
        "million": lambda: generate.million(seed, rows),
        "long_trend": lambda: generate.long_trend(seed, min(rows, 200_000)),
    }
    out = {}
    for name in sorted(wanted):
        path = folder / f"{name}.json"
        path.write_bytes(generate.encoded(makers[name]()))
        out[name] = path
    return out


def _as_child(parser: argparse.ArgumentParser, args: argparse.Namespace) -> int:
    side, pack = args.child[0], Path(args.child[1])
    where = Where(limits=args.limits, cache=args.cache)
    if args.profile_to:
        profile_child(side, pack, where, args.profile_to)
    elif args.result is not None:
        child(side, pack, where, args.result, args.pdf)
    else:
        parser.error("--child needs --result or --profile-to")
    return 0


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(prog="python -m bench", description=__doc__)
    parser.add_argument("--out", type=Path, default=Path("out/bench"))
    parser.add_argument("--repeat", type=int, default=3)
    parser.add_argument("--seed", type=int, default=2026)
    parser.add_argument("--charts", type=int, default=60, help="charts in the mixed pack")
    parser.add_argument("--rows", type=int, default=1_000_000, help="rows of the long packs")
    parser.add_argument("--modes", default=",".join(m.name for m in MODES))
    parser.add_argument("--profile", action="store_true", help="also write profile-60/-1m.txt")
    parser.add_argument("--child", nargs=2, metavar=("SIDE", "PACK"), help=argparse.SUPPRESS)
    parser.add_argument("--limits", default="default", help=argparse.SUPPRESS)
    parser.add_argument("--result", type=Path, help=argparse.SUPPRESS)
    parser.add_argument("--pdf", type=Path, help=argparse.SUPPRESS)
    parser.add_argument("--profile-to", type=Path, help=argparse.SUPPRESS)
    parser.add_argument("--cache", type=Path, help=argparse.SUPPRESS)
    args = parser.parse_args(argv)
    if args.child:
        return _as_child(parser, args)
    if args.repeat < 1 or args.charts < 2:
        parser.error("--repeat must be at least 1 and --charts at least 2")
    names = [n.strip() for n in args.modes.split(",") if n.strip()]
    unknown = [n for n in names if n not in {m.name for m in MODES}]
    if unknown:
        parser.error(
            f"unknown mode(s) {', '.join(unknown)}; known: {', '.join(m.name for m in MODES)}"
        )
    chosen = [m for m in MODES if m.name in names]
    skipped = {m.name: why for m in chosen if (why := m.available()) is not None}
    runnable = [m for m in chosen if m.name not in skipped]
    wanted = {m.pack for m in runnable} | ({p for p, _ in PROFILES} if args.profile else set())
    out: Path = args.out
    packs = write_packs(out / "packs", args.seed, args.charts, args.rows, wanted)
    results: dict[str, Any] = {}
    floors: dict[str, list[Sample]] = {}
    for mode in runnable:
        sys.stderr.write(f"bench: {mode.name} ({args.repeat}×)\n")
        results[mode.name] = run_mode(mode, packs, out, args.repeat, floors)
    for result in results.values():
        judge(result, results)
    document = {
        "machine": machine(),
        "settings": {
            "repeat": args.repeat,
            "seed": args.seed,
            "charts": args.charts,
            "rows": args.rows,
        },
        "modes": results,
        "skipped": skipped,
    }
    (out / "results.json").write_text(json.dumps(document, indent=2) + "\n")
    plot(results, out / "ratios.png")
    if args.profile:
        for which, name in PROFILES:
            sys.stderr.write(f"bench: profiling {which}\n")
            limits = "default" if which == "sixty" else "big"
            command = [sys.executable, "-m", "bench.run", "--child", "plumbline"]
            command += [str(packs[which]), "--limits", limits, "--profile-to", str(out / name)]
            subprocess.run(command, check=True)
    sys.stdout.write(table(results, skipped))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
