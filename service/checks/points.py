"""More points than the output can show: M4 reduction of long series, per drawn segment.

M4 (Jugel, Jerzak, Hackenbroich & Markl, "M4: A Visualization-Oriented Time Series Data Aggregation",
PVLDB 7(10), 2014) splits the x range into the pixel columns of the output and keeps, in each column,
the first, last, lowest and highest point. A line drawn through those points at that width
rasterises like the line through every point, with at most 4 points per column.

The output width is the chart's plot width at print resolution: ``WIDTH_IN`` × 0.8 (the plot area's
share of the figure, about) × 300 dpi ≈ 1,606 px. Every drawn segment (a run of present values) is
reduced on its own, over the pixel columns of the whole chart, so no line is ever joined across a
gap. This check runs after missing-periods and partial-period, which read every point.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from service import formatting, wording
from service.checks.registry import CheckSpec, Context, Finding, register
from service.definition.model import OVER_TIME
from service.intents.plan import ChartPlan, Reduction, Series, all_series

#: The stated output resolution: print, 300 dots per inch.
DPI = 300
#: The plot area's share of the figure width (axes labels and margins take the rest), about.
PLOT_SHARE = 0.8
#: Points M4 keeps per pixel column: first, last, minimum, maximum.
PER_COLUMN = 4


def width_px() -> int:
    """Pixel columns of the drawn time axis at ``DPI`` (1,606 for the 6.69 in page width)."""
    # late import: the house sizes live with the drawing stack, kept out of the check-only path
    from service.intents import geometry

    return round(geometry.WIDTH_IN * PLOT_SHARE * DPI)


def m4_indexes(
    x: npt.ArrayLike, y: npt.ArrayLike, width_px: int, x_range: tuple[float, float] | None = None
) -> npt.NDArray[np.intp]:
    """Sorted indexes of the points M4 keeps: first, last, min and max of each pixel column.

    ``x`` is ascending; ``x_range`` is the drawn x range split into ``width_px`` equal columns (by
    default the range of ``x``). Column of a point: floor(w · (x − x_lo) / (x_hi − x_lo)), the last
    point clipped into column w − 1 (the M4 paper's mapping). Ties keep the first occurrence.
    """
    xa = np.asarray(x, dtype=float)
    ya = np.asarray(y, dtype=float)
    n = len(xa)
    if n == 0:
        return np.zeros(0, dtype=np.intp)
    lo, hi = (float(xa[0]), float(xa[-1])) if x_range is None else x_range
    span = hi - lo
    if span > 0:
        column = np.floor(width_px * (xa - lo) / span).astype(np.int64)
    else:
        column = np.zeros(n, dtype=np.int64)
    column = np.clip(column, 0, width_px - 1)
    starts = np.flatnonzero(np.r_[True, column[1:] != column[:-1]])
    ends = np.r_[starts[1:] - 1, n - 1]
    group = np.repeat(np.arange(len(starts)), np.diff(np.r_[starts, n]))
    lowest = np.minimum.reduceat(ya, starts)
    highest = np.maximum.reduceat(ya, starts)
    at_min = np.flatnonzero(ya == lowest[group])
    at_max = np.flatnonzero(ya == highest[group])
    first_min = at_min[np.unique(group[at_min], return_index=True)[1]]
    first_max = at_max[np.unique(group[at_max], return_index=True)[1]]
    kept = np.unique(np.concatenate([starts, ends, first_min, first_max]))
    return kept.astype(np.intp)


def present_count(series: Series) -> int:
    """The points a series draws (present values)."""
    return len(series.values) - series.values.count(None)


def reduce_series(series: Series, width_px: int, x_range: tuple[float, float]) -> Series:
    """The series with only the points M4 keeps, segment by segment; gaps stay gaps."""
    xs = (
        np.arange(len(series.values), dtype=np.int64)
        if series.xs is None
        else np.asarray(series.xs, dtype=np.int64)
    )
    values: list[float | None] = []
    kept_xs: list[int] = []
    segments: list[tuple[int, int]] = []
    for first, last in series.segments:
        ys = np.asarray(series.values[first : last + 1], dtype=float)  # None becomes NaN
        ys[np.isnan(ys)] = 0.0  # as the drawing does: a segment has no gaps inside
        seg_x = xs[first : last + 1]
        keep = m4_indexes(seg_x, ys, width_px, x_range)
        segments.append((len(values), len(values) + len(keep) - 1))
        values.extend(float(v) for v in ys[keep])
        kept_xs.extend(int(v) for v in seg_x[keep])
    return series.model_copy(update={"values": values, "xs": kept_xs, "segments": segments})


def _x_range(plan: ChartPlan) -> tuple[float, float]:
    return (0.0, float(max(len(plan.periods) - 1, 0)))


def _too_many(series: Series, x_range: tuple[float, float]) -> bool:
    """Over the limit, unless M4 at this width would keep every point (already reduced)."""
    count = present_count(series)
    if count <= PER_COLUMN * width_px():
        return False
    return present_count(reduce_series(series, width_px(), x_range)) < count


def _measure(plan: ChartPlan, ctx: Context) -> Finding:
    everyone = all_series(plan)
    counts = [present_count(s) for s in everyone]
    most = max(counts, default=0)
    limit, locale, x_range = PER_COLUMN * width_px(), ctx.locale, _x_range(plan)
    n = {
        "width": formatting.number(width_px(), locale),
        "limit": formatting.number(limit, locale),
        "dpi": DPI,
        "most": formatting.number(most, locale),
    }
    shown = wording.say("finding.points", locale, **n)
    over = [s.title for s in everyone if _too_many(s, x_range)]
    if over:
        detail = wording.say("finding.points_over", locale, names=", ".join(over), shown=shown, **n)
        return Finding(False, most, detail, shown)
    if plan.reduction is not None:
        r = plan.reduction
        detail = wording.say(
            "finding.points_reduced",
            locale,
            before=formatting.number(r.before, locale),
            after=formatting.number(r.after, locale),
            px=formatting.number(r.width_px, locale),
        )
        return Finding(True, most, detail, wording.say("finding.points_m4", locale, **n))
    if most > limit:
        return Finding(True, most, wording.say("finding.points_gaps", locale, shown=shown), shown)
    return Finding(True, most, wording.say("finding.points_ok", locale, shown=shown, **n), shown)


def _correct(plan: ChartPlan, ctx: Context) -> ChartPlan:
    x_range = _x_range(plan)

    def reduced(series: Series) -> Series:
        return reduce_series(series, width_px(), x_range) if _too_many(series, x_range) else series

    before = sum(present_count(s) for s in all_series(plan))
    series = [reduced(s) for s in plan.series]
    panels = [p.model_copy(update={"series": [reduced(s) for s in p.series]}) for p in plan.panels]
    after = sum(present_count(s) for s in [*series, *(s for p in panels for s in p.series)])
    return plan.model_copy(
        update={
            "series": series,
            "panels": panels,
            "reduction": Reduction(before=before, after=after, width_px=width_px()),
        }
    )


SPEC = register(
    CheckSpec(
        id="many-points",
        title="No more points than the output can show",
        intents=OVER_TIME,
        forms=frozenset({"lines", "panels", "control"}),
        measures="points per series, against the pixel columns of the plot width at print "
        f"resolution (page width × {PLOT_SHARE} at {DPI} dpi, about 1,606 px)",
        threshold="at most 4 points per pixel column and drawn segment (M4's bound: 4 × the width "
        "in px for an unbroken line)",
        source="Jugel, Jerzak, Hackenbroich & Markl, 'M4: A Visualization-Oriented Time Series Data "
        "Aggregation', PVLDB 7(10), 2014",
        waivable=False,
        correction="Each long series was reduced with M4 (first, last, lowest and highest point of "
        "every pixel column, each drawn segment on its own), which draws the same line.",
        measure=_measure,
        correct=_correct,
    )
)
