"""The ``target`` intent: bars against targets and the deviation form, its problems and its drawer."""

from __future__ import annotations

from typing import Any

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
    run_checks,
)
from matplotlib.axes import Axes
from matplotlib.colors import to_hex
from matplotlib.lines import Line2D
from matplotlib.patches import Rectangle

from service.checks import baseline, lie_factor
from service.config import Limits
from service.intents import target
from service.intents.plan import ChartPlan, Reference
from service.render import charts, common, deviation, layout

# An invented budget of a fictional city council's depots (GBP): spend against plan.
SPEND = {"North": 12000.0, "South": 9700.0, "East": None, "West": 8000.0}
PLAN = {"North": 10800.0, "South": 10000.0, "East": 5000.0, "West": None}


def budget(
    spend: dict[str, float | None] | None = None,
    plan: dict[str, float | None] | None = None,
    *,
    plan_unit: str = "GBP",
) -> Json:
    spend = SPEND if spend is None else spend
    plan = PLAN if plan is None else plan
    return {
        "name": "budget",
        "columns": [
            make_column("depot", "text"),
            make_column("spend", "number", "GBP"),
            make_column("plan", "number", plan_unit),
        ],
        "rows": [{"depot": d, "spend": s, "plan": plan.get(d)} for d, s in spend.items()],
    }


def target_chart(**overrides: Any) -> Json:
    chart: Json = {
        "id": "spend",
        "intent": "target",
        "title": "Spend against plan by depot",
        "dataset": "budget",
        "category": "depot",
        "actual": "spend",
        "target": "plan",
    }
    chart.update(overrides)
    return chart


def target_definition(dataset: Json | None = None, **chart: Any) -> Json:
    return make_definition(datasets=[dataset or budget()], charts=[target_chart(**chart)])


def test_bars_carry_actuals_and_per_category_targets_from_zero() -> None:
    plan = plan_of(target_definition())
    assert (plan.form, plan.baseline) == ("bars", 0.0)
    assert [(c.label, c.value, c.target) for c in plan.categories] == [
        ("North", 12000.0, 10800.0),
        ("South", 9700.0, 10000.0),
        ("East", None, 5000.0),  # missing actual: no data, never zero
        ("West", 8000.0, None),
    ]
    axis = plan.value_axis
    assert axis.lo == 0.0
    assert axis.hi >= 12000.0
    assert (axis.unit, axis.label) == ("GBP", "Spend (GBP)")
    assert plan.references == []  # targets differ per depot: marks, not one line
    assert plan.notes == ["No target given for: West."]


def test_bars_with_one_target_value_carry_a_target_reference() -> None:
    definition = target_definition(target=None, target_value=11000.0)
    plan = plan_of(definition)
    assert plan.references == [Reference(value=11000.0, label="target £11,000", kind="target")]
    assert {c.target for c in plan.categories} == {11000.0}
    assert plan.value_axis.lo == 0.0
    assert plan.value_axis.hi >= 12000.0
    ctx = context_for(intake(definition))
    assert baseline.SPEC.measure(plan, ctx).ok
    assert lie_factor.SPEC.measure(plan, ctx).ok


def test_axis_is_fitted_to_targets_above_every_actual() -> None:
    plan = plan_of(target_definition(target=None, target_value=20000.0))
    assert plan.value_axis.hi >= 20000.0


def test_deviation_is_actual_minus_target_around_a_labelled_zero() -> None:
    definition = target_definition(form="deviation")
    plan = plan_of(definition)
    assert (plan.form, plan.baseline) == ("deviation", 0.0)
    assert [(c.label, c.value) for c in plan.categories] == [
        ("North", 1200.0),  # 12,000 − 10,800
        ("South", -300.0),  # 9,700 − 10,000
        ("East", None),  # no actual
        ("West", None),  # no target
    ]
    assert plan.references == [Reference(value=0.0, label="on target", kind="target")]
    axis = plan.value_axis
    assert (axis.lo, axis.hi) == (-400.0, 1200.0)  # scaled to the variances, not symmetric
    assert axis.unit == "GBP"
    assert plan.notes == [target.DEVIATION_NOTE]
    assert plan.notes[0] == "Bars show actual minus target."
    ctx = context_for(intake(definition))
    assert baseline.SPEC.measure(plan, ctx).ok
    assert lie_factor.SPEC.measure(plan, ctx).ok


def test_deviation_from_one_target_value_says_what_the_target_is() -> None:
    plan = plan_of(target_definition(form="deviation", target=None, target_value=10000.0))
    assert [c.value for c in plan.categories] == [2000.0, -300.0, None, -2000.0]
    assert plan.notes == [
        "Bars show actual minus target. The target is £10,000 for every category."
    ]


def test_categories_keep_the_data_order() -> None:
    spend = {"Zeta": 1.0, "Alpha": 30.0, "Mid": 10.0}
    plan = plan_of(target_definition(budget(spend, dict.fromkeys(spend, 10.0)), form="deviation"))
    assert [c.label for c in plan.categories] == ["Zeta", "Alpha", "Mid"]


def test_variance_is_none_when_either_side_is_missing() -> None:
    assert target.variance(5.0, 7.5) == -2.5
    assert target.variance(None, 7.5) is None
    assert target.variance(5.0, None) is None


def test_target_in_another_unit_is_refused() -> None:
    problem = find(problems_of(target_definition(budget(plan_unit="EUR"))), "mixed_units")
    assert problem.path == "sections[0].charts[0].target"
    assert "'EUR'" in problem.message
    assert "'GBP'" in problem.message
    assert "actual minus target would mean nothing" in problem.message
    assert "GBP" in problem.hint


def test_duplicate_and_missing_categories_are_problems() -> None:
    dataset = budget()
    dataset["rows"] += [
        {"depot": "North", "spend": 1.0, "plan": 1.0},
        {"depot": None, "spend": 2.0, "plan": 2.0},
    ]
    problems = problems_of(target_definition(dataset))
    assert find(problems, "duplicate_category").value == "North"
    assert find(problems, "category_missing").path == "sections[0].charts[0].category"


def test_empty_data_is_a_problem() -> None:
    dataset = budget()
    dataset["rows"] = []
    problem = find(problems_of(target_definition(dataset)), "empty_dataset")
    assert problem.path == "sections[0].charts[0].dataset"


def test_too_many_categories_is_over_the_limit() -> None:
    problem = find(problems_of(target_definition(), Limits(max_categories=3)), "limit_exceeded")
    assert problem.context == {"limit": 3, "setting": "max_categories"}
    assert "PLUMBLINE_LIMITS__MAX_CATEGORIES" in problem.hint


def _drawn(plan: ChartPlan) -> Axes:
    figure = charts.figure_for(plan)
    figure.canvas.draw()
    assert layout.measure(figure) == (0, 0)  # no overlapping tick labels, nothing cut off
    return figure.axes[0]


def test_deviation_drawer_draws_variances_from_a_labelled_zero_line() -> None:
    plan = only_chart(run_checks(target_definition(form="deviation"))).plan
    ax = _drawn(plan)
    bars = [p for p in ax.patches if isinstance(p, Rectangle)]
    # bar widths in data units are the variances, each starting at zero
    assert sorted((b.get_x(), b.get_width()) for b in bars) == [(0.0, -300.0), (0.0, 1200.0)]
    widths_px = {b.get_width(): b.get_window_extent().width for b in bars}
    assert widths_px[1200.0] / widths_px[-300.0] == pytest.approx(4.0, rel=1e-6)
    colours = {b.get_width(): to_hex(b.get_facecolor()) for b in bars}
    assert colours[1200.0] == common.colour(plan, 0)  # above target
    assert colours[-300.0] == common.colour(plan, 1)  # below target
    assert colours[1200.0] != colours[-300.0]
    zero = [
        line
        for line in ax.get_lines()
        if isinstance(line, Line2D) and [float(x) for x in line.get_xdata()] == [0.0, 0.0]
    ]
    assert len(zero) == 1
    texts = [t.get_text() for t in ax.texts]
    assert "on target" in texts
    assert "+£1,200" in texts
    assert "\u2212£300" in texts
    assert texts.count("  no data") == 2
    assert [t.get_text() for t in ax.get_yticklabels()] == ["North", "South", "East", "West"]


def test_signed_labels() -> None:
    plan = plan_of(target_definition(form="deviation"))
    assert deviation.signed_label(plan, 1200.0) == "+£1,200"
    assert deviation.signed_label(plan, -300.0) == "\u2212£300"
    assert deviation.signed_label(plan, 0.0) == "£0"


@pytest.mark.parametrize("form", ["bars", "deviation"])
def test_both_forms_render_to_pdf(form: str) -> None:
    plan = only_chart(run_checks(target_definition(form=form))).plan
    pdf = charts.draw(plan)
    assert pdf.startswith(b"%PDF-")
    assert len(pdf) > 1000
