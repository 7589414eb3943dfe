"""The lie factor against published and derived values, alone and through the pipeline."""

from __future__ import annotations

import pytest
from factories import (
    context_for,
    intake,
    make_compare_definition,
    make_waiver,
    result_of,
    run_checks,
)

from service.checks import lie_factor as lf
from service.checks.results import Status
from service.intents.plan import Category, ChartPlan, Scale


def bars(values: list[float], base: float) -> ChartPlan:
    return ChartPlan(
        chart_id="on-time",
        intent="compare",
        form="bars",
        title="t",
        value_axis=Scale(lo=min(base, 0.0), hi=max(values) * 1.1, unit="%", label="on_time (%)"),
        baseline=base,
        categories=[Category(label=f"r{i}", value=v) for i, v in enumerate(values)],
    )


def test_tufte_fuel_economy_example() -> None:
    # Tufte, The Visual Display of Quantitative Information (1983), p. 57: the mandated fuel
    # economy standard rose 18 → 27.5 mpg and was drawn as lines 0.6 in → 5.3 in long.
    factor = lf.lie_factor(18, 27.5, 0.6, 5.3)
    # Tufte, p. 57: data effect (27.5 - 18) / 18 = 0.528; graphic effect (5.3 - 0.6) / 0.6 = 7.833.
    data_effect, graphic_effect = (27.5 - 18) / 18, (5.3 - 0.6) / 0.6
    assert data_effect == pytest.approx(0.528, abs=5e-4)
    assert graphic_effect == pytest.approx(7.833, abs=5e-4)
    # Tufte, p. 57: "Lie Factor = 7.833 / 0.528 = 14.8".
    assert factor == pytest.approx(14.84, abs=0.01)


def test_truncated_bars_derived_from_tufte_definition() -> None:
    # Derived from Tufte's definition (1983, p. 57): bars for 50 and 55 on an axis starting at 45
    # are drawn 5 and 10 long; graphic effect (10 - 5) / 5 = 1.0, data effect (55 - 50) / 50 = 0.1.
    assert lf.lie_factor(50, 55, 5, 10) == pytest.approx(10.0)


def test_worst_takes_the_pair_furthest_from_one() -> None:
    # Derived from Tufte's definition: 55 → 50 drawn 10 → 5 gives 0.5 / (5 / 55) = 5.5, and
    # 50 → 55 gives 10.0; the worst pair is the one furthest from 1.
    assert lf.lie_factor(55, 50, 10, 5) == pytest.approx(5.5)
    assert lf.worst([50, 55], [5, 10]) == pytest.approx(10.0)
    assert lf.worst([55, 50], [10, 5]) == pytest.approx(10.0)


def test_understatement_is_a_lie_factor_below_one() -> None:
    # Derived: 10 → 20 (effect 1.0) drawn 10 → 15 (effect 0.5) gives 0.5.
    assert lf.worst([10, 20], [10, 15]) == pytest.approx(0.5)


@pytest.mark.parametrize(
    ("values", "shown"),
    [([50.0], [50.0]), ([42.0, 42.0, 42.0], [42.0, 42.0, 42.0]), ([], [])],
)
def test_worst_is_undefined_without_a_change(values: list[float], shown: list[float]) -> None:
    assert lf.worst(values, shown) is None


def test_honest_zero_based_bars_have_lie_factor_one() -> None:
    values = [93.4, 88.9, 91.2, 94.6]
    assert lf.worst(values, values) == pytest.approx(1.0)
    plan = bars(values, base=0.0)
    assert lf.drawn_lengths(plan) == (values, values)


def test_acceptable_band_is_tufte_0_95_to_1_05() -> None:
    # Tufte (1983), p. 57: lie factors above 1.05 or below 0.95 indicate substantial distortion;
    # restated in the Rice University Online Statistics Education glossary, "Lie factor".
    assert (lf.LOW, lf.HIGH) == (0.95, 1.05)
    assert lf.SPEC.threshold == "0.95 to 1.05"


def _factor_bars(target: float) -> ChartPlan:
    # Bars 100 and 200 from base b: lie factor 100 / (100 - b), so b = 100 - 100 / target.
    return bars([100.0, 200.0], base=100.0 - 100.0 / target)


@pytest.mark.parametrize(
    ("target", "ok"),
    [(1.0, True), (1.04, True), (1.06, False), (1.2, False)],
)
def test_measure_judges_the_band(target: float, ok: bool) -> None:
    ctx = context_for(intake(make_compare_definition({"a": 100, "b": 200})))
    finding = lf.SPEC.measure(_factor_bars(target), ctx)
    assert finding.ok is ok
    assert finding.measured == pytest.approx(target, abs=1e-4)


def test_measure_below_band_fails() -> None:
    ctx = context_for(intake(make_compare_definition({"a": 100, "b": 200})))
    # A bar base below zero shortens differences: 100 / (100 + 20) = 0.833.
    finding = lf.SPEC.measure(bars([100.0, 200.0], base=-20.0), ctx)
    assert not finding.ok
    assert finding.measured == pytest.approx(0.8333, abs=1e-4)


def test_single_bar_passes_with_no_measure() -> None:
    ctx = context_for(intake(make_compare_definition({"a": 50})))
    finding = lf.SPEC.measure(bars([50.0], base=45.0), ctx)
    assert finding.ok
    assert finding.measured is None


def test_waived_truncated_baseline_fails_lie_factor_end_to_end() -> None:
    definition = make_compare_definition(
        {"Route 7": 50, "Route 12": 55},
        baseline=45,
        waivers=[make_waiver("bar-zero-baseline", "on-time")],
    )
    checked = run_checks(definition)
    assert result_of(checked, "bar-zero-baseline").status is Status.waived
    factor = result_of(checked, "lie-factor")
    assert factor.status is Status.failed
    # Derived from Tufte's definition (1983, p. 57), as in the direct case above: 10.0.
    assert factor.measured == pytest.approx(10.0)
    assert factor.measured_text == "10.00"
    plan = checked.charts[0].plan
    assert plan.baseline == 45.0
    assert any(flag.startswith("lie-factor:") for flag in plan.flags)
    assert checked.blocked


def test_unwaived_truncated_baseline_is_corrected_and_honest() -> None:
    checked = run_checks(make_compare_definition({"Route 7": 50, "Route 12": 55}, baseline=45))
    assert result_of(checked, "bar-zero-baseline").status is Status.corrected
    factor = result_of(checked, "lie-factor")
    assert factor.status is Status.passed
    assert factor.measured == pytest.approx(1.0)
    assert checked.charts[0].plan.baseline == 0.0
    assert not checked.blocked
