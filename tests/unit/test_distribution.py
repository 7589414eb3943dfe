"""The ``distribution`` intent: histogram and box plans, their problems, checks and drawers.

The data are invented: commuting distances (km) of staff at the offices of a fictional council,
"Larchfield District Council".
"""

from __future__ import annotations

import io
import itertools
import statistics
from typing import Any

import numpy as np
import pytest
from factories import (
    Json,
    context_for,
    encode,
    find,
    guarded,
    intake,
    make_column,
    make_definition,
    make_waiver,
    only_chart,
    plan_of,
    problems_of,
    result_of,
    run_checks,
    status_of,
)
from matplotlib.lines import Line2D
from matplotlib.patches import Rectangle
from matplotlib.text import Text
from pypdf import PdfReader

from service import formatting, pipeline, wording
from service.checks import baseline, lie_factor, scale_note
from service.checks import distribution as checks
from service.checks.results import Status
from service.config import Limits
from service.intents import distribution
from service.intents.compare import scale_note as scale_note_text
from service.intents.plan import Bin, ChartPlan
from service.render import charts
from service.render import layout as render_layout

CIVIC = [1.2, 2.5, 3.1, 3.8, 4.4, 5.0, 5.6, 6.3, 7.1, 7.9, 8.4, 48.0]
DEPOT = [6.8, 9.2, 10.5, 11.8, 12.6, 14.0, 15.3, 17.9, 21.4, 26.0]
COMMUTES = CIVIC + DEPOT


def staff(values: dict[str, list[float | None]] | None = None) -> Json:
    """Dataset 'staff': one row per member of staff, with office and commute (km)."""
    groups = values if values is not None else {"Civic Centre": list(CIVIC), "Depot": list(DEPOT)}
    rows = [{"office": o, "commute": v} for o, vs in groups.items() for v in vs]
    return {
        "name": "staff",
        "source": "Larchfield District Council staff travel survey (invented)",
        "columns": [make_column("office", "text"), make_column("commute", "number", "km")],
        "rows": rows,
    }


def chart(**overrides: Any) -> Json:
    found: Json = {
        "id": "commutes",
        "intent": "distribution",
        "title": "How far staff travel to work",
        "dataset": "staff",
        "measure": "commute",
    }
    found.update(overrides)
    return found


def definition(
    values: dict[str, list[float | None]] | None = None,
    waivers: list[Json] | None = None,
    **overrides: Any,
) -> Json:
    return make_definition(datasets=[staff(values)], charts=[chart(**overrides)], waivers=waivers)


# --- encoder: histogram ---------------------------------------------------------------------------


def _nice(values: list[float], bins: int | str) -> np.ndarray:
    """Round edges for about as many bins as numpy's rule (or the count) gives."""
    count = len(np.histogram_bin_edges(values, bins=bins)) - 1
    return np.asarray(formatting.nice_edges(min(values), max(values), count))


def test_histogram_bins_are_at_round_edges() -> None:
    plan = plan_of(definition())
    edges = _nice(COMMUTES, "auto")
    counts, _ = np.histogram(COMMUTES, bins=edges)
    assert plan.form == "histogram"
    assert [b.count for b in plan.bins] == counts.tolist()
    assert [b.lo for b in plan.bins] == edges[:-1].tolist()
    assert [b.hi for b in plan.bins] == edges[1:].tolist()
    assert plan.baseline == 0.0
    assert (plan.value_axis.lo, plan.value_axis.unit) == (0.0, "observations")
    assert plan.value_axis.hi >= max(counts)
    assert plan.value_axis.label == "Number of values"
    assert plan.x_axis is not None
    assert (plan.x_axis.lo, plan.x_axis.hi) == (edges[0], edges[-1])
    assert (plan.x_axis.unit, plan.x_axis.label) == ("km", "Commute (km)")
    assert plan.guide == "Each bar counts the commute values between its edges. 22 values in all."
    assert plan.notes == []


def test_histogram_with_the_bins_asked_for() -> None:
    plan = plan_of(definition(bins=6))
    counts, _ = np.histogram(COMMUTES, bins=_nice(COMMUTES, 6))
    assert [b.count for b in plan.bins] == counts.tolist()


def test_auto_bins_never_run_to_millions() -> None:
    """A tiny interquartile range with one far value makes numpy's "auto" width tiny; Sturges then."""
    values = np.array([i * 1e-6 for i in range(50)] + [1e6])
    edges = distribution.bin_edges(values, None)
    assert len(edges) <= len(np.histogram_bin_edges(values, bins="sturges")) + 1
    ordinary = np.array(COMMUTES)
    assert distribution.bin_edges(ordinary, None).tolist() == _nice(COMMUTES, "auto").tolist()


def test_missing_values_are_counted_not_zero() -> None:
    plan = plan_of(definition({"Civic Centre": [*CIVIC, None, None], "Depot": DEPOT}))
    assert sum(b.count for b in plan.bins) == len(COMMUTES)
    assert plan.notes == ["2 rows have no commute value: left out, not counted as zero."]
    assert plan.guide is not None
    assert "22 values in all" in plan.guide
    assert plan.bins[0].lo <= min(COMMUTES) < plan.bins[0].hi  # a round edge, no value invented


def test_histogram_passes_the_length_checks() -> None:
    """Bars of counts from zero: the zero-baseline and lie-factor rules hold for a histogram."""
    definition_ = definition()
    plan = plan_of(definition_)
    ctx = context_for(intake(definition_))
    assert baseline.SPEC.measure(plan, ctx).ok
    finding = lie_factor.SPEC.measure(plan, ctx)
    assert finding.ok
    assert finding.measured == 1.0


# --- encoder: box ---------------------------------------------------------------------------------


def test_box_quartiles_whiskers_and_outliers() -> None:
    plan = plan_of(definition(form="box", group="office"))
    assert plan.form == "box"
    assert [(b.label, b.n) for b in plan.boxes] == [("Civic Centre", 12), ("Depot", 10)]
    for box, values in zip(plan.boxes, (CIVIC, DEPOT), strict=True):
        q1, median, q3 = np.percentile(values, [25, 50, 75])
        assert (box.q1, box.median, box.q3) == (q1, median, q3)
        # Source: Python's statistics.quantiles, method="inclusive" (the same linear
        # interpolation as numpy's default, R's type 7) — an independent implementation.
        assert [box.q1, box.median, box.q3] == pytest.approx(
            statistics.quantiles(values, n=4, method="inclusive"), rel=1e-12
        )
        # Tukey's rule: whiskers at the furthest data within 1.5 IQR of the box.
        low_fence, high_fence = q1 - 1.5 * (q3 - q1), q3 + 1.5 * (q3 - q1)
        assert box.low == min(v for v in values if v >= low_fence)
        assert box.high == max(v for v in values if v <= high_fence)
        assert box.outliers == sorted(v for v in values if not low_fence <= v <= high_fence)
    assert plan.boxes[0].outliers == [48.0]
    assert plan.boxes[1].outliers == []
    assert plan.guide == distribution.box_guide("Commute", "en-GB")
    assert plan.guide.startswith("The box holds the middle half of the commute values")


def test_one_box_without_groups() -> None:
    plan = plan_of(definition(form="box"))
    (box,) = plan.boxes
    assert (box.label, box.n) == ("All", len(COMMUTES))
    assert box.median == float(np.median(COMMUTES))


def test_box_scale_off_zero_is_noted() -> None:
    far = {"Outpost": [101.0, 104.5, 108.0, 111.2, 113.9, 120.4]}
    definition_ = definition(far, form="box")
    plan = plan_of(definition_)
    assert plan.value_axis.lo > 0
    assert plan.notes == [scale_note_text(plan.value_axis, "en-GB")]
    assert scale_note.SPEC.measure(plan, context_for(intake(definition_))).ok


# --- problems -------------------------------------------------------------------------------------


def test_too_few_observations() -> None:
    found = find(
        problems_of(definition({"Civic Centre": [3.0, 4.0, None, 5.0, 6.0]})),
        "too_few_observations",
    )
    assert found.path == "sections[0].charts[0].measure"
    assert found.value == 4
    assert "only 4 values of 'commute'" in found.message


def test_all_missing() -> None:
    found = find(problems_of(definition({"Civic Centre": [None] * 6})), "no_values")
    assert found.path == "sections[0].charts[0].measure"


def test_too_many_groups() -> None:
    groups: dict[str, list[float | None]] = {f"Office {i}": [1.0, 2, 3, 4, 5] for i in range(4)}
    problems = problems_of(definition(groups, form="box", group="office"), Limits(max_categories=3))
    found = find(problems, "limit_exceeded")
    assert found.path == "sections[0].charts[0].group"
    assert found.context == {"limit": 3, "setting": "max_categories"}


def test_a_small_group_and_a_histogram_with_groups() -> None:
    small = {"Civic Centre": CIVIC, "Annexe": [2.0, 3.0]}
    found = find(problems_of(definition(small, form="box", group="office")), "too_few_observations")
    assert (found.path, found.value) == ("sections[0].charts[0].group", "Annexe (2)")
    grouped = find(problems_of(definition(group="office")), "group_needs_box")
    assert grouped.hint == "use form 'box', or leave out 'group'"


def test_rows_without_a_group() -> None:
    definition_ = definition(form="box", group="office")
    definition_["datasets"][0]["rows"][0]["office"] = None
    found = find(problems_of(definition_), "group_missing")
    assert "1 rows of dataset 'staff' have no 'office'" in found.message


def test_empty_dataset() -> None:
    found = find(problems_of(definition({})), "empty_dataset")
    assert found.path == "sections[0].charts[0].dataset"


# --- checks ---------------------------------------------------------------------------------------


@pytest.mark.parametrize("form", ["histogram", "box"])
def test_reading_guide_passes(form: str) -> None:
    found = result_of(run_checks(definition(form=form)), "reading-guide")
    assert (found.status, found.measured_text) == (Status.passed, "given")


@pytest.mark.parametrize(
    ("form", "broken"),
    [("histogram", None), ("box", ""), ("box", "The box holds\nthe middle half.")],
)
def test_reading_guide_is_added(form: str, broken: str | None) -> None:
    definition_ = definition(form=form)
    plan = plan_of(definition_)
    bad = plan.model_copy(update={"guide": broken})
    assert not checks.SPEC_GUIDE.measure(bad, context_for(intake(definition_))).ok
    result = guarded(definition_, bad)
    assert status_of(result, "reading-guide") is Status.corrected
    assert result.plan.guide == plan.guide


def test_generic_guide_for_a_chart_of_another_kind() -> None:
    """The correction still gives a guide when the definition cannot name the measure."""
    ctx = context_for(intake(make_definition()))  # a trend chart
    plan = plan_of(definition(form="box")).model_copy(update={"guide": None})
    assert checks.guide_for(plan, ctx) == wording.say(checks.GENERIC_GUIDES["box"], "en-GB")


def test_histogram_bins_even_passes() -> None:
    found = result_of(run_checks(definition()), "histogram-bins-even")
    assert (found.status, found.measured) == (Status.passed, 1.0)
    assert found.measured_text.endswith(" km")


def _with_bins(plan: ChartPlan, edges: list[float]) -> ChartPlan:
    bins = [Bin(lo=a, hi=b, count=3) for a, b in itertools.pairwise(edges)]
    return plan.model_copy(update={"bins": bins})


@pytest.mark.parametrize(
    ("edges", "shown"),
    [
        ([0.0, 5.0, 10.0, 20.0, 50.0], "5 km to 30 km"),  # uneven widths, raw counts
        ([0.0, 5.0, 10.0], None),  # even, passes
    ],
)
def test_uneven_bins_fail(edges: list[float], shown: str | None) -> None:
    definition_ = definition()
    bad = _with_bins(plan_of(definition_), edges)
    finding = checks.SPEC_BINS.measure(bad, context_for(intake(definition_)))
    assert finding.ok is (shown is None)
    if shown is None:
        return
    assert finding.shown == shown
    assert finding.measured == 6.0
    result = guarded(definition_, bad)
    assert status_of(result, "histogram-bins-even") is Status.failed
    assert any(f.startswith("histogram-bins-even:") for f in result.plan.flags)


def test_bins_apart_or_missing_fail() -> None:
    definition_ = definition()
    plan = plan_of(definition_)
    ctx = context_for(intake(definition_))
    apart = plan.model_copy(update={"bins": [Bin(lo=0, hi=5, count=1), Bin(lo=6, hi=11, count=2)]})
    assert checks.SPEC_BINS.measure(apart, ctx).shown == "bins apart"
    assert not checks.SPEC_BINS.measure(plan.model_copy(update={"bins": []}), ctx).ok
    flat = plan.model_copy(update={"bins": [Bin(lo=2, hi=2, count=1)]})
    assert not checks.SPEC_BINS.measure(flat, ctx).ok


@pytest.mark.parametrize("check", ["reading-guide", "histogram-bins-even"])
def test_the_checks_cannot_be_waived(check: str) -> None:
    found = find(problems_of(definition(waivers=[make_waiver(check, "commutes")])), "not_waivable")
    assert found.path == "waivers[0].check"


# --- drawers --------------------------------------------------------------------------------------


def _figure(plan: ChartPlan) -> Any:
    figure = charts.figure_for(plan)
    figure.canvas.draw()
    return figure


def test_histogram_bars_are_the_counts_from_zero_and_touch() -> None:
    plan = only_chart(run_checks(definition({"Civic Centre": [*CIVIC, None], "Depot": DEPOT}))).plan
    figure = _figure(plan)
    ax = figure.axes[0]
    bars = sorted((p for p in ax.patches if isinstance(p, Rectangle)), key=lambda p: p.get_x())
    assert [p.get_height() for p in bars] == [b.count for b in plan.bins]
    assert all(p.get_y() == 0.0 for p in bars)
    assert [p.get_x() for p in bars] == [b.lo for b in plan.bins]
    for left, right in itertools.pairwise(bars):
        assert left.get_x() + left.get_width() == pytest.approx(right.get_x())  # touching
    zero_px = ax.transData.transform((0, 0))[1]
    assert all(p.get_window_extent().y0 == pytest.approx(zero_px) for p in bars)
    assert ax.get_ylim() == (0.0, plan.value_axis.hi)
    assert ax.get_xlabel() == "Commute (km)"
    assert ax.get_ylabel() == "Number of values"
    _guide_is_shown_apart_from_the_notes(figure, plan)


def _text(figure: Any, content: str) -> Text:
    return next(t for t in figure.findobj(Text) if isinstance(t, Text) and t.get_text() == content)


def _guide_is_shown_apart_from_the_notes(figure: Any, plan: ChartPlan) -> None:
    ax = figure.axes[0]
    assert " ".join(figure.get_supxlabel().split()) == plan.guide
    label = _text(figure, figure.get_supxlabel())
    assert label.get_parse_math() is False
    assert plan.notes, "the test data leave a note on the chart"
    notes = _text(figure, ax.get_title(loc="left"))
    assert not label.get_window_extent().overlaps(notes.get_window_extent())
    assert not label.get_window_extent().overlaps(ax.xaxis.label.get_window_extent())
    assert render_layout.measure(figure) == (0, 0)  # nothing overlaps or is cut off


def test_box_positions_are_the_quartiles() -> None:
    plan = only_chart(
        run_checks(
            definition({"Civic Centre": [*CIVIC, None], "Depot": DEPOT}, form="box", group="office")
        )
    ).plan
    figure = _figure(plan)
    ax = figure.axes[0]
    rects = [p for p in ax.patches if isinstance(p, Rectangle) and p.get_gid() == "box"]
    medians = [line for line in ax.get_lines() if line.get_gid() == "median"]
    outliers = [line for line in ax.get_lines() if line.get_gid() == "outliers"]
    whiskers = [line for line in ax.get_lines() if line.get_gid() == "whisker"]
    assert len(rects) == len(medians) == 2
    for rect, median, box in zip(rects, medians, plan.boxes, strict=True):
        assert rect.get_x() == box.q1
        assert rect.get_x() + rect.get_width() == pytest.approx(box.q3)
        assert list(median.get_xdata()) == [box.median, box.median]
    ends = sorted(float(x) for line in whiskers for x in line.get_xdata())
    expected = sorted(v for b in plan.boxes for v in (b.low, b.q1, b.q3, b.high))
    assert ends == pytest.approx(expected)
    assert [list(line.get_xdata()) for line in outliers] == [[48.0]]
    assert isinstance(outliers[0], Line2D)
    labels = [t.get_text() for t in ax.get_yticklabels()]
    assert labels == ["Civic Centre (n = 12)", "Depot (n = 10)"]
    assert ax.get_xlabel() == "Commute (km)"
    _guide_is_shown_apart_from_the_notes(figure, plan)


@pytest.mark.parametrize("form", ["histogram", "box"])
def test_renders_to_pdf(form: str) -> None:
    pdf = charts.draw(only_chart(run_checks(definition(form=form))).plan)
    assert pdf.startswith(b"%PDF")
    text = " ".join(PdfReader(io.BytesIO(pdf)).pages[0].extract_text().split())
    assert ("Each bar counts" if form == "histogram" else "The box holds") in text


# --- end to end -----------------------------------------------------------------------------------


@pytest.mark.parametrize("form", ["histogram", "box"])
def test_pipeline_builds_a_pack(form: str) -> None:
    extra = {"group": "office"} if form == "box" else {}
    built = pipeline.build(encode(definition(form=form, **extra)), Limits())
    assert not built.blocked
    mine = {r["check"]: r["status"] for r in built.results}
    assert mine["reading-guide"] == "passed"
    if form == "histogram":
        assert mine["histogram-bins-even"] == "passed"
    text = " ".join(
        " ".join(page.extract_text().split()) for page in PdfReader(io.BytesIO(built.pdf)).pages
    )
    assert "How far staff travel to work" in text
    guide = "furthest values within 1.5 box-lengths" if form == "box" else "values in all"
    assert guide in text
