"""The chart cache: a hit gives the same bytes, a changed input misses, damage is never served."""

from __future__ import annotations

import json
import os
from pathlib import Path
from typing import Any

import pytest

import service
from service import pipeline
from service.config import Limits
from service.intents.plan import ChartPlan
from service.render import cache, groups
from service.render.measured import LayoutReport
from service.render.options import RenderOptions

ROOT = Path(__file__).parents[2]
DEMO_PATH = ROOT / "sample_requests" / "bus-cooperative-monthly.json"
DEMO = DEMO_PATH.read_bytes()


def demo_with(change: Any) -> bytes:
    definition = json.loads(DEMO)
    change(definition)
    return json.dumps(definition).encode()


def plans_of(raw: bytes) -> list[ChartPlan]:
    return [c.plan for c in pipeline.check(pipeline.intake(raw, Limits())).charts]


def entries(root: Path) -> list[Path]:
    return sorted(p for p in root.rglob("*") if p.is_file() and not p.name.startswith("."))


@pytest.fixture(scope="module")
def demo_plans() -> list[ChartPlan]:
    return plans_of(DEMO)


@pytest.fixture(scope="module")
def serial() -> groups.Drawn:
    """The demo's charts drawn with no cache."""
    return groups.draw_all(plans_of(DEMO))


@pytest.fixture
def warm(tmp_path: Path, demo_plans: list[ChartPlan]) -> RenderOptions:
    """A cache folder holding the demo's groups."""
    options = RenderOptions(cache_dir=tmp_path / "chart-cache")
    assert groups.draw_all(demo_plans, options).cached == 0
    return options


def test_a_hit_gives_the_same_bytes(
    warm: RenderOptions, demo_plans: list[ChartPlan], serial: groups.Drawn
) -> None:
    assert len(entries(warm.cache_dir or Path())) == len(groups.groups(len(demo_plans)))
    again = groups.draw_all(demo_plans, warm)
    assert again.cached == len(serial.files) == 2
    assert again.files == serial.files
    assert again.reports == serial.reports
    assert again.pages == serial.pages


def test_the_pack_from_the_cache_is_byte_identical(warm: RenderOptions) -> None:
    plain = pipeline.build(DEMO, Limits()).pdf
    assert pipeline.build(DEMO, Limits(), options=warm).pdf == plain


def _first_on_time_up(definition: dict[str, Any]) -> None:
    # the demo's second chart (on-time-by-route, group 0) alone reads dataset 'punctuality'; a
    # boardings figure would not do: 'cost_and_use' carries the same measure, so one-measure-one-
    # truth would flag the index chart of group 1 as well
    punctuality = next(d for d in definition["datasets"] if d["name"] == "punctuality")
    punctuality["rows"][0]["on_time"] = round(punctuality["rows"][0]["on_time"] + 0.1, 1)


def _retitle_last(definition: dict[str, Any]) -> None:
    chart = definition["sections"][-1]["charts"][-1]  # length-vs-punctuality, group 1
    chart["title"] += " (revised)"


@pytest.mark.parametrize(
    "case",
    [
        (_first_on_time_up, 0, True),
        # the title is set by the pack's layout, not drawn: the group is drawn again all the same
        (_retitle_last, 1, False),
    ],
)
def test_a_changed_value_or_title_misses_its_group_only(
    warm: RenderOptions,
    serial: groups.Drawn,
    demo_plans: list[ChartPlan],
    case: tuple[Any, int, bool],
) -> None:
    change, changed_group, drawn_differently = case
    raw = demo_with(change)
    plans = plans_of(raw)
    cut = groups.groups(len(plans))
    changed = [i for i, (a, b) in enumerate(zip(plans, demo_plans, strict=True)) if a != b]
    assert changed
    assert all(i in cut[changed_group] for i in changed)
    drawn = groups.draw_all(plans, warm)
    assert drawn.cached == 1  # the other group is re-used, the changed one drawn again
    kept = 1 - changed_group
    assert drawn.files[kept] == serial.files[kept]
    assert (drawn.files[changed_group] != serial.files[changed_group]) is drawn_differently
    assert drawn.files == groups.draw_all(plans).files  # what drawing it afresh gives
    assert groups.draw_all(plans, warm).cached == 2  # and now it is cached too
    assert pipeline.build(raw, Limits(), options=warm).pdf == pipeline.build(raw, Limits()).pdf


def test_a_new_style_version_misses_everything(
    warm: RenderOptions, demo_plans: list[ChartPlan], monkeypatch: pytest.MonkeyPatch
) -> None:
    before = cache.key(demo_plans[:5])
    monkeypatch.setattr(service, "STYLE_VERSION", service.STYLE_VERSION + "-next")
    assert cache.key(demo_plans[:5]) != before
    assert groups.draw_all(demo_plans, warm).cached == 0


def test_the_key_names_the_group_composition(demo_plans: list[ChartPlan]) -> None:
    a, b = demo_plans[0], demo_plans[1]
    keys = {cache.key([a, b]), cache.key([b, a]), cache.key([a]), cache.key([b])}
    assert len(keys) == 4
    assert cache.key([a, b]) == cache.key([a.model_copy(), b.model_copy()])


def _flip_last_byte(path: Path) -> None:
    data = bytearray(path.read_bytes())
    data[-1] ^= 0x01
    path.write_bytes(bytes(data))


def _truncate(path: Path) -> None:
    path.write_bytes(path.read_bytes()[:-100])


def _flip_header(path: Path) -> None:
    data = path.read_bytes()
    at = len(cache.MAGIC) + 64 + 5
    path.write_bytes(data[:at] + bytes([data[at] ^ 0x20]) + data[at + 1 :])


@pytest.mark.parametrize("damage", [_flip_last_byte, _truncate, _flip_header])
def test_a_damaged_entry_is_redrawn_never_served(
    warm: RenderOptions, demo_plans: list[ChartPlan], serial: groups.Drawn, damage: Any
) -> None:
    root = warm.cache_dir or Path()
    target = ChartCacheFor(warm).path(cache.key(demo_plans[:5]))
    damage(target)
    assert ChartCacheFor(warm).get(cache.key(demo_plans[:5])) is None
    assert not target.exists()  # removed, so it is written again
    damage_free = groups.draw_all(demo_plans, warm)
    assert damage_free.cached == 1
    assert damage_free.files == serial.files
    assert target.exists()
    assert len(entries(root)) == 2


def test_an_entry_under_another_name_is_not_served(
    warm: RenderOptions, demo_plans: list[ChartPlan], serial: groups.Drawn
) -> None:
    store = ChartCacheFor(warm)
    first, second = cache.key(demo_plans[:5]), cache.key(demo_plans[5:])
    # an intact file moved to another key's name: its hash holds, the key inside does not
    store.path(first).write_bytes(store.path(second).read_bytes())
    assert store.get(first) is None
    assert groups.draw_all(demo_plans, warm).files == serial.files


def ChartCacheFor(options: RenderOptions) -> cache.ChartCache:  # noqa: N802 - reads as a type
    assert options.cache_dir is not None
    return cache.ChartCache(options.cache_dir, max_bytes=options.cache_max_bytes)


def test_the_folder_stays_under_its_bound_least_recently_used_first(tmp_path: Path) -> None:
    store = cache.ChartCache(tmp_path, max_bytes=10_500)  # room for three entries, not four
    report = [LayoutReport(actions=["thinned x labels"])]
    names = [f"{i:064x}" for i in range(1, 6)]
    for age, name in enumerate(names):
        store.put(name, bytes([age]) * 3_000, report)
        # mtimes one minute apart, oldest first (a file system's clock may be coarse)
        os.utime(store.path(name), (1_000_000 + 60 * age, 1_000_000 + 60 * age))
    total = sum(p.stat().st_size for p in entries(tmp_path))
    assert total <= 10_500
    kept = [n for n in names if store.path(n).exists()]
    assert kept == names[-len(kept) :]  # the oldest went first
    assert len(kept) == 3  # each entry is 3,000 bytes of PDF plus its header
    # a hit makes an entry the most recent: the next write removes another
    oldest = kept[0]
    assert store.get(oldest) == (bytes([2]) * 3_000, report)
    store.put(f"{9:064x}", b"x" * 3_000, report)
    assert store.path(oldest).exists()
    assert not store.path(kept[1]).exists()


def test_no_cache_folder_writes_nothing(
    tmp_path: Path, demo_plans: list[ChartPlan], monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.chdir(tmp_path)
    drawn = groups.draw_all(demo_plans[:2], RenderOptions())
    assert drawn.cached == 0
    assert list(tmp_path.iterdir()) == []


def test_an_unchanged_pack_is_taken_whole_and_a_changed_text_is_laid_out_again(
    warm: RenderOptions,
) -> None:
    """The assembled pack is cached under everything its pages show: the same definition again
    is the same file without laying it out; a changed narrative (no chart changed) reuses every
    chart group but lays the pack out afresh, giving what an uncached build gives."""
    root = warm.cache_dir or Path()
    first = pipeline.build(DEMO, Limits(), options=warm).pdf
    stored = entries(root)
    assert len(stored) == 3  # two chart groups and the pack
    assert pipeline.build(DEMO, Limits(), options=warm).pdf == first
    assert entries(root) == stored  # nothing new: the pack came whole from the cache

    def narrate(definition: dict[str, Any]) -> None:
        definition["sections"][0]["narrative"] += " One sentence more."

    changed = demo_with(narrate)
    cached = pipeline.build(changed, Limits(), options=warm).pdf
    assert cached != first
    assert cached == pipeline.build(changed, Limits()).pdf  # no stale pack, no stale chart
    assert len(entries(root)) == 4  # the groups were reused; one more pack
