"""Checks on share charts: pass, correct, fail and refused waivers, through the pipeline and on plans."""

from __future__ import annotations

from typing import Any

import pytest
from factories import (
    Json,
    context_for,
    find,
    guarded,
    intake,
    make_column,
    make_definition,
    make_waiver,
    only_chart,
    plan_of,
    problems_of,
    result_of,
    run_checks,
    status_of,
)

from service.checks import share as checks
from service.checks.results import Status
from service.intents import share
from service.intents.plan import Category

CHART = "spend-share"


def share_definition(
    parts: dict[str, float | None], *, waivers: list[Json] | None = None, **chart: Any
) -> Json:
    dataset: Json = {
        "name": "budget",
        "source": "Finance ledger",
        "columns": [make_column("department", "text"), make_column("spend", "number", "GBP")],
        "rows": [{"department": k, "spend": v} for k, v in parts.items()],
    }
    spec: Json = {
        "id": CHART,
        "intent": "share",
        "title": "Spend by department",
        "dataset": "budget",
        "category": "department",
        "measure": "spend",
    }
    spec.update(chart)
    return make_definition(datasets=[dataset], charts=[spec], waivers=waivers)


THIRDS = {"A": 33.3, "B": 33.3, "C": 33.3}


def test_share_checks_run_in_order() -> None:
    checked = run_checks(share_definition({"A": 60.0, "B": 40.0}, allow_pie=True))
    names = [r.check for r in checked.results]
    ours = ["parts-sum-to-whole", "no-negative-parts", "expected-parts-shown"]
    ours += ["shares-sum-to-100", "pie-readable"]
    assert [n for n in names if n in ours] == ours
    inapplicable = {"expected-parts-shown", "precision", "log-scale-noted"}  # nothing asked
    assert all(
        r.status is (Status.not_applicable if r.check in inapplicable else Status.passed)
        for r in checked.results
    )


# --- parts-sum-to-whole -----------------------------------------------------------------------


def test_default_tolerance_is_half_a_unit_of_the_last_decimal_per_part() -> None:
    assert share.decimals([12.5, 3.25, 1200.0]) == 2
    assert share.default_tolerance([12.5, 3.25]) == pytest.approx(0.01)
    assert share.default_tolerance([1.0, 2.0, 3.0]) == pytest.approx(1.5)


def test_rounded_parts_within_tolerance_pass() -> None:
    # 3 × 33.3 = 99.9; rounding to 1 decimal may lose up to 0.05 per part: 0.15 in all.
    found = result_of(run_checks(share_definition(THIRDS, whole=100)), "parts-sum-to-whole")
    assert found.status is Status.passed
    assert found.measured == pytest.approx(-0.1)
    assert found.measured_text == "£99.9 against £100.0"


def test_no_whole_stated_passes() -> None:
    found = result_of(run_checks(share_definition(THIRDS)), "parts-sum-to-whole")
    assert found.status is Status.passed
    assert "No whole is stated" in found.explanation


def test_parts_missing_the_whole_fail_and_flag_the_chart() -> None:
    checked = run_checks(share_definition({"A": 33.3, "B": 33.3, "C": 33.0}, whole=100))
    found = result_of(checked, "parts-sum-to-whole")
    assert found.status is Status.failed
    assert "£0.40 apart" in found.explanation
    assert only_chart(checked).plan.flags[0].startswith("parts-sum-to-whole: ")


def test_a_stated_tolerance_is_used() -> None:
    definition = share_definition({"A": 33.3, "B": 33.3, "C": 33.0}, whole=100, tolerance=0.5)
    assert result_of(run_checks(definition), "parts-sum-to-whole").status is Status.passed


# --- no-negative-parts ------------------------------------------------------------------------


def test_no_negative_parts_passes() -> None:
    found = result_of(run_checks(share_definition({"A": 0.0, "B": 4.0})), "no-negative-parts")
    assert (found.status, found.measured) == (Status.passed, 0)


def test_a_negative_part_fails() -> None:
    checked = run_checks(share_definition({"A": 10.0, "B": -2.0, "C": 5.0}))
    found = result_of(checked, "no-negative-parts")
    assert (found.status, found.measured, found.measured_text) == (
        Status.failed,
        1,
        "1 negative",
    )
    assert "B (\u2212£2)" in found.explanation
    plan = only_chart(checked).plan
    assert all(c.percent is None for c in plan.categories)  # no shares of a broken whole
    assert result_of(checked, "shares-sum-to-100").status is Status.passed


# --- expected-parts-shown ---------------------------------------------------------------------


def test_expected_parts_all_present_pass() -> None:
    definition = share_definition({"A": 60.0, "B": 40.0}, expected_categories=["B", "A"])
    assert result_of(run_checks(definition), "expected-parts-shown").status is Status.passed


def test_missing_expected_part_is_put_back_as_no_data() -> None:
    definition = share_definition({"A": 60.0, "B": 40.0}, expected_categories=["A", "C", "B"])
    checked = run_checks(definition)
    found = result_of(checked, "expected-parts-shown")
    assert found.status is Status.corrected
    assert (found.measured, found.measured_text, found.corrected_to) == (
        1,
        "1 of 3 not shown",
        "all shown",
    )
    assert "'expected, no data'" in found.explanation
    plan = only_chart(checked).plan
    assert [(c.label, c.value, c.percent, c.expected_missing) for c in plan.categories] == [
        ("A", 60.0, 60, False),
        ("B", 40.0, 40, False),
        ("C", None, None, True),
    ]


def test_dropping_an_expected_part_from_a_plan_fails_the_measure() -> None:
    definition = share_definition({"A": 60.0, "B": 40.0}, expected_categories=["A", "B"])
    bad = plan_of(definition).model_copy(update={"categories": plan_of(definition).categories[:1]})
    assert not checks.EXPECTED.measure(bad, context_for(intake(definition))).ok
    result = guarded(definition, bad)
    assert status_of(result, "expected-parts-shown") is Status.corrected
    assert [c.label for c in result.plan.categories] == ["A", "B"]
    assert result.plan.categories[1].expected_missing  # put back, never silently dropped


# --- shares-sum-to-100 ------------------------------------------------------------------------


def test_shares_sum_to_100_passes() -> None:
    checked = run_checks(share_definition({"A": 13.626332, "B": 47.989636, "C": 9.596008}))
    found = result_of(checked, "shares-sum-to-100")
    assert (found.status, found.measured, found.measured_text) == (Status.passed, 100, "sum 100%")


def test_naively_rounded_labels_fail_and_are_recomputed() -> None:
    values = {"A": 13.626332, "B": 47.989636, "C": 9.596008, "D": 28.788024}
    definition = share_definition(values)
    plan = plan_of(definition)
    naive = [c.model_copy(update={"percent": round(c.value or 0.0)}) for c in plan.categories]
    bad = plan.model_copy(update={"categories": naive})
    finding = checks.PERCENT.measure(bad, context_for(intake(definition)))
    assert (finding.ok, finding.measured, finding.shown) == (False, 101, "sum 101%")
    result = guarded(definition, bad)
    assert status_of(result, "shares-sum-to-100") is Status.corrected
    # Source: largest-remainder (Hamilton) method, worked in tests/unit/test_share.py.
    assert {c.label: c.percent for c in result.plan.categories} == {
        "A": 14,
        "B": 48,
        "C": 9,
        "D": 29,
    }


# --- pie-readable -----------------------------------------------------------------------------


def test_readable_pie_stays_a_pie() -> None:
    checked = run_checks(share_definition({"A": 50.0, "B": 30.0, "C": 20.0}, allow_pie=True))
    found = result_of(checked, "pie-readable")
    assert (found.status, found.measured) == (Status.passed, 3)
    assert found.measured_text == "3 parts, closest 10.0 pp apart (×1.50)"
    assert only_chart(checked).plan.form == "pie"


def test_six_parts_are_drawn_as_bars() -> None:
    parts = {"A": 30.0, "B": 22.0, "C": 16.0, "D": 12.0, "E": 11.0, "F": 9.0}
    checked = run_checks(share_definition(parts, allow_pie=True))
    found = result_of(checked, "pie-readable")
    assert found.status is Status.corrected
    assert found.measured == 6
    assert found.corrected_to is not None
    assert found.corrected_to.startswith("bars; 6 parts")
    assert "6 parts, more than 5" in found.explanation
    plan = only_chart(checked).plan
    assert (plan.form, plan.baseline, plan.value_axis.lo) == ("bars", 0.0, 0.0)
    assert [c.label for c in plan.categories] == list(parts)  # largest first


def test_parts_a_point_apart_are_drawn_as_bars() -> None:
    checked = run_checks(share_definition({"A": 30.0, "B": 31.0, "C": 39.0}, allow_pie=True))
    found = result_of(checked, "pie-readable")
    assert found.status is Status.corrected
    assert found.measured_text == "3 parts, closest 1.0 pp apart (×1.03)"
    assert "30.0% and 31.0% differ by 1.0 percentage points and ×1.03" in found.explanation
    plan = only_chart(checked).plan
    assert plan.form == "bars"
    assert [c.label for c in plan.categories] == ["C", "B", "A"]


def test_pie_with_a_zero_part_is_drawn_as_bars() -> None:
    checked = run_checks(share_definition({"A": 60.0, "B": 40.0, "C": 0.0}, allow_pie=True))
    assert result_of(checked, "pie-readable").status is Status.corrected
    assert [c.label for c in only_chart(checked).plan.categories] == ["A", "B", "C"]


def test_pie_with_missing_expected_part_keeps_it() -> None:
    definition = share_definition(
        {"A": 60.0, "B": 25.0, "C": 15.0, "D": 14.0}, allow_pie=True, expected_categories=["E"]
    )
    plan = only_chart(run_checks(definition)).plan
    assert plan.form == "bars"  # 15 % against 14 %
    assert plan.categories[-1] == Category(label="E", value=None, expected_missing=True)


# --- waivers ----------------------------------------------------------------------------------


@pytest.mark.parametrize(
    "check",
    [
        "parts-sum-to-whole",
        "no-negative-parts",
        "expected-parts-shown",
        "shares-sum-to-100",
        "pie-readable",
        "bar-zero-baseline",  # waivable for compare, never for share (never_waivable_for)
        "lie-factor",
    ],
)
def test_waivers_are_refused_on_a_share_chart(check: str) -> None:
    definition = share_definition(THIRDS, whole=100, waivers=[make_waiver(check, CHART)])
    problem = find(problems_of(definition), "not_waivable")
    assert (problem.path, problem.value) == ("waivers[0].check", check)


def test_bar_checks_run_on_share_bars() -> None:
    checked = run_checks(share_definition({"A": 60.0, "B": 40.0}))
    assert result_of(checked, "bar-zero-baseline").status is Status.passed
    assert result_of(checked, "lie-factor").status is Status.passed
