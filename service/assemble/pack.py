"""The pack document (reportlab): cover, sections, tables, and the "Integrity checks" appendix.

Every user string is escaped before it reaches a Paragraph (reportlab paragraph text is markup), and
charts are reserved as fixed-size slots whose page and position are recorded while the document is
laid out, so :mod:`service.assemble.place` can put the vector chart pages there afterwards.
"""

from __future__ import annotations

import io
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field
from typing import Any
from xml.sax.saxutils import escape

from reportlab import rl_config
from reportlab.lib.styles import ParagraphStyle
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
    Table,
    TableStyle,
)

from service import __version__
from service.assemble import fonts, layout, tables
from service.assemble.appendix import Appendix, ChartChecks
from service.assemble.figures import Headline
from service.assemble.tables import TableBlock
from service.assemble.tables import grid as _grid
from service.wording import say

rl_config.invariant = 1  # fixed dates and ids: the same input gives the same bytes
rl_config.trustedSchemes = []  # no markup may fetch a URL (user text is escaped anyway)
rl_config.trustedHosts = []


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
class SectionBlock:
    heading: str
    narrative: str | None
    blocks: list[ChartBlock | TableBlock]


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
    appendix: Appendix
    fingerprint: str
    report_id: str
    locale: str = "en-GB"
    figures: list[Headline] = field(default_factory=list)


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
        self.natural = (width, height)

    def scale(self, factor: float) -> None:
        """Draw the chart at ``factor`` of its drawn size (its proportions kept)."""
        self.width, self.height = self.natural[0] * factor, self.natural[1] * factor

    def wrap(self, avail_width: float, avail_height: float) -> tuple[float, float]:
        return self.width, self.height

    def draw(self) -> None:
        x, y = self.canv.absolutePosition(0, 0)
        page = self.canv.getPageNumber() - 1
        self._found.append(Slot(self.chart_id, page, x, y, self.width, self.height))


FIT_SCALE = 0.85
"""A chart may be drawn down to this share of its size to fit the rest of a page."""
FLOOR_SCALE = 0.7
"""A chart block taller than a whole page draws its chart down to this share of its size."""
FRAME_HEIGHT = layout.PAGE[1] - 2 * layout.MARGIN


class ChartBox(Flowable):  # type: ignore[misc]
    """A chart's block as one piece: the section's heading and narrative when the chart is the
    section's first, the chart's title and subtitle, the chart, then its source, note, text
    alternative and check line.

    The block moves overleaf whole rather than split. To fill pages (two charts to a page where
    they fit) it draws its chart smaller, down to :data:`FIT_SCALE`, when that makes it fit what is
    left of a page. A block taller than a whole page draws its chart as large as the page allows
    (down to :data:`FLOOR_SCALE`); if it is still too tall, the heading and narrative stay on the
    page and the chart with its title starts the next, and the lines after the chart follow it.
    A chart is never split from its title.
    """

    def __init__(
        self, lead: list[Flowable], head: list[Flowable], slot: ChartSlot, tail: list[Flowable]
    ) -> None:
        super().__init__()
        self._lead, self._head, self._slot, self._tail = lead, head, slot, tail
        parts = self._parts()
        self.spaceBefore = parts[0].getSpaceBefore()
        self.spaceAfter = parts[-1].getSpaceAfter()

    def _parts(self) -> list[Flowable]:
        return [*self._lead, *self._head, self._slot, *self._tail]

    def _text_height(self, width: float) -> float:
        parts = self._parts()
        total = 0.0
        for i, part in enumerate(parts):
            if part is not self._slot:
                total += part.wrap(width, FRAME_HEIGHT)[1]
            if i:
                total += part.getSpaceBefore()
            if i < len(parts) - 1:
                total += part.getSpaceAfter()
        return total

    def wrap(self, avail_width: float, avail_height: float) -> tuple[float, float]:
        text = self._text_height(avail_width)
        chart = self._slot.natural[1]
        room = avail_height - text
        scale = 1.0
        if text + chart > avail_height:
            if room >= chart * FIT_SCALE:
                scale = room / chart
            elif avail_height >= FRAME_HEIGHT - 1:  # a whole page is too small at full size
                scale = max(room / chart, FLOOR_SCALE)
        self._slot.scale(scale)
        self.width, self.height = avail_width, text + chart * scale
        return self.width, self.height

    def split(self, avail_width: float, avail_height: float) -> list[Flowable]:
        if avail_height < FRAME_HEIGHT - 1:
            return []  # not at the top of a page: the whole block moves overleaf
        if self._lead:
            return [*self._lead, ChartBox([], self._head, self._slot, self._tail)]
        return [ChartBox([], self._head, self._slot, []), *self._tail]

    def draw(self) -> None:
        parts = self._parts()
        y = self.height
        for i, part in enumerate(parts):
            height = part.wrap(self.width, FRAME_HEIGHT)[1]
            if i:
                y -= part.getSpaceBefore()
            y -= height
            part.drawOn(self.canv, 0, y)
            y -= part.getSpaceAfter()


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


@dataclass(frozen=True)
class Pages:
    """Where things landed in the previous pass (1-based page numbers): each chart by id, and each
    marked heading by its key (``section:<n>``, ``appendix``, ``appendix:<part>``)."""

    charts: dict[str, int] = field(default_factory=dict)
    marks: dict[str, int] = field(default_factory=dict)

    def chart(self, chart_id: str) -> str:
        """The page of a chart, or of a table (the appendix lists both by id)."""
        return str(self.charts.get(chart_id, self.marks.get(f"table:{chart_id}", "–")))

    def mark(self, key: str) -> str:
        return str(self.marks.get(key, "–"))


class Mark(Flowable):  # type: ignore[misc]
    """Nothing drawn: records the page it falls on under ``key`` (where a table starts)."""

    def __init__(self, key: str, marks: dict[str, int]) -> None:
        super().__init__()
        self._key, self._marks = key, marks

    def wrap(self, avail_width: float, avail_height: float) -> tuple[float, float]:
        return 0.0, 0.0

    def draw(self) -> None:
        self._marks[self._key] = self.canv.getPageNumber()


class Heading(Paragraph):  # type: ignore[misc]
    """A heading that records the page it is drawn on under ``key``."""

    def __init__(self, text: str, style: Any, key: str, marks: dict[str, int]) -> None:
        super().__init__(text, style)
        self._key, self._marks = key, marks

    def split(self, avail_width: float, avail_height: float) -> list[Flowable]:
        return []  # a heading is never split: it moves overleaf whole

    def draw(self) -> None:
        self._marks[self._key] = self.canv.getPageNumber()
        super().draw()


PASSES = 4
"""Layout passes at most: the first learns the pages the contents and the appendix refer to; a
further pass runs only while a page number printed on the page moved something."""


def build(content: PackContent) -> tuple[bytes, list[Slot]]:
    """Lay the pack out; return its PDF bytes and where each chart slot landed.

    The cover's contents and the appendix name pages, which are known only once the pack is laid
    out, so it is laid out again with the pages of the pass before until they stop changing (the
    cover and the appendix keep their height whatever the numbers, so this takes two passes)."""
    pages = Pages()
    for _ in range(PASSES):
        pdf, found, marks = _build_once(content, pages)
        landed = Pages({slot.chart_id: slot.page + 1 for slot in found}, marks)
        if landed == pages:
            break
        pages = landed
    return pdf, found


def _build_once(content: PackContent, pages: Pages) -> tuple[bytes, list[Slot], dict[str, int]]:
    s = layout.styles()
    found: list[Slot] = []
    marks: dict[str, int] = {}
    story: list[Flowable] = [*_cover(content, s, pages), PageBreak()]
    for number, section in enumerate(content.sections):
        story.extend(_section(number, section, s, found, marks, locale=content.locale, pages=pages))
    story.extend([PageBreak(), *_appendix(content, s, pages, marks)])
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
    return buffer.getvalue(), found, marks


def _cover(content: PackContent, s: dict[str, Any], pages: Pages) -> Iterable[Flowable]:
    locale = content.locale
    yield Spacer(1, 0.15 * inch)
    yield Paragraph(_text(content.title), s["title"])
    meta = [
        (say("cover.period", locale), content.period),
        (say("cover.as_of", locale), content.as_of),
        (say("cover.owner", locale), content.owner),
    ]
    if content.audience:
        meta.append((say("cover.audience", locale), content.audience))
    meta.append((say("cover.report_id", locale), content.report_id))
    meta.append((say("cover.review", locale), content.status_line))
    yield _pairs(meta, s, status_row=len(meta) - 1)
    yield Spacer(1, 10)
    yield Paragraph(_text(say("cover.integrity", locale, counts=content.summary_line)), s["body"])
    if content.figures:
        yield Paragraph(_text(say("cover.figures", locale)), s["h2"])
        yield _figures(content.figures, s, pages, locale)
    yield Paragraph(_text(say("cover.contents", locale)), s["h2"])
    yield _contents(content, s, pages)
    yield Paragraph(_text(say("page.caution", locale)), s["caution"])


def _pairs(rows: list[tuple[str, str]], s: dict[str, Any], status_row: int) -> Table:
    cells = [
        [Paragraph(_text(k), s["cover_label"]), Paragraph(_text(v), s["cover_meta"])]
        for k, v in rows
    ]
    status = rows[status_row][1]
    style = s["cover_status"] if _unsealed(status) else s["cover_signed"]
    cells[status_row][1] = Paragraph(_text(status), style)
    table = Table(cells, colWidths=[layout.FRAME_WIDTH * 0.24, layout.FRAME_WIDTH * 0.76])
    table.hAlign = "LEFT"
    table.setStyle(TableStyle(_PLAIN))
    return table


def _unsealed(status: str) -> bool:
    """A draft's status line, or one sealed with a development key, is printed in red on the
    cover; a pack sealed by an organisation's key is printed in the body's ink."""
    return "DRAFT" in status or "DEVELOPMENT" in status


_PLAIN: list[tuple[Any, ...]] = [
    ("FONT", (0, 0), (-1, -1), fonts.REGULAR, 7.5),  # else reportlab sets Helvetica
    ("VALIGN", (0, 0), (-1, -1), "TOP"),
    ("LEFTPADDING", (0, 0), (-1, -1), 0),
    ("RIGHTPADDING", (0, 0), (-1, -1), 6),
    ("TOPPADDING", (0, 0), (-1, -1), 1),
    ("BOTTOMPADDING", (0, 0), (-1, -1), 1),
]


def _figures(figures: list[Headline], s: dict[str, Any], pages: Pages, locale: str) -> Table:
    head = [
        say("appendix.chart", locale),
        say("cover.figure", locale),
        say("cover.latest", locale),
        say("cover.change", locale),
        say("cover.checks", locale),
    ]
    rows = [[Paragraph(_text(h), s["cell_head"]) for h in head]]
    right = tables.right(s["cell"])
    for f in figures:
        status = ParagraphStyle(
            f"status_{f.status}",
            parent=s["cell"],
            textColor=layout.STATUS_COLOURS.get(f.status, layout.INK),
        )
        rows.append(
            [
                Paragraph(_text(_on_page(f.chart, f.chart_id, pages, locale)), s["cell"]),
                Paragraph(_text(f.figure), s["cell"]),
                Paragraph(f"<b>{_text(f.value)}</b>", right),
                Paragraph(_text(f.change), s["cell"]),
                Paragraph(_text(f.checks), status),
            ]
        )
    w = layout.FRAME_WIDTH
    table = Table(rows, colWidths=[w * 0.27, w * 0.2, w * 0.14, w * 0.22, w * 0.17], repeatRows=1)
    table.hAlign = "LEFT"
    table.setStyle(TableStyle([*_RULED]))
    return table


def _on_page(title: str, chart_id: str, pages: Pages, locale: str) -> str:
    return say("page.chart_on_page", locale, title=title, page=pages.chart(chart_id))


_CELLS: list[tuple[Any, ...]] = [
    ("FONT", (0, 0), (-1, -1), fonts.REGULAR, 7.5),  # else reportlab sets Helvetica
    ("VALIGN", (0, 0), (-1, -1), "TOP"),
    ("TOPPADDING", (0, 0), (-1, -1), 2.5),
    ("BOTTOMPADDING", (0, 0), (-1, -1), 2.5),
    ("LEFTPADDING", (0, 0), (-1, -1), 3),
    ("RIGHTPADDING", (0, 0), (-1, -1), 3),
]
_RULED: list[tuple[Any, ...]] = [
    *_CELLS,
    ("LINEBELOW", (0, 0), (-1, 0), 0.8, layout.INK),
    ("LINEBELOW", (0, 1), (-1, -1), 0.3, layout.RULE),
]


def _contents(content: PackContent, s: dict[str, Any], pages: Pages) -> Table:
    """Each section and its charts, then the appendix's parts, with their pages."""
    locale = content.locale
    entries: list[tuple[str, str, bool]] = []
    for number, section in enumerate(content.sections):
        entries.append((section.heading, pages.mark(f"section:{number}"), True))
        for block in section.blocks:
            if isinstance(block, ChartBlock):
                entries.append((block.title, pages.chart(block.chart_id), False))
            else:
                entries.append((block.title, pages.chart(block.table_id), False))
    entries.append((say("appendix.title", locale), pages.mark("appendix"), True))
    for part in _APPENDIX_PARTS:
        entries.append(
            (say(f"appendix.{part}_title", locale), pages.mark(f"appendix:{part}"), False)
        )
    rows = [
        [
            Paragraph(_text(title), s["toc_major"] if major else s["toc_minor"]),
            Paragraph(_text(page), tables.right(s["toc_major"] if major else s["toc_minor"])),
        ]
        for title, page, major in entries
    ]
    w = layout.FRAME_WIDTH
    table = Table(rows, colWidths=[w - 40, 40])
    table.hAlign = "LEFT"
    table.setStyle(
        TableStyle(
            [
                *_PLAIN,
                ("TOPPADDING", (0, 0), (-1, -1), 0.5),
                ("BOTTOMPADDING", (0, 0), (-1, -1), 0.5),
                ("LINEBELOW", (0, 0), (-1, -1), 0.25, layout.RULE),
            ]
        )
    )
    return table


_APPENDIX_PARTS = ("summary", "grid", "rules")


def _section(
    number: int,
    section: SectionBlock,
    s: dict[str, Any],
    found: list[Slot],
    marks: dict[str, int],
    *,
    locale: str,
    pages: Pages,
) -> Iterable[Flowable]:
    """A section: its heading and narrative kept with its first chart (or a table's first rows),
    so a heading is never left at a page foot with what it introduces overleaf."""
    intro: list[Flowable] = [Heading(_text(section.heading), s["h1"], f"section:{number}", marks)]
    for paragraph in (section.narrative or "").split("\n\n"):
        if paragraph.strip():
            intro.append(Paragraph(_text(paragraph.strip()), s["body"]))
    blocks = list(section.blocks)
    first = blocks[0] if blocks else None
    if isinstance(first, ChartBlock):
        yield _chart(first, s, found, (locale, pages), lead=intro)
        blocks = blocks[1:]
    else:
        yield CondPageBreak(_height(intro) + TABLE_START)
        yield from intro
    for block in blocks:
        if isinstance(block, ChartBlock):
            yield _chart(block, s, found, (locale, pages))
        else:
            yield CondPageBreak(TABLE_START)
            yield Mark(f"table:{block.table_id}", marks)
            yield from tables.flowables(block, s)
    yield Spacer(1, 10)


TABLE_START = 90.0
"""Room a table's title, header and first rows need at a page foot, in points; less, and the table
starts on the next page."""


def _height(flowables: list[Flowable]) -> float:
    total = 0.0
    for f in flowables:
        total += (
            f.wrap(layout.FRAME_WIDTH, layout.PAGE[1])[1] + f.getSpaceBefore() + f.getSpaceAfter()
        )
    return total


def _chart(
    block: ChartBlock,
    s: dict[str, Any],
    found: list[Slot],
    where: tuple[str, Pages],
    lead: list[Flowable] | None = None,
) -> ChartBox:
    """A chart's block (see :class:`ChartBox`), after ``lead`` (a section's heading and
    narrative) when it is the section's first. ``where`` is the locale and the pages of the
    previous layout pass (the check line names the page of the chart's checks in the appendix)."""
    locale, pages = where
    head: list[Flowable] = [Paragraph(_text(block.title), s["h2"])]
    if block.subtitle:
        head.append(Paragraph(_text(block.subtitle), s["subtitle"]))
    slot = ChartSlot(block.chart_id, block.width_pt, block.height_pt, found)
    tail: list[Flowable] = []
    if block.source:
        tail.append(Paragraph(_text(say("page.source", locale, source=block.source)), s["muted"]))
    if block.note:
        tail.append(Paragraph(_text(block.note), s["muted"]))
    if block.description:
        label = _text(say("page.text_alternative", locale))
        tail.append(Paragraph(f"<i>{label}</i> {_text(block.description)}", s["small"]))
    page = pages.mark(f"appendix:chart:{block.chart_id}")
    line = say("page.checks_line", locale, counts=block.check_line, page=page)
    tail.append(Paragraph(_text(line), s["muted"]))
    return ChartBox(lead or [], head, slot, tail)


def _appendix(
    content: PackContent, s: dict[str, Any], pages: Pages, marks: dict[str, int]
) -> Iterable[Flowable]:
    locale = content.locale
    appendix = content.appendix
    yield Heading(_text(say("appendix.title", locale)), s["h1"], "appendix", marks)
    yield Paragraph(_text(say("appendix.intro", locale, counts=content.summary_line)), s["body"])
    yield Paragraph(_text(say("appendix.meanings", locale)), s["small"])
    yield Paragraph(_text(say("page.caution", locale)), s["caution"])

    title = Heading(
        _text(say("appendix.summary_title", locale)), s["h2"], "appendix:summary", marks
    )
    if not appendix.attention:
        yield KeepTogether(
            [title, Paragraph(_text(say("appendix.summary_none", locale)), s["body"])]
        )
    else:
        yield CondPageBreak(TABLE_START)
        yield title
        yield _attention(appendix, s, pages, locale)

    grid: list[Flowable] = [
        Heading(_text(say("appendix.grid_title", locale)), s["h2"], "appendix:grid", marks),
        Paragraph(_text(say("appendix.grid_intro", locale)), s["small"]),
    ]
    for chart in appendix.charts:  # the part's heading is kept with the first chart's grid
        yield KeepTogether([*grid, *_passed(chart, s, pages, marks, locale)])
        grid = []

    yield CondPageBreak(TABLE_START)
    yield Heading(_text(say("appendix.rules_title", locale)), s["h2"], "appendix:rules", marks)
    yield Paragraph(_text(say("appendix.rules_intro", locale)), s["small"])
    yield _rules(appendix, s, locale)
    yield Spacer(1, 10)
    yield Paragraph(
        _text(say("appendix.fingerprint", locale, fingerprint=content.fingerprint)), s["small"]
    )


def _fitted(rows: Sequence[Sequence[str]], shares: Sequence[float]) -> list[float]:
    """Column widths for a grid: each column at least as wide as its longest word (so no word is
    broken, ids included), the rest of the frame shared out in proportion to ``shares``."""
    least = [
        max(
            (
                stringWidth(word, fonts.BOLD if r == 0 else fonts.REGULAR, 7.5)
                for r, row in enumerate(rows)
                for word in row[c].split()
            ),
            default=0.0,
        )
        + 8
        for c in range(len(shares))
    ]
    spare = layout.FRAME_WIDTH - sum(least)
    if spare <= 0:  # too many long words to keep whole: shrink every column alike
        return [w * layout.FRAME_WIDTH / sum(least) for w in least]
    total = sum(shares)
    return [w + spare * share / total for w, share in zip(least, shares, strict=True)]


def _attention(appendix: Appendix, s: dict[str, Any], pages: Pages, locale: str) -> LongTable:
    head = [
        say("appendix.chart", locale),
        say("appendix.check", locale),
        say("appendix.status", locale),
        say("appendix.measured", locale),
        say("appendix.done", locale),
        say("appendix.why", locale),
    ]
    rows = [
        [
            _on_page(a.chart_title, a.chart_id, pages, locale),
            a.check,
            a.status_text,
            a.measured,
            a.done,
            a.why,
        ]
        for a in appendix.attention
    ]
    colours = {
        i + 1: layout.STATUS_COLOURS.get(a.status, layout.INK)
        for i, a in enumerate(appendix.attention)
    }
    widths = _fitted([head, *rows], [0.14, 0, 0, 0.1, 0.3, 0.46])
    return _grid([head, *rows], widths, s, colours=colours)


GRID_COLUMNS = 3


def _passed(
    chart: ChartChecks, s: dict[str, Any], pages: Pages, marks: dict[str, int], locale: str
) -> list[Flowable]:
    """One chart's passed checks, three to a row: the id, and under it what was measured."""
    line = say(
        "appendix.chart_line",
        locale,
        title=chart.title,
        page=pages.chart(chart.chart_id),
        counts=chart.counts,
    )
    key = f"appendix:chart:{chart.chart_id}"
    parts: list[Flowable] = [Heading(_text(line), s["grid_head"], key, marks)]
    cells = [
        Paragraph(f"<b>{_text(check)}</b><br/>{_text(measured)}", s["cell"])
        for check, measured in chart.passed
    ]
    if cells:
        while len(cells) % GRID_COLUMNS:
            cells.append(Paragraph("", s["cell"]))
        rows = [cells[i : i + GRID_COLUMNS] for i in range(0, len(cells), GRID_COLUMNS)]
        width = layout.FRAME_WIDTH / GRID_COLUMNS
        table = Table(rows, colWidths=[width] * GRID_COLUMNS)
        table.hAlign = "LEFT"
        table.setStyle(
            TableStyle(
                [
                    *_CELLS,
                    ("INNERGRID", (0, 0), (-1, -1), 0.3, layout.RULE),
                    ("BOX", (0, 0), (-1, -1), 0.3, layout.RULE),
                ]
            )
        )
        parts.append(table)
    if chart.not_applicable:
        text = say("appendix.not_applicable_line", locale, checks=", ".join(chart.not_applicable))
        parts.append(Paragraph(_text(text), s["muted"]))
    parts.append(Spacer(1, 6))
    return parts


def _rules(appendix: Appendix, s: dict[str, Any], locale: str) -> LongTable:
    head = [
        say("appendix.check", locale),
        say("appendix.rule", locale),
        say("appendix.threshold", locale),
        say("appendix.source", locale),
    ]
    rows = [[r.check, r.title, r.threshold, r.source] for r in appendix.rules]
    return _grid([head, *rows], _fitted([head, *rows], [0, 0.26, 0.34, 0.4]), s)
