"""Advice: the window and the comparison of a time chart respect the data's own cycle.

A cycle is found with the autocorrelation function (ACF) of the history, less its least-squares line
(a trend would otherwise hide the cycle): the *first local peak* at lag k ≥ 2, among lags up to N/2,
whose autocorrelation exceeds z/√N, where z is the standard normal quantile at 1 − 0.05/m over the m
lags tested. That is the approximate 95 % white-noise band ±2/√N (Box & Jenkins, from memory) with a
Bonferroni adjustment, so that noise alone shows a peak in under 5 % of series of any length.

With a cycle of k periods the chart is advised (never blocked) when it shows fewer than two cycles
(the minimum statsmodels' ``seasonal_decompose`` asks for, to tell a cycle from a trend), or when it
compares the latest period with the one before (movement) although 1 is not a multiple of k: those two
periods sit at different points of the cycle. Missing values are left out of the sums, pair by pair.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from statistics import NormalDist

import numpy as np

from service.checks.missing import measures_of
from service.checks.registry import CheckSpec, Context, Finding, register
from service.data import periods
from service.intents.plan import ChartPlan, all_series

MIN_POINTS = 8
FAMILY_ERROR = 0.05
_SAME_PHASE = {
    ("month", 12): "the same month a year earlier",
    ("quarter", 4): "the same quarter a year earlier",
    ("week", 52): "the same week a year earlier",
    ("week", 53): "the same week a year earlier",
    ("day", 7): "the same day a week earlier",
}


def acf(values: Sequence[float | None], nlags: int) -> list[float]:
    """Autocorrelation at lags 0..nlags: Σ (x_t − x̄)(x_t+k − x̄) / Σ (x_t − x̄)², pairwise present."""
    x = np.array([np.nan if v is None else v for v in values], dtype=float)
    d = x - np.nanmean(x)
    d[np.isnan(d)] = 0.0  # a missing value adds nothing to any sum
    total = float(d @ d)
    if total == 0.0:
        return [1.0] + [0.0] * nlags
    return [1.0] + [float(d[:-k] @ d[k:]) / total for k in range(1, nlags + 1)]


def detrended(values: Sequence[float | None]) -> list[float | None]:
    """The values less their least-squares line (fitted to the present values)."""
    t = np.array([i for i, v in enumerate(values) if v is not None], dtype=float)
    y = np.array([v for v in values if v is not None], dtype=float)
    slope, intercept = np.polyfit(t, y, 1)
    return [None if v is None else v - (slope * i + intercept) for i, v in enumerate(values)]


def threshold(n: int, lags: int) -> float:
    """The autocorrelation a peak must exceed: z(1 − 0.05/lags) / √n."""
    return NormalDist().inv_cdf(1 - FAMILY_ERROR / max(1, lags)) / math.sqrt(n)


def first_peak(r: Sequence[float], bar: float) -> int | None:
    """The first lag k ≥ 2 with r[k−1] < r[k] ≥ r[k+1] and r[k] > bar."""
    for k in range(2, len(r) - 1):
        if r[k - 1] < r[k] >= r[k + 1] and r[k] > bar:
            return k
    return None


@dataclass(frozen=True)
class Cycle:
    lag: int
    r: float
    bar: float


def dominant_cycle(values: Sequence[float | None]) -> Cycle | None:
    """The cycle of a series by the rule in the module docstring; ``None`` when there is none."""
    n = sum(v is not None for v in values)
    nlags = len(values) // 2
    if n < MIN_POINTS or nlags < 3:
        return None
    r = acf(detrended(values), nlags)
    bar = threshold(n, nlags - 2)  # lags 2 .. nlags−1 can be peaks
    lag = first_peak(r, bar)
    return None if lag is None else Cycle(lag=lag, r=r[lag], bar=bar)


def _on_axis(plan: ChartPlan) -> list[list[float | None]]:
    """Each plan series placed on the plan's period axis (None where nothing is drawn)."""
    out = []
    for series in all_series(plan):
        placed: list[float | None] = [None] * len(plan.periods)
        for x, v in zip(series.positions(), series.values, strict=True):
            placed[x] = v
        out.append(placed)
    return out


def histories(plan: ChartPlan, ctx: Context) -> list[list[float | None]]:
    """The plan's series, or the dataset's when it holds a longer history than the chart shows."""
    table = ctx.table
    if table.periods is not None and len(table.periods):
        full = periods.expected(table.periods.min(), table.periods.max())
        if len(full) > len(plan.periods):
            frame = table.frame.set_index(table.periods).reindex(full)
            return [
                [None if math.isnan(v) else float(v) for v in frame[m].astype(float)]
                for m in measures_of(ctx.chart)
            ]
    return _on_axis(plan)


def _span(n: int, unit: str) -> str:
    return f"{n} {unit}{'' if n == 1 else 's'}"


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    found = histories(plan, ctx)
    if max((sum(v is not None for v in h) for h in found), default=0) < MIN_POINTS:
        return Finding(
            True,
            "too short to test",
            f"Fewer than {MIN_POINTS} values: too short to look for a cycle.",
        )
    cycles = [c for c in map(dominant_cycle, found) if c is not None]
    if not cycles:
        return Finding(True, "no cycle", "No repeating cycle was found in the data.", "no cycle")
    cycle = max(cycles, key=lambda c: c.r)
    unit = str(ctx.table.frequency or "period")
    window = len(plan.periods)
    evidence = (
        f"The data repeat every {_span(cycle.lag, unit)} (autocorrelation {cycle.r:.2f} at lag "
        f"{cycle.lag}, above {cycle.bar:.2f})"
    )
    shown = f"{_span(cycle.lag, unit)} cycle; {_span(window, unit)} shown"
    advice = []
    if window < 2 * cycle.lag:
        advice.append(
            f"the chart shows only {_span(window, unit)}, fewer than two cycles: show at least "
            f"{_span(2 * cycle.lag, unit)} so the cycle is not read as a trend"
        )
    if plan.intent == "movement" and plan.verdicts and 1 % cycle.lag != 0:
        i = plan.verdicts[0].index
        same = _SAME_PHASE.get((unit, cycle.lag), f"the same point of the cycle, {cycle.lag} back")
        pair = f"{plan.periods[i - 1]} with {plan.periods[i]}" if i > 0 else "consecutive periods"
        advice.append(
            f"the latest change compares {pair}, which sit at different points of the cycle: "
            f"compare with {same} as well"
        )
    if not advice:
        return Finding(
            True, cycle.lag, f"{evidence}; the chart shows {window // cycle.lag} cycles.", shown
        )
    return Finding(False, cycle.lag, f"{evidence}, but " + "; and ".join(advice) + ".", shown)


SPEC = register(
    CheckSpec(
        id="window-cycle",
        title="The window and comparison respect the data's cycle",
        intents=frozenset({"trend", "relative_change", "movement"}),
        forms=frozenset({"lines", "panels", "control"}),
        measures="the dominant cycle of the history (first autocorrelation peak at lag ≥ 2 above "
        "the Bonferroni-adjusted white-noise band), against the periods shown and the periods "
        "compared",
        threshold="at least two cycles shown; compared periods at the same point of the cycle",
        source="Box & Jenkins, Time Series Analysis: Forecasting and Control (1970), the "
        "autocorrelation function and its ±2/√N band (from memory); two complete cycles as "
        "statsmodels' seasonal_decompose requires",
        waivable=False,
        correction=None,
        measure=_measure,
        level="advice",
    )
)
