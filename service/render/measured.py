"""Plain records of what the renderer measured while drawing a chart.

The drawing stage hands these back with the chart's bytes; the pipeline gives them to the check
engine, whose ``label-layout`` check turns them into a result. They hold numbers and text only (no
matplotlib, no check types), so the chart cache and the draw queue store them as JSON, and the
checks read them through a protocol of their own instead of importing this stage.
"""

from __future__ import annotations

from dataclasses import dataclass, field


@dataclass
class LayoutReport:
    """Text on a drawn chart after layout, before and after mending: overlapping tick-label pairs,
    texts cut off at the edge, texts drawn over a data mark (``over_data`` names them), and what
    was done to mend them."""

    overlaps_before: int = 0
    clipped_before: int = 0
    overlaps: int = 0
    clipped: int = 0
    actions: list[str] = field(default_factory=list)
    collisions_before: int = 0
    """Texts over data where the drawer first put its labels, before placement."""
    collisions: int = 0
    over_data: list[str] = field(default_factory=list)
    key_kinds: list[str] = field(default_factory=list)
    """The kinds of mark the chart draws, as its key lists them (``render.key.KINDS``)."""

    @property
    def clean(self) -> bool:
        return self.overlaps == 0 and self.clipped == 0 and self.collisions == 0


__all__ = ["LayoutReport"]
