"""A table row taller than a page (a long source line quoted in a check) is split across pages
instead of stopping the layout; rows that fit stay whole."""

from __future__ import annotations

import io

from reportlab.platypus import SimpleDocTemplate

from service.assemble import fonts, layout, tables


def _build(rows: list[list[str]]) -> bytes:
    s = layout.styles()
    fonts.register()
    w = layout.FRAME_WIDTH
    table = tables.grid(rows, [w * 0.7, w * 0.3], s)
    buffer = io.BytesIO()
    SimpleDocTemplate(buffer, pagesize=layout.PAGE).build([table])
    return buffer.getvalue()


def test_a_row_taller_than_a_page_is_split() -> None:
    long = " ".join(["S" * 120] * 41)  # unbroken tokens, 4,960 characters in all
    pdf = _build([["Chart", "Explanation"], ["a", f"Source line: {long}"]])  # LayoutError before
    assert pdf.startswith(b"%PDF")


def test_rows_that_fit_stay_whole() -> None:
    rows = [["Chart", "Explanation"], *[[f"c{i}", "a short line"] for i in range(5)]]
    table = tables.grid(rows, [100.0, 300.0], layout.styles())
    assert not tables.taller_than_page(table)
    assert table.splitInRow == 0
