"""The ``panels`` form: aligned panels stacked on one shared time axis, each with its own value axis.

One axes per panel, stacked top to bottom and sharing the x (time) axis, so a period sits at the same
place in every panel; period labels are printed under the bottom panel only. Each panel has exactly
one value axis (never a twin): its own scale, or the scale every panel shares when the plan gives
them the same one.

Each panel's title and notes are printed above it, left-aligned, as the panel's x-axis label moved
to the top: the chart's own notes go in the first axes' left title (``render.charts``), and a title
is then placed above the label instead of over it.
"""

from __future__ import annotations

from matplotlib.axes import Axes
from matplotlib.figure import Figure

from service.intents.plan import ChartPlan, Panel
from service.render import style
from service.render.basic import (
    Ends,
    draw_gaps,
    draw_series,
    end_labels,
    label_partial,
    time_axis,
    value_axis,
)
from service.render.drawer import drawer


def _own_gaps(plan: ChartPlan, panel: Panel) -> ChartPlan:
    """The plan with only the gaps of this panel's series (each naming only them)."""
    names = {s.name for s in panel.series}
    gaps = [
        g.model_copy(update={"series": [n for n in g.series if n in names]})
        for g in plan.gaps
        if names & set(g.series)
    ]
    return plan.model_copy(update={"gaps": gaps})


def _heading(ax: Axes, panel: Panel) -> None:
    ax.xaxis.set_label_position("top")
    ax.set_xlabel(
        "\n".join([panel.title, *panel.notes]),
        loc="left",
        color=style.INK,
        fontsize=8,
        linespacing=1.3,
        parse_math=False,
    )


@drawer("panels")
def draw_panels(figure: Figure, plan: ChartPlan) -> None:
    count = len(plan.panels)
    if count == 0:
        raise ValueError("a panels plan has no panels")
    grid = figure.add_gridspec(count, 1)
    axes: list[Axes] = []
    for row in range(count):
        axes.append(figure.add_subplot(grid[row, 0], sharex=axes[0] if axes else None))
    drawn: list[Ends] = []
    for ax, panel in zip(axes, plan.panels, strict=True):
        ends = draw_series(ax, plan, panel.series, panel.value_axis)
        draw_gaps(ax, _own_gaps(plan, panel), panel.value_axis, len(panel.series))
        value_axis(ax, plan, panel.value_axis)
        label_partial(ax, plan, panel.series)
        _heading(ax, panel)
        drawn.append(ends)
    # The x axis (ticks, labels, limits) is shared: set it once, on the bottom panel.
    time_axis(axes[-1], plan, room=any(drawn))
    for ax in axes[:-1]:
        ax.tick_params(axis="x", labelbottom=False)
    for ax, ends in zip(axes, drawn, strict=True):
        end_labels(ax, ends)
    figure.align_ylabels(axes)
