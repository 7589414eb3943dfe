"""The basic forms: bars, dots and lines, each filling one axes."""

from __future__ import annotations

from collections.abc import Callable

from matplotlib.axes import Axes
from matplotlib.figure import Figure
from matplotlib.ticker import FixedLocator

from service.intents.plan import ChartPlan
from service.render import common, style
from service.render.registry import Drawer, drawer


def draw_bars(ax: Axes, plan: ChartPlan) -> None:
    base = plan.bar_base or 0.0
    rows = list(range(len(plan.categories)))[::-1]
    axis = plan.value_axis
    span = axis.hi - axis.lo
    for y, category in zip(rows, plan.categories, strict=True):
        if category.value is None:
            common.no_data(ax, base, y)
            continue
        ax.barh(
            y,
            category.value - base,
            left=base,
            height=0.62,
            color=common.colour(plan, 0),
            linewidth=0,
        )
        inside = category.value - base
        ha = "left" if inside >= 0 else "right"
        pad = span * 0.008 * (1 if inside >= 0 else -1)
        ax.text(
            category.value + pad,
            y,
            common.value_label(plan, category.value),
            va="center",
            ha=ha,
            color=style.INK,
            fontsize=7.5,
            parse_math=False,
        )
    common.category_axis(ax, plan, rows)
    ax.set_xlim(axis.lo, axis.hi + span * 0.08)
    if axis.lo < 0 < axis.hi:
        ax.axvline(0, color=style.MUTED, linewidth=0.8)


def draw_dots(ax: Axes, plan: ChartPlan) -> None:
    rows = list(range(len(plan.categories)))[::-1]
    axis = plan.value_axis
    for y, category in zip(rows, plan.categories, strict=True):
        ax.axhline(y, color=style.GRID, linewidth=0.6, zorder=0)
        if category.value is None:
            common.no_data(ax, axis.lo, y)
            continue
        ax.plot(
            [category.value],
            [y],
            marker="o",
            markersize=5.5,
            color=common.colour(plan, 0),
            linestyle="none",
        )
        ax.text(
            category.value,
            y + 0.28,
            common.value_label(plan, category.value),
            va="bottom",
            ha="center",
            color=style.INK,
            fontsize=7,
            parse_math=False,
        )
    common.category_axis(ax, plan, rows)
    ax.set_xlim(axis.lo, axis.hi)


def draw_lines(ax: Axes, plan: ChartPlan) -> None:
    axis = plan.value_axis
    n = len(plan.periods)
    partial = plan.partial
    ends: list[tuple[str, int, float, str]] = []
    for number, series in enumerate(plan.series):
        colour = common.colour(plan, number)
        for first, end in series.segments:
            # the running period is never joined to the complete ones
            last = end - 1 if partial is not None and end == partial.index else end
            if last < first:
                continue
            xs = list(range(first, last + 1))
            ys = [float(series.values[i] or 0.0) for i in xs]  # a segment holds no gaps
            ax.plot(xs, ys, color=colour, marker="o" if first == last else "", markersize=3.5)
        value = series.values[partial.index] if partial is not None else None
        if partial is not None and value is not None:
            ax.plot(
                [partial.index],
                [value],
                marker="o",
                markersize=6,
                markerfacecolor="white",
                markeredgecolor=colour,
                markeredgewidth=1.4,
                linestyle="none",
                zorder=3,
            )
        complete = [
            i
            for i, v in enumerate(series.values)
            if v is not None and (partial is None or i != partial.index)
        ]
        if complete and len(plan.series) > 1:
            ends.append(
                (series.name, complete[-1], float(series.values[complete[-1]] or 0.0), colour)
            )
    for gap in plan.gaps:
        ax.axvspan(gap.index - 0.45, gap.index + 0.45, color=style.GAP_FILL, linewidth=0, zorder=0)
        everyone = len(gap.series) == len(plan.series)
        text = "no data" if everyone else "no data: " + ", ".join(gap.series)
        ax.text(
            gap.index,
            (axis.lo + axis.hi) / 2,
            text,
            rotation=90,
            va="center",
            ha="center",
            fontsize=7,
            color=style.MUTED,
            fontstyle="italic",
            parse_math=False,
        )
    step = max(1, -(-n // 8))
    ticks = list(range(0, n, step))
    ax.xaxis.set_major_locator(FixedLocator(ticks))
    ax.set_xticklabels([plan.periods[i] for i in ticks], parse_math=False)
    ax.set_xlim(-0.6, n - 0.4 + (0.12 * n + 0.8 if ends else 0.0))
    ax.set_ylim(axis.lo, axis.hi)
    ax.yaxis.set_major_formatter(common.value_formatter(plan))
    ax.grid(axis="y")
    ax.set_axisbelow(True)
    ax.set_ylabel(axis.label, parse_math=False)
    partial_values = [s.values[partial.index] for s in plan.series] if partial else []
    present = [v for v in partial_values if v is not None]
    if partial is not None and present:
        ax.annotate(
            f"{plan.periods[partial.index]} so far:\n{partial.text}",
            xy=(partial.index, min(present)),
            xytext=(-8, 0),
            textcoords="offset points",
            ha="right",
            va="center",
            fontsize=7,
            color=style.MUTED,
            fontstyle="italic",
            parse_math=False,
        )
    _direct_labels(ax, ends, axis.lo, axis.hi)


def _direct_labels(ax: Axes, ends: list[tuple[str, int, float, str]], lo: float, hi: float) -> None:
    """Name each line at its last complete point, nudged apart so no two labels overlap."""
    if not ends:
        return
    height_pt = ax.get_figure().get_size_inches()[1] * 72 * 0.7  # type: ignore[union-attr]
    per_unit = height_pt / (hi - lo)
    order = sorted(range(len(ends)), key=lambda k: ends[k][2])
    placed: list[float] = []
    for k in order:
        want = (ends[k][2] - lo) * per_unit
        y = max(want, placed[-1] + 9.0) if placed else want
        placed.append(y)
        name, x, value, colour = ends[k]
        ax.annotate(
            name,
            xy=(x, value),
            xytext=(6, y - want),
            textcoords="offset points",
            va="center",
            ha="left",
            color=colour,
            fontsize=7.5,
            parse_math=False,
            annotation_clip=False,
        )


def _alone(draw: Callable[[Axes, ChartPlan], None]) -> Drawer:
    """A drawer for a form that fills one axes."""

    def in_figure(figure: Figure, plan: ChartPlan) -> None:
        draw(figure.add_subplot(), plan)

    return in_figure


drawer("bars")(_alone(draw_bars))
drawer("dots")(_alone(draw_dots))
drawer("lines")(_alone(draw_lines))
