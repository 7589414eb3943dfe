"""Value-axis ranges shared by the encoders, and the measures that hold them honest.

A range ends at the next nice number (a whole multiple of a 1–2–2.5–5 step) at or beyond the data,
choosing among the steps that give 3 to 8 intervals the one that wastes the least height. A
percentage measure whose values all lie within 0–100 never runs past 100. A period still running
at ``as_of`` never decides the range of the complete periods (:func:`fit_periods`): its value is
drawn on the scale when it fits, else as an off-scale mark.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence

PERCENT = "%"
"""The unit of a percentage measure (a share of a whole: 0–100)."""
MIN_INTERVALS, MAX_INTERVALS = 3, 8
"""How many tick intervals a nice range may have."""
EDGE_ROOM = 0.005
"""Room (a share of the data's span) a position encoding keeps between its extreme marks and the
frame before rounding to the next nice number, so a line or dot never sits on the plot's edge."""
MIN_COMPLETE_SHARE = 0.6
"""The least share of the plot height the complete periods (and what the scale must show with
them: zero, references) may use."""
_FACTORS = (1.0, 2.0, 2.5, 5.0)


def nice_step(span: float, target_ticks: int = 5) -> float:
    """A 1–2–5 step that splits ``span`` into about ``target_ticks`` intervals."""
    if span <= 0 or not math.isfinite(span):
        return 1.0
    raw = span / target_ticks
    magnitude = 10.0 ** math.floor(math.log10(raw))
    for factor in (1, 2, 2.5, 5, 10):
        if factor * magnitude >= raw:
            return float(factor * magnitude)
    return float(10 * magnitude)


def _steps(span: float) -> list[float]:
    """Every 1–2–2.5–5 step from about a tenth of ``span`` / MAX_INTERVALS up to ``span``."""
    top = math.floor(math.log10(span))
    return [f * 10.0**k for k in range(top - 2, top + 2) for f in _FACTORS]


def _nice(lo: float, hi: float, ceiling: float | None) -> tuple[float, float]:
    """The tightest range of whole steps around [lo, hi], with 3 to 8 intervals, not past
    ``ceiling``; ties go to about five intervals, then to a step without a 2.5."""
    best: tuple[tuple[float, int, int], float, float] | None = None
    for step in _steps(hi - lo):
        a = math.floor(round(lo / step, 9)) * step
        b = math.ceil(round(hi / step, 9)) * step
        n = round((b - a) / step)
        if not MIN_INTERVALS <= n <= MAX_INTERVALS or (ceiling is not None and b > ceiling):
            continue
        rank = (round(b - a, 9), abs(n - 5), int(step / 10.0 ** math.floor(math.log10(step))) == 2)
        if best is None or rank < best[0]:
            best = (rank, a, b)
    if best is None:  # no whole step fits under the ceiling: end at the ceiling itself
        step = nice_step(hi - lo)
        return math.floor(lo / step) * step, min(math.ceil(hi / step) * step, ceiling or math.inf)
    return best[1], best[2]


def fit(
    values: Iterable[float], *, include_zero: bool, unit: str = "", pad: float = 0.0
) -> tuple[float, float]:
    """A range that holds every value, ending at the next nice number at or beyond the data.

    ``pad`` (a share of the data's span) keeps room beyond the extreme values before rounding; a
    percentage (``unit`` "%") with every value within 0–100 ends at 100 at most."""
    finite = [v for v in values if math.isfinite(v)]
    if not finite:
        return (0.0, 1.0)
    lo, hi = min(finite), max(finite)
    data_lo, data_hi = lo, hi
    if include_zero:
        lo, hi = min(lo, 0.0), max(hi, 0.0)
    if lo == hi == 0.0:
        return (0.0, 1.0)
    if lo == hi:
        lo, hi = lo - abs(lo) * 0.1, hi + abs(hi) * 0.1
    room = (hi - lo) * pad
    lo = lo if (include_zero and lo == 0.0) or data_lo >= 0.0 > lo - room else lo - room
    hi = hi if (include_zero and hi == 0.0) or data_hi <= 0.0 < hi + room else hi + room
    ceiling = 100.0 if unit == PERCENT and data_hi <= 100.0 else None
    if ceiling is not None:
        hi = min(hi, ceiling)
    new_lo, new_hi = _nice(lo, hi, ceiling)
    if data_lo >= 0.0:
        new_lo = max(new_lo, 0.0)  # room for the marks never takes the axis below zero
    if data_hi <= 0.0:
        new_hi = min(new_hi, 0.0)
    return (_tidy(new_lo), _tidy(new_hi))


def ticks(lo: float, hi: float) -> list[float]:
    """The tick values of a range drawn by :func:`fit`: whole steps from ``lo`` to ``hi``, the step
    the one that splits the range into 3 to 8 equal intervals closest to five."""
    span = hi - lo
    if not (math.isfinite(span) and span > 0):
        return [lo]
    fitting = []
    for step in _steps(span):
        n = span / step
        whole = abs(n - round(n)) < 1e-6 and abs(lo / step - round(lo / step)) < 1e-6
        if whole and MIN_INTERVALS <= round(n) <= MAX_INTERVALS:
            fitting.append((abs(round(n) - 5), step))
    step = min(fitting)[1] if fitting else nice_step(span)
    first = math.ceil(lo / step - 1e-9) * step
    count = math.floor((hi - first) / step + 1e-9)
    return [_tidy(first + i * step) for i in range(count + 1)]


def _tidy(value: float) -> float:
    """Drop floating-point dust (3.8000000000000003 → 3.8) so labels and notes read cleanly."""
    return float(f"{value:.12g}") + 0.0  # + 0.0: never a negative zero


def fit_log(values: Iterable[float]) -> tuple[float, float]:
    """A logarithmic range: from the power of ten at or below the least value to the one above
    the greatest."""
    positive = [v for v in values if math.isfinite(v) and v > 0]
    if not positive:
        return (1.0, 10.0)
    lo = 10.0 ** math.floor(math.log10(min(positive)))
    hi = 10.0 ** math.ceil(math.log10(max(positive)))
    return (lo, hi if hi > lo else lo * 10)


def complete_share(
    lo: float,
    hi: float,
    complete: Sequence[float],
    shown: Sequence[float] = (),
    *,
    log: bool = False,
    zero: bool = False,
) -> float:
    """The share of the plot height [lo, hi] that the complete periods use, together with what the
    scale must show beside them (``shown``: references; zero when the chart asks for a zero-based
    scale and the range includes it: a zero the partial period pulled in does not count).

    1.0 when there is nothing complete to measure."""
    values = [v for v in (*complete, *shown) if math.isfinite(v) and (v > 0 or not log)]
    if not complete or not values or hi <= lo:
        return 1.0
    if zero and lo <= 0.0 <= hi and not log:
        values.append(0.0)
    f = math.log10 if log else float
    return (f(max(values)) - f(min(values))) / (f(hi) - f(lo))


def fit_periods(
    complete: Iterable[float],
    partial: Iterable[float],
    *,
    include_zero: bool,
    unit: str = "",
    log: bool = False,
    pad: float = EDGE_ROOM,
) -> tuple[float, float]:
    """The range of a chart over time: decided by the complete periods alone, widened to hold the
    partial period's values only where the complete periods keep ``MIN_COMPLETE_SHARE`` of the
    height (a value left outside is drawn as an off-scale mark)."""
    done = [v for v in complete if math.isfinite(v)]
    running = [v for v in partial if math.isfinite(v)]
    if not done:
        done, running = running, []
    lo, hi = fit_log(done) if log else fit(done, include_zero=include_zero, unit=unit, pad=pad)
    if not running:
        return lo, hi
    wide = (
        fit_log([*done, *running])
        if log
        else fit([*done, *running], include_zero=include_zero, unit=unit, pad=pad)
    )
    if complete_share(*wide, done, log=log, zero=include_zero) >= MIN_COMPLETE_SHARE:
        return wide
    return lo, hi
