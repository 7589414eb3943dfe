"""`plumbline verify` on a sealed pack: every step passes; one flipped byte fails it."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest

from service import pipeline, seal
from service.config import Limits
from service.seal import keys

ROOT = Path(__file__).parents[2]
DEMO = ROOT / "sample_requests" / "bus-cooperative-monthly.json"


def _verify(pack: Path, data_dir: Path) -> subprocess.CompletedProcess[str]:
    env = {**os.environ, "PLUMBLINE_DATA_DIR": str(data_dir)}
    return subprocess.run(
        [sys.executable, "-m", "service.cli", "verify", str(pack)],
        capture_output=True,
        text=True,
        check=False,
        cwd=ROOT,
        env=env,
        timeout=180,
    )


@pytest.fixture(scope="module")
def sealed(tmp_path_factory: pytest.TempPathFactory) -> tuple[Path, Path]:
    data_dir = tmp_path_factory.mktemp("data")
    definition = DEMO.read_bytes()
    draft = pipeline.build(definition, Limits()).pdf
    key = keys.development(data_dir / "keys")
    assert key.is_development
    pack = data_dir / "demo-sealed.pdf"
    pack.write_bytes(seal.seal(draft, definition, key).signed)
    return pack, data_dir


def test_verify_reports_every_step_passed(sealed: tuple[Path, Path]) -> None:
    pack, data_dir = sealed
    run = _verify(pack, data_dir)
    assert run.returncode == 0, run.stdout + run.stderr
    lines = run.stdout.splitlines()
    assert lines[-1] == "verified"
    steps = lines[:-1]
    assert len(steps) >= 6
    assert all(line.startswith("ok") for line in steps), run.stdout
    assert any("development key" in line for line in steps)  # said plainly
    assert any("re-render" in line for line in steps)


def test_one_flipped_byte_fails_verification(sealed: tuple[Path, Path], tmp_path: Path) -> None:
    pack, data_dir = sealed
    data = bytearray(pack.read_bytes())
    data[len(data) // 2] ^= 0x01
    tampered = tmp_path / "tampered.pdf"
    tampered.write_bytes(bytes(data))
    run = _verify(tampered, data_dir)
    assert run.returncode == 1
    assert "NOT verified" in run.stdout
    assert "FAIL" in run.stdout
    assert "Traceback" not in run.stderr
