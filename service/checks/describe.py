"""The text alternative of a chart: what it shows, its extremes and its verdicts, in plain words.

Generated from the final plan and the check results, so it says what the reader will see. An
encoder may write its own opening (``plan.description``); the checks' verdicts are added either way
by :func:`describe` only when the plan has none (the author's own text is kept as written).
"""

from __future__ import annotations

from service import formatting, wording
from service.checks.results import CheckResult, Status
from service.intents.plan import ChartPlan, all_series


def _say(plan: ChartPlan, key: str, **values: object) -> str:
    return wording.say(key, plan.locale, **values)


def _value(plan: ChartPlan, value: float | None) -> str:
    return plan.value_axis.shown(value, plan.locale)


def _categories(plan: ChartPlan) -> list[str]:
    present = [c for c in plan.categories if c.value is not None]
    if not present:
        return []
    top = max(present, key=lambda c: c.value or 0.0)
    low = min(present, key=lambda c: c.value or 0.0)
    count = len(plan.categories)
    words = [_say(plan, "text.one_category" if count == 1 else "text.categories", count=count)]
    if top is not low:
        words.append(_say(plan, "text.highest", name=top.label, value=_value(plan, top.value)))
        words.append(_say(plan, "text.lowest", name=low.label, value=_value(plan, low.value)))
    missing = [c.label for c in plan.categories if c.value is None]
    if missing:
        words.append(_say(plan, "text.no_data_for", names=", ".join(missing)))
    return words


def _series(plan: ChartPlan) -> list[str]:
    series = all_series(plan)
    if not series or not plan.periods:
        return []
    first_period, last_period = plan.periods[0], plan.periods[-1]
    if first_period == last_period:
        words = [_say(plan, "text.one_period", period=first_period)]
    else:
        words = [_say(plan, "text.period_range", first=first_period, last=last_period)]
    for s in series:
        values = [(i, v) for i, v in enumerate(s.values) if v is not None]
        if not values:
            continue
        first, last = values[0], values[-1]
        xs = s.positions()
        style = _style_of(plan, s.unit)
        if first[0] == last[0]:
            words.append(
                _say(
                    plan,
                    "text.series_one",
                    name=s.title,
                    value=formatting.show(first[1], style, plan.locale),
                    period=plan.periods[xs[first[0]]],
                )
            )
            continue
        words.append(
            _say(
                plan,
                "text.series_from_to",
                name=s.title,
                first=formatting.show(first[1], style, plan.locale),
                first_period=plan.periods[xs[first[0]]],
                last=formatting.show(last[1], style, plan.locale),
                last_period=plan.periods[xs[last[0]]],
            )
        )
    if plan.gaps:
        names = ", ".join(plan.periods[g.index] for g in plan.gaps[:6])
        key = "text.no_data_for_more" if len(plan.gaps) > 6 else "text.no_data_for"
        words.append(_say(plan, key, names=names))
    if plan.partial is not None:
        period = plan.periods[plan.partial.index]
        words.append(_say(plan, "text.partial_period", period=period, done=plan.partial.text))
    return words


def _style_of(plan: ChartPlan, unit: str) -> formatting.Style:
    """How a series' values are written: its axis's style when the units agree."""
    axes = [plan.value_axis, *(p.value_axis for p in plan.panels)]
    return next((a.writes for a in axes if a.unit == unit), formatting.style_for(unit))


def _shape(plan: ChartPlan) -> str:
    """What histograms, box plots and scatter plots hold, which categories and series do not say."""
    locale = plan.locale
    if plan.bins and plan.x_axis is not None:
        axis = plan.x_axis
        total = sum(b.count for b in plan.bins)
        top = max(plan.bins, key=lambda b: b.count)
        return _say(
            plan,
            "text.bins",
            total=formatting.number(total, locale),
            lo=axis.shown(plan.bins[0].lo, locale),
            hi=axis.shown(plan.bins[-1].hi, locale),
            top_lo=formatting.number(top.lo, locale),
            top_hi=axis.shown(top.hi, locale),
            count=formatting.number(top.count, locale),
        )
    if plan.boxes:
        return "; ".join(
            _say(
                plan,
                "text.box",
                name=b.label,
                median=_value(plan, b.median),
                q1=formatting.number(b.q1, locale),
                q3=_value(plan, b.q3),
                n=formatting.number(b.n, locale),
            )
            for b in plan.boxes
        )
    if plan.points:
        count = formatting.number(len(plan.points), locale)
        if plan.fit is None:
            return _say(plan, "text.points", count=count)
        r2 = formatting.number(plan.fit.r2, locale, digits=2)
        return _say(plan, "text.points_fit", count=count, r2=r2)
    return ""


def describe(plan: ChartPlan, results: list[CheckResult]) -> str:
    """A plain-language description of the chart for readers who cannot see it."""
    form = _say(plan, f"text.form_{plan.form}")
    parts = _categories(plan) + _series(plan)
    sentences = [wording.sentence(_say(plan, "text.opening", form=form, title=plan.title))]
    if parts:
        sentences.append(wording.sentence(_capital("; ".join(parts))))
    shape = _shape(plan)
    if shape:
        sentences.append(wording.sentence(_capital(shape)))
    if plan.guide:
        sentences.append(wording.sentence(plan.guide))
    sentences += [wording.sentence(v.text) for v in plan.verdicts]
    sentences += [wording.sentence(note) for note in plan.notes]
    corrected = [r.check for r in results if r.status is Status.corrected]
    failed = [r.check for r in results if r.status is Status.failed]
    if corrected:
        sentences.append(_say(plan, "text.corrected_by", checks=", ".join(corrected)))
    if failed:
        sentences.append(_say(plan, "text.failed_checks", checks=", ".join(failed)))
    return " ".join(s for s in sentences if s)


def _capital(text: str) -> str:
    """A sentence begins with a capital letter."""
    return text[:1].upper() + text[1:]
