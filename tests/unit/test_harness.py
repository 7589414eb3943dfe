"""The test harness itself: require-or-skip skips loudly, or fails when CI requires the tool; a
process that never gets ready fails with what it printed."""

from __future__ import annotations

import sys
from pathlib import Path

import harness
import pytest


def test_a_missing_tool_skips_loudly(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.delenv("PLUMBLINE_REQUIRE_EXAMPLE", raising=False)
    with pytest.raises(pytest.skip.Exception, match=r"^!!! example tests NOT RUN: no tool; get it"):
        harness.require_or_skip(
            None, "PLUMBLINE_REQUIRE_EXAMPLE", "example tests", "no tool", "get it"
        )


def test_a_required_tool_that_is_missing_fails(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setenv("PLUMBLINE_REQUIRE_EXAMPLE", "1")
    with pytest.raises(pytest.fail.Exception, match=r"^PLUMBLINE_REQUIRE_EXAMPLE=1 but no tool$"):
        harness.require_or_skip(False, "PLUMBLINE_REQUIRE_EXAMPLE", "example tests", "no tool")


def test_an_available_tool_goes_on(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setenv("PLUMBLINE_REQUIRE_EXAMPLE", "1")
    harness.require_or_skip("/usr/bin/example", "PLUMBLINE_REQUIRE_EXAMPLE", "example", "no tool")


def test_a_process_that_exits_before_it_is_ready_fails_with_its_output(tmp_path: Path) -> None:
    command = [sys.executable, "-c", "print('port taken'); raise SystemExit(3)"]
    with pytest.raises(pytest.fail.Exception, match=r"exited with status 3(.|\n)*port taken"):
        harness.start_process(
            command, ready=lambda: False, log=tmp_path / "out.log", what="the example", timeout=30
        )


def test_a_process_not_ready_in_time_is_stopped(tmp_path: Path) -> None:
    command = [sys.executable, "-c", "import time; time.sleep(60)"]
    with pytest.raises(pytest.fail.Exception, match=r"the example was not ready within 0.5 s"):
        harness.start_process(
            command, ready=lambda: False, log=tmp_path / "out.log", what="the example", timeout=0.5
        )


def test_a_free_port_accepts_nothing_yet() -> None:
    assert not harness.accepts(harness.free_port())()
