"""Charts drawn in worker processes give the same pack, byte for byte, as charts drawn serially."""

from __future__ import annotations

import io
import json
import multiprocessing
import os
import subprocess
import sys
from collections.abc import Iterator
from concurrent.futures import ProcessPoolExecutor
from pathlib import Path

import pikepdf
import pytest
from factories import make_category_dataset, make_compare_chart, make_definition, make_monthly
from factories import make_trend_chart as trend

from service import pipeline
from service.config import Limits
from service.errors import InvalidRequest
from service.render import groups, pool
from service.render.options import RenderOptions

ROOT = Path(__file__).parents[2]
DEMO = (ROOT / "sample_requests" / "bus-cooperative-monthly.json").read_bytes()
MONTHS = [f"2026-{m:02d}-01" for m in range(1, 11)]


def twenty_charts() -> bytes:
    """A generated pack of 20 charts: ten monthly trends and ten route comparisons."""
    datasets = [
        make_monthly(MONTHS, [1000.0 + 37 * k + 11 * i * (k % 3) for i in range(10)], name=f"r{k}")
        for k in range(5)
    ]
    datasets += [
        make_category_dataset(
            {f"Route {r}": 70.0 + ((r * 7 + k * 5) % 25) for r in range(1, 7)}, name=f"p{k}"
        )
        for k in range(5)
    ]
    charts = [
        trend(id=f"trend-{i}", title=f"Boardings by month, depot {i}", dataset=f"r{i % 5}")
        for i in range(10)
    ]
    charts += [
        make_compare_chart(
            id=f"routes-{i}", title=f"On time by route, area {i}", dataset=f"p{i % 5}"
        )
        for i in range(10)
    ]
    return json.dumps(make_definition(datasets=datasets, charts=charts)).encode()


@pytest.fixture(scope="module", autouse=True)
def _stop_pool() -> Iterator[None]:
    yield
    pool.shutdown()


@pytest.fixture(scope="module")
def demo_serial() -> bytes:
    return pipeline.build(DEMO, Limits()).pdf


def test_demo_is_byte_identical_with_two_workers(demo_serial: bytes) -> None:
    parallel = pipeline.build(DEMO, Limits(), options=RenderOptions(workers=2))
    assert pool.size() == 1  # two processes draw: this one and one helper
    assert parallel.pdf == demo_serial


def test_twenty_charts_byte_identical_with_two_and_three_workers() -> None:
    raw = twenty_charts()
    serial = pipeline.build(raw, Limits())
    with pikepdf.open(io.BytesIO(serial.pdf)) as pdf:
        placed = sum(
            1
            for page in pdf.pages
            for name in page.resources.get("/XObject", {})
            if str(name).startswith("/PlChart")
        )
    assert placed == 20
    assert pipeline.build(raw, Limits(), options=RenderOptions(workers=2)).pdf == serial.pdf
    assert pipeline.build(raw, Limits(), options=RenderOptions(workers=3)).pdf == serial.pdf


def test_the_pool_is_kept_across_packs(demo_serial: bytes) -> None:
    options = RenderOptions(workers=2)
    pipeline.build(DEMO, Limits(), options=options)
    first = pool.executor(1)
    pid = first.submit(os.getpid).result()
    assert pipeline.build(DEMO, Limits(), options=options).pdf == demo_serial
    assert pool.executor(1) is first
    assert first.submit(os.getpid).result() == pid
    assert pid != os.getpid()


@pytest.mark.parametrize("count", [0, 1, 4, 5, 9, 10, 11, 20, 39, 40, 41, 64, 65, 200])
def test_groups_cover_every_chart_once_and_depend_on_the_count_only(count: int) -> None:
    cut = groups.groups(count)
    assert [i for group in cut for i in group] == list(range(count))
    assert len(cut) <= groups.MAX_GROUPS
    assert all(len(group) == groups.group_size(count) for group in cut[:-1])
    if count >= groups.MIN_GROUP:
        assert groups.group_size(count) >= groups.MIN_GROUP


def test_a_ten_chart_pack_is_two_groups_of_five() -> None:
    # the rule's reason (see groups.py): one file per process on two cores
    assert [list(g) for g in groups.groups(10)] == [[0, 1, 2, 3, 4], [5, 6, 7, 8, 9]]


def _nested_build(raw: bytes) -> tuple[bytes, bool]:
    """What an API worker process does: build a pack with its own drawing helpers."""
    built = pipeline.build(raw, Limits(), options=RenderOptions(workers=2))
    return built.pdf, multiprocessing.current_process().daemon


def test_nested_pool_inside_an_api_style_worker(demo_serial: bytes) -> None:
    context = multiprocessing.get_context("spawn")
    with ProcessPoolExecutor(max_workers=1, mp_context=context) as outer:
        pdf, daemonic = outer.submit(_nested_build, DEMO).result(timeout=300)
    # ProcessPoolExecutor workers are not daemonic (Python >= 3.9), so they may start processes
    assert daemonic is False
    assert pdf == demo_serial


SCRIPT = """
import multiprocessing, sys
from concurrent.futures import ProcessPoolExecutor
sys.path.insert(0, {tests!r})
from test_render_parallel import DEMO, _nested_build

if __name__ == "__main__":
    with ProcessPoolExecutor(1, mp_context=multiprocessing.get_context("spawn")) as outer:
        pdf, _ = outer.submit(_nested_build, DEMO).result()
    print(len(pdf))
"""


def test_a_process_with_nested_helpers_exits(tmp_path: Path) -> None:
    # A multiprocessing child joins its non-daemonic children before atexit runs: without the
    # pool's Finalize hook the outer worker (and so this script) would never exit.
    script = tmp_path / "nested.py"
    script.write_text(SCRIPT.format(tests=str(Path(__file__).parents[1] / "unit")))
    env = {**os.environ, "PYTHONPATH": os.pathsep.join([str(ROOT), str(ROOT / "tests")])}
    run = subprocess.run(
        [sys.executable, str(script)],
        capture_output=True,
        text=True,
        timeout=300,
        cwd=ROOT,
        env=env,
        check=False,
    )
    assert run.returncode == 0, run.stderr
    assert int(run.stdout) > 10_000


def test_workers_setting_out_of_range_is_a_clear_error() -> None:
    with pytest.raises(InvalidRequest, match="PLUMBLINE_RENDER_WORKERS"):
        RenderOptions(workers=0)
