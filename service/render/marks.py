"""Where a drawn chart's data marks are, in display pixels: what text must never sit on.

A data mark is anything a drawer puts on the axes to show data: line paths (tested segment by
segment, not by their bounding box), the markers at a line's points, bars, boxes and other patches,
scatter dots, interval marks, and reference lines (``axhline``/``axvline``, target ticks). Grid
lines, spines, the axes' background, the band that marks a period without data (``gid`` ``no_data``)
and the leader line from a label to its mark (``gid`` ``leader``) are not data and are left out.

``text_over_data`` measures a figure after layout; ``render.place`` uses the same marks to choose
a free position for each direct label. Both need a laid-out figure (text extents need a renderer).
"""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass

import numpy as np
from matplotlib.artist import Artist
from matplotlib.backend_bases import RendererBase
from matplotlib.collections import Collection, PathCollection
from matplotlib.figure import Figure
from matplotlib.lines import Line2D
from matplotlib.patches import Patch
from matplotlib.path import Path
from matplotlib.text import Text
from matplotlib.transforms import Bbox

#: Artists with these ids are drawn on the axes but show no data.
NOT_DATA = frozenset({"no_data", "leader", "grid"})
#: A text's box is shrunk by this many pixels on each side before it is tested: a mark that only
#: touches the edge of the line box (the room above and below the letters) is not under the text.
TEXT_INSET_PX = 1.5
_NO_STYLE = (None, "", " ", "None", "none")


@dataclass(frozen=True)
class Mark:
    """One data mark's geometry in display pixels, and where its axes clips it."""

    artist: Artist
    clip: Bbox | None
    paths: tuple[Path, ...] = ()
    """Outlines tested as strokes (lines) or, when ``filled``, as areas (bars, wedges)."""
    filled: bool = False
    boxes: tuple[Bbox, ...] = ()
    """Markers and dots, each as the square it covers."""

    def hits(self, box: Bbox) -> bool:
        if self.clip is not None:
            inside = Bbox.intersection(box, self.clip)
            if inside is None or inside.width <= 0 or inside.height <= 0:
                return False
            box = inside
        if any(overlap(box, b) for b in self.boxes):
            return True
        return any(bool(p.intersects_bbox(box, filled=self.filled)) for p in self.paths)


def overlap(a: Bbox, b: Bbox) -> bool:
    return bool(a.x0 < b.x1 and b.x0 < a.x1 and a.y0 < b.y1 and b.y0 < a.y1)


def _squares(points: np.ndarray, half: float) -> tuple[Bbox, ...]:
    return tuple(
        Bbox([[x - half, y - half], [x + half, y + half]])
        for x, y in points
        if np.isfinite(x) and np.isfinite(y)
    )


def _clip(artist: Artist) -> Bbox | None:
    if not artist.get_clip_on():
        return None
    box = artist.get_clip_box()
    return None if box is None else Bbox(box.get_points())


def _line(line: Line2D, px_per_pt: float) -> Mark | None:
    paths: tuple[Path, ...] = ()
    boxes: tuple[Bbox, ...] = ()
    if line.get_linestyle() not in _NO_STYLE and line.get_linewidth() > 0:
        paths = (line.get_transform().transform_path(line.get_path()),)
    if line.get_marker() not in _NO_STYLE:
        points = line.get_transform().transform(np.asarray(line.get_xydata(), dtype=float))
        half = (line.get_markersize() + line.get_markeredgewidth()) * px_per_pt / 2
        boxes = _squares(points, half)
    if not paths and not boxes:
        return None
    return Mark(line, _clip(line), paths=paths, boxes=boxes)


def _patch(patch: Patch) -> Mark | None:
    path = patch.get_transform().transform_path(patch.get_path())
    extent = path.get_extents()
    if extent.width <= 0 and extent.height <= 0:
        return None
    return Mark(patch, _clip(patch), paths=(path,), filled=True)


def _collection(collection: Collection, px_per_pt: float) -> Mark | None:
    if isinstance(collection, PathCollection):  # scatter: one marker per offset
        points = collection.get_offset_transform().transform(collection.get_offsets())
        sizes = collection.get_sizes()
        half = (float(np.sqrt(sizes.max())) if len(sizes) else 0.0) * px_per_pt / 2
        return Mark(collection, _clip(collection), boxes=_squares(points, half))
    transform = collection.get_transform()
    paths = tuple(transform.transform_path(p) for p in collection.get_paths())
    filled = len(collection.get_facecolor()) > 0
    return Mark(collection, _clip(collection), paths=paths, filled=filled) if paths else None


def data_marks(figure: Figure) -> list[Mark]:
    """Every visible data mark on the figure's axes, in display pixels (after layout)."""
    px_per_pt = figure.dpi / 72.0
    marks: list[Mark] = []
    for ax in figure.axes:
        children: list[Artist] = [*ax.lines, *ax.patches, *ax.collections]
        for artist in children:
            if not artist.get_visible() or artist.get_gid() in NOT_DATA:
                continue
            mark: Mark | None = None
            if isinstance(artist, Line2D):
                mark = _line(artist, px_per_pt)
            elif isinstance(artist, Patch):
                mark = _patch(artist)
            elif isinstance(artist, Collection):
                mark = _collection(artist, px_per_pt)
            if mark is not None:
                marks.append(mark)
    return marks


def drawn_texts(figure: Figure) -> Iterator[Text]:
    """Every text the figure shows, tick labels included."""
    for text in figure.findobj(Text):
        if isinstance(text, Text) and text.get_visible() and text.get_text().strip():
            yield text


def text_box(text: Text, renderer: RendererBase) -> Bbox | None:
    """The text's box in display pixels, shrunk by ``TEXT_INSET_PX``; None when it is not drawn
    (an annotation whose point lies outside its axes reports matplotlib's unit box)."""
    box = text.get_window_extent(renderer)
    if box.width <= 0 or (tuple(box.bounds) == (0.0, 0.0, 1.0, 1.0)):
        return None
    inset = min(TEXT_INSET_PX, box.width / 2, box.height / 2)
    return Bbox([[box.x0 + inset, box.y0 + inset], [box.x1 - inset, box.y1 - inset]])


def text_over_data(figure: Figure, renderer: RendererBase) -> list[str]:
    """The texts drawn over a data mark (one entry per text, however many marks it covers)."""
    marks = data_marks(figure)
    over: list[str] = []
    for text in drawn_texts(figure):
        box = text_box(text, renderer)
        if box is not None and any(m.hits(box) for m in marks):
            over.append(text.get_text())
    return over


__all__ = ["NOT_DATA", "Mark", "data_marks", "drawn_texts", "text_box", "text_over_data"]
