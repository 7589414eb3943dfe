"""The control form: a measure over time against its centre line and natural process limits.

Draws what the plan says: the series (gaps and a partial last period as the lines form does), the
centre line solid and the limits dashed, each labelled at the right where the series leaves
room (``render.place``); every point a verdict marks as a
signal in the flag colour; and the first verdict (the latest change) as text under the time axis,
below its point.
"""

from __future__ import annotations

import textwrap

from matplotlib.axes import Axes
from matplotlib.figure import Figure

from service.intents.plan import ChartPlan, Reference
from service.render import place, style
from service.render.basic import draw_gaps, draw_series, label_partial, time_axis, value_axis
from service.render.drawer import drawer

DASHED = (0, (4, 3))
VERDICT_WIDTH = 90


def _reference(ax: Axes, reference: Reference) -> None:
    """A reference line across the axes, labelled at its right end where that is free."""
    centre = reference.kind == "centre"
    line = ax.axhline(
        reference.value,
        color=style.INK if centre else style.MUTED,
        linewidth=0.8,
        linestyle="-" if centre else DASHED,
        zorder=1,
        gid=f"reference-{reference.kind}",
    )
    place.label(
        ax,
        reference.label,
        (1.0, reference.value),
        place.along(reference.value),
        xycoords=("axes fraction", "data"),
        key=line,
        fontsize=6.5,
        color=style.MUTED,
    )


def _signals(ax: Axes, plan: ChartPlan) -> None:
    if not plan.series:
        return
    series = plan.series[0]
    marked = sorted({v.index for v in plan.verdicts if v.signal})
    points = [(i, series.at(i)) for i in marked]
    xs = [i for i, y in points if y is not None]
    ys = [y for _, y in points if y is not None]
    if xs:
        ax.plot(
            xs,
            ys,
            marker="o",
            markersize=6,
            color=style.FLAG,
            linestyle="none",
            zorder=6,
            gid="signal",
        )


def _verdict(ax: Axes, plan: ChartPlan) -> None:
    """The verdict on the latest change, under the time axis below its point."""
    if not plan.verdicts:
        return
    verdict = plan.verdicts[0]
    right = verdict.index >= len(plan.periods) / 2
    ax.annotate(
        textwrap.fill(verdict.text, VERDICT_WIDTH),
        xy=(verdict.index, 0.0),
        xycoords=("data", "axes fraction"),
        xytext=(0, -20),
        textcoords="offset points",
        ha="right" if right else "left",
        va="top",
        multialignment="left",
        fontsize=7,
        color=style.FLAG if verdict.signal else style.INK,
        parse_math=False,
        annotation_clip=False,
        gid="verdict",
    )


@drawer("control")
def draw_control(figure: Figure, plan: ChartPlan) -> None:
    ax = figure.add_subplot()
    for reference in plan.references:
        _reference(ax, reference)
    draw_series(ax, plan, plan.series, plan.value_axis)
    draw_gaps(ax, plan, plan.value_axis, len(plan.series))
    time_axis(ax, plan, room=False)
    value_axis(ax, plan, plan.value_axis)
    label_partial(ax, plan, plan.series)
    _signals(ax, plan)
    _verdict(ax, plan)
