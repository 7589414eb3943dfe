"""The pack-quality figures: each measurement finds a planted problem, and the demo's draft is
measured (slow: drawn and read back as text and pictures).

The demo test asserts the figures the demo meets today and holds the others to today's numbers at
worst (a ratchet): tighten ``CEILINGS`` as the pack improves, and move a figure to ``MET`` once the
demo meets it.
"""

from __future__ import annotations

import sys
from functools import cache
from types import ModuleType, SimpleNamespace

import numpy as np
import pytest

from service import pipeline
from service.checks.outcome import Checked
from service.checks.results import CheckResult, Status
from service.config import Limits
from tests.quality import pack_quality as quality

MET: frozenset[str] = frozenset(
    {
        "height_share",
        "text_over_data",
        "key_mismatches",
        "raw_identifiers",
        "missing_table_periods",
    }
)
"""Figures the demo meets today (asserted met)."""
CEILINGS: dict[str, float] = {"sparse_pages": 0}
"""Today's numbers of the figures the demo has no target for (reported): they may only fall."""
FLOORS: dict[str, float] = {}
"""The same for figures that must rise (a share)."""


@cache
def demo_checked() -> Checked:
    return pipeline.check(pipeline.intake(quality.DEMO.read_bytes(), Limits()))


def fake(pages: list[str], fill: list[float] | None = None) -> quality.Draft:
    """The demo's checks with pages of our own, as if the draft read so."""
    return quality.Draft("demo", demo_checked(), b"", pages, fill or [1.0] * len(pages))


def test_page_fill_is_where_the_ink_ends_in_the_text_frame() -> None:
    page = np.full((400, 280), 255, dtype=np.uint8)
    assert quality.page_fill(page) == 0.0
    page[40:60, 40:200] = 0  # a heading near the top of the frame
    assert 0.0 < quality.page_fill(page) < quality.SPARSE
    page[330:340, 40:200] = 0  # content near the frame's foot
    assert quality.page_fill(page) > 0.9
    page[390:395, 40:200] = 0  # the footer, below the bottom margin, is not content
    assert quality.page_fill(page) <= 1.0


def test_a_sparse_page_counts_unless_it_ends_a_section() -> None:
    headings = [s.heading for s in demo_checked().definition.sections]
    pages = ["cover", f"{headings[0]}\nchart", "a stranded heading", "more", f"{headings[1]}\n"]
    found = quality.sparse_pages(fake(pages, [0.5, 0.9, 0.1, 0.1, 0.1]))
    assert found.value == 1  # p. 3; p. 4 ends a section, p. 5 is the last page
    assert "p. 3" in found.detail
    blank = quality.sparse_pages(fake(pages, [0.5, 0.9, 0.9, 0.0, 0.9]))
    assert blank.value == 1  # a blank page before a section ends nothing


def test_raw_identifiers_are_found_outside_the_appendix_ids() -> None:
    pages = [
        "Operating cost, operating_cost (GBP), length_km",
        "Integrity checks\ncost-vs-use   label-layout   passed   on_time was read",
    ]
    found = quality.raw_identifiers(fake(pages))
    assert found.value == 3
    assert found.detail == "length_km, on_time, operating_cost"


def test_a_missing_period_of_a_time_indexed_table_is_found() -> None:
    months = ["Dec 2025", "Jan 2026", "Feb 2026", "Mar 2026", "Apr 2026", "May 2026"]
    months += ["Jun 2026", "Jul 2026", "Sept 2026", "Oct 2026", "Nov 2026"]
    table = "Boardings by month\nmonth boardings\n" + "\n".join(months)
    assert quality.missing_table_periods(fake([table])).value == 1
    assert quality.missing_table_periods(fake([table + "\nAugust 2026 no data"])).value == 0


def test_text_over_data_is_read_from_the_label_layout_result() -> None:
    def result(measured: str, after: str | None = None) -> CheckResult:
        return CheckResult(
            check="label-layout",
            chart="c",
            status=Status.corrected if after else Status.passed,
            measured=0,
            measured_text=measured,
            corrected_to=after,
            threshold="0",
            explanation="",
            source="",
        )

    done = fake([])
    plain = result("0 overlaps, 0 cut off")
    done.checked = Checked(done.checked.definition, {}, "", [])
    assert quality.text_over_data(done).value is None  # no result: not measured
    chart = demo_checked().charts[0]
    charts = [
        type(chart)(path="p", plan=chart.plan, results=[plain]),
        type(chart)(
            path="q",
            plan=chart.plan,
            results=[result("0 overlaps, 3 text over data", "0 overlaps, 1 text over data")],
        ),
    ]
    done.checked = Checked(done.checked.definition, {}, "", charts)
    assert quality.text_over_data(done).value == 1


def test_the_complete_period_height_share_is_read_from_the_plan() -> None:
    plans = {c.plan.chart_id: c.plan for c in demo_checked().charts}
    journeys = quality.height_share_of(plans["journeys-trend"])
    assert journeys is not None
    assert journeys >= quality.HEIGHT_SHARE  # 5,580–6,240 on 5,500–6,250 (was 1,000–7,000: 11 %)
    boardings = quality.height_share_of(plans["boardings-trend"])
    assert boardings is not None
    assert boardings > quality.HEIGHT_SHARE  # read from zero
    assert quality.height_share_of(plans["on-time-by-route"]) is None  # no periods


def test_the_demo_draft_meets_what_it_meets_and_gets_no_worse() -> None:
    figures = quality.measure(quality.DEMO.read_bytes(), "demo")
    sys.stdout.write(quality.table({"demo": figures}) + "\n")
    by_key = {f.key: f for f in figures}
    assert set(by_key) >= MET | set(CEILINGS) | set(FLOORS)
    for key in MET:
        assert by_key[key].met, by_key[key]
    for key, ceiling in CEILINGS.items():
        value = by_key[key].value
        assert value is not None, by_key[key]
        assert value <= ceiling, by_key[key]
    for key, floor in FLOORS.items():
        value = by_key[key].value
        assert value is not None, by_key[key]
        assert value >= floor, by_key[key]


def test_key_mismatches_compare_the_drawn_key_with_the_plan(
    monkeypatch: pytest.MonkeyPatch,
) -> None:
    charts = demo_checked().charts
    done = fake([])
    done.reports = [SimpleNamespace(overlaps=0) for _ in charts]
    assert quality.key_mismatches(done).value is None  # the drawing reports no key
    kinds = ModuleType("tests.quality.kinds")
    kinds.kinds_in_plan = lambda plan: {"no_data"} if plan.gaps else set()  # type: ignore[attr-defined]
    monkeypatch.setitem(sys.modules, "tests.quality.kinds", kinds)
    done.reports = [SimpleNamespace(key_kinds=[]) for _ in charts]
    found = quality.key_mismatches(done)
    gapped = [c.plan.chart_id for c in charts if c.plan.gaps]
    assert found.value == len(gapped) > 0  # a gap drawn, but no key names it
    assert found.detail.startswith(f"{gapped[0]} (no_data)")
