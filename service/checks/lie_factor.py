"""Tufte's lie factor of drawn lengths, and the check that holds bars to 0.95–1.05.

Lie factor = (size of effect shown in the graphic) / (size of effect in the data), where the effect
between two values a → b is (b − a) / a (Tufte, *The Visual Display of Quantitative Information*,
1983, p. 57). For bars, the graphic's value is the drawn length: value minus where the bar starts.
"""

from __future__ import annotations

import numpy as np

from service import formatting, wording
from service.checks.registry import CheckSpec, Context, Finding, register
from service.intents import intents_drawing
from service.intents.plan import ChartPlan

LOW, HIGH = 0.95, 1.05


def lie_factor(data_a: float, data_b: float, shown_a: float, shown_b: float) -> float:
    """The lie factor of one change a → b, drawn as sizes shown_a → shown_b."""
    data_effect = (data_b - data_a) / data_a
    shown_effect = (shown_b - shown_a) / shown_a
    return shown_effect / data_effect


def worst(values: list[float], shown: list[float]) -> float | None:
    """The lie factor furthest from 1 over every pair of marks; ``None`` if no pair defines one."""
    v = np.asarray(values, dtype=float)
    s = np.asarray(shown, dtype=float)
    a_v, b_v = np.meshgrid(v, v, indexing="ij")
    a_s, b_s = np.meshgrid(s, s, indexing="ij")
    defined = (a_v != 0) & (a_s != 0) & (a_v != b_v)
    if not defined.any():
        return None
    # A pair whose effect overflows (a value near the smallest float beside ordinary ones)
    # defines no finite factor: it is dropped below, not warned about.
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        factors = ((b_s - a_s) / a_s) / ((b_v - a_v) / a_v)
    factors = factors[defined & np.isfinite(factors)]
    if factors.size == 0:
        return None
    return float(factors[np.argmax(np.abs(factors - 1.0))])


def drawn_lengths(plan: ChartPlan) -> tuple[list[float], list[float]]:
    """The values the marks stand for, and the lengths drawn for them."""
    base = plan.baseline or 0.0
    if plan.form == "histogram":
        counts = [float(b.count) for b in plan.bins]
        return counts, [c - base for c in counts]
    values = [c.value for c in plan.categories if c.value is not None]
    return values, [v - base for v in values]


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    values, lengths = drawn_lengths(plan)
    factor = worst(values, lengths)
    if factor is None:
        return Finding(True, None, wording.say("finding.no_effect", ctx.locale))
    shown = formatting.number(factor, ctx.locale, digits=2)
    if LOW <= factor <= HIGH:
        detail = wording.say("finding.lengths_proportional", ctx.locale, factor=shown)
        return Finding(True, round(factor, 4), detail, shown)
    detail = wording.say(
        "finding.lengths_exaggerate",
        ctx.locale,
        factor=shown,
        low=formatting.number(LOW, ctx.locale),
        high=formatting.number(HIGH, ctx.locale),
    )
    return Finding(False, round(factor, 4), detail, shown)


#: The forms drawn with bars from a zero line.
_BARS = frozenset({"bars", "deviation", "histogram"})


SPEC = register(
    CheckSpec(
        id="lie-factor",
        title="Lie factor of drawn lengths",
        intents=intents_drawing(_BARS),
        forms=_BARS,
        measures="the worst ratio, over every pair of bars, of the change shown by the drawn lengths "
        "to the change in the data",
        threshold="0.95 to 1.05",
        source="Tufte, The Visual Display of Quantitative Information (1983), p. 57",
        waivable=True,
        never_waivable_for=frozenset({"share"}),
        correction=None,
        measure=_measure,
    )
)
