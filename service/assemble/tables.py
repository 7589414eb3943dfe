"""Tables of the pack: a checked table plan written in the report's locale, and grids laid out.

:func:`block` writes a :class:`~service.intents.table.TablePlan` (already measured by the table
checks) as text: headers from column labels with units, numbers through :mod:`service.formatting`,
"no data" in the rows of periods without data, the partial period's completeness, estimates marked,
a totals row, and notes under the table (estimates, rows left out, periods not among the rows).
Every word comes from :mod:`service.wording`.

:func:`flowables` lays a block out as one table whose title is its first row: a table that runs
onto the next page repeats its header there under its title marked "continued". :func:`grid` is the
house grid, shared with the appendix.
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field
from typing import Any
from xml.sax.saxutils import escape

from reportlab.lib.enums import TA_RIGHT
from reportlab.lib.styles import ParagraphStyle
from reportlab.pdfbase.pdfmetrics import stringWidth
from reportlab.platypus import Flowable, LongTable, Paragraph, Spacer, TableStyle

from service import formatting, wording
from service.assemble import fonts, layout
from service.intents.table import TableColumn, TablePlan, Value, completeness_text


@dataclass(frozen=True)
class TableBlock:
    title: str
    header: list[str]
    rows: list[list[str]]
    numeric: list[bool]
    notes: list[str] = field(default_factory=list)
    """Lines under the table: estimates, rows left out, periods not among the rows."""
    quiet: list[int] = field(default_factory=list)
    """Rows (0-based, below the header) of periods without data, set in a muted colour."""
    totals: bool = False
    """The last row is the totals row."""
    continued: str = ""
    """The title over the rest of the table on a following page."""
    table_id: str = ""
    """The table's id in the definition (the contents and the appendix give its page)."""


def block(plan: TablePlan, locale: str) -> TableBlock:
    """The table as the reader sees it, in the report's locale."""
    digits = [_digits(plan, c, col) for c, col in enumerate(plan.columns)]
    rows = [
        [_cell(v, d, locale) for v, d in zip(row.values, digits, strict=True)] for row in plan.rows
    ]
    time = next((c for c, col in enumerate(plan.columns) if col.time), None)
    for r, row in enumerate(plan.rows):
        if time is not None and row.state == "partial" and row.completeness is not None:
            done = completeness_text(row.completeness, locale)
            rows[r][time] += "\n" + wording.say("table.partial", locale, done=done)
    if plan.totals:
        rows.append(_totals_row(plan, digits, locale))
    return TableBlock(
        title=plan.title,
        header=[_header(col, locale) for col in plan.columns],
        rows=rows,
        numeric=[col.numeric for col in plan.columns],
        notes=_notes(plan, locale),
        quiet=[r for r, row in enumerate(plan.rows) if row.state == "missing"],
        totals=bool(plan.totals),
        continued=wording.say("table.continued", locale, title=plan.title),
        table_id=plan.table_id,
    )


def _header(column: TableColumn, locale: str) -> str:
    titled = formatting.titled(column.label, column.unit)
    if column.estimate:
        return wording.say("table.estimate_header", locale, label=titled)
    return titled


def _digits(plan: TablePlan, c: int, column: TableColumn) -> int:
    """One number of decimals per column, so its values line up: none for integers."""
    if not column.numeric:
        return 0
    values = [v for row in plan.rows if isinstance(v := row.values[c], float)]
    values += [t for name, t in plan.totals if name == column.name]
    return 0 if column.kind.value == "integer" else formatting.decimals_for(values)


def _cell(value: Value, digits: int, locale: str) -> str:
    if value is None:
        return wording.say("table.no_data", locale)
    if isinstance(value, float):
        return formatting.number(value, locale, digits=digits)
    return value


def _totals_row(plan: TablePlan, digits: list[int], locale: str) -> list[str]:
    totals = dict(plan.totals)
    label = wording.say("table.total", locale)
    if plan.left_out:
        label = wording.say("table.total_of_shown", locale, count=len(plan.rows))
    gaps = sum(1 for row in plan.rows if row.state != "actual")
    if gaps == 1:
        label = wording.say("table.total_incomplete_one", locale, total=label)
    elif gaps:
        label = wording.say("table.total_incomplete", locale, total=label, count=gaps)
    row = [
        formatting.number(totals[col.name], locale, digits=d) if col.name in totals else ""
        for col, d in zip(plan.columns, digits, strict=True)
    ]
    first = next((c for c, col in enumerate(plan.columns) if col.name not in totals), None)
    if first is not None:
        row[first] = label
    return row


def _notes(plan: TablePlan, locale: str) -> list[str]:
    notes = []
    estimates = [formatting.titled(c.label, c.unit) for c in plan.columns if c.estimate]
    if estimates:
        notes.append(wording.say("table.estimates_note", locale, columns=", ".join(estimates)))
    if plan.unshown_missing:
        listed = ", ".join(plan.unshown_missing)
        notes.append(wording.say("table.missing_not_shown", locale, periods=listed))
    if plan.left_out == 1:
        notes.append(wording.say("table.row_left_out", locale, shown=len(plan.rows)))
    elif plan.left_out:
        notes.append(
            wording.say("table.rows_left_out", locale, count=plan.left_out, shown=len(plan.rows))
        )
    return notes


# --- layout -------------------------------------------------------------------------------------


def text(value: str) -> str:
    """Escape user text for a Paragraph; keep line breaks."""
    return escape(value).replace("\n", "<br/>")


class TitledTable(LongTable):  # type: ignore[misc]
    """A table whose first row is its title: where it breaks onto another page, the title
    repeats there (marked as continued), then the header."""

    continued: Paragraph | None = None

    def split(self, avail_width: float, avail_height: float) -> list[Flowable]:
        parts: list[Flowable] = super().split(avail_width, avail_height)
        for later in parts[1:]:
            later.continued = self.continued
            if self.continued is not None:
                row = later._cellvalues[0]  # shared with the first part: replaced, not changed
                later._cellvalues[0] = [self.continued, *row[1:]]
        return parts


def flowables(table: TableBlock, s: dict[str, Any]) -> Iterable[Flowable]:
    """A table block laid out: title, header, rows (numbers right-aligned), totals, notes."""
    quiet = ParagraphStyle("cell_quiet", s["cell"], textColor=layout.MUTED)
    total = ParagraphStyle("cell_total", s["cell"], fontName=fonts.BOLD)
    kinds = {r + 1: quiet for r in table.quiet}
    if table.totals:
        kinds[len(table.rows)] = total
    cells: list[list[Any]] = [
        [Paragraph(text(table.title), s["h2"])] + [""] * (len(table.header) - 1)
    ]
    cells += grid_cells([table.header, *table.rows], s, table.numeric, kinds)
    grid_ = TitledTable(cells, colWidths=_widths(table), repeatRows=2, hAlign="LEFT")
    grid_.continued = Paragraph(text(table.continued), s["h2"])
    commands = [
        ("SPAN", (0, 0), (-1, 0)),
        ("LEFTPADDING", (0, 0), (-1, 0), 0),
        ("BOTTOMPADDING", (0, 0), (-1, 0), 4),
        *_style(first=1),
    ]
    if table.totals:
        commands.append(("LINEABOVE", (0, -1), (-1, -1), 0.8, layout.INK))
    grid_.setStyle(TableStyle(commands))
    yield grid_
    if table.notes:
        yield Spacer(1, 3)
    for note in table.notes:
        yield Paragraph(text(note), s["muted"])
    yield Spacer(1, 8)


def grid_cells(
    rows: Sequence[Sequence[str]],
    s: dict[str, Any],
    numeric: Sequence[bool] | None = None,
    kinds: dict[int, ParagraphStyle] | None = None,
) -> list[list[Paragraph]]:
    """Rows as paragraphs: the first a header, numbers right-aligned below it; ``kinds`` gives
    some rows (by index in ``rows``) a style of their own."""
    numeric = numeric or [False] * max((len(row) for row in rows), default=0)
    cells = [[Paragraph(text(v), s["cell_head"]) for v in rows[0]]] if rows else []
    for r, row in enumerate(rows[1:], start=1):
        style = (kinds or {}).get(r, s["cell"])
        cells.append(
            [
                Paragraph(text(v), right(style) if is_number else style)
                for v, is_number in zip(row, numeric, strict=False)
            ]
        )
    return cells


def _style(first: int = 0) -> list[tuple[Any, ...]]:
    """The house grid, from row ``first`` (rows above it are not part of the grid)."""
    return [
        ("FONT", (0, 0), (-1, -1), fonts.register(), 7.5),  # else reportlab sets Helvetica
        ("INNERGRID", (0, first), (-1, -1), 0.3, layout.RULE),
        ("BOX", (0, first), (-1, -1), 0.3, layout.RULE),
        ("LINEBELOW", (0, first), (-1, first), 0.8, layout.INK),
        ("VALIGN", (0, 0), (-1, -1), "TOP"),
        ("TOPPADDING", (0, 0), (-1, -1), 2.5),
        ("BOTTOMPADDING", (0, first), (-1, -1), 2.5),
        ("LEFTPADDING", (0, first), (-1, -1), 3),
        ("RIGHTPADDING", (0, 0), (-1, -1), 3),
    ]


def grid(
    rows: Sequence[Sequence[str]],
    widths: list[float],
    s: dict[str, Any],
    numeric: Sequence[bool] | None = None,
    colours: dict[int, Any] | None = None,
) -> LongTable:
    """The house grid: a header row repeated on every page, then the rows."""
    cells = grid_cells(rows, s, numeric)
    table = LongTable(cells, colWidths=widths, repeatRows=1, hAlign="LEFT")
    commands = _style()
    for r, colour in (colours or {}).items():
        commands.append(("TEXTCOLOR", (2, r), (2, r), colour))
    table.setStyle(TableStyle(commands))
    if taller_than_page(table):  # a long source line quoted in a check, say: split the row
        table.splitInRow = 1
    return table


def taller_than_page(table: LongTable) -> bool:
    """A row that cannot fit on one page (reportlab would give up); rows that fit are kept whole."""
    height = layout.PAGE[1] - 2 * layout.MARGIN
    table.wrap(layout.FRAME_WIDTH, height)
    tallest = float(max(table._rowHeights, default=0))
    return bool(tallest > height - 40)


def right(style: Any) -> Any:
    """``style`` aligned right (numbers in a column)."""
    return ParagraphStyle(f"{style.name}_right", parent=style, alignment=TA_RIGHT)


def _widths(table: TableBlock) -> list[float]:
    """Columns as wide as their widest line (the header set bold), together at least as wide as
    the title, shrunk to the frame only when they would not fit. The totals row's label may wrap:
    it does not widen its column."""
    regular = fonts.register()

    def width(value: str, font: str) -> float:
        lines = value.split("\n")
        return max(float(stringWidth(line, font, _CELL_SIZE)) for line in lines) + _CELL_PADDING

    body = table.rows[:-1] if table.totals else table.rows
    natural = [
        max([width(table.header[c], fonts.BOLD)] + [width(row[c], regular) for row in body])
        for c in range(len(table.header))
    ]
    if table.totals:  # the totals themselves are numbers, set bold: they must fit
        for c, value in enumerate(table.rows[-1]):
            if table.numeric[c]:
                natural[c] = max(natural[c], width(value, fonts.BOLD))
    total = sum(natural)
    title = stringWidth(table.continued or table.title, fonts.BOLD, 11) + 4
    if total < title:
        natural = [w * title / total for w in natural]
        total = title
    scale = min(1.0, layout.FRAME_WIDTH / total) if total else 1.0
    return [w * scale for w in natural]


_CELL_SIZE = 7.5
"""The font size of a cell (the ``cell`` and ``cell_head`` styles)."""
_CELL_PADDING = 3 + 3 + 2
"""A cell's left and right padding, and room for rounding."""
