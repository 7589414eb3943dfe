"""The pie drawer: wedges in plan order from 12 o'clock clockwise, each labelled directly.

Each wedge's sweep is 360° × value / (sum of the drawn values); its label ("label NN %") sits just
outside it, nudged apart from its neighbours on the same side so no two overlap, with a thin leader
line when it had to move. There is no legend. Parts the pie cannot draw (expected parts without data,
parts of zero) are listed in a small note under it. Whether a pie is the right form is decided by the
check ``pie-readable``, never here.
"""

from __future__ import annotations

import math

from matplotlib.axes import Axes
from matplotlib.figure import Figure
from matplotlib.patches import Wedge

from service import formatting
from service.intents.plan import Category, ChartPlan
from service.render import common, style
from service.render.drawer import drawer

#: Where labels sit (radius 1 is the pie's edge) and their least vertical distance apart.
LABEL_RADIUS = 1.14
LABEL_GAP = 0.17
LABEL_TOP = 1.22
EDGE_WIDTH = 0.8


def wedge_angles(values: list[float]) -> list[tuple[float, float]]:
    """(theta1, theta2) in degrees, counter-clockwise from 3 o'clock as matplotlib counts, for
    wedges laid clockwise from 12 o'clock."""
    total = math.fsum(values)
    out: list[tuple[float, float]] = []
    start = 90.0
    for value in values:
        sweep = 360.0 * value / total
        out.append((start - sweep, start))
        start -= sweep
    return out


def _label(category: Category, locale: str) -> str:
    if category.percent is None:
        return category.label
    return f"{category.label} {formatting.percent(category.percent, locale)}"


def spread(wanted: list[float], top: float = LABEL_TOP) -> list[float]:
    """Label heights at least LABEL_GAP apart, each as near its wanted height as room allows,
    all within ±top: pushed down from the top first, then up from the bottom if they ran out."""
    order = sorted(range(len(wanted)), key=lambda k: -wanted[k])
    ys = [min(wanted[k], top) for k in order]
    for i in range(1, len(ys)):
        ys[i] = min(ys[i], ys[i - 1] - LABEL_GAP)
    if ys and ys[-1] < -top:
        ys[-1] = -top
        for i in range(len(ys) - 2, -1, -1):
            ys[i] = max(ys[i], ys[i + 1] + LABEL_GAP)
    placed = [0.0] * len(wanted)
    for k, y in zip(order, ys, strict=True):
        placed[k] = y
    return placed


def _labels(
    ax: Axes, wedges: list[Category], angles: list[tuple[float, float]], locale: str
) -> None:
    mids = [math.radians((a + b) / 2) for a, b in angles]
    for right in (True, False):
        side = [k for k, m in enumerate(mids) if (math.cos(m) >= 0) == right]
        wanted = [LABEL_RADIUS * math.sin(mids[k]) for k in side]
        placed = spread(wanted)
        for k, want, y in zip(side, wanted, placed, strict=True):
            x = LABEL_RADIUS * math.cos(mids[k])
            if abs(y - want) > 0.01:  # moved: keep it clear of the pie, and lead a line to it
                clear = math.sqrt(max(0.0, 1.0 - y * y)) + 0.1
                x = max(abs(x), clear) * (1.0 if right else -1.0)
                edge = (1.02 * math.cos(mids[k]), 1.02 * math.sin(mids[k]))
                ax.plot([edge[0], x], [edge[1], y], color=style.MUTED, linewidth=0.5, gid="leader")
            ax.text(
                x,
                y,
                _label(wedges[k], locale),
                ha="left" if right else "right",
                va="center",
                color=style.INK,
                fontsize=7.5,
                parse_math=False,
            )


def _missing_note(plan: ChartPlan) -> str:
    expected = [c.label for c in plan.categories if c.expected_missing]
    others = [
        c.label
        for c in plan.categories
        if not c.expected_missing and (c.value is None or c.value <= 0)
    ]
    lines = []
    if expected:
        lines.append("Expected, no data: " + ", ".join(expected))
    if others:
        lines.append("Not drawn (zero or no data): " + ", ".join(others))
    return "\n".join(lines)


@drawer("pie")
def draw_pie(figure: Figure, plan: ChartPlan) -> None:
    ax = figure.add_subplot()
    wedges = [c for c in plan.categories if c.value is not None and c.value > 0]
    if wedges:
        angles = wedge_angles([c.value or 0.0 for c in wedges])
        for i, (theta1, theta2) in enumerate(angles):
            ax.add_patch(
                Wedge(
                    (0.0, 0.0),
                    1.0,
                    theta1,
                    theta2,
                    facecolor=common.colour(plan, i),
                    edgecolor="white",
                    linewidth=EDGE_WIDTH,
                )
            )
        _labels(ax, wedges, angles, plan.locale)
    note = _missing_note(plan)
    if note:
        ax.text(
            0.0,
            0.0,
            note,
            transform=ax.transAxes,
            ha="left",
            va="bottom",
            color=style.MUTED,
            fontsize=7,
            fontstyle="italic",
            parse_math=False,
        )
    ax.set_xlim(-2.7, 2.7)
    ax.set_ylim(-1.35, 1.35)
    ax.set_aspect("equal")
    ax.axis("off")
