"""Checks on parts of a whole (intent ``share``): data integrity first, then what the chart shows.

In registry order: the parts add up to the stated whole, no part is negative (both data integrity:
they fail, never corrected or waived); every expected part is shown (missing ones are put back as
"expected, no data"); the percentage labels are the largest-remainder shares and sum to 100; a pie
is only drawn when it can be read (else bars). The first two read the data itself; the others
recompute from the data what the plan should show. None is waivable: each guards the data or
corrects the chart at no cost to what the definition asked for (a definition may allow a pie but
never requires one, and bars show the same parts by length, which is read more accurately).
"""

from __future__ import annotations

import math

import pandas as pd

from service import formatting
from service.checks.registry import CheckSpec, Context, Finding, register
from service.definition.model import ShareChart
from service.intents import share
from service.intents.plan import Category, ChartPlan

_FORMS = frozenset({"bars", "pie"})
_INTENTS = frozenset({"share"})


def _chart(ctx: Context) -> ShareChart:
    assert isinstance(ctx.chart, ShareChart)
    return ctx.chart


def _parts(ctx: Context) -> list[tuple[str, float | None]]:
    """Each part in the data, in input order: (label, value or None)."""
    chart = _chart(ctx)
    frame = ctx.table.frame
    return [
        (str(c), None if pd.isna(v) else float(v))
        for c, v in zip(frame[chart.category], frame[chart.measure], strict=True)
    ]


def _sum_measure(plan: ChartPlan, ctx: Context) -> Finding:
    chart = _chart(ctx)
    values = [v for _, v in _parts(ctx) if v is not None]
    total = math.fsum(values)
    unit = plan.value_axis.unit
    digits = formatting.decimals_for([*values, total])

    def text(x: float) -> str:
        return formatting.with_unit(x, unit, ctx.locale, digits=digits)

    if chart.whole is None:
        return Finding(
            True, total, f"No whole is stated: the shares are of the parts' sum, {text(total)}."
        )
    tolerance = chart.tolerance if chart.tolerance is not None else share.default_tolerance(values)
    gap = total - chart.whole
    shown = f"{text(total)} against {text(chart.whole)}"
    allowed = formatting.with_unit(tolerance, unit, ctx.locale)
    added = f"The parts add up to {text(total)}"
    if abs(gap) <= tolerance + 1e-9 * max(1.0, abs(chart.whole)):
        detail = f"{added}, within {allowed} of the stated whole {text(chart.whole)}."
        return Finding(True, round(gap, 12), detail, shown)
    apart = formatting.with_unit(abs(gap), unit, ctx.locale)
    detail = (
        f"{added}, but the stated whole is {text(chart.whole)}: {apart} apart, more than the "
        f"tolerance of {allowed}. Correct the data or the stated whole."
    )
    return Finding(False, round(gap, 12), detail, shown)


SUM = register(
    CheckSpec(
        id="parts-sum-to-whole",
        title="The parts add up to the whole",
        intents=_INTENTS,
        forms=_FORMS,
        measures="the sum of the parts in the data against the stated whole",
        threshold="|sum − whole| ≤ tolerance (default: half a unit of the last decimal in the "
        "data, per part)",
        source="common practice (no source)",
        waivable=False,
        correction=None,
        measure=_sum_measure,
    )
)


def _negative_measure(plan: ChartPlan, ctx: Context) -> Finding:
    negative = [(label, v) for label, v in _parts(ctx) if v is not None and v < 0]
    if not negative:
        return Finding(True, 0, "No part is negative.", "none")
    listed = ", ".join(
        f"{label} ({formatting.with_unit(v, plan.value_axis.unit, ctx.locale)})"
        for label, v in negative[:5]
    )
    noun = "part is" if len(negative) == 1 else "parts are"
    return Finding(
        False,
        len(negative),
        f"{len(negative)} {noun} negative: {listed}. A part of a whole cannot be less than nothing; "
        "show these as a change (a compare chart) instead.",
        f"{len(negative)} negative",
    )


NEGATIVE = register(
    CheckSpec(
        id="no-negative-parts",
        title="No part of a whole is negative",
        intents=_INTENTS,
        forms=_FORMS,
        measures="the number of parts in the data with a value below zero",
        threshold="0",
        source="common practice (no source)",
        waivable=False,
        correction=None,
        measure=_negative_measure,
    )
)


def _absent(plan: ChartPlan, ctx: Context) -> list[str]:
    shown = {c.label for c in plan.categories}
    return [e for e in _chart(ctx).expected_categories or [] if e not in shown]


def _expected_measure(plan: ChartPlan, ctx: Context) -> Finding:
    expected = _chart(ctx).expected_categories or []
    absent = _absent(plan, ctx)
    if absent:
        detail = f"{len(absent)} of {len(expected)} expected parts are not in the data: "
        shown = f"{len(absent)} of {len(expected)} not shown"
        return Finding(False, len(absent), detail + ", ".join(absent[:6]) + ".", shown)
    if not expected:
        return Finding(True, 0, "No expected parts are listed.", "none listed", applicable=False)
    flagged = [c.label for c in plan.categories if c.expected_missing]
    without = f" ({', '.join(flagged[:6])} shown as 'expected, no data')" if flagged else ""
    return Finding(True, 0, f"All {len(expected)} expected parts are shown{without}.", "all shown")


def _expected_correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    added = [Category(label=a, value=None, expected_missing=True) for a in _absent(plan, ctx)]
    return plan.model_copy(update={"categories": [*plan.categories, *added]})


EXPECTED = register(
    CheckSpec(
        id="expected-parts-shown",
        title="Every expected part is shown",
        intents=_INTENTS,
        forms=_FORMS,
        measures="expected parts (listed in the definition) that the chart does not show",
        threshold="0: each is drawn, as 'expected, no data' when the data lacks it",
        source="common practice (no source)",
        waivable=False,
        correction="Each missing part was added to the chart as 'expected, no data'.",
        measure=_expected_measure,
        correct=_expected_correct,
    )
)


def expected_percents(ctx: Context) -> dict[str, int | None]:
    """The label each part should carry, from the data in input order."""
    parts = _parts(ctx)
    return dict(zip((p for p, _ in parts), share.percents([v for _, v in parts]), strict=True))


def _percent_measure(plan: ChartPlan, ctx: Context) -> Finding:
    want = expected_percents(ctx)
    shown = [c.percent for c in plan.categories if c.percent is not None]
    total = sum(shown) if shown else None
    wrong = [c.label for c in plan.categories if c.percent != want.get(c.label)]
    measured = "no labels" if total is None else f"sum {total} %"
    if wrong:
        adds = (
            "No percentage labels are shown" if total is None else f"The labels add up to {total}"
        )
        detail = f"{adds}; {', '.join(wrong[:6])} do not carry the largest-remainder share."
        return Finding(False, total, detail, measured)
    if total is None:
        return Finding(True, None, "No percentages are shown: the parts have no shares.", measured)
    detail = "The percentage labels add up to 100 (largest remainder; equal remainders go to the "
    return Finding(True, total, detail + "part first in the data).", measured)


def _percent_correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    want = expected_percents(ctx)
    fixed = [c.model_copy(update={"percent": want.get(c.label)}) for c in plan.categories]
    return plan.model_copy(update={"categories": fixed})


PERCENT = register(
    CheckSpec(
        id="shares-sum-to-100",
        title="The percentage labels sum to 100",
        intents=_INTENTS,
        forms=_FORMS,
        measures="the sum of the displayed whole-percent labels, and whether each is the part's "
        "largest-remainder share (equal remainders broken by input order)",
        threshold="exactly 100",
        source="the largest-remainder (Hamilton) method of apportionment",
        waivable=False,
        correction="The labels were recomputed by the largest-remainder method (equal "
        "remainders go to the part first in the data).",
        measure=_percent_measure,
        correct=_percent_correct,
    )
)


def _pie_measure(plan: ChartPlan, ctx: Context) -> Finding:
    values = [c.value for c in plan.categories if c.value is not None]
    pair = share.closest_pair(values) if values and all(v > 0 for v in values) else None
    closest = (
        ""
        if pair is None
        else f", closest {formatting.number(pair[1] - pair[0], ctx.locale, digits=1)} points "
        f"apart (×{pair[1] / pair[0]:.2f})"
    )
    shown = f"{len(values)} parts{closest}"
    if plan.form != "pie":
        return Finding(
            True, len(values), f"Drawn as bars: {shown}.", f"bars; {shown}", applicable=False
        )
    problem = share.pie_problem(values, ctx.locale)
    if problem is None:
        return Finding(
            True, len(values), f"The pie can be read: {shown}, each pair told apart.", shown
        )
    return Finding(False, len(values), f"A pie of these parts cannot be read: {problem}.", shown)


def _pie_correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    categories = share.sorted_parts(plan.categories)
    axis = share.bars_axis(categories, plan.value_axis.unit, plan.value_axis.label)
    return plan.model_copy(
        update={"form": "bars", "baseline": 0.0, "categories": categories, "value_axis": axis}
    )


PIE = register(
    CheckSpec(
        id="pie-readable",
        title="A pie is drawn only when it can be read",
        intents=_INTENTS,
        forms=frozenset({"pie"}),
        measures="the number of parts, and the closest pair of parts in points of the whole and "
        "as a ratio",
        threshold=f"at most {share.MAX_PIE_PARTS} parts, none zero, each pair at least "
        f"{share.MIN_PIE_POINTS:g} points or ×{share.MIN_PIE_RATIO} apart",
        source="Cleveland & McGill, 'Graphical Perception', JASA 79(387):531–554 (1984); UK "
        "Office for National Statistics style guide, 'Part-to-whole'; UNECE, 'Presenting gender "
        "statistics' (pie charts). The separation figures are Plumbline's own choice.",
        # Not waivable: the definition only allows a pie, it never requires one, and bars show the
        # same parts by length, which is read more accurately; there is nothing to trade away.
        waivable=False,
        correction="The parts were drawn as zero-based bars, largest first, instead.",
        measure=_pie_measure,
        correct=_pie_correct,
    )
)
