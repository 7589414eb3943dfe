"""The movement intent: XmR statistics, Western Electric rules, the encoder, its check and its drawer."""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np
import pytest
from factories import (
    Json,
    context_for,
    guarded,
    intake,
    make_column,
    make_definition,
    make_monthly,
    make_waiver,
    only_chart,
    plan_of,
    problems_of,
    result_of,
    run_checks,
    status_of,
)
from matplotlib.lines import Line2D
from matplotlib.text import Annotation

from service.checks import missing, partial, scale_note
from service.checks import movement as checks
from service.checks.results import Status
from service.intents import movement
from service.intents.movement import D2, ProcessLimits, run_rules, xmr
from service.intents.plan import Verdict
from service.render import charts, style

# --- XmR statistics -----------------------------------------------------------------------------

FLOW = [49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1]


def test_nist_individuals_chart_example() -> None:
    limits = xmr(FLOW)
    # Source: NIST/SEMATECH e-Handbook of Statistical Methods, §6.3.2.2, individuals control chart
    # of flow rates: x̄ = 50.81, MR̄ = 1.8778, UCL = 55.8041, LCL = 45.8159, no point outside.
    # The handbook uses 3/1.128 (as this module does); with the rounded 2.66 the limits move in the
    # third decimal (55.8050), hence the tolerance of 1e-3.
    assert limits.centre == pytest.approx(50.81, abs=1e-9)
    assert limits.mr_bar == pytest.approx(1.8778, abs=1e-4)
    assert limits.upper == pytest.approx(55.8041, abs=1e-3)
    assert limits.lower == pytest.approx(45.8159, abs=1e-3)
    assert limits.upper == pytest.approx(limits.centre + 3 * limits.mr_bar / 1.128, abs=1e-12)
    assert run_rules(FLOW, limits)[1] == []
    # D4 = 3.268 for moving ranges of two (Wheeler's rounding; from memory).
    assert limits.range_limit == pytest.approx(3.268 * 1.8778, abs=1e-3)


def test_moving_ranges_skip_gaps() -> None:
    assert movement.moving_ranges([1.0, 3.0, None, 4.0, 2.0]) == [2.0, 2.0]


# Centre 0 and sigma exactly 1 (MR̄ = d2), so the values below are z-scores.
UNIT = ProcessLimits(centre=0.0, mr_bar=D2)


def fired(values: list[float | None], run_length: int = 8) -> dict[int, list[int]]:
    return {rule: found for rule, found in run_rules(values, UNIT, run_length).items() if found}


# Rules as in the Western Electric Statistical Quality Control Handbook (1956), each side apart.
@pytest.mark.parametrize(
    ("values", "expected"),
    [
        ([0.5, -0.5, 3.1], {1: [2], 2: [], 3: []}),  # rule 1: one point beyond 3 sigma
        ([0.5, -0.5, -3.1], {1: [2]}),  # … below
        ([0.5, -0.5, 3.0], {}),  # on the limit is not beyond it
        ([0.0, 2.1, 0.0, 2.1], {2: [3]}),  # rule 2: two of three beyond 2 sigma
        ([2.1, 2.1], {2: [1]}),
        ([2.1, 0.0, 0.0, 2.1], {}),  # just misses: the two are four apart
        ([2.1, -2.1, 0.0], {}),  # just misses: opposite sides
        ([1.1, 1.1, 0.5, 1.1, 1.1], {3: [4]}),  # rule 3: four of five beyond 1 sigma
        ([1.1, 1.1, 0.5, 0.5, 1.1, 1.1], {}),  # just misses: three of five
        ([-1.1, -1.1, -1.1, -0.5, -1.1], {3: [4]}),
        ([0.5] * 8, {4: [7]}),  # rule 4: eight in a row on one side
        ([0.5] * 7, {}),
        ([0.5] * 7 + [0.0, 0.5], {}),  # a point on the centre line breaks the run
        ([-0.5] * 9, {4: [7, 8]}),
        ([0.5] * 4 + [None] + [0.5] * 4, {4: [8]}),  # a gap is skipped, not a break
    ],
)
def test_western_electric_rules(values: list[float | None], expected: dict[int, list[int]]) -> None:
    assert fired(values) == {rule: found for rule, found in expected.items() if found}


def test_run_length_eight_or_nine() -> None:
    # Western Electric (1956) counts eight in a row; Nelson (1984, J. Quality Technology) nine.
    assert fired([0.5] * 8, run_length=8) == {4: [7]}
    assert fired([0.5] * 8, run_length=9) == {}
    assert fired([0.5] * 9, run_length=9) == {4: [8]}


# --- the encoder through the pipeline -----------------------------------------------------------

NOISE = [float(v) for v in np.round(100 + np.random.default_rng(1).normal(0, 2, 24), 1)]


def movement_definition(values: Sequence[float | None], **chart: object) -> Json:
    spec: Json = {
        "id": "boardings-movement",
        "intent": "movement",
        "title": "Boardings: latest change",
        "dataset": "ridership",
        "measure": "boardings",
        "source": "Ticketing system",
    }
    spec.update(chart)
    columns = [make_column("month", "date"), make_column("boardings", "number", "boardings")]
    return make_definition(
        datasets=[make_monthly(end_in_october(len(values)), list(values), columns=columns)],
        charts=[spec],
    )


def end_in_october(n: int, extra: int = 0) -> list[str]:
    """``n`` month starts ending in October 2026 (plus ``extra`` months after it)."""
    last = 2026 * 12 + 9 + extra  # October 2026 as a month count
    return [f"{m // 12}-{m % 12 + 1:02d}-01" for m in range(last - n + 1, last + 1)]


def test_final_big_jump_is_a_signal() -> None:
    checked = run_checks(movement_definition([*NOISE[:-1], 125.0]))
    plan = only_chart(checked).plan
    assert plan.form == "control"
    assert len(plan.periods) == 24  # the whole history, not the last two periods
    headline = plan.verdicts[0]
    assert headline.signal
    assert headline.index == 23
    assert headline.text.startswith("Latest change +")
    assert "(Sept 2026 to Oct 2026): signal (rule 1: beyond the upper limit" in headline.text
    assert "moving range beyond its limit" in headline.text
    found = result_of(checked, "delta-verdict")
    assert (found.status, found.measured) == (Status.passed, "signal")
    kinds = [r.kind for r in plan.references]
    assert kinds == ["centre", "limit", "limit"]
    limits = xmr([*NOISE[:-1], 125.0])
    assert [r.value for r in plan.references] == pytest.approx(
        [limits.centre, limits.upper, limits.lower]
    )
    assert plan.references[1].label.startswith("upper natural process limit ")
    # the axis holds the data and the limits, on a position scale that says it does not start at 0
    assert plan.value_axis.lo <= min(limits.lower, *NOISE)
    assert plan.value_axis.hi >= 125.0
    assert plan.notes == ["Scale starts at 90 boardings, not zero: compare positions, not lengths."]
    assert "signal" in (plan.description or "")


def test_noise_is_routine_variation() -> None:
    checked = run_checks(movement_definition(NOISE))
    plan = only_chart(checked).plan
    headline = plan.verdicts[0]
    limits = xmr(NOISE)
    assert not headline.signal
    assert headline.text.endswith(
        f"within routine variation (limits {limits.lower:.1f} to {limits.upper:.1f}; "
        f"moving-range limit {limits.range_limit:.1f})"
    )
    assert all(not v.signal for v in plan.verdicts)
    assert result_of(checked, "delta-verdict").measured == "routine variation"


def test_five_points_is_too_little_history() -> None:
    checked = run_checks(movement_definition(NOISE[:5]))
    plan = only_chart(checked).plan
    assert plan.references == []
    assert plan.verdicts == [
        Verdict(index=4, text="Too little history for a verdict (5 of 10 points)", signal=False)
    ]
    assert result_of(checked, "delta-verdict").measured == "too little history"
    few = run_checks(movement_definition(NOISE[:7], min_history=6))
    assert only_chart(few).plan.verdicts[0].text.startswith("Latest change")


def test_partial_last_month_is_not_judged() -> None:
    values = [*NOISE, 20.0]  # November 2026 is 8 of 30 days old at as_of: it looks like a collapse
    definition = movement_definition(values)
    definition["datasets"][0]["rows"] = [
        {"month": m, "boardings": v} for m, v in zip(end_in_october(25, 1), values, strict=True)
    ]
    checked = run_checks(definition)
    plan = only_chart(checked).plan
    assert plan.partial is not None
    assert plan.partial.index == 24
    assert plan.periods[-1] == "Nov 2026"
    headline = plan.verdicts[0]
    assert headline.index == 23
    assert "Nov" not in headline.text
    assert not headline.signal
    assert all(v.index != 24 for v in plan.verdicts)
    limits = xmr(NOISE)  # computed without the partial month
    assert plan.references[0].value == pytest.approx(limits.centre)
    ctx = context_for(intake(definition))
    assert partial.SPEC.measure(plan, ctx).ok


def test_gaps_and_existing_time_checks_pass_on_the_plan() -> None:
    values: list[float | None] = [*NOISE]
    values[10] = None
    definition = movement_definition(values)
    plan = plan_of(definition)
    ctx = context_for(intake(definition))
    assert plan.series[0].name == "boardings"
    assert plan.series[0].segments == [(0, 9), (11, 23)]
    assert [(g.index, g.series) for g in plan.gaps] == [(10, ["boardings"])]
    for spec in (missing.SPEC, partial.SPEC, scale_note.SPEC, checks.SPEC):
        assert spec.measure(plan, ctx).ok, spec.id


def test_a_shift_marks_every_point_where_a_rule_fires() -> None:
    shifted = NOISE[:12] + [v + 5 for v in NOISE[12:]]
    plan = plan_of(movement_definition(shifted))
    limits = xmr(shifted)
    rules = run_rules(shifted, limits)
    expected = sorted({i for found in rules.values() for i in found} - {23})
    assert [v.index for v in plan.verdicts[1:]] == expected
    assert all(v.signal for v in plan.verdicts)
    assert plan.verdicts[1].text == f"{plan.periods[expected[0]]}: signal (rule 1)"
    assert "rule 4: 8 in a row above the centre line" in plan.verdicts[0].text
    figure = charts.figure_for(plan)
    (marks,) = [line for line in figure.axes[0].get_lines() if line.get_gid() == "signal"]
    assert list(np.asarray(marks.get_xdata(), dtype=float)) == [*expected, 23]


def test_no_value_the_period_before_is_said() -> None:
    values: list[float | None] = [*NOISE]
    values[22] = None
    headline = plan_of(movement_definition(values)).verdicts[0]
    assert headline.text.startswith(
        "No change to judge for Oct 2026 (no value the period before): within routine variation"
    )


def test_measure_with_no_values_is_a_problem() -> None:
    problems = problems_of(movement_definition([None] * 12))
    assert [(p.code, p.path) for p in problems] == [("no_values", "sections[0].charts[0].measure")]


# --- the check delta-verdict --------------------------------------------------------------------


@pytest.mark.parametrize(
    ("change", "measured"),
    [
        ({"verdicts": []}, "none"),
        ({"verdicts": [Verdict(index=23, text="Latest change: fine", signal=False)]}, "wrong"),
        ({"references": []}, "signal"),
    ],
)
def test_missing_or_wrong_verdict_fails_and_is_corrected(
    change: dict[str, object], measured: str
) -> None:
    definition = movement_definition([*NOISE[:-1], 125.0])
    plan = plan_of(definition)
    bad = plan.model_copy(update=change)
    finding = checks.SPEC.measure(bad, context_for(intake(definition)))
    assert not finding.ok
    assert finding.measured == measured
    result = guarded(definition, bad)
    assert status_of(result, "delta-verdict") is Status.corrected
    assert result.plan.verdicts == plan.verdicts
    assert result.plan.references == plan.references


def test_correction_widens_an_axis_that_hides_the_limits() -> None:
    definition = movement_definition([*NOISE[:-1], 125.0])
    plan = plan_of(definition)
    narrow = plan.value_axis.model_copy(update={"lo": 95.0, "hi": 130.0})
    bad = plan.model_copy(update={"verdicts": [], "value_axis": narrow, "notes": []})
    fixed = (
        checks.SPEC.correct(bad, context_for(intake(definition))) if checks.SPEC.correct else bad
    )
    lowest = min(r.value for r in fixed.references)
    assert fixed.value_axis.lo <= lowest
    assert fixed.notes == plan.notes


def test_delta_verdict_cannot_be_waived() -> None:
    definition = movement_definition(NOISE)
    definition["waivers"] = [make_waiver("delta-verdict", "boardings-movement")]
    assert [p.code for p in problems_of(definition)] == ["not_waivable"]


# --- the drawer ---------------------------------------------------------------------------------


def test_drawn_reference_lines_sit_at_the_limits() -> None:
    plan = only_chart(run_checks(movement_definition([*NOISE[:-1], 125.0]))).plan
    figure = charts.figure_for(plan)
    figure.canvas.draw()
    ax = figure.axes[0]
    lines = {str(line.get_gid()): line for line in ax.get_lines() if line.get_gid()}
    drawn = [
        line
        for line in ax.get_lines()
        if isinstance(line, Line2D) and str(line.get_gid()).startswith("reference-")
    ]
    drawn_at = [float(np.asarray(line.get_ydata(), dtype=float)[0]) for line in drawn]
    assert drawn_at == pytest.approx([r.value for r in plan.references])
    assert drawn[0].get_linestyle() == "-"  # centre line solid
    assert all(line.get_linestyle() == "--" for line in drawn[1:])  # limits dashed
    signal = lines["signal"]
    assert list(np.asarray(signal.get_xdata(), dtype=float)) == [23.0]
    assert signal.get_color() == style.FLAG
    texts = [a.get_text().replace("\n", " ") for a in ax.texts if isinstance(a, Annotation)]
    assert plan.verdicts[0].text in texts
    assert all(r.label in texts for r in plan.references)
    assert all(not t.get_parse_math() for t in ax.texts)


def test_control_chart_renders_to_pdf() -> None:
    plan = only_chart(run_checks(movement_definition(NOISE[:5]))).plan
    pdf = charts.draw(plan)
    assert pdf.startswith(b"%PDF")
