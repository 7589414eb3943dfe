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
import numpy.typing as npt

from service import formatting, wording
from service.checks.missing import measures_of
from service.checks.registry import CheckSpec, Context, Finding, register
from service.data import periods
from service.definition.model import OVER_TIME
from service.intents.plan import ChartPlan, all_series

MIN_POINTS = 8
FAMILY_ERROR = 0.05
_SAME_PHASE = {
    ("month", 12): "finding.same_month",
    ("quarter", 4): "finding.same_quarter",
    ("week", 52): "finding.same_week",
    ("week", 53): "finding.same_week",
    ("day", 7): "finding.same_day",
}
"""Catalogue keys for the period one cycle back, where it has a name of its own."""


Values = Sequence[float | None] | npt.NDArray[np.float64]
"""A history: a list with ``None`` where a value is missing, or an array with NaN there."""

#: Above this many values the first peak is looked for with the FFT's autocorrelation first.
DIRECT_MAX = 20_000


def _array(values: Values) -> npt.NDArray[np.float64]:
    return np.array(values, dtype=float)  # None becomes NaN


def _deviations(x: npt.NDArray[np.float64]) -> npt.NDArray[np.float64]:
    d = x - np.nanmean(x)
    d[np.isnan(d)] = 0.0  # a missing value adds nothing to any sum
    return d


def _r(d: npt.NDArray[np.float64], k: int, total: float) -> float:
    return float(d[:-k] @ d[k:]) / total


def acf(values: Values, nlags: int) -> list[float]:
    """Autocorrelation at lags 0..nlags: Σ (x_t − x̄)(x_t+k − x̄) / Σ (x_t − x̄)², pairwise present."""
    d = _deviations(_array(values))
    total = float(d @ d)
    if total == 0.0:
        return [1.0] + [0.0] * nlags
    return [1.0] + [_r(d, k, total) for k in range(1, nlags + 1)]


def _detrended(x: npt.NDArray[np.float64]) -> npt.NDArray[np.float64]:
    present = ~np.isnan(x)
    t = np.flatnonzero(present).astype(float)
    slope, intercept = np.polyfit(t, x[present], 1)
    fitted: npt.NDArray[np.float64] = x - (slope * np.arange(len(x), dtype=float) + intercept)
    return fitted


def detrended(values: Values) -> list[float | None]:
    """The values less their least-squares line (fitted to the present values)."""
    return [None if math.isnan(v) else v for v in _detrended(_array(values)).tolist()]


def threshold(n: int, lags: int) -> float:
    """The autocorrelation a peak must exceed: z(1 − 0.05/lags) / √n."""
    return NormalDist().inv_cdf(1 - FAMILY_ERROR / max(1, lags)) / math.sqrt(n)


def first_peak(r: Sequence[float], bar: float) -> int | None:
    """The first lag k ≥ 2 with r[k−1] < r[k] ≥ r[k+1] and r[k] > bar."""
    for k in range(2, len(r) - 1):
        if r[k - 1] < r[k] >= r[k + 1] and r[k] > bar:
            return k
    return None


def peak_by_fft(d: npt.NDArray[np.float64], nlags: int, bar: float) -> tuple[int, float] | None:
    """``first_peak(acf(d, nlags), bar)`` and its r, without the O(n · nlags) products.

    The FFT gives every lag's autocorrelation in O(n log n), within ``tol`` of the direct sums (each
    direct sum is within n·ε of the exact value, as |Σ d_t d_t+k| ≤ Σ d_t²; the FFT's error is far
    smaller). Every lag where the peak rule could hold within that tolerance is a candidate; the
    candidates are then judged in order with the direct sums, so the lag found and its r are exactly
    those of the direct rule."""
    total = float(d @ d)
    if total == 0.0:
        return None
    n = len(d)
    size = 1 << (2 * n - 1).bit_length()
    spectrum = np.fft.rfft(d, size)
    approx = np.fft.irfft(spectrum.real**2 + spectrum.imag**2, size)[: nlags + 1] / total
    tol = 4 * n * np.finfo(float).eps + 1e-12
    k = np.arange(2, nlags)
    loose = (
        (approx[k - 1] < approx[k] + 2 * tol)
        & (approx[k] + 2 * tol >= approx[k + 1])
        & (approx[k] + tol > bar)
    )
    for lag in k[loose].tolist():
        before, here, after = (_r(d, j, total) for j in (lag - 1, lag, lag + 1))
        if before < here >= after and here > bar:
            return lag, here
    return None


@dataclass(frozen=True)
class Cycle:
    lag: int
    r: float
    bar: float


def dominant_cycle(values: Values) -> Cycle | None:
    """The cycle of a series by the rule in the module docstring; ``None`` when there is none."""
    x = _array(values)
    n = int(np.count_nonzero(~np.isnan(x)))
    nlags = len(x) // 2
    if n < MIN_POINTS or nlags < 3:
        return None
    d = _detrended(x)
    bar = threshold(n, nlags - 2)  # lags 2 .. nlags−1 can be peaks
    if len(x) > DIRECT_MAX:
        found = peak_by_fft(_deviations(d), nlags, bar)
        return None if found is None else Cycle(lag=found[0], r=found[1], bar=bar)
    r = acf(d, nlags)
    lag = first_peak(r, bar)
    return None if lag is None else Cycle(lag=lag, r=r[lag], bar=bar)


def _on_axis(plan: ChartPlan) -> list[npt.NDArray[np.float64]]:
    """Each plan series placed on the plan's period axis (NaN where nothing is drawn)."""
    out = []
    for series in all_series(plan):
        values = _array(series.values)
        if series.xs is None and len(values) == len(plan.periods):
            out.append(values)
            continue
        placed = np.full(len(plan.periods), np.nan)
        placed[np.asarray(series.positions(), dtype=np.intp)] = values
        out.append(placed)
    return out


def histories(plan: ChartPlan, ctx: Context) -> list[npt.NDArray[np.float64]]:
    """The plan's series, or the dataset's when it holds a longer history than the chart shows."""
    table = ctx.table
    if table.periods is not None and len(table.periods):
        full = periods.expected(table.periods.min(), table.periods.max())
        if len(full) > len(plan.periods):
            frame = table.frame.set_index(table.periods).reindex(full)
            return [frame[m].to_numpy(dtype=float, na_value=np.nan) for m in measures_of(ctx.chart)]
    return _on_axis(plan)


def _span(n: int, unit: str, locale: str) -> str:
    """A number of periods in words: "12 months", "1 Woche"."""
    return wording.say(f"finding.{unit}_{'one' if n == 1 else 'many'}", locale, count=n)


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    found = histories(plan, ctx)
    locale = ctx.locale
    if max((int(np.count_nonzero(~np.isnan(h))) for h in found), default=0) < MIN_POINTS:
        detail = wording.say("finding.too_short_cycle", locale, count=MIN_POINTS)
        return Finding(True, "too short to test", detail)
    cycles = [c for c in map(dominant_cycle, found) if c is not None]
    if not cycles:
        return Finding(True, "no cycle", wording.say("finding.no_cycle", locale), "no cycle")
    cycle = max(cycles, key=lambda c: c.r)
    unit = str(ctx.table.frequency or "period")
    window = len(plan.periods)
    evidence = wording.say(
        "finding.cycle_evidence",
        locale,
        span=_span(cycle.lag, unit, locale),
        r=formatting.number(cycle.r, locale, digits=2),
        lag=cycle.lag,
        bar=formatting.number(cycle.bar, locale, digits=2),
    )
    shown = wording.say(
        "finding.cycle_shown",
        locale,
        span=_span(cycle.lag, unit, locale),
        window=_span(window, unit, locale),
    )
    advice = []
    if window < 2 * cycle.lag:
        advice.append(
            wording.say(
                "finding.too_few_cycles",
                locale,
                window=_span(window, unit, locale),
                least=_span(2 * cycle.lag, unit, locale),
            )
        )
    if plan.intent == "movement" and plan.verdicts and 1 % cycle.lag != 0:
        i = plan.verdicts[0].index
        key = _SAME_PHASE.get((unit, cycle.lag), "finding.same_point")
        same = wording.say(key, locale, lag=cycle.lag)
        if i > 0:
            pair = wording.say(
                "finding.pair", locale, before=plan.periods[i - 1], after=plan.periods[i]
            )
        else:
            pair = wording.say("finding.consecutive", locale)
        advice.append(wording.say("finding.compare_phase", locale, pair=pair, same=same))
    if not advice:
        detail = wording.say(
            "finding.cycles_shown", locale, evidence=evidence, count=window // cycle.lag
        )
        return Finding(True, cycle.lag, detail, shown)
    detail = wording.say("finding.cycle_but", locale, evidence=evidence, advice="; ".join(advice))
    return Finding(False, cycle.lag, detail, shown)


SPEC = register(
    CheckSpec(
        id="window-cycle",
        title="The window and comparison respect the data's cycle",
        intents=OVER_TIME,
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
