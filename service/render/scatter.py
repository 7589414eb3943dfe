"""Drawer of ``scatter``: one dot per point, names beside the named ones, the fitted line if planned.

The line is drawn across the range of the data's x values (never extended beyond them), and the
reading guide goes under the axes like the other spreads' (``distribution.show_guide``).
"""

from __future__ import annotations

from matplotlib.figure import Figure

from service.intents.plan import ChartPlan
from service.render import common, place, style
from service.render.distribution import show_guide
from service.render.drawer import drawer


@drawer("scatter")
def draw_scatter(figure: Figure, plan: ChartPlan) -> None:
    ax = figure.add_subplot()
    xs = [p.x for p in plan.points]
    ys = [p.y for p in plan.points]
    ax.scatter(
        xs,
        ys,
        s=18,
        color=common.colour(plan, 0),
        linewidths=0,
        zorder=3,
        gid="points",
    )
    for point in plan.points:
        if point.label is None:
            continue
        place.label(
            ax,
            point.label,
            (point.x, point.y),
            [place.Spot(4, 3, "left", "bottom"), *place.around(4.0)],
            fontsize=7,
            color=style.INK,
        )
    if plan.fit is not None and xs:
        lo, hi = min(xs), max(xs)
        fit = plan.fit
        ax.plot(
            [lo, hi],
            [fit.intercept + fit.slope * lo, fit.intercept + fit.slope * hi],
            color=style.INK,
            linewidth=1.1,
            zorder=4,
            gid="fit",
        )
    if plan.x_axis is not None:
        ax.set_xlim(plan.x_axis.lo, plan.x_axis.hi)
        ax.set_xlabel(plan.x_axis.label, parse_math=False)
    axis = plan.value_axis
    ax.set_ylim(axis.lo, axis.hi)
    ax.set_ylabel(axis.label, parse_math=False)
    ax.xaxis.set_major_formatter(common.value_formatter(plan))
    ax.yaxis.set_major_formatter(common.value_formatter(plan))
    ax.grid(axis="both")
    ax.set_axisbelow(True)
    show_guide(figure, plan)
