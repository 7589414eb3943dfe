"""aspect-banking: Cleveland's median-absolute-slope banking to 45°, as advice that never blocks."""

from __future__ import annotations

import math

import pytest
import statsmodels.api as sm  # test-only: a published data set, never imported by service/
from factories import (
    Json,
    context_for,
    intake,
    make_column,
    make_dataset,
    make_definition,
    make_monthly,
    make_trend_chart,
    only_chart,
    plan_of,
    result_of,
    run_checks,
)

from service.checks import banking
from service.checks.results import Status
from service.intents.plan import Panel, Series
from service.render import charts

MONTHS = [
    f"{y}-{m:02d}-01" for y, m in [(2025, 11), (2025, 12)] + [(2026, m) for m in range(1, 11)]
]


def _line(values: list[float | None]) -> Series:
    runs: list[tuple[int, int]] = []
    for i, v in enumerate(values):
        if v is None:
            continue
        if runs and runs[-1][1] == i - 1:
            runs[-1] = (runs[-1][0], i)
        else:
            runs.append((i, i))
    return Series(name="s", unit="", values=values, segments=runs)


def _sunspots() -> tuple[list[float], list[float]]:
    frame = sm.datasets.sunspots.load_pandas().data
    return [float(v) for v in frame["YEAR"]], [float(v) for v in frame["SUNACTIVITY"]]


def test_sunspots_bank_to_cleveland_ratio() -> None:
    years, spots = _sunspots()
    assert (len(spots), years[0], years[-1]) == (309, 1700.0, 2008.0)
    result = banking.banking_ratio(
        [_line(list(spots))], years[-1] - years[0], max(spots) - min(spots)
    )
    assert result is not None
    m, ratio = result
    # Source: computed from statsmodels' yearly sunspots (1700–2008) with Cleveland's median
    # absolute slope over the data range (Cleveland, McGill & McGill, JASA 1988).
    # Cleveland's published sunspot figure uses about 0.055 (from a secondary source).
    assert m == pytest.approx(23.5615, rel=1e-3)
    assert ratio == pytest.approx(0.04244, rel=1e-3)


def test_a_straight_line_banks_to_one_and_flat_or_single_points_have_no_slope() -> None:
    # A line from corner to corner of its data rectangle is at 45° when height = width.
    assert banking.banking_ratio([_line([0.0, 1.0, 2.0, 3.0])], 3.0, 3.0) == (1.0, 1.0)
    assert banking.banking_ratio([_line([5.0, 5.0, 5.0])], 2.0, 1.0) is None
    assert banking.banking_ratio([_line([1.0, None, 2.0])], 2.0, 1.0) is None  # no joined pair
    assert banking.banking_ratio([_line([1.0, 2.0])], 1.0, 0.0) is None


def test_slopes_are_never_taken_across_a_gap() -> None:
    # 0 → 1 is joined; 1 → (gap) → 9 is not, so the jump to 9 adds no slope.
    assert banking.slopes([_line([0.0, 1.0, None, 9.0, 9.0])], 4.0, 9.0) == [
        pytest.approx(4 / 9),
        0.0,
    ]


def _sunspot_definition() -> Json:
    years, spots = _sunspots()
    rows = [{"year": f"{int(y)}-01-01", "sunspots": v} for y, v in zip(years, spots, strict=True)]
    dataset = make_dataset(
        name="sun",
        columns=[make_column("year", "date"), make_column("sunspots", "number", "sunspots")],
        time_column="year",
        frequency="year",
        rows=rows,
    )
    chart = make_trend_chart(id="sun", title="Sunspots", dataset="sun", measures=["sunspots"])
    return make_definition(datasets=[dataset], charts=[chart])


def test_sunspots_drawn_at_page_width_get_advice_that_slopes_look_steeper() -> None:
    checked = run_checks(_sunspot_definition())
    found = result_of(checked, "aspect-banking")
    assert found.status is Status.advice
    # range(y) is the drawn axis, 0–200 (the next nice number above the data): 1/m = 0.0446
    # for the line as drawn; the figure is 2.9 in / 6.69 in = 0.43 high.
    assert found.measured == pytest.approx(0.0446, abs=1e-4)
    assert found.measured_text == "suggests 0.045; drawn 0.43"
    assert "slopes look steeper than they are" in found.explanation
    assert only_chart(checked).plan.flags == []  # advice never flags or blocks the chart
    assert not found.blocking


def test_a_line_near_45_degrees_passes() -> None:
    values = [100.0, 108, 104, 113, 110, 118, 115, 123, 120, 128, 125, 133]
    definition = make_definition(
        datasets=[make_monthly(MONTHS, values)], charts=[make_trend_chart(from_zero=False)]
    )
    found = result_of(run_checks(definition), "aspect-banking")
    assert found.status is Status.passed
    assert found.measured_text == "suggests 0.45; drawn 0.46"  # within a factor of 2
    assert "within a factor of 2" in found.explanation


def test_a_gentle_line_on_a_zero_based_axis_gets_advice_that_slopes_look_flatter() -> None:
    found = result_of(run_checks(make_definition()), "aspect-banking")
    assert found.status is Status.advice
    assert "slopes look flatter than they are" in found.explanation
    # boardings 50,860–57,120 on an axis from zero: the reason is named
    assert "span only" in found.explanation
    assert "starts at zero" in found.explanation


def test_drawn_ratio_is_the_figure_ratio_split_between_stacked_panels() -> None:
    plan = plan_of(make_definition())
    width, height = charts.size_in(plan)
    assert banking.drawn_ratio(plan) == pytest.approx(height / width)
    panel = Panel(title="p", value_axis=plan.value_axis, series=plan.series)
    two = plan.model_copy(update={"form": "panels", "series": [], "panels": [panel, panel]})
    assert banking.drawn_ratio(two) == pytest.approx(charts.size_in(two)[1] / 2 / width)


def test_a_log_axis_banks_the_logarithms() -> None:
    definition = make_definition(
        datasets=[make_monthly(MONTHS[:4], [1.0, 10.0, 100.0, 1000.0])],
        charts=[make_trend_chart(scale="log", from_zero=False)],
    )
    taken = intake(definition)
    plan = plan_of(definition)
    axis = plan.value_axis
    assert axis.log
    # each step is one decade of the axis's decades: |dy/dx| = (1 / decades) / (1 / 3)
    decades = math.log10(axis.hi) - math.log10(axis.lo)
    finding = banking.SPEC.measure(plan, context_for(taken))
    assert finding.measured == pytest.approx(round(decades / 3, 4))


def test_a_line_with_no_slope_passes() -> None:
    definition = make_definition(datasets=[make_monthly(MONTHS[:3], [7, 7, 7])])
    found = result_of(run_checks(definition), "aspect-banking")
    assert (found.status, found.measured) == (Status.passed, None)


def test_the_check_is_advice_and_not_waivable() -> None:
    spec = banking.SPEC
    assert spec.level == "advice"
    assert not spec.waivable
    assert not spec.correctable
    assert "Talbot" in spec.source
    assert "Cleveland" in spec.source
