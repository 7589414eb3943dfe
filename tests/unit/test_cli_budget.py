"""``plumbline check`` and ``render`` run under the service's time and memory budget, which flags
override (``--time-limit SECONDS``, ``--memory-limit MB``, 0: none): past either the command stops
with exit code 2 and a message naming the flag.

Ten thousand years of days (now refused as out of range; six centuries, let through here by a raised
``max_periods``, stand in for them) once ran ``plumbline
check`` for minutes at 4.7 GB, and ``render`` had no limit at all.
"""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest
from factories import encode, make_daily

ROOT = Path(__file__).resolve().parents[2]


def plumbline(*args: str, data_dir: Path) -> subprocess.CompletedProcess[str]:
    env = {
        **os.environ,
        "PYTHONPATH": os.pathsep.join([str(ROOT), os.environ.get("PYTHONPATH", "")]),
        "PLUMBLINE_DATA_DIR": str(data_dir),
        "PLUMBLINE_LIMITS__MAX_PERIODS": "10000000",
    }
    return subprocess.run(
        [sys.executable, "-m", "service.cli", *args],
        capture_output=True,
        text=True,
        env=env,
        timeout=120,
        check=False,
    )


@pytest.fixture
def ages(tmp_path: Path) -> Path:
    path = tmp_path / "ages.json"
    path.write_bytes(encode(make_daily("1700-01-01", "2250-12-30")))  # six centuries of days
    return path


@pytest.mark.parametrize("command", ["check", "render"])
def test_past_the_time_limit_the_command_stops_with_exit_2(
    command: str, ages: Path, tmp_path: Path
) -> None:
    output = ["-o", str(tmp_path / "out.pdf")] if command == "render" else []
    # six centuries of days take 2 to 20 s to check here, by the load; half a second is too little
    done = plumbline(command, str(ages), *output, "--time-limit", "0.5", data_dir=tmp_path)
    assert done.returncode == 2, done.stderr
    assert "time budget of 0.5 s" in done.stderr
    assert "--time-limit" in done.stderr
    assert "Traceback" not in done.stderr


def test_past_the_memory_limit_the_command_stops_with_exit_2(ages: Path, tmp_path: Path) -> None:
    done = plumbline(
        "check", str(ages), "--time-limit", "60", "--memory-limit", "500", data_dir=tmp_path
    )
    assert done.returncode == 2, done.stderr
    assert "memory limit of 500 MB" in done.stderr
    assert "--memory-limit" in done.stderr
