"""Lay out a checked report's pack around charts that are already drawn.

:func:`content_for` turns the report (definition, tables, every check result) into the pack's
content; :func:`sizes` reads each drawn chart page's size; :func:`lay_out` lays the document out
with reportlab and places each chart page into its slot with pikepdf. This stage draws nothing,
creates no check result and keeps no cache: ``pipeline.render`` runs the sequence around it.
"""

from __future__ import annotations

import contextlib
import io
from collections.abc import Mapping

import pikepdf

from service import formatting
from service.assemble import appendix, figures, pack, place, tables
from service.assemble.appendix import counts_text
from service.assemble.pack import ChartBlock, PackContent, SectionBlock
from service.assemble.tables import TableBlock
from service.checks.outcome import Checked, CheckedChart
from service.checks.results import Status
from service.wording import say

Placement = Mapping[str, tuple[int, int]]
"""Where each chart was drawn, by chart id: (index of its file among the drawn PDFs, page)."""


def sizes(files: list[bytes], placement: Placement) -> dict[str, tuple[float, float]]:
    """Each drawn chart's page size in points (width, height), by chart id."""
    out: dict[str, tuple[float, float]] = {}
    with contextlib.ExitStack() as stack:
        opened = [stack.enter_context(pikepdf.open(io.BytesIO(f))) for f in files]
        for chart_id, (file, page) in placement.items():
            out[chart_id] = _size(opened[file].pages[page])
    return out


def lay_out(content: PackContent, files: list[bytes], placement: Placement) -> bytes:
    """The pack's PDF: the document laid out, each drawn chart page placed into its slot."""
    document, slots = pack.build(content)
    return place.place(document, slots, files, placement)


def _size(page: pikepdf.Page) -> tuple[float, float]:
    box = [float(v) for v in page.mediabox]
    return box[2] - box[0], box[3] - box[1]


def content_for(
    checked: Checked, sizes: Mapping[str, tuple[float, float]], *, status_line: str
) -> PackContent:
    definition = checked.definition
    report = definition.report
    locale = report.locale
    by_id = {c.plan.chart_id: c for c in checked.charts}
    shown = {t.plan.table_id: t.plan for t in checked.shown_tables}
    sections: list[SectionBlock] = []
    for section in definition.sections:
        blocks: list[ChartBlock | TableBlock] = []
        for chart in section.charts:
            blocks.append(_chart_block(by_id[chart.id], sizes[chart.id], locale))
        for table in section.tables:
            blocks.append(tables.block(shown[table.id], locale))
        sections.append(SectionBlock(section.heading, section.narrative, blocks))
    results = checked.results
    return PackContent(
        title=report.title,
        period=_period(checked, locale),
        as_of=formatting.moment(report.as_of, locale),
        owner=report.owner,
        audience=report.audience,
        status_line=status_line,
        summary_line=counts_text(results, locale),
        sections=sections,
        appendix=appendix.content(checked, locale),
        fingerprint=checked.fingerprint,
        report_id=report.id,
        locale=locale,
        figures=figures.headline(checked, locale),
    )


def _period(checked: Checked, locale: str) -> str:
    period = checked.definition.report.period
    if period.label:
        return period.label
    start, end = formatting.day(period.start, locale), formatting.day(period.end, locale)
    return say("cover.period_range", locale, start=start, end=end)


def _chart_block(chart: CheckedChart, size: tuple[float, float], locale: str) -> ChartBlock:
    line = counts_text(chart.results, locale)
    failed = [r.check for r in chart.results if r.status is Status.failed]
    if failed:
        line = f"{say('page.failed', locale, checks=', '.join(failed))} · {line}"
    return ChartBlock(
        chart_id=chart.plan.chart_id,
        title=chart.plan.title,
        subtitle=chart.plan.subtitle,
        note=chart.plan.note,
        width_pt=size[0],
        height_pt=size[1],
        check_line=line,
        source=chart.plan.source,
        description=chart.plan.description,
    )
