"""A chart that must be read to a stated precision delivers it, or labels its values.

What the drawn chart delivers is estimated from the plan (the renderer is not run):

- value per millimetre = value-axis span / plot length in mm. The plot length is an estimate: for the
  horizontal forms (bars, dots, deviation) 75 % of the figure width ``geometry.WIDTH_IN`` (the rest is
  category labels and margins); for the vertical forms (lines, control) 75 % of the figure height
  ``size_in(plan)`` (the rest is tick labels, notes and margins);
- a reader judges a position against a gridline to about 0.5 mm (from memory; common practice), so
  the chart resolves differences of value_per_mm × 0.5. On a logarithmic axis the same 0.5 mm is a
  ratio, turned into an amount at the value that matters.

Required: the ``absolute`` precision, or ``relative`` × the smallest non-zero absolute value shown.
When the chart alone is too coarse, the values are labelled (labels print up to two decimals).
"""

from __future__ import annotations

import math

from service import formatting, wording
from service.checks.registry import CheckSpec, Context, Finding, register
from service.definition.model import INTENTS, Precision
from service.intents.plan import ChartPlan, all_series

READING_MM = 0.5
PLOT_SHARE = 0.75
MM_PER_IN = 25.4
HORIZONTAL = frozenset({"bars", "dots", "deviation"})
VERTICAL = frozenset({"lines", "control"})
#: The finest step a value label shows: labels print at most two decimals.
LABEL_DECIMALS = 2


def plot_length_mm(plan: ChartPlan) -> float:
    """The estimated length of the drawn value axis, in millimetres."""
    # late imports: the house sizes live with the drawing stack, loaded only for charts that
    # state a precision
    if plan.form in HORIZONTAL:
        from service.intents import geometry

        return geometry.WIDTH_IN * PLOT_SHARE * MM_PER_IN
    from service.intents.geometry import size_in

    return size_in(plan)[1] * PLOT_SHARE * MM_PER_IN


def shown_values(plan: ChartPlan) -> list[float]:
    if plan.form in HORIZONTAL:
        return [c.value for c in plan.categories if c.value is not None]
    return [v for s in all_series(plan) for v in s.values if v is not None]


def required(precision: Precision, values: list[float]) -> float:
    """The difference readers must tell apart, as an amount in the axis's unit."""
    if precision.absolute is not None:
        return precision.absolute
    assert precision.relative is not None
    nonzero = [abs(v) for v in values if v != 0]
    return precision.relative * min(nonzero) if nonzero else 0.0


def resolvable(plan: ChartPlan, values: list[float], precision: Precision) -> float:
    """The smallest difference the chart alone lets a reader see, as an amount."""
    axis = plan.value_axis
    length = plot_length_mm(plan)
    if not axis.log:
        return (axis.hi - axis.lo) / length * READING_MM
    ratio = 10 ** ((math.log10(axis.hi) - math.log10(axis.lo)) / length * READING_MM) - 1
    magnitudes = [abs(v) for v in values if v != 0] or [axis.lo]
    where = max(magnitudes) if precision.absolute is not None else min(magnitudes)
    return ratio * where


def label_step(values: list[float]) -> float:
    """Half the last decimal the labels print; 0 when they print every value exactly."""
    digits = formatting.decimals_for(values)
    exact = all(abs(v * 10**digits - round(v * 10**digits)) < 1e-9 for v in values)
    return 0.0 if exact else 0.5 * 10.0**-LABEL_DECIMALS


def about(value: float, unit: str, locale: str) -> str:
    """An amount to two significant figures, with its unit ("0.014%", "£1,200")."""
    if value <= 0 or not math.isfinite(value):
        return formatting.with_unit(value, unit, locale)
    places = 1 - math.floor(math.log10(value))
    rounded = round(value, places)
    digits = max(0, places)
    while digits > 0 and round(rounded, digits - 1) == rounded:
        digits -= 1
    return formatting.with_unit(rounded, unit, locale, digits=digits)


def note_for(plan: ChartPlan, ctx: Context) -> str | None:
    precision = ctx.chart.precision
    values = shown_values(plan)
    if precision is None or not values:
        return None
    unit = plan.value_axis.unit
    chart = about(resolvable(plan, values, precision), unit, ctx.locale)
    need = about(required(precision, values), unit, ctx.locale)
    return wording.say("text.values_labelled", ctx.locale, chart=chart, need=need)


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    precision = ctx.chart.precision
    locale = ctx.locale
    if precision is None:
        detail = wording.say("finding.no_precision", locale)
        return Finding(
            True, None, detail, wording.say("finding.not_asked", locale), applicable=False
        )
    values = shown_values(plan)
    if not values:
        detail = wording.say("finding.no_values_to_read", locale)
        return Finding(True, None, detail, wording.say("finding.no_values", locale))
    unit = plan.value_axis.unit
    res, need = resolvable(plan, values, precision), required(precision, values)
    res_text, need_text = about(res, unit, locale), about(need, unit, locale)
    per_mm = about(res / READING_MM, unit, locale)
    alone = wording.say("finding.chart_alone", locale, res=res_text, per_mm=per_mm)
    measured = float(f"{res:.4g}")
    shown = wording.say("finding.about", locale, value=res_text)
    if res <= need:
        detail = wording.say("finding.precision_ok", locale, alone=alone, need=need_text)
        return Finding(True, measured, wording.sentence(detail[:1].upper() + detail[1:]), shown)
    step = label_step(values)
    if plan.value_labels and step <= need:
        detail = wording.say("finding.precision_labelled", locale, alone=alone, need=need_text)
        labelled = wording.say("finding.labelled_about", locale, value=res_text)
        return Finding(True, measured, detail, labelled)
    detail = wording.say("finding.precision_short", locale, alone=alone, need=need_text)
    if plan.value_labels:
        step_text = about(step, unit, locale)
        detail = wording.sentence(
            detail, wording.say("finding.labels_round", locale, step=step_text)
        )
    return Finding(False, measured, detail, shown)


def _correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    note = note_for(plan, ctx)
    notes = plan.notes if note is None or note in plan.notes else [*plan.notes, note]
    return plan.model_copy(update={"value_labels": True, "notes": notes})


SPEC = register(
    CheckSpec(
        id="precision",
        title="The chart gives the precision readers need",
        intents=frozenset(INTENTS),
        forms=frozenset(HORIZONTAL | VERTICAL),
        measures="the smallest difference the drawn chart resolves: value-axis span / estimated plot "
        "length in mm (75 % of the figure width or height) × a reading resolution of 0.5 mm",
        threshold="resolvable difference ≤ the stated precision (absolute, or relative × the "
        "smallest value shown); otherwise values are labelled",
        source="common practice (no source): a reading resolution of 0.5 mm against a gridline, "
        "from memory",
        waivable=True,
        correction="Each value was labelled on the chart, with a note saying why.",
        measure=_measure,
        correct=_correct,
    )
)
