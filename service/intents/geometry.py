"""The physical size of a drawn chart, known before it is drawn.

Checks that judge what a reader can see (precision, banking, how many points a line can show) need
the chart's size; the renderer draws at exactly this size. Nothing here draws.
"""

from __future__ import annotations

import textwrap

from service.intents.forms import BAR_ROW_IN, FORMS, LINE_HEIGHT_IN
from service.intents.plan import ChartPlan

__all__ = ["BAR_ROW_IN", "LINE_HEIGHT_IN", "NOTE_WIDTH", "WIDTH_IN", "size_in"]

WIDTH_IN = 6.69  # 170 mm: the text width of the A4 page

#: Characters of a note line at the chart's width (7.5 pt italic DejaVu Sans on 170 mm).
NOTE_WIDTH = 115


def size_in(plan: ChartPlan) -> tuple[float, float]:
    """Width and height: the text width, and the form's height (``forms.FORMS``) plus the notes."""
    lines = sum(len(textwrap.wrap(n, NOTE_WIDTH)) for n in plan.notes) + len(plan.flags)
    lines += len(textwrap.wrap(plan.guide, NOTE_WIDTH)) if plan.guide else 0
    extra = 0.18 * lines
    return WIDTH_IN, FORMS[plan.form].height(plan, extra)
