"""Helpers every drawer shares: number formats, colours, missing values, category axes."""

from __future__ import annotations

import textwrap
from typing import Any, Literal

from matplotlib.axes import Axes
from matplotlib.ticker import FixedLocator, FuncFormatter

from service import formatting
from service.intents import colours, scales
from service.intents.plan import ChartPlan, Scale
from service.render import style

#: Characters of a category label before it wraps onto a second line.
LABEL_WIDTH = 36


def colour(plan: ChartPlan, index: int) -> str:
    """The colour of the ``index``-th colour-coded mark: its measure's colour across the pack where
    the plan gives one (``intents.colours``), from the plan's palette, else the house palette."""
    return colours.mark_colour(plan, index)


#: The least distance between two value ticks, in points, before a short axis keeps every other.
MIN_TICK_GAP = 16.0
#: Width of one character of a value label, in points (7.5 pt DejaVu Sans digits and letters).
CHAR_WIDTH = 4.6


def value_ticks(ax: Axes, axis: Scale, which: Literal["x", "y"]) -> None:
    """Ticks at the plan's nice steps, so the drawn value axis ends where the plan's range ends
    (room beyond it for labels carries no tick), and its line stops there too."""
    if axis.log:
        return
    ticks = scales.ticks(axis.lo, axis.hi)
    box = ax.get_position()
    inches = ax.get_figure().get_size_inches()  # type: ignore[union-attr]
    length = box.width * inches[0] * 72 if which == "x" else box.height * inches[1] * 72
    if len(ticks) > 4 and (len(ticks) - 1) % 2 == 0 and length / (len(ticks) - 1) < MIN_TICK_GAP:
        ticks = ticks[::2]  # a short axis (a panel) keeps every other step, ends included
    (ax.xaxis if which == "x" else ax.yaxis).set_major_locator(FixedLocator(ticks))
    ax.spines["bottom" if which == "x" else "left"].set_bounds(axis.lo, axis.hi)


def room_for(ax: Axes, lo: float, hi: float, labels: list[tuple[float, str]]) -> float:
    """The right end of an x range from ``lo`` that keeps each label, starting at its x, inside the
    axes: the value axis ends at a nice number near the data, so the labels need their own room."""
    width = ax.get_position().width * ax.get_figure().get_size_inches()[0] * 72  # type: ignore[union-attr]
    end = hi
    for x, text in labels:
        share = min((len(text) * CHAR_WIDTH + 4) / width, 0.45)
        end = max(end, lo + (x - lo) / (1.0 - share))
    return end


def value_formatter(plan: ChartPlan) -> FuncFormatter:
    def fmt(value: float, _pos: Any) -> str:
        return formatting.number(value, plan.locale)

    return FuncFormatter(fmt)


def value_label(plan: ChartPlan, value: float | None) -> str:
    present = [c.value for c in plan.categories if c.value is not None]
    digits = formatting.decimals_for(present)
    return plan.value_axis.shown(value, plan.locale, short=True, digits=digits)


def no_data(ax: Axes, x: float, y: float, text: str | None = None) -> None:
    """A category whose value is missing says so, where its mark would start."""
    ax.text(
        x,
        y,
        f"  {text or 'no data'}",
        va="center",
        ha="left",
        color=style.MUTED,
        fontsize=7.5,
        fontstyle="italic",
        parse_math=False,
    )


def category_axis(ax: Axes, plan: ChartPlan, rows: list[int]) -> None:
    ax.yaxis.set_major_locator(FixedLocator(rows))
    ax.set_yticklabels(
        [textwrap.fill(c.label, LABEL_WIDTH) for c in plan.categories], parse_math=False
    )
    ax.tick_params(axis="y", length=0)
    ax.set_ylim(-0.6, len(rows) - 0.4)
    ax.spines["left"].set_visible(False)
    ax.xaxis.set_major_formatter(value_formatter(plan))
    value_ticks(ax, plan.value_axis, "x")
    ax.grid(axis="x")
    ax.set_axisbelow(True)
    ax.set_xlabel(plan.value_axis.label, parse_math=False)
