"""Measure a drawn chart's text after layout: overlapping tick labels, text cut off at the edge,
text drawn over a data mark (``render.marks``).

Runs on the real figure (text extents need a renderer), and mends what it can by thinning the
time axis's tick labels or shrinking category labels; what it found and did is reported, and the
check ``label-layout`` turns the report into a result.
"""

from __future__ import annotations

import textwrap
import warnings
from typing import Any
from weakref import WeakKeyDictionary

from matplotlib.axes import Axes
from matplotlib.axis import XAxis, YAxis
from matplotlib.backend_bases import RendererBase
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure
from matplotlib.text import Text
from matplotlib.transforms import Bbox

from service.render import key, marks, place
from service.render.measured import LayoutReport

#: Text may reach this close to the figure's edge (pixels at the figure's dpi) before it is cut.
EDGE_TOLERANCE_PX = 1.0

_NOTES: WeakKeyDictionary[Text, tuple[list[str], int]] = WeakKeyDictionary()
"""The notes over a chart, unwrapped, and the width they were wrapped to, by the title that
shows them (so the mender can wrap them again to the room the layout left)."""


def set_notes(ax: Axes, notes: list[str], width: int, **style: Any) -> None:
    """Write the chart's notes over its plot, from the plot's left edge, wrapped to ``width``
    characters; :func:`mend` wraps them narrower if the layout leaves them less room."""
    title = ax.set_title(_wrapped(notes, width), loc="left", parse_math=False, **style)
    _NOTES[title] = (notes, width)


def _wrapped(notes: list[str], width: int) -> str:
    return "\n".join(textwrap.fill(note, width) for note in notes)


def _rewrap_notes(figure: Figure, renderer: RendererBase) -> bool:
    """Wrap notes that run past the figure's right edge to the room they have; True if any did
    (the figure must then be laid out again)."""
    edge = figure.bbox.padded(EDGE_TOLERANCE_PX)
    changed = False
    for title, (notes, width) in list(_NOTES.items()):
        if title.figure is not figure:
            continue
        box = title.get_window_extent(renderer)
        if box.x1 <= edge.x1 or box.width <= 0:
            continue
        room = (edge.x1 - box.x0) / box.width  # the share of the widest line that fits
        narrower = max(20, int(width * room) - 2)
        if narrower >= width:
            continue
        title.set_text(_wrapped(notes, narrower))
        _NOTES[title] = (notes, narrower)
        changed = True
    return changed


def _visible(texts: list[Text]) -> list[Text]:
    return [t for t in texts if t.get_visible() and t.get_text().strip()]


def _drawn_ticklabels(axis: XAxis | YAxis) -> list[Text]:
    """Tick labels matplotlib actually draws: those of ticks inside the view limits."""
    if not axis.axes.axison or not axis.get_visible():
        return []  # an axes drawn without axes (a pie) draws no tick labels
    lo, hi = sorted(axis.get_view_interval())
    span = (hi - lo) or 1.0
    return _visible(
        [
            tick.label1
            for tick in axis.get_major_ticks()
            if lo - span * 1e-9 <= tick.get_loc() <= hi + span * 1e-9
        ]
    )


def _overlapping(boxes: list[Bbox]) -> int:
    """Pairs of boxes that share more than one square pixel."""
    return sum(
        1
        for i, a in enumerate(boxes)
        for b in boxes[i + 1 :]
        if _area(Bbox.intersection(a, b)) > 1.0
    )


def _area(box: Bbox | None) -> float:
    return 0.0 if box is None else max(0.0, box.width) * max(0.0, box.height)


def lay_out(figure: Figure) -> bool:
    """Run the figure's layout once, drawing nothing; False when the layout collapsed (the
    figure is too small for its text, so it leaves no room for the plot)."""
    FigureCanvasAgg(figure)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        figure.draw_without_rendering()
    return not any("constrained_layout not applied" in str(w.message) for w in caught)


def measure(figure: Figure, *, laid_out: bool = False, collapsed: bool = False) -> tuple[int, int]:
    """(overlapping tick-label pairs, text artists cut off at the figure's edge). The figure is
    laid out first unless ``laid_out`` says ``lay_out`` ran (then ``collapsed`` is its verdict):
    text is measured where the layout put it, and nothing is drawn again."""
    if not laid_out:
        collapsed = not lay_out(figure)
    renderer = figure.canvas.get_renderer()  # type: ignore[attr-defined]
    edge = figure.bbox.padded(EDGE_TOLERANCE_PX)
    overlaps, clipped = 0, int(collapsed)  # a collapsed layout leaves no room for the plot
    ticks: list[Text] = []
    for ax in figure.axes:
        for axis in (ax.xaxis, ax.yaxis):
            labels = _drawn_ticklabels(axis)
            ticks.extend(labels)
            overlaps += _overlapping([t.get_window_extent(renderer) for t in labels])
    every_tick = {
        id(t) for ax in figure.axes for t in [*ax.get_xticklabels(), *ax.get_yticklabels()]
    }
    others = [t for t in figure.findobj(Text) if isinstance(t, Text) and id(t) not in every_tick]
    texts = _visible(others) + ticks
    for text in texts:
        box = text.get_window_extent(renderer)
        if box.width > 0 and not (edge.contains(box.x0, box.y0) and edge.contains(box.x1, box.y1)):
            clipped += 1
    return overlaps, clipped


def _thin(ax: Axes) -> bool:
    """Show every other x tick label; False when there is nothing left to thin."""
    labels = _drawn_ticklabels(ax.xaxis)
    if len(labels) < 3:
        return False
    for i, label in enumerate(labels):
        label.set_visible(i % 2 == 0)
    return True


def _shrink(ax: Axes) -> bool:
    changed = False
    for label in ax.get_yticklabels():
        size = label.get_fontsize()
        if isinstance(size, int | float) and size > 6:
            label.set_fontsize(size - 1)
            changed = True
    return changed


def mend(figure: Figure, *, attempts: int = 3, locale: str = "en-GB") -> LayoutReport:
    """Lay out once, place the direct labels, measure, and try to mend overlaps and cut-off text;
    report before and after.

    Texts over data are counted first where the drawers put their labels, then each label is moved
    to a free spot (``render.place``); labels with none go into the key (in ``locale``'s words),
    which takes room, so the figure is laid out and its labels placed once more.

    A mend hides or shrinks labels where the layout put them and measures them again without
    laying out again: the layout keeps the room it made for the labels as they were, so what is
    measured is what the page shows (and each mend costs no further draw of the figure)."""
    collapsed = not lay_out(figure)
    report = LayoutReport()
    renderer = figure.canvas.get_renderer()  # type: ignore[attr-defined]
    report.collisions_before = len(marks.text_over_data(figure, renderer))
    keyed = place.place(figure, renderer)
    if keyed:
        key.draw(figure, locale, keyed)
        collapsed = not lay_out(figure)
        renderer = figure.canvas.get_renderer()  # type: ignore[attr-defined]
        more = place.place(figure, renderer)
        if more:
            key.draw(figure, locale, [*keyed, *more])
            collapsed = not lay_out(figure)
            renderer = figure.canvas.get_renderer()  # type: ignore[attr-defined]
        keyed += more
        report.actions += [f"moved the label '{k.text}' into the key" for k in keyed]
    if _rewrap_notes(figure, renderer):  # the notes over a plot set far right (long category names)
        collapsed = not lay_out(figure)
        renderer = figure.canvas.get_renderer()  # type: ignore[attr-defined]
        place.place(figure, renderer)
    report.overlaps_before, report.clipped_before = report.overlaps, report.clipped = measure(
        figure, laid_out=True, collapsed=collapsed
    )
    for _ in range(attempts):
        if report.overlaps == 0 and report.clipped == 0:
            break
        acted = False
        for ax in figure.axes:
            if _thin(ax):
                report.actions.append("showed every other label on the horizontal axis")
                acted = True
            elif _shrink(ax):
                report.actions.append("shrank the category labels")
                acted = True
        if not acted:
            break
        report.overlaps, report.clipped = measure(figure, laid_out=True, collapsed=collapsed)
    report.over_data = marks.text_over_data(figure, renderer)
    report.collisions = len(report.over_data)
    report.key_kinds = list(key.drawn_kinds(figure)) if figure.legends else []
    return report
