"""A library's warning reaches the command line's standard error as its category and message,
never with the source path of the library that raised it (the issue saw matplotlib's)."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).parents[2]
LIBRARY = "/opt/plumbline/lib/python3.11/site-packages/matplotlib/axes/_base.py"
FONT = "/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf"

NOISY = f"""
import sys, warnings
from service import cli, pipeline

checked = pipeline.check

def noisy(*args, **kwargs):
    warnings.warn_explicit(
        "Glyph 8203 missing from font {FONT}", UserWarning, "{LIBRARY}", 3016
    )
    return checked(*args, **kwargs)

pipeline.check = noisy
sys.exit(cli.main(["check", sys.argv[1], "--time-limit", "0", "--memory-limit", "0"]))
"""


def test_a_library_warning_on_the_command_line_carries_no_path() -> None:
    ran = subprocess.run(
        [sys.executable, "-c", NOISY, str(ROOT / "sample_requests" / "first-definition.json")],
        capture_output=True,
        text=True,
        check=False,
        cwd=ROOT,
        timeout=120,
    )
    assert ran.returncode == 0, ran.stderr
    assert "UserWarning: Glyph 8203 missing from font DejaVuSans.ttf" in ran.stderr
    assert "site-packages" not in ran.stderr
    assert "/usr/share" not in ran.stderr
    assert "_base.py" not in ran.stderr
