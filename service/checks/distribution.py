"""Checks of spreads and scatter plots: a reading guide, a fit only on request, even histogram bins.

- ``reading-guide``: many readers do not read box plots or scatter plots unaided, so each such chart
  carries a one-line guide (corrected by adding the guide for its form).
- ``fit-on-request``: a least-squares line suggests a relationship; it is drawn only when the
  definition asks, is the least-squares fit of the data, and shows its r².
- ``histogram-bins-even``: with raw counts, a bar's area must be proportional to its frequency, which
  holds only when every bin has the same width (a data-integrity rule: it fails, never corrected).
"""

from __future__ import annotations

import itertools
import math

from service import formatting
from service.checks.registry import CheckSpec, Context, Finding, register
from service.definition.model import DistributionChart, RelationshipChart
from service.intents import distribution, relationship
from service.intents.plan import ChartPlan, Fit

#: A guide for a form, when the chart definition cannot supply a fuller one.
GENERIC_GUIDES = {
    "histogram": "Each bar counts the values between its edges.",
    "box": distribution.box_guide("measured"),
    "scatter": "Each dot is one row: further right means more of the horizontal measure, higher "
    "means more of the vertical one.",
}
#: Bin widths (and joins) may differ by this share of the histogram's whole range: float dust only.
BIN_TOLERANCE = 1e-9


def guide_for(plan: ChartPlan, ctx: Context) -> str:
    chart = ctx.chart
    if plan.form == "histogram" and isinstance(chart, DistributionChart):
        total = sum(b.count for b in plan.bins)
        return distribution.histogram_guide(chart.measure, total, plan.locale)
    if plan.form == "box" and isinstance(chart, DistributionChart):
        return distribution.box_guide(chart.measure)
    if plan.form == "scatter" and isinstance(chart, RelationshipChart):
        return relationship.guide(chart, plan.fit, plan.locale)
    return GENERIC_GUIDES[plan.form]


def _guide(plan: ChartPlan, ctx: Context) -> Finding:
    text = (plan.guide or "").strip()
    words = len(text.split())
    if not text:
        return Finding(False, 0, "The chart carries no guide to reading it.", "none")
    if "\n" in text:
        return Finding(False, words, "The reading guide runs over several lines.", "several lines")
    return Finding(True, words, f"Reading guide: {text}", "given")


def _add_guide(plan: ChartPlan, ctx: Context) -> ChartPlan:
    return plan.model_copy(update={"guide": guide_for(plan, ctx)})


SPEC_GUIDE = register(
    CheckSpec(
        id="reading-guide",
        title="Histograms, box plots and scatter plots say how to read them",
        intents=frozenset({"distribution", "relationship"}),
        forms=frozenset({"histogram", "box", "scatter"}),
        measures="whether the chart carries a reading guide, on one line",
        threshold="a guide is given, without line breaks",
        source="common practice (no source)",
        waivable=False,
        correction="The reading guide for the form was added to the chart.",
        measure=_guide,
        correct=_add_guide,
    )
)


def _close(a: Fit, b: Fit) -> bool:
    return all(
        math.isclose(x, y, rel_tol=1e-9, abs_tol=1e-12)
        for x, y in ((a.slope, b.slope), (a.intercept, b.intercept), (a.r2, b.r2))
    )


def _fit(plan: ChartPlan, ctx: Context) -> Finding:
    chart = ctx.chart
    assert isinstance(chart, RelationshipChart)
    if not chart.fit:
        if plan.fit is None:
            return Finding(
                True,
                None,
                "No line is drawn, and none was asked for.",
                "no line",
                applicable=False,
            )
        return Finding(
            False,
            round(plan.fit.r2, 4),
            "A fitted line is drawn, but the definition did not ask for one.",
            "line not asked for",
        )
    expected = relationship.fit_for(chart, ctx.table)
    if plan.fit is None:
        return Finding(
            False, None, "The definition asked for a least-squares line, but none is drawn.", "none"
        )
    if expected is None or not _close(plan.fit, expected):
        return Finding(
            False,
            round(plan.fit.r2, 4),
            "The line drawn is not the least-squares fit of the data.",
            "not the least-squares line",
        )
    text = relationship.r2_text(plan.fit, plan.locale)
    if not any(text in t for t in [plan.guide or "", *plan.notes]):
        return Finding(
            False,
            round(plan.fit.r2, 4),
            f"The least-squares line is drawn, but its r² ({text}) is not shown.",
            "r² not shown",
        )
    return Finding(
        True,
        round(plan.fit.r2, 4),
        f"The least-squares line asked for is drawn, with {text}.",
        text,
    )


def _refit(plan: ChartPlan, ctx: Context) -> ChartPlan:
    chart = ctx.chart
    assert isinstance(chart, RelationshipChart)
    fit = relationship.fit_for(chart, ctx.table)
    notes = [n for n in plan.notes if "r²" not in n]
    guide = relationship.guide(chart, fit, plan.locale)
    return plan.model_copy(update={"fit": fit, "guide": guide, "notes": notes})


SPEC_FIT = register(
    CheckSpec(
        id="fit-on-request",
        title="A fitted line only when asked, and then with its r²",
        intents=frozenset({"relationship"}),
        forms=frozenset({"scatter"}),
        measures="whether a line is drawn, whether the definition asked for one, whether it is the "
        "least-squares fit of the data, and whether its r² is shown",
        threshold="a line exactly when asked; then the least-squares line with its r² shown",
        source="common practice (no source)",
        waivable=False,
        correction="The line was drawn as the definition asked: the least-squares fit with its r², "
        "or no line.",
        measure=_fit,
        correct=_refit,
    )
)


def _bins(plan: ChartPlan, ctx: Context) -> Finding:
    bins = plan.bins
    if not bins:
        return Finding(False, None, "The histogram has no bins.", "no bins")
    unit = plan.x_axis.unit if plan.x_axis else ""
    widths = [b.hi - b.lo for b in bins]
    narrow, wide = min(widths), max(widths)
    tolerance = BIN_TOLERANCE * (bins[-1].hi - bins[0].lo)
    if narrow <= 0:
        return Finding(False, None, "A bin ends where it starts, or before.", "a bin of no width")
    ratio = round(wide / narrow, 4)
    joins = [a.hi - b.lo for a, b in itertools.pairwise(bins)]
    if any(abs(j) > tolerance for j in joins):
        return Finding(
            False,
            ratio,
            "The bins do not meet: a bin starts away from where the last ended.",
            "bins apart",
        )
    narrow_text = formatting.with_unit(narrow, unit, plan.locale)
    if wide - narrow > tolerance:
        wide_text = formatting.with_unit(wide, unit, plan.locale)
        return Finding(
            False,
            ratio,
            f"Bin widths run from {narrow_text} to {wide_text}: with raw counts, the wider bars "
            "overstate their share of the values.",
            f"{narrow_text} to {wide_text}",
        )
    return Finding(
        True, ratio, f"Every bin is {narrow_text} wide, so areas follow the counts.", narrow_text
    )


SPEC_BINS = register(
    CheckSpec(
        id="histogram-bins-even",
        title="Histogram bins have equal widths",
        intents=frozenset({"distribution"}),
        forms=frozenset({"histogram"}),
        measures="the widest bin's width divided by the narrowest's, and whether the bins meet",
        threshold="1 (equal to within a billionth of the range), each bin starting where the last "
        "ends",
        source="Freedman, Pisani & Purves, Statistics, the chapter on the histogram: area must be "
        "proportional to frequency (from memory)",
        waivable=False,
        correction=None,
        measure=_bins,
    )
)
