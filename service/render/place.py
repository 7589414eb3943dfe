"""Direct labels placed where they cover no data: one helper for every drawer.

A drawer adds a direct label (a line's end label, a reference line's label, a control limit's
label, a point's name, an index base) with :func:`label`, giving the spots it may take in order
of preference (:class:`Spot`: an offset in points from an anchor, and which side of it the text
hangs). The label is drawn at the first spot. After the figure is laid out, :func:`place` tests
each label where it is against every data mark (``render.marks``), the chart's other texts and
the labels placed before it, and moves it to the first free spot. A label with no free spot goes
into the chart's key when it has a key handle (the line or mark it names), and otherwise keeps
the spot where it covers least.

Labels are remembered per figure (weakly: a figure that is dropped takes its labels with it).
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from typing import Any, Literal
from weakref import WeakKeyDictionary

from matplotlib.artist import Artist
from matplotlib.axes import Axes
from matplotlib.backend_bases import RendererBase
from matplotlib.figure import Figure
from matplotlib.text import Annotation
from matplotlib.transforms import Bbox

from service.render import marks

#: How far (pixels) a label that must stay inside its axes may reach past the axes' edge.
EDGE_PX = 1.0
#: A placed label keeps this far (pixels) from data and other texts: the measure counts a text
#: as over data only when a mark enters its letters' box (``marks.TEXT_INSET_PX``), but a label
#: set down on a line still reads as struck through.
CLEARANCE_PX = 1.5


HAlign = Literal["left", "center", "right"]
VAlign = Literal["bottom", "center", "top"]


@dataclass(frozen=True)
class Spot:
    """Where a label may sit: ``offset`` points from its anchor ``xy`` (the label's own anchor
    when None), with the text's horizontal and vertical alignment to that point."""

    dx: float
    dy: float
    ha: HAlign = "left"
    va: VAlign = "center"
    xy: tuple[float, float] | None = None


@dataclass
class Label:
    text: Annotation
    spots: Sequence[Spot]
    inside: bool
    key: Artist | None


@dataclass(frozen=True)
class Keyed:
    """A label that found no free spot and is shown in the key instead: its words and the mark
    it names (the key draws that mark's style beside the words)."""

    text: str
    handle: Artist


_LABELS: WeakKeyDictionary[Figure, list[Label]] = WeakKeyDictionary()


def around(gap: float = 4.0, reach: int = 3) -> list[Spot]:
    """Spots around a point: right, above, below, left, then the diagonals, then further out."""
    spots: list[Spot] = []
    for k in range(1, reach + 1):
        d = gap * k
        spots += [
            Spot(d, 0, "left", "center"),
            Spot(0, d, "center", "bottom"),
            Spot(0, -d, "center", "top"),
            Spot(-d, 0, "right", "center"),
            Spot(d, d, "left", "bottom"),
            Spot(d, -d, "left", "top"),
            Spot(-d, d, "right", "bottom"),
            Spot(-d, -d, "right", "top"),
        ]
    return spots


def beside(gap: float = 6.0, step: float = 4.5, reach: int = 6) -> list[Spot]:
    """Spots for a line's end label: to the right of the end, level with it, then nudged up and
    down in turn; then above and below the end, and above and below to its left."""
    spots = [Spot(gap, 0, "left", "center")]
    for k in range(1, reach + 1):
        spots += [Spot(gap, step * k, "left", "center"), Spot(gap, -step * k, "left", "center")]
    return [
        *spots,
        Spot(0, gap, "center", "bottom"),
        Spot(0, -gap, "center", "top"),
        Spot(-gap, gap, "right", "bottom"),
        Spot(-gap, -gap, "right", "top"),
    ]


def over(gap: float = 4.0) -> list[Spot]:
    """Spots for a value over its point: above, below, then around it."""
    return [Spot(0, gap, "center", "bottom"), Spot(0, -gap, "center", "top"), *around(gap)]


def along(value: float, start: HAlign = "right", gap: float = 2.0) -> list[Spot]:
    """Spots along a horizontal reference line at ``value`` (the anchor's y in data, its x as a
    fraction of the axes): at the ``start`` end, the other end, then in between; above the line,
    then below it."""
    ends: list[tuple[float, HAlign]] = [(1.0, "right"), (0.0, "left")]
    if start == "left":
        ends.reverse()
    spots: list[Spot] = []
    between: list[tuple[float, HAlign]] = [(k / 8, "center") for k in (4, 2, 6, 1, 3, 5, 7)]
    for fx, ha in [*ends, *between]:
        pad = 3.0 if ha == "left" else -3.0 if ha == "right" else 0.0
        spots += [
            Spot(pad, gap, ha, "bottom", (fx, value)),
            Spot(pad, -gap, ha, "top", (fx, value)),
        ]
    return spots


def atop(dx: float, dy: float, va: VAlign) -> list[Spot]:
    """Spots at the end of a vertical reference line: to its right, then to its left."""
    return [Spot(dx, dy, "left", va), Spot(-dx, dy, "right", va)]


def up_and_down(step: float = 8.0, reach: int = 12) -> list[Spot]:
    """Spots for an upright label centred on its anchor, then moved up and down in turn."""
    spots = [Spot(0, 0, "center", "center")]
    for k in range(1, reach + 1):
        spots += [Spot(0, step * k, "center", "center"), Spot(0, -step * k, "center", "center")]
    return spots


def label(
    ax: Axes,
    text: str,
    xy: tuple[float, float],
    spots: Sequence[Spot],
    *,
    xycoords: Any = "data",
    inside: bool = True,
    key: Artist | None = None,
    **style: Any,
) -> Annotation:
    """A direct label drawn at the first of ``spots``, placed by :func:`place` after layout.

    ``inside``: the label must stay inside its axes. ``key``: the mark the label names, shown
    in the key with the label's words if no spot is free."""
    first = spots[0]
    annotation = ax.annotate(
        text,
        xy=first.xy or xy,
        xycoords=xycoords,
        xytext=(first.dx, first.dy),
        textcoords="offset points",
        ha=first.ha,
        va=first.va,
        parse_math=False,
        annotation_clip=False,
        **style,
    )
    figure = ax.get_figure(root=True)
    assert isinstance(figure, Figure)
    _LABELS.setdefault(figure, []).append(
        Label(
            annotation,
            [s if s.xy else Spot(s.dx, s.dy, s.ha, s.va, xy) for s in spots],
            inside,
            key,
        )
    )
    return annotation


def labels_of(figure: Figure) -> list[Label]:
    return list(_LABELS.get(figure, []))


def _put(label: Label, spot: Spot) -> None:
    text = label.text
    if spot.xy is not None:
        text.xy = spot.xy
    text.set_position((spot.dx, spot.dy))
    text.set_horizontalalignment(spot.ha)
    text.set_verticalalignment(spot.va)


def _cost(
    label: Label, renderer: RendererBase, data: list[marks.Mark], others: list[Bbox], figure: Figure
) -> int:
    """How much the label covers where it is now: 0 is free."""
    whole = label.text.get_window_extent(renderer)
    room = label.text.axes.bbox if label.inside and label.text.axes else figure.bbox
    if not room.padded(EDGE_PX).contains(whole.x0, whole.y0) or not room.padded(EDGE_PX).contains(
        whole.x1, whole.y1
    ):
        return 1000  # outside its room: worse than covering anything
    box = whole.padded(CLEARANCE_PX)
    hits = sum(1 for m in data if m.hits(box))
    crowd = sum(1 for o in others if marks.overlap(box, o))
    return hits * 10 + crowd


def place(figure: Figure, renderer: RendererBase) -> list[Keyed]:
    """Move each direct label of the figure to its first free spot (after layout); the labels
    that found none and went into the key."""
    labels = labels_of(figure)
    if not labels:
        return []
    data = marks.data_marks(figure)
    pending = {id(lb.text) for lb in labels}
    keyed: list[Keyed] = []
    for lb in labels:
        pending.discard(id(lb.text))
        if not lb.text.get_visible():
            continue  # in the key already
        others = _boxes(
            (t for t in marks.drawn_texts(figure) if id(t) not in pending and t is not lb.text),
            renderer,
        )
        best: tuple[int, Spot] | None = None
        for spot in lb.spots:
            _put(lb, spot)
            cost = _cost(lb, renderer, data, others, figure)
            if best is None or cost < best[0]:
                best = (cost, spot)
            if cost == 0:
                break
        assert best is not None
        _put(lb, best[1])
        if best[0] > 0 and lb.key is not None:
            lb.text.set_visible(False)
            keyed.append(Keyed(lb.text.get_text(), lb.key))
    return keyed


def _boxes(texts: Iterable[Any], renderer: RendererBase) -> list[Bbox]:
    return [b for t in texts if (b := marks.text_box(t, renderer)) is not None]


__all__ = [
    "Keyed",
    "Label",
    "Spot",
    "along",
    "around",
    "atop",
    "beside",
    "label",
    "labels_of",
    "over",
    "place",
    "up_and_down",
]
