"""The physical size of a drawn chart, known before it is drawn.

Checks that judge what a reader can see (precision, banking, how many points a line can show) need
the chart's size; the renderer draws at exactly this size. Nothing here draws.
"""

from __future__ import annotations

import textwrap

from service.intents.plan import ChartPlan

WIDTH_IN = 6.69  # 170 mm: the text width of the A4 page
LINE_HEIGHT_IN = 2.9
BAR_ROW_IN = 0.27

#: Characters of a note line at the chart's width (7.5 pt italic DejaVu Sans on 170 mm).
NOTE_WIDTH = 115


#: Height of one of several aligned panels.
PANEL_HEIGHT_IN = 1.6


def size_in(plan: ChartPlan) -> tuple[float, float]:
    lines = sum(len(textwrap.wrap(n, NOTE_WIDTH)) for n in plan.notes) + len(plan.flags)
    lines += len(textwrap.wrap(plan.guide, NOTE_WIDTH)) if plan.guide else 0
    extra = 0.18 * lines
    if plan.form in {"bars", "dots", "deviation"}:
        rows = max(len(plan.categories), 2)
        return WIDTH_IN, min(8.5, 0.75 + BAR_ROW_IN * rows + extra)
    if plan.form == "box":
        rows = max(len(plan.boxes), 2)
        return WIDTH_IN, min(8.5, 1.0 + 2 * BAR_ROW_IN * rows + extra)
    if plan.form == "panels":
        return WIDTH_IN, min(9.0, 0.6 + PANEL_HEIGHT_IN * len(plan.panels) + extra)
    if plan.form == "pie":
        return WIDTH_IN, 3.4 + extra
    return WIDTH_IN, LINE_HEIGHT_IN + extra
