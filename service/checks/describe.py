"""The text alternative of a chart: what it shows, its extremes and its verdicts, in plain words.

Generated from the final plan and the check results, so it says what the reader will see. An
encoder may write its own opening (``plan.description``); the checks' verdicts are added either way
by :func:`describe` only when the plan has none (the author's own text is kept as written).
"""

from __future__ import annotations

from service import formatting
from service.checks.results import CheckResult, Status
from service.intents.plan import ChartPlan

_FORM_WORDS = {
    "bars": "Bar chart",
    "dots": "Dot chart",
    "deviation": "Chart of differences from target",
    "pie": "Pie chart",
    "lines": "Line chart",
    "control": "Chart of values against their natural process limits",
    "panels": "Aligned panels",
    "histogram": "Histogram",
    "box": "Box plot",
    "scatter": "Scatter plot",
}


def _value(plan: ChartPlan, value: float | None) -> str:
    return formatting.with_unit(value, plan.value_axis.unit, plan.locale)


def _categories(plan: ChartPlan) -> list[str]:
    present = [c for c in plan.categories if c.value is not None]
    if not present:
        return []
    top = max(present, key=lambda c: c.value or 0.0)
    low = min(present, key=lambda c: c.value or 0.0)
    count = len(plan.categories)
    words = [f"{count} {'category' if count == 1 else 'categories'}"]
    if top is not low:
        words.append(f"highest {top.label} ({_value(plan, top.value)})")
        words.append(f"lowest {low.label} ({_value(plan, low.value)})")
    missing = [c.label for c in plan.categories if c.value is None]
    if missing:
        words.append("no data for " + ", ".join(missing))
    return words


def _series(plan: ChartPlan) -> list[str]:
    series = plan.series or [s for p in plan.panels for s in p.series]
    if not series or not plan.periods:
        return []
    words = [f"{plan.periods[0]} to {plan.periods[-1]}"]
    for s in series:
        values = [(i, v) for i, v in enumerate(s.values) if v is not None]
        if not values:
            continue
        first, last = values[0], values[-1]
        xs = s.xs or list(range(len(s.values)))
        unit = s.unit
        words.append(
            f"{s.name} from {formatting.with_unit(first[1], unit, plan.locale)} "
            f"({plan.periods[xs[first[0]]]}) to {formatting.with_unit(last[1], unit, plan.locale)} "
            f"({plan.periods[xs[last[0]]]})"
        )
    if plan.gaps:
        words.append(
            "no data for "
            + ", ".join(plan.periods[g.index] for g in plan.gaps[:6])
            + (" and more" if len(plan.gaps) > 6 else "")
        )
    if plan.partial is not None:
        words.append(f"{plan.periods[plan.partial.index]} is partial ({plan.partial.text})")
    return words


def _shape(plan: ChartPlan) -> str:
    """What histograms, box plots and scatter plots hold, which categories and series do not say."""
    if plan.bins:
        total = sum(b.count for b in plan.bins)
        top = max(plan.bins, key=lambda b: b.count)
        unit = plan.x_axis.unit if plan.x_axis else ""
        lo = formatting.with_unit(plan.bins[0].lo, unit, plan.locale)
        hi = formatting.with_unit(plan.bins[-1].hi, unit, plan.locale)
        most = (
            f"{formatting.number(top.lo, plan.locale)} to "
            f"{formatting.with_unit(top.hi, unit, plan.locale)}"
        )
        return (
            f" {total} values, in bins from {lo} to {hi}; the fullest bin is {most} ({top.count})."
        )
    if plan.boxes:
        medians = "; ".join(
            f"{b.label}: median {_value(plan, b.median)}, middle half "
            f"{formatting.number(b.q1, plan.locale)} to {_value(plan, b.q3)} (n = {b.n})"
            for b in plan.boxes
        )
        return f" {medians}."
    if plan.points:
        fit = f"; r² = {plan.fit.r2:.2f}" if plan.fit else ""
        return f" {len(plan.points)} points{fit}."
    return ""


def describe(plan: ChartPlan, results: list[CheckResult]) -> str:
    """A plain-language description of the chart for readers who cannot see it."""
    opening = f"{_FORM_WORDS.get(plan.form, 'Chart')}: {plan.title}."
    parts = _categories(plan) + _series(plan)
    text = opening + (" " + "; ".join(parts) + "." if parts else "")
    text += _shape(plan)
    if plan.guide:
        text += f" {plan.guide}"
    text += "".join(f" {v.text}." for v in plan.verdicts)
    text += "".join(f" {note}" for note in plan.notes)
    corrected = [r.check for r in results if r.status is Status.corrected]
    failed = [r.check for r in results if r.status is Status.failed]
    if corrected:
        text += f" Corrected by the checks: {', '.join(corrected)}."
    if failed:
        text += f" Failed checks: {', '.join(failed)}."
    return text
