"""Draw one chart plan into vector PDF bytes, byte-identical for the same plan and versions."""

from __future__ import annotations

import io
import warnings
from collections.abc import Callable
from typing import Any

from matplotlib.backend_bases import GraphicsContextBase, RendererBase
from matplotlib.backends.backend_pdf import PdfPages, RendererPdf
from matplotlib.figure import Figure
from matplotlib.font_manager import FontProperties
from matplotlib.text import Text

from service.errors import RenderFailed
from service.intents.geometry import NOTE_WIDTH, size_in
from service.intents.plan import ChartPlan
from service.render import key, layout, style
from service.render.measured import LayoutReport
from service.render.registry import DRAWERS

#: OpenType features switched off for every text on a chart.
NO_LIGATURES = ("-liga", "-clig")


class _Shaping:
    """What matplotlib's PDF renderer reads from a text artist to shape a line: its features."""

    def __init__(self, language: Any) -> None:
        self._language = language

    def get_fontfeatures(self) -> tuple[str, ...]:
        return NO_LIGATURES

    def get_language(self) -> Any:
        return self._language


class ChartFigure(Figure):
    """A chart's figure: in a PDF, every line of its text is shaped without ligatures.

    matplotlib 3.11 hands the renderer the text artist, and so its font features, only for
    single-line text; each line of a multi-line text is drawn with ``mtext=None`` and shaped with
    the font's default features, ligatures on (matplotlib issue #30282). A ligature glyph stands
    for several characters, so the PDF writer puts it in a second font subset numbered from code 0,
    and PDF/A validators read CID 0 as .notdef whatever glyph it maps to (ISO 19005-3, 6.2.11.8;
    pikepdf's validator follows veraPDF here). So while the figure draws into a PDF, a line that
    comes without features gets the house's.
    """

    def draw(self, renderer: RendererBase) -> None:
        # A MixedModeRenderer hands draw_text on to the PDF renderer; a raster or other renderer
        # is left alone (some read the artist for placement, which a multi-line text would break).
        pdf = getattr(renderer.draw_text, "__self__", None)
        if not isinstance(pdf, RendererPdf):
            super().draw(renderer)
            return
        plain: Callable[..., None] = pdf.draw_text

        def draw_text(  # noqa: PLR0917 - matplotlib's draw_text signature, positions included
            gc: GraphicsContextBase,
            x: float,
            y: float,
            s: str,
            prop: FontProperties,
            angle: float,
            ismath: bool | str = False,
            mtext: Text | _Shaping | None = None,
        ) -> None:
            if mtext is None or mtext.get_fontfeatures() is None:
                mtext = _Shaping(None if mtext is None else mtext.get_language())
            plain(gc, x, y, s, prop, angle, ismath, mtext)

        pdf.draw_text = draw_text  # type: ignore[method-assign]  # this page's renderer only
        try:
            super().draw(renderer)
        finally:
            del pdf.draw_text


def figure_for(plan: ChartPlan) -> Figure:
    """The chart as a matplotlib figure (what ``draw`` saves; tests measure its artists)."""
    style.install()
    figure = ChartFigure(figsize=size_in(plan), layout="constrained")
    try:
        DRAWERS[plan.form](figure, plan)
        ax = figure.axes[0]
        if plan.notes:
            layout.set_notes(
                ax, list(plan.notes), NOTE_WIDTH, color=style.INK, fontsize=7.5, fontstyle="italic"
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
        key.draw(figure, plan.locale)
    except (ValueError, RuntimeError, OverflowError, KeyError) as exc:
        raise RenderFailed.logged(f"chart '{plan.chart_id}' could not be drawn", exc) from exc
    for text in figure.findobj(Text):
        # Ligature glyphs (ff, fi) land in a second font subset at code 0, which PDF/A checks
        # read as .notdef; spelt out, they stay in the first subset. matplotlib applies these to
        # single-line text; ChartFigure covers the lines of multi-line text.
        text.set_fontfeatures(NO_LIGATURES)
    return figure


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
                reports.append(layout.mend(figure, locale=plan.locale))
                # mend() laid the figure out: keep that layout. With no engine at all (not even
                # "none", a placeholder engine), savefig draws once instead of twice.
                figure.set_layout_engine(None)
                with warnings.catch_warnings():  # a collapsed layout is in the report already
                    warnings.filterwarnings("ignore", "constrained_layout not applied")
                    pages.savefig(figure)
    except (ValueError, RuntimeError, OverflowError) as exc:
        raise RenderFailed.logged("the charts could not be drawn", exc) from exc
    return buffer.getvalue(), reports


def draw(plan: ChartPlan) -> bytes:
    """The chart as a one-page vector PDF, laid out and labelled as in a pack."""
    figure = figure_for(plan)
    layout.mend(figure, locale=plan.locale)
    figure.set_layout_engine(None)  # keep the layout its labels were placed in
    buffer = io.BytesIO()
    try:
        figure.savefig(
            buffer, format="pdf", metadata={"CreationDate": None, "Creator": "Plumbline"}
        )
    except (ValueError, RuntimeError, OverflowError) as exc:
        raise RenderFailed.logged(f"chart '{plan.chart_id}' could not be drawn", exc) from exc
    return buffer.getvalue()


__all__ = ["NO_LIGATURES", "ChartFigure", "draw", "draw_pages", "figure_for", "size_in"]
