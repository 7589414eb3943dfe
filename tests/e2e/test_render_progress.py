"""A build says how far it has got: stages in order, then charts drawn out of the pack's total.

The command line turns that into a bar on standard error; the job resource reports the same counts
(tests/api/test_jobs_http.py). Both are checked against the demo's own chart count, read from the
definition, not restated here.
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

from service import pipeline
from service.config import Limits
from service.render.options import RenderOptions

ROOT = Path(__file__).parents[2]
DEMO = ROOT / "sample_requests" / "bus-cooperative-monthly.json"


def _chart_count() -> int:
    definition = json.loads(DEMO.read_bytes())
    return sum(len(section.get("charts", [])) for section in definition["sections"])


def test_a_build_reports_every_stage_and_counts_charts_up_to_the_total() -> None:
    seen: list[tuple[str, int, int]] = []
    pipeline.build(
        DEMO.read_bytes(), Limits(), options=RenderOptions(), progress=lambda *a: seen.append(a)
    )
    total = _chart_count()
    stages = list(dict.fromkeys(stage for stage, _, _ in seen))
    assert stages == ["reading", "checking", "drawing", "assembling"]
    drawn = [done for stage, done, of in seen if stage in ("drawing", "assembling") and of]
    assert drawn == sorted(drawn), "charts drawn never go down"
    assert drawn[0] == 0
    assert drawn[-1] == total
    assert len(set(drawn)) >= 3, "a 10-chart pack is drawn in groups, each reported"
    assert all(of == total for stage, _, of in seen if stage != "reading")


def render(folder: Path, *flags: str) -> subprocess.CompletedProcess[str]:
    """``plumbline render`` of the demo, standard error captured (so it is not a terminal)."""
    command = [sys.executable, "-m", "service.cli", "render", str(DEMO)]
    run = subprocess.run(
        [*command, "-o", str(folder / "pack.pdf"), *flags],
        capture_output=True,
        text=True,
        check=False,
        timeout=180,
        env={"PATH": "/usr/bin:/bin", "PLUMBLINE_DATA_DIR": str(folder / "var")},
        cwd=ROOT,
    )
    assert run.returncode == 0, run.stderr
    return run


def test_the_command_line_shows_a_bar_on_standard_error(tmp_path: Path) -> None:
    run = render(tmp_path, "--progress")
    total = _chart_count()
    frames = run.stderr.split("\r")
    assert f"[{'#' * 30}] {total}/{total} charts, assembling" in frames[-1]
    assert any(f"0/{total} charts, drawing" in frame for frame in frames)
    assert "wrote" in run.stdout
    assert "\r" not in run.stdout


def test_without_a_terminal_no_bar_is_drawn(tmp_path: Path) -> None:
    assert "charts," not in render(tmp_path).stderr
