"""The ``deviation`` form: horizontal bars from zero to each category's variance (actual − target).

Bars above target use the first colour of the plan's palette, bars below it the second; each carries
its signed value ("+1,200 GBP", "-300 GBP": Babel's hyphen-minus, like the tick labels, so no second
font subset is embedded). Every reference of the plan (the zero line, "on target") is drawn as a
vertical line with its label at the top. A category without a variance is marked "no data" at zero.
"""

from __future__ import annotations

from matplotlib.axes import Axes
from matplotlib.figure import Figure

from service import formatting
from service.intents.plan import ChartPlan
from service.render import common, place, style
from service.render.drawer import drawer

#: Room beside the axis range for the value labels of the longest bars, as a share of the span
#: (at least; more where a label is long for the axes' width).
LABEL_ROOM = 0.14


def _rooms(ax: Axes, plan: ChartPlan) -> tuple[float, float]:
    """Room left and right of the axis range (data units) that holds the longest value label on
    each side, now that the range ends at the data rather than symmetric about zero."""
    axis = plan.value_axis
    span = axis.hi - axis.lo
    width = ax.get_position().width * ax.get_figure().get_size_inches()[0] * 72  # type: ignore[union-attr]
    need = [0.0, 0.0]
    for category in plan.categories:
        if category.value is not None:
            side = 0 if category.value < 0 else 1
            need[side] = max(
                need[side], len(signed_label(plan, category.value)) * common.CHAR_WIDTH + 4
            )
    shares = [min(n / width, 0.3) for n in need]
    total = span / max(1.0 - sum(shares), 0.4)
    return max(shares[0] * total, span * LABEL_ROOM), max(shares[1] * total, span * LABEL_ROOM)


def signed_label(plan: ChartPlan, value: float) -> str:
    """The value with its unit and an explicit sign: "+£1,200", "−300 journeys", "0 pp"."""
    present = [c.value for c in plan.categories if c.value is not None]
    digits = formatting.decimals_for(present)
    text = plan.value_axis.shown(value, plan.locale, short=True, digits=digits)
    return f"+{text}" if round(value, digits) > 0 else text


def draw_deviation(ax: Axes, plan: ChartPlan) -> None:
    axis = plan.value_axis
    span = axis.hi - axis.lo
    count = len(plan.categories)
    rows = list(range(count))[::-1]
    for y, category in zip(rows, plan.categories, strict=True):
        value = category.value
        if value is None:
            common.no_data(ax, 0.0, y)
            continue
        above = value >= 0
        ax.barh(
            y,
            value,
            left=0.0,
            height=0.62,
            color=common.colour(plan, 0 if above else 1),
            linewidth=0,
        )
        pad = span * 0.008
        ax.text(
            value + pad if above else value - pad,
            y,
            signed_label(plan, value),
            va="center",
            ha="left" if above else "right",
            color=style.INK,
            fontsize=7.5,
            parse_math=False,
        )
    common.category_axis(ax, plan, rows)
    top = count + 0.1
    ax.set_ylim(-0.6, top)  # a little room above the first row for the reference's label
    for reference in plan.references:
        line = ax.axvline(reference.value, color=style.INK, linewidth=0.9, zorder=3)
        place.label(
            ax,
            reference.label,
            (reference.value, top),
            place.atop(3.0, -2.0, "top"),
            key=line,
            color=style.MUTED,
            fontsize=7,
            fontstyle="italic",
        )
    left, right = _rooms(ax, plan)
    ax.set_xlim(axis.lo - left, axis.hi + right)


@drawer("deviation")
def draw(figure: Figure, plan: ChartPlan) -> None:
    draw_deviation(figure.add_subplot(), plan)
