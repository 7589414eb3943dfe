"""The benchmark runs end to end on a small pack: both sides draw every chart, the JSON is complete.

No timing is asserted: the numbers depend on the machine. What can break is the harness itself (a
side that draws fewer charts than the other, a missing field, a mode that no longer runs).
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest

from bench import floor, generate, run

ROOT = Path(__file__).parents[2]
"""The checkout: ``python -m bench`` runs from here (the benchmark is not installed)."""

SIDE_FIELDS = {
    "wall_s",
    "cpu_s",
    "rss_mb",
    "rss_children_mb",
    "work_s",
    "charts",
    "pages",
    "bytes",
    "samples_wall_s",
}
MODE_FIELDS = {"pack", "metric", "plumbline", "floor", "ratio", "cpu_ratio", "targets", "met"}


@pytest.fixture(scope="module")
def bench(tmp_path_factory: pytest.TempPathFactory) -> tuple[dict[str, object], Path]:
    out = tmp_path_factory.mktemp("bench")
    command = [sys.executable, "-m", "bench", "--out", str(out), "--charts", "6"]
    command += ["--rows", "3000", "--repeat", "1", "--modes", "cold-1-worker,million-rows"]
    done = subprocess.run(
        command, cwd=ROOT, capture_output=True, text=True, check=False, timeout=600
    )
    assert done.returncode == 0, done.stderr
    assert "cold-1-worker" in done.stdout  # the printed table
    return json.loads((out / "results.json").read_text()), out


def test_both_sides_draw_every_chart(bench: tuple[dict[str, object], Path]) -> None:
    results, _ = bench
    modes = results["modes"]
    assert isinstance(modes, dict)
    cold = modes["cold-1-worker"]
    assert cold["plumbline"]["charts"] == cold["floor"]["charts"] == 6
    million = modes["million-rows"]
    assert million["plumbline"]["charts"] == million["floor"]["charts"] == 1
    for mode in (cold, million):
        assert mode["plumbline"]["pages"] >= 1
        assert mode["floor"]["pages"] >= 1


def test_results_have_every_field(bench: tuple[dict[str, object], Path]) -> None:
    results, out = bench
    assert set(results) == {"machine", "settings", "modes", "skipped"}
    machine = results["machine"]
    assert isinstance(machine, dict)
    assert {"cpu_count", "python", "matplotlib"} <= set(machine)
    modes = results["modes"]
    assert isinstance(modes, dict)
    for mode in modes.values():
        assert set(mode) >= MODE_FIELDS
        assert set(mode["plumbline"]) >= SIDE_FIELDS
        assert set(mode["floor"]) >= SIDE_FIELDS
        assert mode["ratio"] > 0
    million = modes["million-rows"]
    assert "relative" in million  # compared with the mixed pack
    assert set(million["met"]) == {"relative", "rss"}
    assert modes["cold-1-worker"]["targets"]["ratio_at_most"] == 1.0
    assert (out / "ratios.png").read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    assert (out / "plumbline-cold-1-worker.pdf").read_bytes().startswith(b"%PDF-")


def test_the_floor_draws_the_marks_of_each_intent() -> None:
    """Every intent of the generated pack gets its data's marks, not a lesser chart."""
    definition = generate.sixty(charts=16)
    tables = floor.frames(definition)
    for chart in (c for s in definition["sections"] for c in s["charts"]):
        frame = tables[chart["dataset"]]
        figure = floor.draw(chart, frame)
        marks = sum(
            len(ax.patches)
            + sum(len(c.get_offsets()) for c in ax.collections)  # scatter dots, error bars
            + sum(len(line.get_xdata()) for line in ax.lines)
            for ax in figure.axes
        )
        assert marks >= min(len(frame), 12), chart["id"]


def test_an_unknown_mode_is_refused_with_the_known_ones(
    capsys: pytest.CaptureFixture[str],
) -> None:
    with pytest.raises(SystemExit) as stopped:
        run.main(["--modes", "warp-speed"])
    assert stopped.value.code == 2
    assert "unknown mode(s) warp-speed; known: cold-1-worker" in capsys.readouterr().err
