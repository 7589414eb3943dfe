"""The kinds of mark a chart plan asks to be drawn, read from the plan alone (never from the figure),
so that a test can hold a drawn chart's key to them."""

from __future__ import annotations

from service.intents.plan import ChartPlan, all_series


def kinds_in_plan(plan: ChartPlan) -> set[str]:
    kinds: set[str] = set()
    series = all_series(plan)
    names = {s.name for s in series}
    if plan.partial is not None and plan.form in {"lines", "panels", "control"}:
        at = plan.partial.index
        if any(not s.estimate and s.at(at) is not None for s in series):
            kinds.add("partial_actual")
    for s in series:
        if s.estimate:
            projected = s.name.removesuffix(" (estimate)") in names - {s.name}
            kinds.add("projection" if projected else "estimate")
    if plan.form == "bars" and any(
        c.target is not None and c.value is not None for c in plan.categories
    ):
        kinds.add("target")
    if plan.form == "control" and any(
        v.signal and plan.series and plan.series[0].at(v.index) is not None for v in plan.verdicts
    ):
        kinds.add("signal")
    if plan.gaps and plan.form in {"lines", "panels", "control"}:
        kinds.add("no_data")
    if plan.form in {"bars", "dots"} and any(
        c.value is not None and c.lo is not None and c.hi is not None for c in plan.categories
    ):
        kinds.add("interval")
    return kinds
