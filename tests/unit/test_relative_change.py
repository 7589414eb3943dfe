"""``relative_change``: indexed lines or aligned panels, never two y-axes; encoder, problems, drawing."""

from __future__ import annotations

import pytest
from factories import (
    Json,
    context_for,
    find,
    intake,
    make_column,
    make_definition,
    only_chart,
    plan_of,
    problems_of,
    result_of,
    run_checks,
)
from matplotlib.figure import Figure

from service.checks import missing, partial
from service.checks.results import Status
from service.config import Limits
from service.intents.compare import scale_note
from service.intents.plan import ChartPlan, Reference
from service.render import charts

JAN_FEB = ["2026-01-01", "2026-02-01"]
# Jun to Nov 2026, as_of 9 November: Aug has no row, Sep has no cases, Nov is 8 of 30 days old.
GAPPY = ["2026-06-01", "2026-07-01", "2026-09-01", "2026-10-01", "2026-11-01"]
PATH = "sections[0].charts[0]"


def spend(months: list[str], cost: list[float | None], cases: list[float | None]) -> Json:
    """A monthly dataset 'spend': cost in GBP and cases (a count), in different units."""
    rows = [
        {"month": m, "cost": c, "cases": k} for m, c, k in zip(months, cost, cases, strict=True)
    ]
    return {
        "name": "spend",
        "source": "Finance ledger",
        "columns": [
            make_column("month", "date"),
            make_column("cost", "number", "GBP"),
            make_column("cases", "integer", "cases"),
        ],
        "time_column": "month",
        "frequency": "month",
        "rows": rows,
    }


def relative(dataset: Json, **chart: object) -> Json:
    spec: Json = {
        "id": "cost-and-cases",
        "intent": "relative_change",
        "title": "Cost and cases",
        "dataset": "spend",
        "measures": ["cost", "cases"],
    }
    spec.update(chart)
    return make_definition(datasets=[dataset], charts=[spec])


def rising(**chart: object) -> Json:
    """Cost 200 → 250 GBP and cases 40 → 44, January to February 2026."""
    return relative(spend(JAN_FEB, [200.0, 250.0], [40, 44]), **chart)


def gappy(**chart: object) -> Json:
    return relative(
        spend(GAPPY, [200.0, 210.0, 230.0, 240.0, 90.0], [40, 41, None, 44, 12]), **chart
    )


def values(plan: ChartPlan) -> dict[str, list[float | None]]:
    return {s.name: s.values for s in plan.series}


# --- the index form --------------------------------------------------------------------------------


def test_index_arithmetic_base_100() -> None:
    plan = plan_of(rising())
    assert plan.form == "lines"
    # 250 / 200 × 100 = 125 and 44 / 40 × 100 = 110 (arithmetic of an index, base = 100)
    assert values(plan) == {"cost": [100.0, 125.0], "cases": [100.0, 110.0]}
    assert [s.segments for s in plan.series] == [[(0, 1)], [(0, 1)]]
    assert plan.value_axis.unit == "Index (Jan 2026 = 100)"
    assert plan.value_axis.lo <= 100.0
    assert plan.value_axis.hi >= 125.0
    assert plan.references == [Reference(value=100.0, label="Jan 2026 = 100", kind="centre")]
    assert plan.notes[0] == (
        "Indexed: Jan 2026 = 100. Units differ (cost in GBP, cases in cases), so only the change "
        "is compared."
    )
    assert plan.panels == []


def test_index_arithmetic_percent_change() -> None:
    plan = plan_of(rising(index_as="percent_change"))
    # (250 / 200 − 1) × 100 = 25 and (44 / 40 − 1) × 100 = 10
    assert values(plan) == {"cost": [0.0, 25.0], "cases": [0.0, 10.0]}
    assert plan.value_axis.unit == "% change since Jan 2026"
    assert plan.value_axis.includes_zero
    assert plan.references == [Reference(value=0.0, label="Jan 2026 = 0%", kind="centre")]
    assert plan.notes == [
        "Change since Jan 2026, in %. Units differ (cost in GBP, cases in cases), so only the "
        "change is compared."
    ]


def test_a_stated_base_period_is_used() -> None:
    plan = plan_of(rising(base_period="2026-02-01"))
    assert values(plan)["cost"] == [80.0, 100.0]  # 200 / 250 × 100
    assert plan.references[0].label == "Feb 2026 = 100"


def test_default_base_is_the_first_period_where_every_measure_is_non_zero() -> None:
    months = ["2026-01-01", *JAN_FEB[1:], "2026-03-01"]
    plan = plan_of(relative(spend(months, [0.0, 200.0, 250.0], [None, 40, 44])))
    assert plan.references[0].label == "Feb 2026 = 100"
    assert values(plan) == {"cost": [0.0, 100.0, 125.0], "cases": [None, 100.0, 110.0]}


def test_a_zero_base_value_cannot_be_indexed() -> None:
    definition = relative(spend(JAN_FEB, [0.0, 250.0], [40, 44]), base_period="2026-01-01")
    problem = find(problems_of(definition), "cannot_index")
    assert problem.path == f"{PATH}.measures[0]"
    assert "a value of zero in the base period Jan 2026" in problem.message
    assert "panels" in problem.hint


def test_a_missing_base_value_cannot_be_indexed() -> None:
    definition = relative(spend(JAN_FEB, [200.0, 250.0], [None, 44]), base_period="2026-01-01")
    problem = find(problems_of(definition), "cannot_index")
    assert (problem.path, problem.value) == (f"{PATH}.measures[1]", "cases")
    assert "no value" in problem.message


def test_a_base_period_outside_the_data() -> None:
    problem = find(problems_of(rising(base_period="2025-06-01")), "base_period_not_in_data")
    assert problem.path == f"{PATH}.base_period"
    assert "Jan 2026 to Feb 2026" in problem.hint


def test_no_period_to_index_to() -> None:
    definition = relative(spend(JAN_FEB, [0.0, 250.0], [40, 0]))
    problem = find(problems_of(definition), "no_common_base")
    assert "panels" in problem.hint


def test_negative_values_cannot_be_indexed_but_can_be_panels() -> None:
    dataset = spend(JAN_FEB, [200.0, -50.0], [40, 44])
    problem = find(problems_of(relative(dataset)), "negative_values")
    assert problem.path == f"{PATH}.measures[0]"
    assert plan_of(relative(dataset, form="panels")).form == "panels"


def test_empty_data_and_too_many_measures() -> None:
    assert find(problems_of(relative(spend([], [], []))), "empty_dataset").path == f"{PATH}.dataset"
    found = find(problems_of(rising(), Limits(max_series=1)), "limit_exceeded")
    assert (found.path, found.value) == (f"{PATH}.measures", 2)


# --- the panels form -------------------------------------------------------------------------------


def test_panels_each_have_their_own_axis_fitted_to_their_measure() -> None:
    plan = plan_of(rising(form="panels"))
    assert plan.form == "panels"
    assert plan.series == []
    cost, cases = plan.panels
    assert (cost.title, cases.title) == ("Cost (GBP)", "Cases")
    assert [s.values for s in cost.series] == [[200.0, 250.0]]
    assert [s.values for s in cases.series] == [[40.0, 44.0]]
    assert (cost.value_axis.unit, cases.value_axis.unit) == ("GBP", "cases")
    # each axis holds its own measure, closely: neither is stretched to the other's range
    assert cost.value_axis.lo <= 200.0
    assert cost.value_axis.hi >= 250.0
    assert cases.value_axis.lo <= 40.0
    assert 44.0 <= cases.value_axis.hi < 200.0
    assert cost.value_axis != cases.value_axis
    assert cost.notes == [scale_note(cost.value_axis, "en-GB")]
    assert plan.notes == [
        "Units differ (cost in GBP, cases in cases): each panel has its own scale, so compare "
        "the shape of each line, not heights across panels."
    ]


@pytest.mark.parametrize("form", ["index", "panels"])
def test_gaps_and_partial_period_checks_pass(form: str) -> None:
    definition = gappy(form=form)
    checked = run_checks(definition)
    plan = only_chart(checked).plan
    ctx = context_for(intake(definition))
    for check in ("missing-periods", "partial-period", "estimates-distinct"):
        assert result_of(checked, check).status is Status.passed, check
    assert plan.periods == ["Jun 2026", "Jul 2026", "Aug 2026", "Sept 2026", "Oct 2026", "Nov 2026"]
    assert [(g.index, g.series) for g in plan.gaps] == [(2, ["cost", "cases"]), (3, ["cases"])]
    assert plan.partial is not None
    assert plan.partial.text == "8 of 30 days"
    drawn = plan.series or [s for p in plan.panels for s in p.series]
    assert [s.name for s in drawn] == ["cost", "cases"]
    assert [s.segments for s in drawn] == [[(0, 1), (3, 5)], [(0, 1), (4, 5)]]
    for spec in (missing.SPEC, partial.SPEC):
        assert spec.measure(plan, ctx).ok, spec.id


@pytest.mark.parametrize("form", ["index", "panels"])
def test_a_measure_declared_as_estimates_is_drawn_and_listed_as_such(form: str) -> None:
    definition = rising(form=form)
    definition["datasets"][0]["columns"][2]["estimate"] = True  # cases
    checked = run_checks(definition)
    assert result_of(checked, "estimates-distinct").status is Status.passed
    plan = only_chart(checked).plan
    drawn = plan.series or [s for p in plan.panels for s in p.series]
    assert [s.estimate for s in drawn] == [False, True]
    assert "Estimates, not actuals (dashed, or a hollow diamond): Cases." in plan.notes


# --- drawing ---------------------------------------------------------------------------------------


def drawn(definition: Json) -> tuple[ChartPlan, Figure]:
    plan = only_chart(run_checks(definition)).plan
    figure = charts.figure_for(plan)
    figure.canvas.draw()  # lay out, so positions are final
    return plan, figure


def test_panels_draw_one_value_axis_each_on_a_shared_time_axis() -> None:
    plan, figure = drawn(gappy(form="panels"))
    axes = figure.axes
    assert len(axes) == len(plan.panels) == 2  # no twinned axes: a twin would be another Axes
    boxes = {tuple(round(b, 6) for b in ax.get_position().bounds) for ax in axes}
    assert len(boxes) == len(axes)  # no two axes drawn in the same place
    assert axes[0].get_position().y0 > axes[1].get_position().y1  # stacked, first on top
    assert len({ax.get_xlim() for ax in axes}) == 1
    for ax, panel in zip(axes, plan.panels, strict=True):
        assert ax.get_ylim() == pytest.approx((panel.value_axis.lo, panel.value_axis.hi))
        assert ax.get_xlabel().split("\n")[0] == panel.title
        assert all(note in ax.get_xlabel() for note in panel.notes)
    top, bottom = ([t.get_text() for t in ax.get_xticklabels() if t.get_visible()] for ax in axes)
    assert "Jun 2026" in bottom
    assert not any(top)  # period labels under the bottom panel only
    assert axes[0].get_title(loc="left").replace("\n", " ") == " ".join(plan.notes)


def test_index_draws_one_axes_on_the_index_scale() -> None:
    plan, figure = drawn(rising())
    (ax,) = figure.axes
    assert ax.get_ylim() == pytest.approx((plan.value_axis.lo, plan.value_axis.hi))
    assert ax.get_ylabel() == "Index (Jan 2026 = 100)"


@pytest.mark.parametrize("form", ["index", "panels"])
def test_renders_to_pdf(form: str) -> None:
    plan = only_chart(run_checks(gappy(form=form))).plan
    pdf = charts.draw(plan)
    assert pdf.startswith(b"%PDF")
    assert len(pdf) > 1_000
