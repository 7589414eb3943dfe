"""`plumbline walkthrough` (what `make demo` runs) then `plumbline verify` on the sealed pack:
every step passes, the PDF/A verdict is reported, and one flipped byte anywhere fails it."""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import pikepdf
import pytest
from pypdf import PdfReader

ROOT = Path(__file__).parents[2]
DEMO = ROOT / "sample_requests" / "bus-cooperative-monthly.json"


def _cli(data_dir: Path, *args: str) -> subprocess.CompletedProcess[str]:
    env = {**os.environ, "PLUMBLINE_DATA_DIR": str(data_dir)}
    return subprocess.run(
        [sys.executable, "-m", "service.cli", *args],
        capture_output=True,
        text=True,
        check=False,
        cwd=ROOT,
        env=env,
        timeout=300,
    )


@pytest.fixture(scope="module")
def walked(tmp_path_factory: pytest.TempPathFactory) -> tuple[Path, Path, str]:
    data_dir = tmp_path_factory.mktemp("data")
    pack = data_dir / "out" / "bus-cooperative-monthly-sealed.pdf"
    run = _cli(data_dir, "walkthrough", str(DEMO), "-o", str(pack))
    assert run.returncode == 0, run.stdout + run.stderr
    return pack, data_dir, run.stdout


def test_walkthrough_signs_off_seals_and_verifies(walked: tuple[Path, Path, str]) -> None:
    pack, _, out = walked
    assert "signed off by Demo Approver" in out
    assert "PDF/A-3b check by pikepdf" in out
    assert "not a certification" in out
    assert out.rstrip().endswith("verified")
    text = "".join(page.extract_text() for page in PdfReader(pack).pages[:1])
    assert "Signed off by Demo Approver on" in text
    assert "DEVELOPMENT key" in text  # the pack says plainly what sealed it
    assert "do not replace" in text  # the caution
    with pikepdf.open(pack) as pdf:
        names = set(pdf.attachments)
        record = json.loads(pdf.attachments["review.json"].get_file().read_bytes())
        definition = pdf.attachments["definition.json"].get_file().read_bytes()
    datasets = {f"data/{d['name']}.csv" for d in json.loads(DEMO.read_text())["datasets"]}
    assert names == {"definition.json", "review.json"} | datasets
    assert definition == DEMO.read_bytes()  # the exact definition, byte for byte
    assert record["signed_off_by"] == "Demo Approver"
    assert record["seal"]["development_key"] is True


def test_verify_reports_every_step_passed(walked: tuple[Path, Path, str]) -> None:
    pack, data_dir, _ = walked
    run = _cli(data_dir, "verify", str(pack))
    assert run.returncode == 0, run.stdout + run.stderr
    lines = run.stdout.splitlines()
    assert lines[-1] == "verified"
    steps = {line.split(":")[0][6:]: line for line in lines[:-1]}
    assert all(line.startswith("ok") for line in steps.values()), run.stdout
    expected = {
        "signature intact",
        "signature valid",
        "signer trusted",
        "signed by",
        "signature covers the whole file",
        "signature encoding",
        "embedded certificates",
        "file SHA-256",
        "attachments",
        "re-render matches",
        "archived",
    }
    assert set(steps) == expected
    assert "development key" in steps["signed by"]  # said plainly


@pytest.mark.parametrize("where", [0.02, 0.5, 0.98])
def test_one_flipped_byte_fails_verification(
    walked: tuple[Path, Path, str], tmp_path: Path, where: float
) -> None:
    pack, data_dir, _ = walked
    data = bytearray(pack.read_bytes())
    data[int(len(data) * where)] ^= 0x01
    tampered = tmp_path / "tampered.pdf"
    tampered.write_bytes(bytes(data))
    run = _cli(data_dir, "verify", str(tampered))
    assert run.returncode == 1, run.stdout + run.stderr
    assert "NOT verified" in run.stdout
    assert "FAIL  archived" in run.stdout  # not the file the archive sealed
    assert "Traceback" not in run.stderr


def test_verify_without_an_archive_checks_the_file_alone(
    walked: tuple[Path, Path, str], tmp_path: Path
) -> None:
    pack, data_dir, _ = walked
    elsewhere = tmp_path / "auditor"
    (elsewhere / "keys").mkdir(parents=True)
    certificate = data_dir / "keys" / "development-seal.pem"
    trust = elsewhere / "seal.pem"
    trust.write_bytes(_certificate_only(certificate.read_bytes()))
    run = _cli(elsewhere, "verify", str(pack), "--trust", str(trust))
    assert run.returncode == 0, run.stdout + run.stderr
    assert "no archive at" in run.stdout
    assert not (elsewhere / "plumbline.db").exists()  # verifying creates nothing


def _certificate_only(pem: bytes) -> bytes:
    start = pem.index(b"-----BEGIN CERTIFICATE-----")
    end = pem.index(b"-----END CERTIFICATE-----") + len(b"-----END CERTIFICATE-----")
    return pem[start:end] + b"\n"
