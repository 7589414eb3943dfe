"""Value-axis ranges shared by the encoders."""

from __future__ import annotations

import math
from collections.abc import Iterable


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


def fit(values: Iterable[float], *, include_zero: bool, pad: float = 0.06) -> tuple[float, float]:
    """A range that holds every value with a little room, widened to whole tick steps."""
    finite = [v for v in values if math.isfinite(v)]
    if not finite:
        return (0.0, 1.0)
    lo, hi = min(finite), max(finite)
    if include_zero:
        lo, hi = min(lo, 0.0), max(hi, 0.0)
    if lo == hi == 0.0:
        return (0.0, 1.0)
    if lo == hi:
        lo, hi = lo - abs(lo) * 0.1, hi + abs(hi) * 0.1
    data_lo, data_hi = lo, hi
    room = (hi - lo) * pad
    step = nice_step(hi - lo)
    new_lo = lo if (include_zero and lo == 0.0) else math.floor((lo - room) / step) * step
    new_hi = hi if (include_zero and hi == 0.0) else math.ceil((hi + room) / step) * step
    if include_zero and lo >= 0.0:
        new_lo = 0.0
    if data_lo >= 0.0:
        new_lo = max(new_lo, 0.0)  # room for the marks never takes the axis below zero
    if data_hi <= 0.0:
        new_hi = min(new_hi, 0.0)
    return (_tidy(new_lo), _tidy(new_hi))


def _tidy(value: float) -> float:
    """Drop floating-point dust (3.8000000000000003 → 3.8) so labels and notes read cleanly."""
    return float(f"{value:.12g}")


def fit_log(values: Iterable[float]) -> tuple[float, float]:
    """A logarithmic range: from the power of ten at or below the least value to the one above
    the greatest."""
    positive = [v for v in values if math.isfinite(v) and v > 0]
    if not positive:
        return (1.0, 10.0)
    lo = 10.0 ** math.floor(math.log10(min(positive)))
    hi = 10.0 ** math.ceil(math.log10(max(positive)))
    return (lo, hi if hi > lo else lo * 10)
