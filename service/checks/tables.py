"""Tables keep the rules the charts keep: every period listed, partial periods and estimates marked,
totals only of measures that add up, and rows left out counted.

Each check recomputes from the data alone what the table must show and measures the table's plan
(:mod:`service.intents.table`) against it; a breach is corrected on the plan, measured again, and
recorded as ``corrected``. Table checks are never waived: what a table lists is the data itself.
"""

from __future__ import annotations

import math
from dataclasses import replace

from service import wording
from service.checks.registry import Finding, TableCheckSpec, TableContext, register_table
from service.checks.results import CheckResult, Status
from service.data import periods
from service.intents.table import (
    TablePlan,
    completeness_text,
    expected_periods,
    total_of,
    with_totals,
)

#: Period labels listed in a finding before it says "and N more".
_LISTED = 6


def guard(plan: TablePlan, ctx: TableContext) -> tuple[TablePlan, list[CheckResult]]:
    """Every table check that applies, in registry order: the final plan and the results."""
    from service.checks.registry import TABLE_CHECKS

    results: list[CheckResult] = []
    for spec in TABLE_CHECKS.values():
        if not spec.applies(plan, ctx):
            continue
        finding = spec.measure(plan, ctx)
        if finding.ok:
            results.append(_result(spec, plan, Status.passed, finding))
            continue
        corrected = spec.correct(plan, ctx)
        after = spec.measure(corrected, ctx)
        if after.ok:
            results.append(_result(spec, plan, Status.corrected, finding, after))
            plan = corrected
        else:
            results.append(_result(spec, plan, Status.failed, finding))
    return plan, results


def _result(
    spec: TableCheckSpec,
    plan: TablePlan,
    status: Status,
    finding: Finding,
    after: Finding | None = None,
) -> CheckResult:
    detail = finding.detail
    if status is Status.corrected:
        detail = f"{detail} {spec.correction}"
    return CheckResult(
        check=spec.id,
        chart=plan.table_id,
        status=status,
        measured=finding.measured,
        measured_text=finding.shown if finding.shown is not None else str(finding.measured),
        corrected_to=None if after is None else after.shown,
        threshold=spec.threshold,
        explanation=detail,
        source=spec.source,
    )


def _listed(labels: list[str]) -> str:
    more = len(labels) - _LISTED
    return ", ".join(labels[:_LISTED]) + (f" (+{more})" if more > 0 else "")


def _time_indexed(plan: TablePlan, ctx: TableContext) -> bool:
    return ctx.table.periods is not None and len(ctx.table.periods) > 0


def _no_data_rows(plan: TablePlan) -> set[str]:
    """The labels of the rows shown for periods without data (empty when no time column shows)."""
    index = next((i for i, c in enumerate(plan.columns) if c.time), None)
    if index is None:
        return set()
    return {str(row.values[index]) for row in plan.rows if row.state == "missing"}


# --- every period listed ------------------------------------------------------------------------


def _missing(ctx: TableContext) -> tuple[list[str], int]:
    """Labels of the expected periods that have no row in the data, and how many are expected."""
    table = ctx.table
    assert table.periods is not None and table.frequency is not None
    full = expected_periods(table)
    absent = full.difference(table.periods)
    return periods.labels(absent, table.frequency, ctx.locale), len(full)


def _measure_missing(plan: TablePlan, ctx: TableContext) -> Finding:
    missing, expected = _missing(ctx)
    listed = _no_data_rows(plan) | set(plan.unshown_missing)
    unshown = [p for p in missing if p not in listed]
    shown = wording.say("table.measured_of", ctx.locale, part=len(missing), whole=expected)
    if unshown:
        text = wording.say("table.check_missing_bad", ctx.locale, periods=_listed(unshown))
        count = wording.say("table.measured_unshown", ctx.locale, count=len(unshown))
        return Finding(False, len(unshown), text, count)
    if not missing:
        text = wording.say("table.check_missing_none", ctx.locale, expected=expected)
        return Finding(True, 0, text, shown)
    text = wording.say(
        "table.check_missing_ok", ctx.locale, missing=len(missing), expected=expected
    )
    return Finding(True, len(missing), text, shown)


def _correct_missing(plan: TablePlan, ctx: TableContext) -> TablePlan:
    missing, _ = _missing(ctx)
    shown = _no_data_rows(plan)
    return replace(plan, unshown_missing=tuple(p for p in missing if p not in shown))


MISSING = register_table(
    TableCheckSpec(
        id="table-missing-periods",
        title="A table lists every period, saying 'no data' where there is none",
        measures="the periods the declared frequency expects between the dataset's first and "
        "last row that have no row, and whether the table lists each (reading 'no data') or "
        "names it under the table",
        threshold="every period without data shown",
        source="common practice (no source); the same rule as the charts' gaps",
        correction="The periods the rows shown leave out are named under the table.",
        applies=_time_indexed,
        measure=_measure_missing,
        correct=_correct_missing,
    )
)


# --- partial periods marked -----------------------------------------------------------------------


def _partial(ctx: TableContext) -> tuple[str, periods.Completeness] | None:
    """The dataset's last period and its completeness, when ``as_of`` falls inside it."""
    table = ctx.table
    assert table.periods is not None and table.frequency is not None
    last = table.periods.max()
    done = periods.completeness(last, ctx.as_of)
    if done is None:
        return None
    return periods.label(last, table.frequency, ctx.locale), done


def _applies_partial(plan: TablePlan, ctx: TableContext) -> bool:
    """A table whose rows shown include a partial period (one a limit left out has no mark)."""
    if not (_time_indexed(plan, ctx) and plan.time_indexed):
        return False
    found = _partial(ctx)
    return found is not None and _partial_row(plan, found[0]) is not None


def _partial_row(plan: TablePlan, label: str) -> int | None:
    index = next(i for i, c in enumerate(plan.columns) if c.time)
    return next((r for r, row in enumerate(plan.rows) if row.values[index] == label), None)


def _measure_partial(plan: TablePlan, ctx: TableContext) -> Finding:
    found = _partial(ctx)
    assert found is not None
    label, done = found
    days = completeness_text(done, ctx.locale)
    r = _partial_row(plan, label)
    assert r is not None  # see _applies_partial
    marked = plan.rows[r].state == "partial" and plan.rows[r].completeness == done
    key = "table.check_partial_ok" if marked else "table.check_partial_bad"
    return Finding(marked, days, wording.say(key, ctx.locale, period=label, done=days), days)


def _correct_partial(plan: TablePlan, ctx: TableContext) -> TablePlan:
    found = _partial(ctx)
    assert found is not None
    label, done = found
    r = _partial_row(plan, label)
    assert r is not None
    rows = list(plan.rows)
    rows[r] = replace(rows[r], state="partial", completeness=done)
    return replace(plan, rows=tuple(rows))


PARTIAL = register_table(
    TableCheckSpec(
        id="table-partial-marked",
        title="A partial period is marked with its completeness",
        measures="whether the period as_of falls in is marked partial, with the days elapsed of "
        "the days in it",
        threshold="the partial period marked",
        source="common practice (no source); the same rule as the charts' partial periods",
        correction="The partial period was marked with its completeness.",
        applies=_applies_partial,
        measure=_measure_partial,
        correct=_correct_partial,
    )
)


# --- estimates marked -----------------------------------------------------------------------------


def _estimates(plan: TablePlan, ctx: TableContext) -> list[str]:
    """The columns shown that the dataset declares as estimates."""
    declared = {c.name for c in ctx.dataset.columns if c.estimate}
    return [c.name for c in plan.columns if c.name in declared]


def _measure_estimates(plan: TablePlan, ctx: TableContext) -> Finding:
    expected = _estimates(plan, ctx)
    unmarked = [c.label for c in plan.columns if c.name in expected and not c.estimate]
    if unmarked:
        text = wording.say("table.check_estimates_bad", ctx.locale, columns=", ".join(unmarked))
        return Finding(False, len(unmarked), text, str(len(expected)))
    labels = ", ".join(c.label for c in plan.columns if c.name in expected)
    text = wording.say("table.check_estimates_ok", ctx.locale, columns=labels)
    return Finding(True, len(expected), text, str(len(expected)))


def _correct_estimates(plan: TablePlan, ctx: TableContext) -> TablePlan:
    expected = set(_estimates(plan, ctx))
    columns = tuple(replace(c, estimate=c.estimate or c.name in expected) for c in plan.columns)
    return replace(plan, columns=columns)


ESTIMATES = register_table(
    TableCheckSpec(
        id="table-estimates-marked",
        title="Estimates in a table are marked as estimates",
        measures="columns declared as estimates and whether each is marked in the header and "
        "listed under the table",
        threshold="every estimate column marked",
        source="common practice (no source); the same rule as the charts' estimates",
        correction="The estimate columns were marked in the header and listed under the table.",
        applies=lambda plan, ctx: bool(_estimates(plan, ctx)),
        measure=_measure_estimates,
        correct=_correct_estimates,
    )
)


# --- totals only of measures that add up ----------------------------------------------------------


def _wrong_totals(plan: TablePlan, ctx: TableContext) -> list[str]:
    """Totalled columns that do not add up, or whose total is not the sum of the rows shown."""
    declared = {c.name: c for c in ctx.dataset.columns}
    index = {c.name: i for i, c in enumerate(plan.columns)}
    wrong = []
    for name, total in plan.totals:
        column = declared.get(name)
        if (
            column is None
            or not column.adds_up()
            or name not in index
            or not math.isclose(total, total_of(plan, index[name]), rel_tol=1e-12, abs_tol=1e-9)
        ):
            wrong.append(name)
    return wrong


def _labels(plan: TablePlan, names: list[str]) -> str:
    """The columns as readers see them (their labels), in the order given."""
    labels = {c.name: c.label for c in plan.columns}
    return ", ".join(labels.get(n, n) for n in names)


def _measure_totals(plan: TablePlan, ctx: TableContext) -> Finding:
    wrong = _wrong_totals(plan, ctx)
    right, whole = len(plan.totals) - len(wrong), len(plan.totals)
    shown = wording.say("table.measured_of", ctx.locale, part=right, whole=whole)
    if wrong:
        text = wording.say("table.check_totals_bad", ctx.locale, columns=_labels(plan, wrong))
        return Finding(False, len(wrong), text, shown)
    names = [n for n, _ in plan.totals]
    text = wording.say("table.check_totals_ok", ctx.locale, columns=_labels(plan, names))
    return Finding(True, 0, text, shown)


def _correct_totals(plan: TablePlan, ctx: TableContext) -> TablePlan:
    declared = {c.name: c for c in ctx.dataset.columns}
    kept = [n for n, _ in plan.totals if n in declared and declared[n].adds_up()]
    return with_totals(plan, kept)


TOTALS = register_table(
    TableCheckSpec(
        id="table-totals-additive",
        title="A table totals only measures that add up, and the totals are the rows' sum",
        measures="each totalled column: whether its values add up (not a percentage, rate or "
        "mean) and whether its total is the sum of the rows shown",
        threshold="every total adds up and matches its rows",
        source="common practice (no source)",
        correction="Totals that do not add up were dropped, and the rest recomputed.",
        applies=lambda plan, ctx: bool(plan.totals or ctx.spec.totals),
        measure=_measure_totals,
        correct=_correct_totals,
    )
)


# --- rows left out counted ------------------------------------------------------------------------


def _rows_in_full(ctx: TableContext) -> int:
    """How many rows the table has before a limit: one per expected period, or one per row."""
    if ctx.table.periods is not None and len(ctx.table.periods) > 0:
        return len(expected_periods(ctx.table))
    return len(ctx.table.frame)


def _measure_left_out(plan: TablePlan, ctx: TableContext) -> Finding:
    rows, shown = _rows_in_full(ctx), len(plan.rows)
    ok = plan.left_out == rows - shown
    key = "table.check_left_out_ok" if ok else "table.check_left_out_bad"
    text = wording.say(key, ctx.locale, shown=shown, rows=rows, left_out=plan.left_out)
    part = wording.say("table.measured_of", ctx.locale, part=shown, whole=rows)
    return Finding(ok, rows - shown, text, part)


def _correct_left_out(plan: TablePlan, ctx: TableContext) -> TablePlan:
    return replace(plan, left_out=_rows_in_full(ctx) - len(plan.rows))


LEFT_OUT = register_table(
    TableCheckSpec(
        id="table-rows-left-out",
        title="A table with a limit says how many rows it leaves out",
        measures="the rows of the dataset (one per expected period for a time series) against "
        "the rows shown and the count of rows the table says it left out",
        threshold="the rows left out counted",
        source="common practice (no source)",
        correction="The table says how many rows it left out.",
        applies=lambda plan, ctx: ctx.spec.limit is not None,
        measure=_measure_left_out,
        correct=_correct_left_out,
    )
)
