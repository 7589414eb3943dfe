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

from service import formatting, wording
from service.checks.registry import CheckSpec, Context, Finding, register
from service.definition.model import DistributionChart, RelationshipChart
from service.intents import distribution, relationship
from service.intents.plan import ChartPlan, Fit

#: A guide for a form (its catalogue key), when the chart definition cannot supply a fuller one.
GENERIC_GUIDES = {
    "histogram": "text.generic_histogram_guide",
    "box": "text.generic_box_guide",
    "scatter": "text.generic_scatter_guide",
}
#: Bin widths (and joins) may differ by this share of the histogram's whole range: float dust only.
BIN_TOLERANCE = 1e-9


def guide_for(plan: ChartPlan, ctx: Context) -> str:
    chart = ctx.chart
    if plan.form == "histogram" and isinstance(chart, DistributionChart):
        total = sum(b.count for b in plan.bins)
        return distribution.histogram_guide(ctx.table.label(chart.measure), total, plan.locale)
    if plan.form == "box" and isinstance(chart, DistributionChart):
        return distribution.box_guide(ctx.table.label(chart.measure), plan.locale)
    if plan.form == "scatter" and isinstance(chart, RelationshipChart):
        return relationship.guide(chart, ctx.table, plan.fit, plan.locale)
    return wording.say(GENERIC_GUIDES[plan.form], plan.locale)


def _guide(plan: ChartPlan, ctx: Context) -> Finding:
    text = (plan.guide or "").strip()
    words = len(text.split())
    locale = plan.locale
    if not text:
        return Finding(False, 0, wording.say("finding.no_guide", locale), "none")
    if "\n" in text:
        return Finding(False, words, wording.say("finding.guide_lines", locale), "several lines")
    return Finding(True, words, wording.say("finding.guide", locale, text=text), "given")


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
    locale = plan.locale
    if not chart.fit:
        if plan.fit is None:
            return Finding(
                True, None, wording.say("finding.no_line", locale), "no line", applicable=False
            )
        detail = wording.say("finding.line_not_asked", locale)
        return Finding(False, round(plan.fit.r2, 4), detail, "line not asked for")
    expected = relationship.fit_for(chart, ctx.table)
    if plan.fit is None:
        return Finding(False, None, wording.say("finding.line_missing", locale), "none")
    if expected is None or not _close(plan.fit, expected):
        detail = wording.say("finding.line_wrong", locale)
        return Finding(False, round(plan.fit.r2, 4), detail, "not the least-squares line")
    text = relationship.r2_text(plan.fit, locale)
    if not any(text in t for t in [plan.guide or "", *plan.notes]):
        detail = wording.say("finding.r2_not_shown", locale, r2=text)
        return Finding(False, round(plan.fit.r2, 4), detail, "r² not shown")
    return Finding(
        True, round(plan.fit.r2, 4), wording.say("finding.line_ok", locale, r2=text), text
    )


def _refit(plan: ChartPlan, ctx: Context) -> ChartPlan:
    chart = ctx.chart
    assert isinstance(chart, RelationshipChart)
    fit = relationship.fit_for(chart, ctx.table)
    notes = [n for n in plan.notes if "r²" not in n]
    guide = relationship.guide(chart, ctx.table, fit, plan.locale)
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
    locale = plan.locale
    if not bins:
        return Finding(False, None, wording.say("finding.no_bins", locale), "no bins")
    unit = plan.x_axis.unit if plan.x_axis else ""
    widths = [b.hi - b.lo for b in bins]
    narrow, wide = min(widths), max(widths)
    tolerance = BIN_TOLERANCE * (bins[-1].hi - bins[0].lo)
    if narrow <= 0:
        detail = wording.say("finding.bin_no_width", locale)
        return Finding(False, None, detail, "a bin of no width")
    ratio = round(wide / narrow, 4)
    joins = [a.hi - b.lo for a, b in itertools.pairwise(bins)]
    if any(abs(j) > tolerance for j in joins):
        return Finding(False, ratio, wording.say("finding.bins_apart", locale), "bins apart")
    narrow_text = formatting.with_unit(narrow, unit, locale)
    if wide - narrow > tolerance:
        wide_text = formatting.with_unit(wide, unit, locale)
        widths_text = wording.say("finding.from_to", locale, first=narrow_text, last=wide_text)
        detail = wording.say("finding.bins_uneven", locale, widths=widths_text)
        return Finding(False, ratio, detail, widths_text)
    return Finding(
        True, ratio, wording.say("finding.bins_even", locale, width=narrow_text), narrow_text
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
