"""No text over data, measured: every text on a drawn chart against every data mark on it."""

from __future__ import annotations

from datetime import date
from functools import cache
from pathlib import Path

import pytest
from matplotlib.axes import Axes
from matplotlib.figure import Figure

from service import pipeline
from service.checks import engine
from service.checks.results import Status
from service.config import Limits
from service.intents.plan import ChartPlan
from service.render import charts, key, layout, marks, place

DEMO = Path(__file__).parents[2] / "sample_requests" / "bus-cooperative-monthly.json"


@cache
def demo_plans() -> dict[str, ChartPlan]:
    checked = pipeline.check(pipeline.intake(DEMO.read_bytes(), Limits()))
    return {c.plan.chart_id: c.plan for c in checked.charts}


def _over_data_as_first_drawn(plan: ChartPlan) -> list[str]:
    """Texts over data with every label where its drawer first put it (before placement)."""
    figure = charts.figure_for(plan)
    layout.lay_out(figure)
    return marks.text_over_data(figure, figure.canvas.get_renderer())  # type: ignore[attr-defined]


def _text_on_the_lines(figure: Figure) -> None:
    """A text no placement moves, where both lines start (index 100 in the first period)."""
    figure.axes[0].text(0, 100, "planted", ha="center", va="center")


@pytest.mark.parametrize(
    ("chart", "text"),
    [
        ("boardings-trend", "Boardings"),  # the end label under the estimate's marker
        ("cost-vs-use", "Dec 2025 = 100"),  # the index base's label struck by a line
        ("complaints-movement", "centre line 43 complaints"),  # limit labels crossed
        ("complaints-movement", "upper natural process limit 58 complaints"),
        ("length-vs-punctuality", "9 College circular"),  # the fit line through a point label
    ],
)
def test_the_demo_as_first_drawn_has_text_over_data(chart: str, text: str) -> None:
    assert text in _over_data_as_first_drawn(demo_plans()[chart])


def test_a_line_crossing_a_text_between_its_points_is_found() -> None:
    """The text lies inside the line's bounding box but off it, then on it: segments are tested."""
    figure = Figure(figsize=(4, 3))
    ax = figure.add_subplot()
    ax.set_xlim(0, 10)
    ax.set_ylim(0, 10)
    ax.plot([0, 10], [0, 10], color="k")
    off = ax.text(7, 2, "off the line")
    layout.lay_out(figure)
    renderer = figure.canvas.get_renderer()  # type: ignore[attr-defined]
    assert marks.text_over_data(figure, renderer) == []
    off.set_position((4, 5))
    assert marks.text_over_data(figure, renderer) == ["off the line"]


def test_markers_bars_and_reference_lines_are_data_but_grid_and_gap_bands_are_not() -> None:
    figure = Figure(figsize=(4, 3))
    ax = figure.add_subplot()
    ax.set_xlim(0, 10)
    ax.set_ylim(0, 10)
    ax.plot([2], [8], marker="o", linestyle="none")
    ax.bar([8], [3], width=1.5)
    ax.axhline(5, color="k")
    ax.axvspan(4, 5, gid="no_data")
    ax.grid(True)
    ax.text(2, 8, "on the marker", ha="center", va="center")
    ax.text(8, 1, "in the bar", ha="center")
    ax.text(1, 5, "on the reference", va="center")
    ax.text(4.5, 2, "in the gap band", ha="center")
    layout.lay_out(figure)
    found = marks.text_over_data(figure, figure.canvas.get_renderer())  # type: ignore[attr-defined]
    assert sorted(found) == ["in the bar", "on the marker", "on the reference"]


def test_label_layout_names_the_texts_over_data() -> None:
    plan = demo_plans()["cost-vs-use"]
    figure = charts.figure_for(plan)
    _text_on_the_lines(figure)
    report = layout.mend(figure)
    assert report.over_data == ["planted"]
    assert not report.clean
    result = engine.finish_chart(plan, report, [], date(2026, 11, 9))
    assert result.status is Status.failed
    assert f"{report.collisions} texts over data" in result.measured_text
    assert "Over the data:" in result.explanation


@pytest.mark.parametrize("chart", list(demo_plans()))
def test_every_demo_chart_is_drawn_with_no_text_over_data(chart: str) -> None:
    plan = demo_plans()[chart]
    report = layout.mend(charts.figure_for(plan), locale=plan.locale)
    assert report.over_data == []
    assert report.clean


def _crossed_square() -> tuple[Figure, Axes]:
    figure = Figure(figsize=(4, 3))
    ax = figure.add_subplot()
    ax.set_xlim(0, 10)
    ax.set_ylim(0, 10)
    ax.plot([0, 10], [5, 5], color="k")
    return figure, ax


def test_a_label_over_a_line_moves_to_its_first_free_spot() -> None:
    figure, ax = _crossed_square()
    spots = [place.Spot(0, 0, "center", "center"), *place.over(6.0)]
    text = place.label(ax, "a label", (5, 5), spots)
    layout.lay_out(figure)
    renderer = figure.canvas.get_renderer()  # type: ignore[attr-defined]
    assert marks.text_over_data(figure, renderer) == ["a label"]
    assert place.place(figure, renderer) == []
    assert marks.text_over_data(figure, renderer) == []
    assert (text.get_position(), text.get_verticalalignment()) == ((0, 6.0), "bottom")


def test_labels_are_placed_apart_from_each_other() -> None:
    figure, ax = _crossed_square()
    first = place.label(ax, "first", (5, 7), place.around(4.0))
    second = place.label(ax, "second", (5, 7), place.around(4.0))
    layout.lay_out(figure)
    renderer = figure.canvas.get_renderer()  # type: ignore[attr-defined]
    place.place(figure, renderer)
    a, b = (marks.text_box(t, renderer) for t in (first, second))
    assert a is not None
    assert b is not None
    assert not marks.overlap(a, b)


def test_a_label_with_no_free_spot_goes_into_the_key() -> None:
    figure, ax = _crossed_square()
    line = ax.lines[0]
    text = place.label(ax, "stuck", (5, 5), [place.Spot(0, 0, "center", "center")], key=line)
    report = layout.mend(figure)
    assert not text.get_visible()
    assert key.entries(figure) == ["stuck"]
    assert report.actions == ["moved the label 'stuck' into the key"]
    assert report.collisions == 0


def test_a_label_with_no_free_spot_and_no_key_stays_and_is_counted() -> None:
    figure, ax = _crossed_square()
    place.label(ax, "stuck", (5, 5), [place.Spot(0, 0, "center", "center")])
    report = layout.mend(figure)
    assert report.over_data == ["stuck"]
    assert key.entries(figure) == []
