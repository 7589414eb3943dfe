"""A foreign exception inside drawing or placing charts reaches the caller only as a plain sentence
and an incident id: its class, message and memory addresses go to the log."""

from __future__ import annotations

import logging
from typing import Any, cast

import pikepdf
import pytest

from service.assemble import place
from service.errors import RenderFailed
from service.render import charts

FOREIGN = "IndexError: glyph <matplotlib.text.Text object at 0x7f3c2a1b9e50>"


def fails(*_: Any, **__: Any) -> Any:
    raise ValueError(FOREIGN)


def _plain(problem: RenderFailed) -> None:
    assert problem.incident
    assert f"incident {problem.incident}" in problem.message
    for leak in ("0x7f", "IndexError", "ValueError", "matplotlib", "object at"):
        assert leak not in problem.message


def test_a_chart_that_cannot_be_drawn_is_told_without_foreign_text(
    monkeypatch: pytest.MonkeyPatch, caplog: pytest.LogCaptureFixture
) -> None:
    monkeypatch.setattr(charts, "figure_for", fails)
    with caplog.at_level(logging.ERROR), pytest.raises(RenderFailed) as raised:
        charts.draw_pages([cast(Any, object())])
    _plain(raised.value)
    assert "the charts could not be drawn" in raised.value.message
    assert "0x7f3c2a1b9e50" in caplog.text  # the detail is in the log, under the incident


def test_charts_that_cannot_be_placed_are_told_without_foreign_text(
    monkeypatch: pytest.MonkeyPatch,
) -> None:
    def broken(*_: Any, **__: Any) -> Any:
        raise pikepdf.PdfError(FOREIGN)

    monkeypatch.setattr(place.pikepdf, "open", broken)
    with pytest.raises(RenderFailed) as raised:
        place.place(b"%PDF-1.7", [cast(Any, object())], [b"%PDF-1.7"], {})
    _plain(raised.value)
