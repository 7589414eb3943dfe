"""The pack's pages: the footer, the cover and its contents, headings kept with what follows,
and the appendix for reviewers. Read back from the laid-out PDF with pdfminer."""

from __future__ import annotations

import io
from collections.abc import Iterator

import pytest
from factories import make_definition, make_monthly, make_trend_chart, run_checks
from pdfminer.high_level import extract_pages
from pdfminer.layout import LTPage, LTTextContainer, LTTextLine

from service import pipeline
from service.assemble import layout

SEALED = (
    "Signed off by Demo Approver on 2026-12-03 13:12 UTC · signed with a DEVELOPMENT key, "
    "not an organisation's seal"
)
MONTHS = [f"2026-{m:02d}-01" for m in range(1, 11)]


def _lines(page: LTPage) -> Iterator[LTTextLine]:
    for box in page:
        if isinstance(box, LTTextContainer):
            yield from (line for line in box if isinstance(line, LTTextLine))


def _pages(pdf: bytes) -> list[LTPage]:
    return list(extract_pages(io.BytesIO(pdf)))


def _render(definition: dict[str, object], status_line: str = "DRAFT — not signed off") -> bytes:
    pdf, _ = pipeline.render(run_checks(definition), status_line=status_line)
    return pdf


@pytest.fixture(scope="module")
def sealed_pdf() -> bytes:
    dataset = make_monthly(MONTHS, [float(50_000 + 100 * n) for n in range(10)])
    return _render(make_definition(datasets=[dataset], charts=[make_trend_chart()]), SEALED)


def test_the_sealed_footer_never_runs_into_the_page_number(sealed_pdf: bytes) -> None:
    for page in _pages(sealed_pdf):
        foot = [line for line in _lines(page) if line.y1 < layout.MARGIN]
        number = [line for line in foot if line.get_text().strip().startswith("Page")]
        assert len(number) == 1, [line.get_text() for line in foot]
        for line in foot:
            if line is number[0] or line.y1 < number[0].y0 or line.y0 > number[0].y1:
                continue
            assert line.x1 + 6 <= number[0].x0, (line.get_text(), number[0].get_text())
        text = " ".join(line.get_text().strip() for line in foot)
        assert "DEVELOPMENT key" in text  # the caveat is never cut off
