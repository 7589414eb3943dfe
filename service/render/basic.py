"""The basic forms: bars, dots and lines, each filling one axes."""

from __future__ import annotations

import textwrap
from collections.abc import Callable
from typing import Any, NamedTuple, cast

from matplotlib.artist import Artist
from matplotlib.axes import Axes
from matplotlib.figure import Figure
from matplotlib.ticker import FixedLocator, NullFormatter
from matplotlib.transforms import offset_copy

from service import formatting, wording
from service.intents import colours
from service.intents.plan import ChartPlan, Scale, Series, all_series
from service.render import common, place, style
from service.render.drawer import Drawer, drawer


def draw_bars(ax: Axes, plan: ChartPlan) -> None:
    base = plan.baseline or 0.0
    rows = list(range(len(plan.categories)))[::-1]
    axis = plan.value_axis
    span = axis.hi - axis.lo
    bars: list[tuple[float, float]] = []  # (row, value): drawn in one call, in this order
    labels: list[tuple[float, str]] = []  # (where a label starts, its text) on the right
    for y, category in zip(rows, plan.categories, strict=True):
        if category.target is not None:
            ax.plot(
                [category.target] * 2,
                [y - 0.42, y + 0.42],
                color=style.INK,
                linewidth=1.6,
                solid_capstyle="butt",
                zorder=4,
                gid="target",
            )
        if category.value is None:
            common.no_data(ax, base, y, "expected, no data" if category.expected_missing else None)
            continue
        _interval(ax, category.lo, category.hi, y)
        bars.append((y, category.value - base))
        inside = category.value - base
        ha = "left" if inside >= 0 else "right"
        pad = span * 0.008 * (1 if inside >= 0 else -1)
        text = common.value_label(plan, category.value)
        if category.percent is not None:
            text = f"{formatting.percent(category.percent, plan.locale)} ({text})"
        ends = [category.value, category.hi, category.target]
        top = max(v for v in ends if v is not None)
        if inside >= 0:
            labels.append((top + pad, text))
        ax.text(
            top + pad if inside >= 0 else category.value + pad,
            y,
            text,
            va="center",
            ha=ha,
            color=style.INK,
            fontsize=7.5,
            parse_math=False,
        )
    if bars:
        ax.barh(
            [y for y, _ in bars],
            [width for _, width in bars],
            left=base,
            height=0.62,
            color=common.colour(plan, 0),
            linewidth=0,
        )
    for ref in plan.references:
        line = ax.axvline(
            ref.value, color=style.INK, linewidth=0.9, linestyle=(0, (4, 2)), zorder=4
        )
        place.label(
            ax,
            ref.label,
            (ref.value, 1.0),
            place.atop(2.0, 2.0, "bottom"),
            xycoords=("data", "axes fraction"),
            inside=False,
            key=line,
            fontsize=7,
            color=style.INK,
        )
    common.category_axis(ax, plan, rows)
    ax.set_xlim(axis.lo, max(axis.hi + span * 0.08, common.room_for(ax, axis.lo, axis.hi, labels)))
    if axis.lo < 0 < axis.hi:
        ax.axvline(0, color=style.MUTED, linewidth=0.8)


def _interval(ax: Axes, lo: float | None, hi: float | None, y: float) -> None:
    """A value's uncertainty interval, drawn as a thin line with end ticks."""
    if lo is None or hi is None:
        return
    ax.plot([lo, hi], [y, y], color=style.INK, linewidth=0.9, zorder=5, gid="interval")
    for end in (lo, hi):
        ax.plot(
            [end, end],
            [y - 0.14, y + 0.14],
            color=style.INK,
            linewidth=0.9,
            zorder=5,
            gid="interval",
        )


def draw_dots(ax: Axes, plan: ChartPlan) -> None:
    rows = list(range(len(plan.categories)))[::-1]
    axis = plan.value_axis
    for y, category in zip(rows, plan.categories, strict=True):
        ax.axhline(y, color=style.GRID, linewidth=0.6, zorder=0, gid="grid")
        if category.value is None:
            common.no_data(
                ax, axis.lo, y, "expected, no data" if category.expected_missing else None
            )
            continue
        _interval(ax, category.lo, category.hi, y)
        ax.plot(
            [category.value],
            [y],
            marker="o",
            markersize=5.5,
            color=common.colour(plan, 0),
            linestyle="none",
        )
        place.label(
            ax,
            common.value_label(plan, category.value),
            (category.value, y),
            place.over(5.0),
            color=style.INK,
            fontsize=7,
        )
    common.category_axis(ax, plan, rows)
    ax.set_xlim(axis.lo, axis.hi)


def draw_lines(ax: Axes, plan: ChartPlan) -> None:
    ends = draw_series(ax, plan, plan.series, plan.value_axis)
    draw_references(ax, plan)
    draw_gaps(ax, plan, plan.value_axis, len(plan.series))
    time_axis(ax, plan, room=bool(ends))
    value_axis(ax, plan, plan.value_axis)
    label_partial(ax, plan, plan.series)
    end_labels(ax, ends)


class End(NamedTuple):
    """Where a line ends, for its direct label: its name, last complete point, colour and the
    drawn mark (shown in the key if the label finds no room)."""

    name: str
    x: int
    value: float
    colour: str
    mark: Artist


Ends = list[End]


def draw_series(ax: Axes, plan: ChartPlan, series_list: list[Series], axis: Scale) -> Ends:
    """Draw lines segment by segment (never across a gap, never into a partial period).

    Returns where each line ends, for direct labels when there is more than one."""
    partial = plan.partial
    ends: Ends = []
    names = [s.name for s in series_list]
    for number, series in enumerate(series_list):
        base = series.name.removesuffix(" (estimate)")
        index = names.index(base) if series.estimate and base in names else number
        colour = style.MUTED if series.muted else colours.series_colour(plan, series, index)
        xs_all = series.xs or list(range(len(series.values)))
        style_kw: dict[str, Any] = {
            "color": colour,
            "linewidth": 1.0 if series.muted else 1.6,
            "zorder": 1.8 if series.muted else 2.2,  # grey lines behind the focus series
        }
        if series.estimate:
            style_kw["linestyle"] = (0, (3, 2))
            style_kw["gid"] = "estimate"
        mark: Artist | None = None
        for first, end in series.segments:
            running = partial is not None and xs_all[end] == partial.index and not series.estimate
            last = end - 1 if running else end
            if last < first:
                continue
            xs = xs_all[first : last + 1]
            ys = [float(v or 0.0) for v in series.values[first : last + 1]]  # no gaps inside
            if first == last and series.estimate:  # a lone estimate: a hollow diamond
                y, arrow = _on_scale(ys[0], axis)
                (mark,) = ax.plot(
                    xs,
                    [y],
                    marker=arrow or "D",
                    clip_on=arrow is None,
                    markersize=5,
                    markerfacecolor="white",
                    markeredgewidth=1.2,
                    linestyle="none",
                    color=colour,
                    gid="projection" if base in names and base != series.name else "estimate",
                )
            else:
                marker = "o" if first == last else ""
                (mark,) = ax.plot(xs, ys, marker=marker, markersize=3.5, **style_kw)
            if plan.value_labels:
                for x, y in zip(xs, ys, strict=True):
                    place.label(
                        ax,
                        formatting.number(y, plan.locale, digits=axis.writes.decimals),
                        (x, y),
                        place.over(4.0),
                        fontsize=6.5,
                        color=style.INK,
                    )
        if partial is not None and partial.index in xs_all and not series.estimate:
            value = series.values[xs_all.index(partial.index)]
            if value is not None:
                y, arrow = _on_scale(value, axis)
                # arrows of several series at one edge stand side by side, not on top of each other
                beside = (number - (len(series_list) - 1) / 2) * 7.0 if arrow else 0.0
                ax.plot(
                    [partial.index],
                    [y],
                    marker=arrow or "o",
                    clip_on=arrow is None,
                    transform=offset_copy(
                        ax.transData, cast(Figure, ax.get_figure()), x=beside, units="points"
                    ),
                    markersize=6,
                    markerfacecolor="white",
                    markeredgecolor=colour,
                    markeredgewidth=1.4,
                    linestyle="none",
                    zorder=3,
                    gid="partial_actual",
                )
        complete = [
            (x, v)
            for x, v in zip(xs_all, series.values, strict=True)
            if v is not None and (partial is None or x != partial.index or series.estimate)
        ]
        if complete and mark is not None and (len(series_list) > 1 or series.estimate):
            tagged = series.estimate and "estimate" not in series.name
            name = wording.say("text.estimate_of", plan.locale, name=series.title)
            ends.append(
                End(
                    name if tagged else series.title,
                    complete[-1][0],
                    float(complete[-1][1]),
                    colour,
                    mark,
                )
            )
    return ends


def _on_scale(value: float, axis: Scale) -> tuple[float, str | None]:
    """Where a value of the partial period is drawn: at itself when the scale holds it, else at the
    edge it lies beyond, as an arrow pointing off the scale (the plan's ``off_scale`` says it)."""
    if value < axis.lo:
        return axis.lo, "v"
    if value > axis.hi:
        return axis.hi, "^"
    return value, None


def draw_references(ax: Axes, plan: ChartPlan) -> None:
    """Horizontal reference lines (a base of 100, a target), labelled at the left where free."""
    for ref in plan.references:
        line = ax.axhline(
            ref.value, color=style.MUTED, linewidth=0.8, linestyle=(0, (4, 2)), zorder=1
        )
        place.label(
            ax,
            ref.label,
            (0.0, ref.value),
            place.along(ref.value, start="left"),
            xycoords=("axes fraction", "data"),
            key=line,
            fontsize=7,
            color=style.MUTED,
        )


def draw_gaps(ax: Axes, plan: ChartPlan, axis: Scale, series_count: int) -> None:
    middle = (axis.lo * axis.hi) ** 0.5 if axis.log else (axis.lo + axis.hi) / 2
    for gap in plan.gaps:
        ax.axvspan(
            gap.index - 0.45,
            gap.index + 0.45,
            color=style.GAP_FILL,
            linewidth=0,
            zorder=0,
            gid="no_data",
        )
        everyone = len(gap.series) >= series_count
        titles = {s.name: s.title for s in all_series(plan)}
        text = wording.say("text.no_data", plan.locale)
        if not everyone:
            # Upright in the band: a line per few words keeps it short enough to fit between lines.
            text += ":\n" + textwrap.fill(", ".join(titles.get(n, n) for n in gap.series), 18)
        place.label(
            ax,
            text,
            (gap.index, middle),
            place.up_and_down(),
            rotation=90,
            fontsize=7,
            color=style.MUTED,
            fontstyle="italic",
        )


def time_axis(ax: Axes, plan: ChartPlan, *, room: bool, labels: bool = True) -> None:
    n = len(plan.periods)
    step = max(1, -(-n // 8))
    ticks = list(range(0, n, step))
    ax.xaxis.set_major_locator(FixedLocator(ticks))
    if labels:
        ax.set_xticklabels([plan.periods[i] for i in ticks], parse_math=False)
    else:
        ax.set_xticklabels([])
    ax.set_xlim(-0.6, n - 0.4 + (0.12 * n + 0.8 if room else 0.0))


def value_axis(ax: Axes, plan: ChartPlan, axis: Scale) -> None:
    if axis.log:
        ax.set_yscale("log")
    ax.set_ylim(axis.lo, axis.hi)
    common.value_ticks(ax, axis, "y")
    ax.yaxis.set_major_formatter(common.value_formatter(plan))
    ax.yaxis.set_minor_formatter(NullFormatter())
    ax.grid(axis="y")
    ax.set_axisbelow(True)
    ax.set_ylabel(axis.label, parse_math=False)


def label_partial(ax: Axes, plan: ChartPlan, series_list: list[Series]) -> None:
    partial = plan.partial
    if partial is None:
        return
    present = []
    for series in series_list:
        xs = series.xs or list(range(len(series.values)))
        if partial.index in xs and series.values[xs.index(partial.index)] is not None:
            present.append(float(series.values[xs.index(partial.index)] or 0.0))
    bottom, top = ax.get_ylim()
    beyond = [v for v in present if not bottom <= v <= top]
    if partial.off_scale is not None and beyond:
        above = max(beyond) > top
        ax.annotate(
            textwrap.fill(partial.off_scale, 38),
            xy=(partial.index, 1.0 if above else 0.0),
            xycoords=("data", "axes fraction"),
            xytext=(-8, -3 if above else 3),
            textcoords="offset points",
            ha="right",
            va="top" if above else "bottom",
            fontsize=7,
            color=style.MUTED,
            fontstyle="italic",
            parse_math=False,
        )
    elif present:
        place.label(
            ax,
            wording.say(
                "text.so_far", plan.locale, period=plan.periods[partial.index], done=partial.text
            ),
            (partial.index, min(present)),
            [place.Spot(-8, 0, "right", "center"), *place.around(8.0)],
            fontsize=7,
            color=style.MUTED,
            fontstyle="italic",
        )


def end_labels(ax: Axes, ends: Ends) -> None:
    """Name each line at its last complete point, beside it where that covers nothing else.

    Placed from the lowest end up, each nudged upwards first, so labels keep their lines' order."""
    for end in sorted(ends, key=lambda e: e.value):
        place.label(
            ax,
            end.name,
            (end.x, end.value),
            place.beside(),
            inside=False,
            key=end.mark,
            color=end.colour,
            fontsize=7.5,
        )


def _alone(draw: Callable[[Axes, ChartPlan], None]) -> Drawer:
    """A drawer for a form that fills one axes."""

    def in_figure(figure: Figure, plan: ChartPlan) -> None:
        draw(figure.add_subplot(), plan)

    return in_figure


drawer("bars")(_alone(draw_bars))
drawer("dots")(_alone(draw_dots))
drawer("lines")(_alone(draw_lines))
