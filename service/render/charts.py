"""Draw one chart plan into vector PDF bytes, byte-identical for the same plan and versions."""

from __future__ import annotations

import io
import textwrap
import warnings
from importlib import import_module

from matplotlib.backends.backend_pdf import PdfPages
from matplotlib.figure import Figure
from matplotlib.text import Text

from service.checks.layout import LayoutReport
from service.errors import RenderFailed
from service.intents.geometry import NOTE_WIDTH, size_in
from service.intents.plan import ChartPlan
from service.render import layout, style
from service.render.registry import DRAWERS

#: Modules that register drawers (see ``render.registry``), loaded by name so no tool drops them.
DRAWER_MODULES = ("forms", "pie", "control", "panels", "deviation", "distribution", "scatter")
for _name in DRAWER_MODULES:
    import_module(f"service.render.{_name}")


def figure_for(plan: ChartPlan) -> Figure:
    """The chart as a matplotlib figure (what ``draw`` saves; tests measure its artists)."""
    style.install()
    figure = Figure(figsize=size_in(plan), layout="constrained")
    try:
        DRAWERS[plan.form](figure, plan)
        ax = figure.axes[0]
        if plan.notes:
            ax.set_title(
                "\n".join(textwrap.fill(note, NOTE_WIDTH) for note in plan.notes),
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
    for text in figure.findobj(Text):
        # Ligature glyphs (ff, fi) land in a second font subset at code 0, which PDF/A checks
        # read as .notdef; spelt out, they stay in the first subset.
        text.set_fontfeatures(NO_LIGATURES)  # (matplotlib 3.11 ignores them in multi-line text)
    return figure


#: OpenType features switched off for every text on a chart.
NO_LIGATURES = ("-liga", "-clig")


def draw_pages(plans: list[ChartPlan]) -> tuple[bytes, list[LayoutReport]]:
    """Every chart of a pack as one page each of a single vector PDF, in order.

    One file shares one font subset across all charts: measured on the demo, fontTools subsetting
    for every chart separately was over half of the render time.
    """
    buffer = io.BytesIO()
    metadata = {"CreationDate": None, "Creator": "Plumbline"}
    reports = []
    try:
        with PdfPages(buffer, metadata=metadata) as pages:
            for plan in plans:
                figure = figure_for(plan)
                reports.append(layout.mend(figure))
                # mend() ran the layout on the final labels: keep it rather than run it again
                figure.set_layout_engine("none")
                with warnings.catch_warnings():  # a collapsed layout is in the report already
                    warnings.filterwarnings("ignore", "constrained_layout not applied")
                    pages.savefig(figure)
    except (ValueError, RuntimeError, OverflowError) as exc:
        raise RenderFailed(f"the charts could not be drawn: {exc}") from exc
    return buffer.getvalue(), reports


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


__all__ = ["draw", "draw_pages", "figure_for", "size_in"]
