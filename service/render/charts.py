"""Draw one chart plan into vector PDF bytes, byte-identical for the same plan and versions."""

from __future__ import annotations

import io

from matplotlib.backends.backend_pdf import PdfPages
from matplotlib.figure import Figure

from service.errors import RenderFailed
from service.intents.plan import ChartPlan
from service.render import (  # noqa: F401  (each registers its drawers)
    forms,
    style,
)
from service.render.registry import DRAWERS


def size_in(plan: ChartPlan) -> tuple[float, float]:
    lines = len(plan.notes) + len(plan.flags)
    extra = 0.18 * lines
    if plan.form in {"bars", "dots"}:
        rows = max(len(plan.categories), 2)
        return style.WIDTH_IN, min(8.5, 0.75 + style.BAR_ROW_IN * rows + extra)
    return style.WIDTH_IN, style.LINE_HEIGHT_IN + extra


def figure_for(plan: ChartPlan) -> Figure:
    """The chart as a matplotlib figure (what ``draw`` saves; tests measure its artists)."""
    style.install()
    figure = Figure(figsize=size_in(plan), layout="constrained")
    try:
        DRAWERS[plan.form](figure, plan)
        ax = figure.axes[0]
        if plan.notes:
            ax.set_title(
                "\n".join(plan.notes),
                loc="left",
                color=style.INK,
                fontsize=7.5,
                fontstyle="italic",
                parse_math=False,
            )
        if plan.flags:
            figure.suptitle(
                "CHECK FAILED — "
                + " | ".join(f.split(":", 1)[0] for f in plan.flags)
                + " (see the integrity appendix)",
                color=style.FLAG,
                fontsize=8,
                fontweight="bold",
                x=0.01,
                ha="left",
                parse_math=False,
            )
    except (ValueError, RuntimeError, OverflowError, KeyError) as exc:
        raise RenderFailed(f"chart '{plan.chart_id}' could not be drawn: {exc}") from exc
    return figure


def draw_pages(plans: list[ChartPlan]) -> bytes:
    """Every chart of a pack as one page each of a single vector PDF, in order.

    One file shares one font subset across all charts: measured on the demo, fontTools subsetting
    for every chart separately was over half of the render time.
    """
    buffer = io.BytesIO()
    metadata = {"CreationDate": None, "Creator": "Plumbline"}
    try:
        with PdfPages(buffer, metadata=metadata) as pages:
            for plan in plans:
                pages.savefig(figure_for(plan))
    except (ValueError, RuntimeError, OverflowError) as exc:
        raise RenderFailed(f"the charts could not be drawn: {exc}") from exc
    return buffer.getvalue()


def draw(plan: ChartPlan) -> bytes:
    """The chart as a one-page vector PDF."""
    figure = figure_for(plan)
    buffer = io.BytesIO()
    try:
        figure.savefig(
            buffer, format="pdf", metadata={"CreationDate": None, "Creator": "Plumbline"}
        )
    except (ValueError, RuntimeError, OverflowError) as exc:
        raise RenderFailed(f"chart '{plan.chart_id}' could not be drawn: {exc}") from exc
    return buffer.getvalue()
