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

from service import formatting, wording
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
    axis, locale = plan.value_axis, ctx.locale
    digits = formatting.decimals_for([*values, total])

    def text(x: float) -> str:
        return axis.shown(x, locale, digits=digits)

    if chart.whole is None:
        return Finding(True, total, wording.say("finding.no_whole", locale, sum=text(total)))
    tolerance = chart.tolerance if chart.tolerance is not None else share.default_tolerance(values)
    gap = total - chart.whole
    whole = text(chart.whole)
    shown = wording.say("finding.against", locale, value=text(total), other=whole)
    allowed = axis.shown(tolerance, locale)
    if abs(gap) <= tolerance + 1e-9 * max(1.0, abs(chart.whole)):
        detail = wording.say(
            "finding.sum_within", locale, sum=text(total), allowed=allowed, whole=whole
        )
        return Finding(True, round(gap, 12), detail, shown)
    detail = wording.say(
        "finding.sum_apart",
        locale,
        sum=text(total),
        whole=whole,
        apart=axis.shown(abs(gap), locale),
        allowed=allowed,
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
    locale = ctx.locale
    if not negative:
        return Finding(True, 0, wording.say("finding.no_negative", locale), "none")
    listed = ", ".join(f"{label} ({plan.value_axis.shown(v, locale)})" for label, v in negative[:5])
    key = "finding.negative_one" if len(negative) == 1 else "finding.negative"
    return Finding(
        False,
        len(negative),
        wording.say(key, locale, count=len(negative), listed=listed),
        wording.say("finding.count_negative", locale, count=len(negative)),
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
    locale = ctx.locale
    counts = {"count": len(absent), "total": len(expected)}
    if absent:
        detail = wording.say("finding.parts_absent", locale, names=", ".join(absent[:6]), **counts)
        shown = wording.say("finding.parts_not_shown", locale, **counts)
        return Finding(False, len(absent), detail, shown)
    if not expected:
        listed = wording.say("finding.none_listed", locale)
        return Finding(
            True, 0, wording.say("finding.no_expected", locale), listed, applicable=False
        )
    flagged = [c.label for c in plan.categories if c.expected_missing]
    key = "finding.parts_shown_flagged" if flagged else "finding.parts_shown"
    detail = wording.say(key, locale, total=len(expected), names=", ".join(flagged[:6]))
    return Finding(True, 0, detail, wording.say("finding.all_shown", locale))


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
    locale = ctx.locale
    if total is None:
        measured = wording.say("finding.no_labels", locale)
    else:
        measured = wording.say("finding.sum_of", locale, value=formatting.percent(total, locale))
    if wrong:
        key = "finding.labels_missing" if total is None else "finding.labels_wrong"
        detail = wording.say(key, locale, total=total, names=", ".join(wrong[:6]))
        return Finding(False, total, detail, measured)
    if total is None:
        return Finding(True, None, wording.say("finding.no_shares", locale), measured)
    return Finding(True, total, wording.say("finding.labels_ok", locale), measured)


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
    locale = ctx.locale
    if pair is None:
        shown = wording.say("finding.parts", locale, count=len(values))
    else:
        shown = wording.say(
            "finding.parts_closest",
            locale,
            count=len(values),
            points=formatting.points(pair[1] - pair[0], locale, digits=1, short=True),
            ratio=formatting.number(pair[1] / pair[0], locale, digits=2),
        )
    if plan.form != "pie":
        measured = wording.say("finding.bars_measured", locale, shown=shown)
        return Finding(
            True,
            len(values),
            wording.say("finding.as_bars", locale, shown=shown),
            measured,
            applicable=False,
        )
    problem = share.pie_problem(values, locale)
    if problem is None:
        return Finding(True, len(values), wording.say("finding.pie_ok", locale, shown=shown), shown)
    return Finding(
        False, len(values), wording.say("finding.pie_bad", locale, problem=problem), shown
    )


def _pie_correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    categories = share.sorted_parts(plan.categories)
    axis = share.bars_axis(
        categories, plan.value_axis.unit, plan.value_axis.label, plan.value_axis.style
    )
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
