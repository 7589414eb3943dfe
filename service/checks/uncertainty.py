"""Values that carry uncertainty show it, and the chart says whether their differences are real.

For a compare chart with an ``interval``, recomputed from the data alone:

- spread and sample size (``sd``, ``n``): a one-way analysis of variance from the summary statistics
  (Fisher), F = [Σ nᵢ(x̄ᵢ − x̄)² / (k − 1)] / [Σ (nᵢ − 1)sᵢ² / (N − k)], p from the F distribution
  with (k − 1, N − k) degrees of freedom, judged at α = 1 − level;
- interval bounds only (``lower``, ``upper``): two categories are distinguishable when their intervals
  do not overlap. Overlap does not prove the values equal: two 95 % intervals can overlap while the
  difference is significant (Schenker & Gentleman 2001), so the rule is conservative.

The plan must draw each interval (``Category.lo``/``hi``) and carry a one-line note with the verdict;
a plan lacking either is corrected. A chart without an interval passes: no uncertainty is given.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from itertools import combinations

import pandas as pd

from service import formatting, wording
from service.checks.registry import CheckSpec, Context, Finding, register
from service.definition.model import CompareChart
from service.intents import compare
from service.intents.plan import ChartPlan


@dataclass(frozen=True)
class Anova:
    f: float
    p: float
    df_between: int
    df_within: int


def anova(means: list[float], sds: list[float], ns: list[float]) -> Anova:
    """One-way ANOVA from each group's mean, standard deviation (n − 1 divisor) and size."""
    from scipy import special  # F distribution; scipy.stats would cost a second to import

    k, total = len(means), sum(ns)
    grand = sum(n * m for n, m in zip(ns, means, strict=True)) / total
    between = sum(n * (m - grand) ** 2 for n, m in zip(ns, means, strict=True)) / (k - 1)
    within = sum((n - 1) * s**2 for n, s in zip(ns, sds, strict=True)) / (total - k)
    if within == 0:  # no spread inside any group: any difference of means is certain
        f = math.inf if between > 0 else 0.0
        p = 0.0 if between > 0 else 1.0
    else:
        f = between / within
        p = float(special.fdtrc(k - 1, total - k, f))  # survival function of F(k−1, N−k)
    return Anova(f=f, p=p, df_between=k - 1, df_within=int(total - k))


def separate_pairs(
    intervals: dict[str, tuple[float, float]],
) -> tuple[list[tuple[str, str]], int]:
    """Pairs of categories whose intervals do not overlap, and how many pairs there are."""
    pairs = list(combinations(intervals, 2))
    apart = [
        (a, b)
        for a, b in pairs
        if intervals[a][1] < intervals[b][0] or intervals[b][1] < intervals[a][0]
    ]
    return apart, len(pairs)


def plural(noun: str) -> str:
    """A column name made plural for a sentence ("route" → "routes", "category" → "categories");
    a name that is not a plain word ("k", "area_code") becomes "categories"."""
    if len(noun) < 3 or not noun.isalpha():
        return "categories"
    if noun.endswith("y") and noun[-2:-1] not in set("aeiou"):
        return noun[:-1] + "ies"
    if noun.endswith(("s", "x", "z", "ch", "sh")):
        return noun + "es"
    return noun + "s"


@dataclass(frozen=True)
class Verdict:
    measured: float | int | str
    shown: str
    detail: str
    note: str


def _p(value: float, locale: str) -> str:
    if value < 0.0001:
        return f"p < {formatting.number(0.0001, locale, digits=4)}"
    return f"p = {formatting.number(value, locale, digits=4)}"


def things_of(chart: CompareChart, ctx: Context) -> str:
    """What the categories are, in the plural, for a sentence: "routes" (from the category's
    label in English), else the catalogue's word for categories."""
    if ctx.locale.lower().startswith("en"):
        named = plural(formatting.in_sentence(ctx.table.label(chart.category), ctx.locale))
        if named != "categories":
            return named
    return wording.say("finding.categories", ctx.locale)


def verdict(chart: CompareChart, ctx: Context) -> Verdict:
    """Whether the differences between the categories are distinguishable, from the data alone."""
    spec = chart.interval
    assert spec is not None
    frame = ctx.table.frame
    locale = ctx.locale
    things = things_of(chart, ctx)
    level = formatting.percent(spec.level * 100, locale)

    def say(key: str, **values: object) -> str:
        return wording.say(key, locale, things=things, level=level, **values)

    if spec.sd is not None and spec.n is not None:
        rows = frame[[chart.measure, spec.sd, spec.n]].dropna()
        rows = rows[rows[spec.n] >= 1]
        if len(rows) < 2 or rows[spec.n].sum() <= len(rows):
            return _undecided(things, locale)
        result = anova(
            [float(v) for v in rows[chart.measure]],
            [float(v) for v in rows[spec.sd]],
            [float(v) for v in rows[spec.n]],
        )
        p = _p(result.p, locale)
        test = say("finding.anova", f=formatting.number(result.f, locale, digits=2), p=p)
        if result.p < 1 - spec.level:
            return Verdict(
                round(result.p, 6),
                say("finding.distinguishable_p", p=p),
                say("finding.anova_apart", test=test),
                say("text.beyond_chance", test=test),
            )
        return Verdict(
            round(result.p, 6),
            say("finding.not_distinguishable_p", p=p),
            say("finding.anova_chance", test=test),
            say("text.may_be_chance", test=test),
        )
    assert spec.lower is not None and spec.upper is not None
    bounds = frame[[chart.category, spec.lower, spec.upper]].dropna()
    intervals = {
        str(c): (float(lo), float(hi))
        for c, lo, hi in zip(
            bounds[chart.category], bounds[spec.lower], bounds[spec.upper], strict=True
        )
    }
    if len(intervals) < 2:
        return _undecided(things, locale)
    apart, pairs = separate_pairs(intervals)
    listed = ", ".join(f"{a}–{b}" for a, b in apart[:4]) + (" …" if len(apart) > 4 else "")
    counts = {"count": len(apart), "pairs": pairs}
    shown = say("finding.pairs_apart_one" if pairs == 1 else "finding.pairs_apart", **counts)
    if apart:
        return Verdict(
            len(apart),
            shown,
            say("finding.intervals_apart", listed=listed, **counts),
            say("text.intervals_apart", listed=listed, **counts),
        )
    return Verdict(0, shown, say("finding.intervals_overlap"), say("text.intervals_overlap"))


def _undecided(things: str, locale: str) -> Verdict:
    return Verdict(
        "undecided",
        wording.say("finding.too_few_intervals", locale),
        wording.say("finding.undecided", locale, things=things),
        wording.say("text.undecided", locale, things=things),
    )


def _expected_bounds(
    chart: CompareChart, ctx: Context
) -> dict[str, tuple[float | None, float | None]]:
    frame = ctx.table.frame
    values = [None if pd.isna(v) else float(v) for v in frame[chart.measure]]
    bounds = compare.intervals(chart, frame, values)
    return dict(zip(map(str, frame[chart.category]), bounds, strict=True))


def _drawn(plan: ChartPlan, expected: dict[str, tuple[float | None, float | None]]) -> list[str]:
    """Categories whose interval the data has but the plan does not draw as given."""
    wrong = []
    for category in plan.categories:
        lo, hi = expected.get(category.label, (None, None))
        if lo is None or hi is None:
            continue
        if (
            category.lo is None
            or category.hi is None
            or not (math.isclose(category.lo, lo) and math.isclose(category.hi, hi))
        ):
            wrong.append(category.label)
    return wrong


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    chart = ctx.chart
    if not isinstance(chart, CompareChart) or chart.interval is None:
        return Finding(
            True, "no uncertainty given", wording.say("finding.no_uncertainty", ctx.locale)
        )
    found = verdict(chart, ctx)
    wrong = _drawn(plan, _expected_bounds(chart, ctx))
    missing = []
    if wrong:
        names = ", ".join(wrong[:5])
        missing.append(wording.say("finding.intervals_not_drawn", ctx.locale, names=names))
    if found.note not in plan.notes:
        missing.append(wording.say("finding.verdict_not_said", ctx.locale))
    if missing:
        but = wording.say("finding.but", ctx.locale, problems="; ".join(missing))
        return Finding(False, found.measured, wording.sentence(found.detail, but), found.shown)
    return Finding(True, found.measured, found.detail, found.shown)


def _correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    chart = ctx.chart
    assert isinstance(chart, CompareChart)
    expected = _expected_bounds(chart, ctx)
    categories = []
    for category in plan.categories:
        lo, hi = expected.get(category.label, (None, None))
        given = lo is not None and hi is not None
        categories.append(category.model_copy(update={"lo": lo, "hi": hi}) if given else category)
    note = verdict(chart, ctx).note
    notes = plan.notes if note in plan.notes else [*plan.notes, note]
    return plan.model_copy(update={"categories": categories, "notes": notes})


SPEC = register(
    CheckSpec(
        id="uncertainty",
        title="Uncertainty is drawn and its verdict stated",
        intents=frozenset({"compare"}),
        forms=frozenset({"bars", "dots"}),
        measures="with sd and n: the p value of a one-way ANOVA from the summary statistics; with "
        "bounds: the pairs of categories whose intervals do not overlap",
        threshold="α = 1 − the interval's level (0.05 by default); every interval drawn and the "
        "verdict on the chart",
        source="One-way analysis of variance (Fisher, Statistical Methods for Research Workers, "
        "1925); Schenker & Gentleman, 'On judging the significance of differences by examining "
        "the overlap between confidence intervals', The American Statistician 55(3), 2001 "
        "(from memory)",
        waivable=False,
        correction="Each interval was drawn and a line saying whether the differences are real "
        "was added to the chart.",
        measure=_measure,
        correct=_correct,
    )
)
