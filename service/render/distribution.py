"""Drawers of spreads: ``histogram`` (touching bars on the measure's axis) and ``box`` (Tukey boxes).

Both show the plan's reading guide under the axes, as the figure's bottom label (``show_guide``), so
it never meets the notes, which ``charts.figure_for`` puts in the axes' left title.
"""

from __future__ import annotations

import textwrap

from matplotlib.figure import Figure
from matplotlib.patches import Rectangle
from matplotlib.ticker import FixedLocator

from service import formatting
from service.intents.plan import ChartPlan
from service.render import common, style
from service.render.drawer import drawer

#: Characters per line of the guide at its font size across the chart's width.
GUIDE_CHARS = 110
#: Edges labelled on the measure axis: every k-th, so at most this many.
MAX_EDGE_TICKS = 12
BOX_HEIGHT = 0.5


def show_guide(figure: Figure, plan: ChartPlan) -> None:
    """The plan's reading guide, under the axes (wrapped to the chart's width)."""
    if not plan.guide:
        return
    figure.supxlabel(
        textwrap.fill(plan.guide, GUIDE_CHARS, break_on_hyphens=False),
        x=0.01,
        ha="left",
        color=style.MUTED,
        fontsize=7.5,
        fontstyle="italic",
        parse_math=False,
    )


@drawer("histogram")
def draw_histogram(figure: Figure, plan: ChartPlan) -> None:
    ax = figure.add_subplot()
    base = plan.baseline or 0.0
    for b in plan.bins:
        ax.bar(
            b.lo,
            b.count - base,
            width=b.hi - b.lo,
            bottom=base,
            align="edge",
            color=common.colour(plan, 0),
            edgecolor="white",
            linewidth=0.5,
        )
    edges = [plan.bins[0].lo, *(b.hi for b in plan.bins)] if plan.bins else []
    step = max(1, -(-len(edges) // MAX_EDGE_TICKS))
    ticks = edges[::step]
    ax.xaxis.set_major_locator(FixedLocator(ticks))
    ax.set_xticklabels([formatting.number(t, plan.locale) for t in ticks], parse_math=False)
    if plan.x_axis is not None:
        ax.set_xlim(plan.x_axis.lo, plan.x_axis.hi)
        ax.set_xlabel(plan.x_axis.label, parse_math=False)
    axis = plan.value_axis
    ax.set_ylim(axis.lo, axis.hi)
    ax.yaxis.set_major_formatter(common.value_formatter(plan))
    ax.set_ylabel(axis.label, parse_math=False)
    ax.grid(axis="y")
    ax.set_axisbelow(True)
    show_guide(figure, plan)


@drawer("box")
def draw_box(figure: Figure, plan: ChartPlan) -> None:
    ax = figure.add_subplot()
    rows = list(range(len(plan.boxes)))[::-1]
    half = BOX_HEIGHT / 2
    ink = common.colour(plan, 0)
    for y, box in zip(rows, plan.boxes, strict=True):
        for start, end in ((box.low, box.q1), (box.q3, box.high)):
            ax.plot([start, end], [y, y], color=ink, linewidth=1.0, gid="whisker")
        for end in (box.low, box.high):
            ax.plot([end, end], [y - half / 2, y + half / 2], color=ink, linewidth=1.0, gid="cap")
        ax.add_patch(
            Rectangle(
                (box.q1, y - half),
                box.q3 - box.q1,
                BOX_HEIGHT,
                facecolor="#dfe7ef",
                edgecolor=ink,
                linewidth=1.0,
                gid="box",
            )
        )
        ax.plot(
            [box.median] * 2, [y - half, y + half], color=style.INK, linewidth=2.0, gid="median"
        )
        if box.outliers:
            ax.plot(
                box.outliers,
                [y] * len(box.outliers),
                marker="o",
                markersize=3.5,
                markerfacecolor="white",
                markeredgecolor=ink,
                linestyle="none",
                gid="outliers",
            )
    ax.yaxis.set_major_locator(FixedLocator(rows))
    labels = [f"{b.label} (n = {formatting.number(b.n, plan.locale)})" for b in plan.boxes]
    ax.set_yticklabels(labels, parse_math=False)
    ax.tick_params(axis="y", length=0)
    ax.set_ylim(-0.6, len(rows) - 0.4)
    ax.spines["left"].set_visible(False)
    axis = plan.value_axis
    ax.set_xlim(axis.lo, axis.hi)
    ax.xaxis.set_major_formatter(common.value_formatter(plan))
    ax.set_xlabel(axis.label, parse_math=False)
    ax.grid(axis="x")
    ax.set_axisbelow(True)
    show_guide(figure, plan)
