"""The pack's pages: the footer, the cover and its contents, headings kept with what follows,
and the appendix for reviewers. Read back from the laid-out PDF with pdfminer."""

from __future__ import annotations

import io
from collections.abc import Iterator

import pytest
from factories import (
    make_category_dataset,
    make_column,
    make_compare_chart,
    make_definition,
    make_monthly,
    make_report,
    make_trend_chart,
    run_checks,
)
from pdfminer.high_level import extract_pages
from pdfminer.layout import LTPage, LTTextContainer, LTTextLine

from service import pipeline
from service.assemble import figures, layout, pack

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


def _text(page: LTPage) -> str:
    return "\n".join(line.get_text().rstrip("\n") for line in _lines(page))


def _body(page: LTPage) -> list[LTTextLine]:
    """The page's lines above the footer, top to bottom."""
    body = [line for line in _lines(page) if line.y0 > layout.MARGIN]
    return sorted(body, key=lambda line: -line.y1)


def _pack_definition(locale: str = "en-GB") -> dict[str, object]:
    """Three sections: a trend with a key figure, a long narrative whose heading could be stranded,
    and bars asked to start at 85 (corrected to zero)."""
    ridership = make_monthly(MONTHS, [float(50_000 + 700 * n) for n in range(10)])
    routes = make_category_dataset({"A": 91.0, "B": 88.5, "C": 95.2})
    narrative = "\n\n".join(["The months after the timetable change are steadier. " * 8] * 4)
    sections = [
        {
            "heading": "Ridership",
            "narrative": "Boardings rose all year.",
            "charts": [make_trend_chart(key_figure="boardings")],
        },
        {
            "heading": "Ridership again",
            "narrative": narrative,
            "charts": [make_trend_chart(id="second", title="Boardings once more")],
        },
        {
            "heading": "Punctuality",
            "charts": [make_compare_chart(baseline=85)],
        },
    ]
    report = make_report(locale=locale)
    return make_definition(datasets=[ridership, routes], report=report, sections=sections)


@pytest.fixture(scope="module")
def pack_pages() -> list[LTPage]:
    return _pages(_render(_pack_definition()))


def _page_of(pages: list[LTPage], text: str, start: int = 1) -> int:
    """The 1-based number of the first page from ``start`` whose body has a line ``text``."""
    for number, page in enumerate(pages[start - 1 :], start=start):
        if any(line.get_text().strip() == text for line in _body(page)):
            return number
    raise AssertionError(f"{text!r} is on no page")


def test_the_cover_writes_the_as_of_time_for_people(pack_pages: list[LTPage]) -> None:
    cover = _text(pack_pages[0])
    assert "9 November 2026, 07:30 UTC" in cover
    assert "2026-11-09T07:30" not in cover


def _rows(page: LTPage) -> list[str]:
    """The page's text lines, joining boxes that share a baseline (a table row), top to bottom."""
    rows: dict[int, list[LTTextLine]] = {}
    for line in _lines(page):
        rows.setdefault(round(line.y0), []).append(line)
    return [
        " ".join(line.get_text().strip() for line in sorted(rows[y], key=lambda line: line.x0))
        for y in sorted(rows, reverse=True)
    ]


def test_the_cover_lists_the_contents_with_their_pages(pack_pages: list[LTPage]) -> None:
    rows = _rows(pack_pages[0])
    assert "Contents" in rows
    for heading in ("Ridership", "Ridership again", "Punctuality", "Integrity checks"):
        page = _page_of(pack_pages, heading, start=2)
        assert f"{heading} {page}" in rows, (heading, page, rows)
    chart = _page_of(pack_pages, "Departures on time by route", start=2)
    assert f"Departures on time by route {chart}" in rows


def test_the_cover_lists_each_charts_key_figure(pack_pages: list[LTPage]) -> None:
    cover = _text(pack_pages[0])
    assert "Headline figures" in cover
    assert "56,300" in cover  # October's boardings, the latest value
    assert "+700" in cover  # the change from September
    assert "Oct 2026" in cover


def test_a_heading_is_never_left_at_a_page_foot_without_what_follows(
    pack_pages: list[LTPage],
) -> None:
    """The long narrative of "Ridership again" does not fit under the first chart: the heading,
    the narrative and the chart move overleaf together."""
    headings = {"Ridership", "Ridership again", "Punctuality", "Boardings once more"}
    for number, page in enumerate(pack_pages[1:], start=2):
        body = _body(page)
        if body:
            assert body[-1].get_text().strip() not in headings, number
    assert _page_of(pack_pages, "Ridership again", 2) == _page_of(
        pack_pages, "Boardings once more", 2
    )


def test_the_appendix_summary_lists_what_is_not_a_plain_pass_first(
    pack_pages: list[LTPage],
) -> None:
    start = _page_of(pack_pages, "Integrity checks", start=2)
    appendix = "\n".join(_text(p) for p in pack_pages[start - 1 :])
    summary = appendix.index("Checks that need a reviewer's attention")
    grid = appendix.index("Passed checks by chart")
    rules = appendix.index("Rules")
    assert summary < grid < rules
    attention = appendix[summary:grid]
    assert "bar-zero-baseline" in attention
    assert "corrected" in attention
    assert "Departures on" in attention  # the chart's title, not its id
    assert "no-dual-axis" not in attention


def test_checks_that_cannot_fail_are_not_counted_as_passes(pack_pages: list[LTPage]) -> None:
    start = _page_of(pack_pages, "Integrity checks", start=2)
    appendix = "\n".join(_text(p) for p in pack_pages[start - 1 :])
    assert "not applicable" in appendix
    _, checked = pipeline.render(run_checks(_pack_definition()))  # with the checks of the drawing
    inapplicable = [r for r in checked.results if r.status.value == "not_applicable"]
    assert inapplicable
    passed = sum(r.status.value == "passed" for r in checked.results)
    applicable = len(checked.results) - len(inapplicable)
    cover = " ".join(_rows(pack_pages[0]))
    assert f"{applicable} checks: {passed} passed" in cover
    assert f"{len(inapplicable)} not applicable" in cover


def test_ids_never_break_and_thresholds_are_written_once(pack_pages: list[LTPage]) -> None:
    start = _page_of(pack_pages, "Integrity checks", start=2)
    lines = [line.get_text().strip() for p in pack_pages[start - 1 :] for line in _lines(p)]
    checked = run_checks(_pack_definition())
    ids = {r.check for r in checked.results}
    for check in ids:
        fragments = [
            line
            for line in lines
            # a line that is a prefix of an id and not itself an id ("partial-period" is one)
            if line and line not in ids and check.startswith(line) and "-" in line
        ]
        assert fragments == [], (check, fragments)
    text = " ".join(" ".join(lines).split())
    for threshold in {r.threshold for r in checked.results if len(r.threshold) > 20}:
        assert text.count(" ".join(threshold.split())) == 1, threshold  # once, under "Rules"


def test_german_pack_speaks_german() -> None:
    pages = _pages(_render(_pack_definition(locale="de-DE")))
    cover = _text(pages[0])
    assert "9. November 2026, 07:30 UTC" in cover
    assert "Inhalt" in cover
    assert "Seite 1 von" in cover


def _six_depots() -> dict[str, object]:
    """A six-series chart (drawn as six panels, taller than what is left of any page) between
    sections of bars: today's layout left the page before it 90 % blank."""
    names = ["north", "south", "east", "west", "centre", "airport"]
    rows = [
        {"month": m, **{n: 1000 + 37 * i + 91 * j for j, n in enumerate(names)}}
        for i, m in enumerate(MONTHS)
    ]
    depots = {
        "name": "depots",
        "columns": [make_column("month", "date")]
        + [make_column(n, "integer", "journeys") for n in names],
        "time_column": "month",
        "frequency": "month",
        "rows": rows,
    }
    routes = make_category_dataset({"A": 91.0, "B": 88.5, "C": 95.2, "D": 90.1})
    trend = {
        "id": "depots",
        "intent": "trend",
        "title": "Journeys by depot",
        "dataset": "depots",
        "measures": names,
    }
    sections = [
        {
            "heading": "Punctuality",
            "narrative": "Routes kept time. " * 30,
            "charts": [make_compare_chart(), make_compare_chart(id="again", title="Again")],
        },
        {"heading": "Depots", "narrative": "Six depots. " * 20, "charts": [trend]},
        {"heading": "After", "charts": [make_compare_chart(id="after", title="After")]},
    ]
    return make_definition(datasets=[depots, routes], sections=sections)


def _fill(page: LTPage) -> float:
    """The share of the body frame above the lowest text or chart drawn on the page."""
    top = page.height - layout.MARGIN
    lows = [item.y0 for item in page if item.y0 > layout.MARGIN - 1]
    return (top - min(lows)) / (top - layout.MARGIN) if lows else 0.0


def test_pages_are_filled_and_a_tall_chart_stays_with_its_heading() -> None:
    pages = _pages(_render(_six_depots()))
    headings = {"Punctuality", "Depots", "After", "Integrity checks"}
    starts = [bool(_body(p)) and _body(p)[0].get_text().strip() in headings for p in pages] + [True]
    for number in range(2, len(pages)):
        last_of_section = starts[number]  # the next page (index ``number``) starts a section
        if not last_of_section:
            assert _fill(pages[number - 1]) >= 0.25, number
    assert _page_of(pages, "Depots", 2) == _page_of(pages, "Journeys by depot", 2)


def test_a_headline_figure_of_a_percentage_changes_in_percentage_points() -> None:
    dataset = make_monthly(MONTHS, [float(90 + n % 3) for n in range(10)])
    dataset["columns"][1]["unit"] = "%"
    chart = make_trend_chart(key_figure="boardings", from_zero=False)
    (found,) = figures.headline(
        run_checks(make_definition(datasets=[dataset], charts=[chart])), "en-GB"
    )
    assert (found.value, found.change) == ("90%", "−2 percentage points from Sept 2026")


def test_a_key_figure_the_chart_does_not_have_is_said_so_on_the_cover() -> None:
    chart = make_trend_chart(key_figure="journeys")
    (found,) = figures.headline(run_checks(make_definition(charts=[chart])), "en-GB")
    assert found.value == "—"
    assert found.change == "The chart has no figure named “journeys”; it has: Boardings."


def test_a_heading_is_never_split_over_two_pages() -> None:
    """A heading that does not fit at a page foot moves overleaf whole (reportlab would split a
    paragraph of several lines, and a split copy of the heading would not record its page)."""
    marks: dict[str, int] = {}
    text = "A heading long enough to wrap over three lines on the page " * 3
    heading = pack.Heading(text, layout.styles()["h1"], "section:0", marks)
    _, height = heading.wrap(layout.FRAME_WIDTH, layout.PAGE[1])
    assert height > 40  # several lines
    assert heading.split(layout.FRAME_WIDTH, height - 5) == []


def test_each_chart_names_the_appendix_page_of_its_checks(pack_pages: list[LTPage]) -> None:
    chart = _page_of(pack_pages, "Departures on time by route", start=2)
    text = " ".join(" ".join(_rows(pack_pages[chart - 1])).split())
    start = _page_of(pack_pages, "Integrity checks", start=2)
    grid = next(
        number
        for number, page in enumerate(pack_pages[start - 1 :], start=start)
        if "Departures on time by route · page" in _text(page)
    )
    assert f"(details in the appendix, page {grid})." in text
