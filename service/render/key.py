"""A chart's key: exactly the kinds of mark it draws, in the report's words.

A drawer says what kind of mark an artist is through its ``gid`` (one of ``KINDS``); the key is
built from the drawn figure, so it lists a kind when, and only when, a mark of that kind is on the
chart, in the style it was drawn in. Labels that found no free spot on the chart (``render.place``)
join the key with the mark they name. Marks every reader knows (a line, a bar) need no key; a mark
that differs from them (a hollow point, a dashed line, a tick, a red point, a grey band) does.

The key sits above the plot, outside it, so it never covers data.
"""

from __future__ import annotations

from collections.abc import Sequence

from matplotlib.artist import Artist
from matplotlib.figure import Figure
from matplotlib.legend import Legend
from matplotlib.legend_handler import HandlerLine2D
from matplotlib.lines import Line2D

from service.render import style
from service.render.place import Keyed
from service.wording import say

#: The kinds of mark a key explains, in the order it lists them (each is an artist's ``gid``).
KINDS = ("partial_actual", "estimate", "projection", "target", "signal", "no_data", "interval")
#: Entries on one row of the key.
PER_ROW = 3


def drawn_kinds(figure: Figure) -> dict[str, Artist]:
    """The first visible artist of each kind on the figure's axes, in ``KINDS`` order."""
    found: dict[str, Artist] = {}
    for ax in figure.axes:
        for artist in [*ax.lines, *ax.patches, *ax.collections]:
            kind = artist.get_gid()
            if kind in KINDS and kind not in found and artist.get_visible():
                found[kind] = artist
    return {k: found[k] for k in KINDS if k in found}


def _handle(kind: str, artist: Artist) -> Artist:
    if kind == "target":  # drawn as a short upright tick: shown as one
        return Line2D(
            [], [], marker="|", markersize=9, markeredgewidth=1.6, color=style.INK, linestyle="none"
        )
    if kind == "interval":  # a thin line between two end ticks (see ``_HANDLERS``)
        return _INTERVAL
    return artist


_INTERVAL = Line2D(
    [], [], marker="|", markersize=6, markeredgewidth=0.9, linewidth=0.9, color=style.INK
)
#: The interval's key mark has its ticks at both ends; every other mark shows one marker.
_HANDLERS = {_INTERVAL: HandlerLine2D(numpoints=2)}


def draw(figure: Figure, locale: str, keyed: Sequence[Keyed] = ()) -> Legend | None:
    """Add the key above the plot (replacing one drawn before); None when nothing needs one."""
    for old in list(figure.legends):
        old.remove()
    kinds = drawn_kinds(figure)
    handles = [_handle(k, a) for k, a in kinds.items()] + [k.handle for k in keyed]
    words = [say(f"key.{k}", locale) for k in kinds] + [k.text for k in keyed]
    if not handles:
        return None
    return figure.legend(
        handles,
        words,
        loc="outside upper left",
        ncols=min(PER_ROW, len(handles)),
        frameon=False,
        fontsize=7,
        handlelength=2.2,
        columnspacing=1.6,
        borderaxespad=0.2,
        handler_map=_HANDLERS,
    )


def entries(figure: Figure) -> list[str]:
    """The words of the figure's key, in order (empty when it has none)."""
    return [t.get_text() for legend in figure.legends for t in legend.get_texts()]


__all__ = ["KINDS", "draw", "drawn_kinds", "entries"]
