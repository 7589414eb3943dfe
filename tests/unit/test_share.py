"""Intent ``share``: the largest-remainder method, the encoder, its problems, and the pie drawer."""

from __future__ import annotations

import itertools
import math
from typing import Any

import pytest
from factories import (
    Json,
    codes,
    find,
    make_column,
    make_definition,
    plan_of,
    problems_of,
    run_checks,
)
from matplotlib.axes import Axes
from matplotlib.patches import Rectangle, Wedge
from matplotlib.text import Text

from service.config import Limits
from service.intents.plan import Category, ChartPlan
from service.intents.share import largest_remainder, pie_problem
from service.render import charts
from service.render import pie as pie_drawer


def budget(parts: dict[str, float | None]) -> Json:
    """A dataset 'budget' of departments (text) and spend (number, GBP)."""
    return {
        "name": "budget",
        "source": "Finance ledger",
        "columns": [make_column("department", "text"), make_column("spend", "number", "GBP")],
        "rows": [{"department": k, "spend": v} for k, v in parts.items()],
    }


def share_definition(parts: dict[str, float | None], **chart: Any) -> Json:
    spec: Json = {
        "id": "spend-share",
        "intent": "share",
        "title": "Spend by department",
        "dataset": "budget",
        "category": "department",
        "measure": "spend",
    }
    spec.update(chart)
    return make_definition(datasets=[budget(parts)], charts=[spec])


# --- the largest-remainder (Hamilton) method ------------------------------------------------


def test_largest_remainder_worked_example() -> None:
    values = [13.626332, 47.989636, 9.596008, 28.788024]
    # Naive rounding gives 14 + 48 + 10 + 29 = 101.
    assert sum(round(v) for v in values) == 101
    # Source: the largest-remainder (Hamilton) method, as described in Balinski & Young, "Fair
    # Representation" (1982) (from memory): floors 13, 47, 9, 28 leave 3 points, which go to the
    # largest remainders .99, .79 and .63.
    assert largest_remainder(values) == [14, 48, 9, 29]


def test_equal_remainders_go_to_the_part_first_in_the_input() -> None:
    # Source: largest-remainder (Hamilton) method; the tie rule (input order) is Plumbline's own.
    assert largest_remainder([1 / 3, 1 / 3, 1 / 3]) == [34, 33, 33]
    assert largest_remainder([1.0, 1.0, 1.0]) == [34, 33, 33]
    # 12.5 and 37.5 both leave .5: the first in the input gets the point, not the larger part.
    assert largest_remainder([12.5, 37.5, 50.0]) == [13, 37, 50]
    assert largest_remainder([37.5, 12.5, 50.0]) == [38, 12, 50]


def test_largest_remainder_reads_decimals_as_written() -> None:
    # 0.1 + 0.2 is not 0.3 in binary floating point; the quotas are exact, so no dust decides.
    assert largest_remainder([0.1, 0.2, 0.3, 0.4]) == [10, 20, 30, 40]
    assert largest_remainder([0.0, 5.0, 0.0]) == [0, 100, 0]
    assert largest_remainder([2.0, 1.0], total=10) == [7, 3]
    assert largest_remainder([]) == []


@pytest.mark.parametrize("values", [[1.0, -1.0, 3.0], [0.0, 0.0], [1.0, math.nan]])
def test_largest_remainder_refuses_values_without_shares(values: list[float]) -> None:
    with pytest.raises(ValueError):  # noqa: PT011 - several messages, one contract
        largest_remainder(values)


# --- the pie rule -----------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("values", "readable"),
    [
        ([50.0, 30.0, 20.0], True),
        ([45.0, 50.0, 5.0], True),  # exactly 5 points apart: told apart
        ([40.0, 44.0, 16.0], False),  # 4 points and ×1.1
        ([97.0, 2.0, 1.0], True),  # 2 % against 1 %: 1 point, but ×2
        ([31.0, 30.0, 39.0], False),  # 30 % against 31 %
        ([30.0, 20.0, 15.0, 12.0, 10.0, 8.0, 5.0], False),  # 7 parts
        ([60.0, 40.0, 0.0], False),  # a zero part has no wedge
        ([100.0], True),
    ],
)
def test_pie_rule(values: list[float], readable: bool) -> None:
    assert (pie_problem(values) is None) is readable


# --- the encoder ------------------------------------------------------------------------------


def test_default_form_is_sorted_zero_based_bars_with_shares() -> None:
    plan = plan_of(share_definition({"Roads": 300.0, "Parks": 0.0, "Schools": 500.0, "Art": 200.0}))
    assert plan.form == "bars"
    assert plan.baseline == 0.0
    assert plan.value_axis.lo == 0.0
    assert plan.value_axis.unit == "GBP"
    assert [c.label for c in plan.categories] == ["Schools", "Roads", "Art", "Parks"]
    assert [c.percent for c in plan.categories] == [50, 30, 20, 0]  # the zero part is kept
    assert plan.notes == ["Percentages of the whole (£1,000); they sum to 100."]


def test_equal_parts_keep_input_order() -> None:
    plan = plan_of(share_definition({"North": 1.0, "South": 1.0, "East": 1.0}))
    assert [(c.label, c.percent) for c in plan.categories] == [
        ("North", 34),
        ("South", 33),
        ("East", 33),
    ]


def test_expected_parts_are_not_added_by_the_encoder() -> None:
    plan = plan_of(share_definition({"A": 60.0, "B": 40.0}, expected_categories=["A", "B", "C"]))
    assert [c.label for c in plan.categories] == ["A", "B"]


def test_a_missing_value_is_shown_without_a_share() -> None:
    plan = plan_of(share_definition({"A": 60.0, "B": None, "C": 40.0}))
    assert [(c.label, c.value, c.percent) for c in plan.categories] == [
        ("A", 60.0, 60),
        ("C", 40.0, 40),
        ("B", None, None),
    ]


def test_pie_is_planned_as_asked_when_allowed() -> None:
    plan = plan_of(share_definition({"A": 31.0, "B": 30.0, "C": 39.0}, allow_pie=True))
    assert plan.form == "pie"  # the check 'pie-readable' decides whether it stays a pie
    assert [c.label for c in plan.categories] == ["C", "A", "B"]


# --- problems ---------------------------------------------------------------------------------


def test_problems_of_the_data() -> None:
    definition = share_definition({"A": 1.0, "B": 2.0}, expected_categories=["A", "C", "C"])
    rows = definition["datasets"][0]["rows"]
    rows += [{"department": "A", "spend": 3.0}, {"department": None, "spend": 4.0}]
    found = problems_of(definition)
    base = "sections[0].charts[0]"
    assert set(codes(found)) == {
        ("duplicate_category", f"{base}.category"),
        ("category_missing", f"{base}.category"),
        ("duplicate_expected_category", f"{base}.expected_categories[2]"),
    }
    assert find(found, "duplicate_category").value == "A"


def test_empty_dataset_is_a_problem() -> None:
    found = problems_of(share_definition({}))
    assert find(found, "empty_dataset").path == "sections[0].charts[0].dataset"


def test_too_many_parts_counts_expected_ones_too() -> None:
    definition = share_definition({"A": 1.0, "B": 2.0, "C": 3.0}, expected_categories=["D"])
    problem = find(problems_of(definition, Limits(max_categories=3)), "limit_exceeded")
    assert (problem.path, problem.value) == ("sections[0].charts[0].category", 4)
    assert problem.context == {"limit": 3, "setting": "max_categories"}


# --- drawing ----------------------------------------------------------------------------------


def _drawn(plan: ChartPlan) -> Axes:
    assert pie_drawer.draw_pie  # registered under the form "pie"
    figure = charts.figure_for(plan)
    figure.canvas.draw()
    return figure.axes[0]


def test_pie_wedges_are_proportional_clockwise_from_twelve() -> None:
    values = {"Schools": 500.0, "Roads": 300.0, "Art": 200.0}
    plan = run_checks(share_definition(values, allow_pie=True)).charts[0].plan
    assert plan.form == "pie"
    ax = _drawn(plan)
    wedges = [p for p in ax.patches if isinstance(p, Wedge)]
    assert len(wedges) == 3
    sweeps = [w.theta2 - w.theta1 for w in wedges]
    for sweep, value in zip(sweeps, values.values(), strict=True):
        assert sweep / 360.0 == pytest.approx(value / 1000.0)
    assert wedges[0].theta2 == pytest.approx(90.0)  # 12 o'clock
    for before, after in itertools.pairwise(wedges):
        assert after.theta2 == pytest.approx(before.theta1)  # clockwise, no gap
    assert all(w.get_edgecolor() == (1.0, 1.0, 1.0, 1.0) for w in wedges)
    texts = [t.get_text() for t in ax.findobj(Text)]
    assert {"Schools 50%", "Roads 30%", "Art 20%"} <= set(texts)
    assert ax.get_legend() is None
    assert ax.get_aspect() == 1.0


def test_pie_lists_parts_it_cannot_draw() -> None:
    plan = plan_of(share_definition({"A": 70.0, "B": 30.0}, allow_pie=True))
    missing = Category(label="C", value=None, expected_missing=True)
    plan = plan.model_copy(update={"categories": [*plan.categories, missing]})
    texts = [t.get_text() for t in _drawn(plan).findobj(Text)]
    assert "Expected, no data: C" in texts


def test_pie_labels_are_never_mathtext() -> None:
    plan = plan_of(share_definition({"$x^2$": 70.0, "B": 30.0}, allow_pie=True))
    labels = [t for t in _drawn(plan).findobj(Text) if t.get_text().startswith("$x^2$")]
    assert labels
    assert all(not t.get_parse_math() for t in labels)


def test_share_bars_print_percent_and_value() -> None:
    plan = run_checks(share_definition({"A": 600.0, "B": 400.0})).charts[0].plan
    ax = _drawn(plan)
    assert len([p for p in ax.patches if isinstance(p, Rectangle) and p.get_width() > 0]) == 2
    texts = [t.get_text() for t in ax.findobj(Text)]
    assert "60% (£600)" in texts
    assert "40% (£400)" in texts


@pytest.mark.parametrize("allow_pie", [False, True])
def test_renders_to_pdf(allow_pie: bool) -> None:
    plan = run_checks(share_definition({"A": 600.0, "B": 300.0, "C": 100.0}, allow_pie=allow_pie))
    pdf = charts.draw(plan.charts[0].plan)
    assert pdf.startswith(b"%PDF")
