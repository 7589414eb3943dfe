"""The queue's settings refuse what would break delivery, saying which setting to change."""

from __future__ import annotations

from pathlib import Path

import pytest

from service.config import Settings
from service.distributed.options import VISIBILITY_MARGIN_S, QueueMisconfigured, QueueOptions


@pytest.fixture
def settings(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Settings:
    for name in ("QUEUE_URL", "QUEUE_VISIBILITY_TIMEOUT_S", "QUEUE_RESTORE_INTERVAL_S"):
        monkeypatch.delenv(f"PLUMBLINE_{name}", raising=False)
    return Settings(data_dir=tmp_path, render_timeout_s=30)


def test_the_visibility_timeout_defaults_to_the_render_budget_plus_a_margin(
    settings: Settings, monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.setenv("PLUMBLINE_QUEUE_URL", "redis://127.0.0.1:6379/0")
    options = QueueOptions.of(settings)
    assert options.visibility_timeout_s == 30 + VISIBILITY_MARGIN_S
    assert options.restore_interval_s == 10.0


def test_a_visibility_timeout_within_the_render_budget_is_refused(
    settings: Settings, monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.setenv("PLUMBLINE_QUEUE_URL", "redis://127.0.0.1:6379/0")
    monkeypatch.setenv("PLUMBLINE_QUEUE_VISIBILITY_TIMEOUT_S", "30")
    with pytest.raises(QueueMisconfigured, match="must be longer than the render budget"):
        QueueOptions.of(settings)
    monkeypatch.setenv("PLUMBLINE_QUEUE_VISIBILITY_TIMEOUT_S", "soon")
    with pytest.raises(QueueMisconfigured, match="must be a number of seconds"):
        QueueOptions.of(settings)


def test_a_missing_or_foreign_broker_url_is_refused(
    settings: Settings, monkeypatch: pytest.MonkeyPatch
) -> None:
    with pytest.raises(QueueMisconfigured, match="PLUMBLINE_QUEUE_URL is not set"):
        QueueOptions.of(settings)
    monkeypatch.setenv("PLUMBLINE_QUEUE_URL", "amqp://127.0.0.1:5672")
    with pytest.raises(QueueMisconfigured, match="not a Redis URL"):
        QueueOptions.of(settings)
