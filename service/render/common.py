"""Helpers every drawer shares: number formats, colours, missing values, category axes."""

from __future__ import annotations

import textwrap
from typing import Any

from matplotlib.axes import Axes
from matplotlib.ticker import FixedLocator, FuncFormatter

from service import formatting
from service.intents.plan import ChartPlan
from service.render import style

#: Characters of a category label before it wraps onto a second line.
LABEL_WIDTH = 36


def colour(plan: ChartPlan, index: int) -> str:
    """The colour of the ``index``-th mark series: the plan's palette, else the house palette."""
    palette = plan.palette or list(style.PALETTE)
    return palette[index % len(palette)]


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
    ax.grid(axis="x")
    ax.set_axisbelow(True)
    ax.set_xlabel(plan.value_axis.label, parse_math=False)
