"""The pack document (reportlab): cover, sections, tables, and the "Integrity checks" appendix.

Every user string is escaped before it reaches a Paragraph (reportlab paragraph text is markup), and
charts are reserved as fixed-size slots whose page and position are recorded while the document is
laid out, so :mod:`service.assemble.place` can put the vector chart pages there afterwards.
"""

from __future__ import annotations

import io
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from typing import Any
from xml.sax.saxutils import escape

from reportlab import rl_config
from reportlab.lib.units import inch
from reportlab.pdfbase.pdfmetrics import stringWidth
from reportlab.pdfgen import canvas
from reportlab.platypus import (
    BaseDocTemplate,
    CondPageBreak,
    Flowable,
    Frame,
    KeepTogether,
    LongTable,
    PageBreak,
    PageTemplate,
    Paragraph,
    Spacer,
    TableStyle,
)

from service import __version__
from service.assemble import fonts, layout
from service.wording import say

rl_config.invariant = 1  # fixed dates and ids: the same input gives the same bytes
rl_config.trustedSchemes = []  # no markup may fetch a URL (user text is escaped anyway)
rl_config.trustedHosts = []

CAUTION = (
    "These checks support, but do not replace, the report owner's judgement, the reporting "
    "standards that apply to this pack, and professional review. A check that passed shows "
    "that one rule was met, not that the figures are right."
)


@dataclass(frozen=True)
class ChartBlock:
    chart_id: str
    title: str
    subtitle: str | None
    note: str | None
    width_pt: float
    height_pt: float
    check_line: str
    source: str | None = None
    description: str | None = None


@dataclass(frozen=True)
class TableBlock:
    title: str
    header: list[str]
    rows: list[list[str]]
    numeric: list[bool]


@dataclass(frozen=True)
class SectionBlock:
    heading: str
    narrative: str | None
    blocks: list[ChartBlock | TableBlock]


@dataclass(frozen=True)
class AppendixRow:
    chart: str
    check: str
    status: str
    measured: str
    threshold: str
    explanation: str


@dataclass(frozen=True)
class PackContent:
    title: str
    period: str
    as_of: str
    owner: str
    audience: str | None
    status_line: str
    summary_line: str
    sections: list[SectionBlock]
    appendix: list[AppendixRow]
    sources: list[tuple[str, str]]
    fingerprint: str
    report_id: str
    locale: str = "en-GB"


@dataclass(frozen=True)
class Slot:
    chart_id: str
    page: int  # 0-based
    x: float
    y: float
    width: float
    height: float


class ChartSlot(Flowable):  # type: ignore[misc]
    """Reserves room for a chart and records where it landed."""

    def __init__(self, chart_id: str, width: float, height: float, found: list[Slot]) -> None:
        super().__init__()
        self.chart_id, self.width, self.height, self._found = chart_id, width, height, found

    def wrap(self, avail_width: float, avail_height: float) -> tuple[float, float]:
        return self.width, self.height

    def draw(self) -> None:
        x, y = self.canv.absolutePosition(0, 0)
        page = self.canv.getPageNumber() - 1
        self._found.append(Slot(self.chart_id, page, x, y, self.width, self.height))


def _text(value: str) -> str:
    """Escape user text for a Paragraph; keep paragraph breaks."""
    return escape(value).replace("\n", "<br/>")


FOOTER_SIZE = 7.5
FOOTER_LEADING = 9.5
FOOTER_Y = layout.MARGIN * 0.6
FOOTER_GAP = 12.0
"""The least room between the footer's text and the page number, in points."""


def _fit(text: str, font: str, width: float) -> str:
    """``text``, cut at a word and ended with "…" when it is wider than ``width`` points."""
    if stringWidth(text, font, FOOTER_SIZE) <= width:
        return text
    words = text.split(" ")
    while len(words) > 1:
        words.pop()
        cut = " ".join(words).rstrip(" ·,;") + " …"
        if stringWidth(cut, font, FOOTER_SIZE) <= width:
            return cut
    return "…"


def footer_lines(title: str, status: str, number: str, font: str) -> list[str]:
    """The footer's text, measured against the page number beside it: one line when the title and
    the status fit beside the number, else the title beside the number and the status on a line of
    its own below, using the frame's whole width (the status is never cut while it fits there)."""
    beside = layout.FRAME_WIDTH - stringWidth(number, font, FOOTER_SIZE) - FOOTER_GAP
    both = f"{title} · {status}"
    if stringWidth(both, font, FOOTER_SIZE) <= beside:
        return [both]
    return [_fit(title, font, beside), _fit(status, font, layout.FRAME_WIDTH)]


def _numbered(content: PackContent) -> type[canvas.Canvas]:
    regular = fonts.register()

    class NumberedCanvas(canvas.Canvas):  # type: ignore[misc]
        def __init__(self, *args: Any, **kwargs: Any) -> None:
            kwargs.setdefault("initialFontName", regular)
            super().__init__(*args, **kwargs)
            self._pages: list[dict[str, Any]] = []

        def showPage(self) -> None:  # noqa: N802 - reportlab's name
            self._pages.append(dict(self.__dict__))
            self._startPage()

        def save(self) -> None:
            total = len(self._pages)
            for state in self._pages:
                self.__dict__.update(state)
                self._footer(total)
                canvas.Canvas.showPage(self)
            canvas.Canvas.save(self)

        def _footer(self, total: int) -> None:
            self.saveState()
            self.setFont(regular, FOOTER_SIZE)
            self.setFillColor(layout.MUTED)
            number = say("page.number", content.locale, page=self._pageNumber, pages=total)
            right = layout.PAGE[0] - layout.MARGIN
            self.drawRightString(right, FOOTER_Y, number)
            lines = footer_lines(content.title, content.status_line, number, regular)
            for i, line in enumerate(lines):
                self.drawString(layout.MARGIN, FOOTER_Y - i * FOOTER_LEADING, line)
            self.restoreState()

    return NumberedCanvas


def build(content: PackContent) -> tuple[bytes, list[Slot]]:
    """Lay the pack out; return its PDF bytes and where each chart slot landed."""
    s = layout.styles()
    found: list[Slot] = []
    story: list[Flowable] = [*_cover(content, s), PageBreak()]
    for section in content.sections:
        story.extend(_section(section, s, found))
    story.extend([PageBreak(), *_appendix(content, s)])
    buffer = io.BytesIO()
    doc = BaseDocTemplate(
        buffer,
        pagesize=layout.PAGE,
        leftMargin=layout.MARGIN,
        rightMargin=layout.MARGIN,
        topMargin=layout.MARGIN,
        bottomMargin=layout.MARGIN,
        title=content.title,
        author=content.owner,
        subject=f"{content.period} · {content.status_line}",
        creator=f"Plumbline {__version__}",
        producer=f"Plumbline {__version__}",
        initialFontName=fonts.register(),
    )
    frame = Frame(
        layout.MARGIN,
        layout.MARGIN,
        layout.FRAME_WIDTH,
        layout.PAGE[1] - 2 * layout.MARGIN,
        id="body",
        leftPadding=0,
        rightPadding=0,
        topPadding=0,
        bottomPadding=0,
    )
    doc.addPageTemplates([PageTemplate(id="page", frames=[frame])])
    doc.build(story, canvasmaker=_numbered(content))
    return buffer.getvalue(), found


def _cover(content: PackContent, s: dict[str, Any]) -> Iterable[Flowable]:
    yield Spacer(1, 1.2 * inch)
    yield Paragraph(_text(content.title), s["title"])
    meta = [
        f"Reporting period: {_text(content.period)}",
        f"Data as of: {_text(content.as_of)}",
        f"Owner: {_text(content.owner)}",
    ]
    if content.audience:
        meta.append(f"Audience: {_text(content.audience)}")
    meta.append(f"Report id: {_text(content.report_id)}")
    yield Paragraph("<br/>".join(meta), s["cover_meta"])
    yield Paragraph(_text(content.status_line), s["status"])
    yield Paragraph(
        f"Integrity: {_text(content.summary_line)}. The appendix lists every check of every chart.",
        s["body"],
    )
    yield Paragraph(_text(CAUTION), s["caution"])


def _section(section: SectionBlock, s: dict[str, Any], found: list[Slot]) -> Iterable[Flowable]:
    yield CondPageBreak(2.5 * inch)
    yield Paragraph(_text(section.heading), s["h1"])
    for paragraph in (section.narrative or "").split("\n\n"):
        if paragraph.strip():
            yield Paragraph(_text(paragraph.strip()), s["body"])
    for block in section.blocks:
        if isinstance(block, ChartBlock):
            parts: list[Flowable] = [Paragraph(_text(block.title), s["h2"])]
            if block.subtitle:
                parts.append(Paragraph(_text(block.subtitle), s["subtitle"]))
            parts.append(ChartSlot(block.chart_id, block.width_pt, block.height_pt, found))
            if block.source:
                parts.append(Paragraph(f"Source: {_text(block.source)}", s["muted"]))
            if block.note:
                parts.append(Paragraph(_text(block.note), s["muted"]))
            if block.description:
                parts.append(
                    Paragraph(f"<i>Text alternative:</i> {_text(block.description)}", s["small"])
                )
            parts.append(Paragraph(_text(block.check_line), s["muted"]))
            yield KeepTogether(parts)
        else:
            yield from _table(block, s)
    yield Spacer(1, 10)


def _grid(
    rows: Sequence[Sequence[str]],
    widths: list[float],
    s: dict[str, Any],
    numeric: Sequence[bool] | None = None,
    colours: dict[int, Any] | None = None,
) -> LongTable:
    cells = [
        [Paragraph(_text(v), s["cell_head"] if r == 0 else s["cell"]) for v in row]
        for r, row in enumerate(rows)
    ]
    table = LongTable(cells, colWidths=widths, repeatRows=1, hAlign="LEFT")
    commands: list[tuple[Any, ...]] = [
        ("FONT", (0, 0), (-1, -1), fonts.register(), 7.5),  # else reportlab sets Helvetica
        ("INNERGRID", (0, 0), (-1, -1), 0.3, layout.RULE),
        ("BOX", (0, 0), (-1, -1), 0.3, layout.RULE),
        ("LINEBELOW", (0, 0), (-1, 0), 0.8, layout.INK),
        ("VALIGN", (0, 0), (-1, -1), "TOP"),
        ("TOPPADDING", (0, 0), (-1, -1), 2.5),
        ("BOTTOMPADDING", (0, 0), (-1, -1), 2.5),
        ("LEFTPADDING", (0, 0), (-1, -1), 3),
        ("RIGHTPADDING", (0, 0), (-1, -1), 3),
    ]
    for r, colour in (colours or {}).items():
        commands.append(("TEXTCOLOR", (2, r), (2, r), colour))
    table.setStyle(TableStyle(commands))
    if numeric:
        for r in range(1, len(rows)):
            for c, is_number in enumerate(numeric):
                if is_number:
                    cells[r][c].style = _right(s["cell"])
    if _taller_than_page(table):  # a long source line quoted in a check, say: split the row
        table.splitInRow = 1
    return table


def _taller_than_page(table: LongTable) -> bool:
    """A row that cannot fit on one page (reportlab would give up); rows that fit are kept whole."""
    height = layout.PAGE[1] - 2 * layout.MARGIN
    table.wrap(layout.FRAME_WIDTH, height)
    tallest = float(max(table._rowHeights, default=0))
    return bool(tallest > height - 40)


def _right(style: Any) -> Any:
    from reportlab.lib.enums import TA_RIGHT
    from reportlab.lib.styles import ParagraphStyle

    return ParagraphStyle(f"{style.name}_right", parent=style, alignment=TA_RIGHT)


def _table(block: TableBlock, s: dict[str, Any]) -> Iterable[Flowable]:
    yield Paragraph(_text(block.title), s["h2"])
    yield _grid([block.header, *block.rows], _widths(block), s, block.numeric)
    yield Spacer(1, 8)


def _widths(block: TableBlock) -> list[float]:
    """Columns as wide as their longest cell (about 4.4 pt a character at 7.5 pt), shrunk to the
    frame only when they would not fit."""
    natural = [
        max(len(row[c]) for row in [block.header, *block.rows]) * 4.4 + 12
        for c in range(len(block.header))
    ]
    total = sum(natural)
    scale = min(1.0, layout.FRAME_WIDTH / total) if total else 1.0
    return [w * scale for w in natural]


def _appendix(content: PackContent, s: dict[str, Any]) -> Iterable[Flowable]:
    yield Paragraph("Integrity checks", s["h1"])
    yield Paragraph(
        f"{_text(content.summary_line)}. Every check of every chart is listed below with what it "
        "measured and the threshold it applies. <b>corrected</b>: the definition asked for "
        "something that breaks the rule, and the honest form was drawn instead. <b>waived</b>: "
        "the breach was accepted, with the reason and by whom. <b>failed</b>: the rule is broken "
        "and the pack cannot be signed off until it is fixed or waived.",
        s["body"],
    )
    yield Paragraph(_text(CAUTION), s["caution"])
    header = ["Chart", "Check", "Status", "Measured", "Threshold", "Explanation"]
    rows = [
        [r.chart, r.check, r.status, r.measured, r.threshold, r.explanation]
        for r in content.appendix
    ]
    colours = {
        i + 1: layout.STATUS_COLOURS.get(r.status, layout.INK)
        for i, r in enumerate(content.appendix)
    }
    w = layout.FRAME_WIDTH
    widths = [w * 0.16, w * 0.17, w * 0.09, w * 0.11, w * 0.14, w * 0.33]
    yield _grid([header, *rows], widths, s, colours=colours)
    yield Spacer(1, 12)
    yield Paragraph("Sources of the rules", s["h2"])
    for check, source in content.sources:
        yield Paragraph(f"<b>{_text(check)}</b>: {_text(source)}", s["small"])
    yield Spacer(1, 10)
    yield Paragraph(
        f"Definition fingerprint (SHA-256 of the definition as received): "
        f"{_text(content.fingerprint)}",
        s["small"],
    )
