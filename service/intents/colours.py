"""One colour per measure across the whole pack.

The pack decides each measure's colour once, before any chart is planned: measures (matched by
column name) take the palette's colours in the order they first appear in the definition's charts.
Each plan then carries those choices as palette *slots* (indexes into the plan's palette, else the
house palette), so a chart drawn with the house palette instead of a custom one keeps them. Series
carry their measure's slot; the other forms list theirs in ``ChartPlan.slots`` (the measure's own
first). Within one chart two measures never share a colour: when the pack has more measures than
the palette has colours, a chart whose measures would collide takes the next free slot instead.

The drawers and the colour checks read colours through :func:`mark_colour` and
:func:`series_colour`, so what is measured is what is drawn. Nothing here draws.
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping, Sequence

from service import palette as house
from service.definition.model import AnyChart
from service.intents.plan import ChartPlan, Series

#: Forms whose colours encode categories (the parts of a whole), not measures.
_BY_CATEGORY = frozenset({"pie"})


def measures_of(chart: AnyChart) -> list[str]:
    """The measures a chart draws, in the order it names them."""
    for field in ("measures", "measure", "actual", "y"):
        value = getattr(chart, field, None)
        if isinstance(value, str):
            return [value]
        if isinstance(value, list):
            return [str(v) for v in value]
    return []


def pack_slots(charts: Iterable[AnyChart]) -> dict[str, int]:
    """Each measure's palette slot: the measures in order of first appearance."""
    slots: dict[str, int] = {}
    for chart in charts:
        for measure in measures_of(chart):
            slots.setdefault(measure, len(slots))
    return slots


def palette_of(plan: ChartPlan) -> list[str]:
    """The colours slots index: the plan's palette, else the house palette."""
    return list(plan.palette or house.PALETTE)


def mark_colour(plan: ChartPlan, index: int) -> str:
    """The colour of the ``index``-th colour-coded mark of a form that is not drawn as series."""
    palette = palette_of(plan)
    slot = plan.slots[index] if index < len(plan.slots) else index
    return palette[slot % len(palette)]


def series_colour(plan: ChartPlan, series: Series, index: int) -> str:
    """The colour of a series: its measure's slot, else its position ``index`` on its axes."""
    palette = palette_of(plan)
    slot = series.slot if series.slot is not None else index
    return palette[slot % len(palette)]


def _distinct(wanted: Sequence[int], size: int) -> list[int]:
    """``wanted`` slots, each moved to the next free one where two would show one colour."""
    taken: set[int] = set()
    out = []
    for slot in wanted:
        free = slot
        while free % size in taken and len(taken) < size:
            free += 1
        taken.add(free % size)
        out.append(free)
    return out


def _paint_series(
    series: list[Series], measures: list[str], slots: Mapping[str, int], size: int
) -> list[Series]:
    own = [slots[m] for m in measures[: len(series)]]
    chosen = _distinct(own, size)
    by_name = {s.name: slot for s, slot in zip(series, chosen, strict=False)}
    out = []
    for i, s in enumerate(series):
        slot = chosen[i] if i < len(chosen) else by_name.get(s.name.removesuffix(" (estimate)"))
        out.append(s if slot is None else s.model_copy(update={"slot": slot}))
    return out


def paint(plan: ChartPlan, chart: AnyChart, slots: Mapping[str, int]) -> ChartPlan:
    """The plan with its measures' pack-wide colours."""
    measures = measures_of(chart)
    if plan.form in _BY_CATEGORY or not measures or any(m not in slots for m in measures):
        return plan
    size = len(palette_of(plan))
    if plan.panels:
        panels = [
            panel.model_copy(update={"series": _paint_series(panel.series, [measure], slots, size)})
            for panel, measure in zip(plan.panels, measures, strict=False)
        ]
        return plan.model_copy(update={"panels": panels})
    if plan.series:
        return plan.model_copy(update={"series": _paint_series(plan.series, measures, slots, size)})
    own = slots[measures[0]]
    return plan.model_copy(update={"slots": _distinct([own, own + 1], size)})
