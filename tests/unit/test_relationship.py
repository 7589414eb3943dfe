"""The ``relationship`` intent: the scatter plan, its problems, the fit check and the drawer.

The data are invented: for staff of a fictional council ("Larchfield District Council"), the
distance of each commute (km) against the time it takes (min).
"""

from __future__ import annotations

import io
from typing import Any

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
from matplotlib.collections import PathCollection
from matplotlib.text import Annotation
from pypdf import PdfReader
from scipy import stats

from service import pipeline
from service.checks import distribution as checks
from service.checks import scale_note
from service.checks.results import Status
from service.config import Limits
from service.intents import relationship
from service.intents.compare import scale_note as scale_note_text
from service.intents.plan import ChartPlan, Fit
from service.render import charts
from service.render import layout as render_layout

Row = tuple[str, float | None, float | None]
TRIPS: list[Row] = [
    ("Planning", 2.4, 11.0),
    ("Housing", 3.2, 14.0),
    ("Parks", 5.1, 20.0),
    ("Waste", 6.3, 18.0),
    ("Finance", 7.8, 27.0),
    ("Licensing", 8.9, 22.0),
    ("Legal", 9.4, 24.0),
    ("Leisure", 11.7, 29.0),
    ("Highways", 12.5, 35.0),
    ("Revenues", 15.2, 31.0),
    ("Elections", 18.6, 44.0),
]
GAPS: list[Row] = [("Audit", None, 30.0), ("Estates", 4.0, None), ("Payroll", None, None)]


def trips(rows: list[Row] | None = None) -> Json:
    return {
        "name": "trips",
        "source": "Larchfield District Council staff travel survey (invented)",
        "columns": [
            make_column("team", "text"),
            make_column("distance", "number", "km"),
            make_column("time", "number", "min"),
        ],
        "rows": [{"team": t, "distance": d, "time": m} for t, d, m in rows or TRIPS],
    }


def chart(**overrides: Any) -> Json:
    found: Json = {
        "id": "distance-time",
        "intent": "relationship",
        "title": "Longer commutes take longer",
        "dataset": "trips",
        "x": "distance",
        "y": "time",
    }
    found.update(overrides)
    return found


def definition(
    rows: list[Row] | None = None, waivers: list[Json] | None = None, **overrides: Any
) -> Json:
    return make_definition(datasets=[trips(rows)], charts=[chart(**overrides)], waivers=waivers)


XS = [float(d) for _, d, _ in TRIPS if d is not None]
YS = [float(m) for _, _, m in TRIPS if m is not None]


# --- encoder --------------------------------------------------------------------------------------


def test_points_axes_and_dropped_rows() -> None:
    plan = plan_of(definition(TRIPS + GAPS, label="team"))
    assert plan.form == "scatter"
    assert [(p.label, p.x, p.y) for p in plan.points] == TRIPS
    assert plan.x_axis is not None
    assert (plan.x_axis.unit, plan.x_axis.label) == ("km", "Distance (km)")
    assert (plan.value_axis.unit, plan.value_axis.label) == ("min", "Time (min)")
    assert plan.x_axis.lo <= min(XS)
    assert plan.x_axis.hi >= max(XS)
    assert plan.value_axis.lo <= min(YS)
    assert plan.value_axis.hi >= max(YS)
    assert plan.notes == [  # the scale fits the times (10 to 40 min), and says so
        scale_note_text(plan.value_axis, "en-GB"),
        "3 rows without both values are not shown.",
    ]
    assert plan.fit is None
    assert plan.guide == (
        "Each dot is one team: further right means more distance, higher means more time."
    )


def test_least_squares_line_agrees_with_scipy() -> None:
    plan = plan_of(definition(TRIPS + GAPS, fit=True))
    assert plan.fit is not None
    reference = stats.linregress(XS, YS)
    # Source: SciPy, scipy.stats.linregress (slope, intercept, rvalue) — an independent fit.
    assert plan.fit.slope == pytest.approx(reference.slope, rel=1e-12)
    assert plan.fit.intercept == pytest.approx(reference.intercept, rel=1e-12)
    assert plan.fit.r2 == pytest.approx(reference.rvalue**2, rel=1e-12)
    r2 = f"{reference.rvalue**2:.2f}"
    share = round(reference.rvalue**2 * 100)
    assert plan.guide == (
        "Each dot is one row: further right means more distance, higher means more time. "
        f"The line is the least-squares fit (r² = {r2}: the line accounts for {share}% of the "
        "variation in time); it shows association, not cause."
    )


def test_least_squares_of_a_known_line() -> None:
    """Points exactly on y = 2x + 1 (common practice (no source): a perfect fit has r² = 1)."""
    assert relationship.least_squares([0, 1, 2, 3], [1, 3, 5, 7]) == Fit(
        slope=2.0, intercept=1.0, r2=1.0
    )
    assert relationship.least_squares([1, 1, 1], [1, 2, 3]) is None
    assert relationship.least_squares([1], [1]) is None


def test_axes_off_zero_are_both_noted() -> None:
    far: list[Row] = [(f"T{i}", 100.0 + i * 3.1, 50.0 + i * 0.7) for i in range(8)]
    definition_ = definition(far)
    plan = plan_of(definition_)
    assert plan.x_axis is not None
    assert plan.x_axis.lo > 0
    assert plan.value_axis.lo > 0
    assert plan.notes == [
        scale_note_text(plan.value_axis, "en-GB"),
        relationship.horizontal_note(plan.x_axis, "en-GB"),
    ]
    assert plan.notes[1].startswith("Horizontal scale starts at ")
    assert plan.notes[1].endswith(" km, not zero: compare positions, not lengths.")
    assert scale_note.SPEC.measure(plan, context_for(intake(definition_))).ok


def test_many_points_are_not_named() -> None:
    many: list[Row] = [(f"T{i}", float(i), float(i % 5)) for i in range(16)]
    assert all(p.label is None for p in plan_of(definition(many, label="team")).points)
    assert all(p.label for p in plan_of(definition(many[:15], label="team")).points)


# --- problems -------------------------------------------------------------------------------------


def test_too_few_points() -> None:
    found = find(problems_of(definition(TRIPS[:2] + GAPS)), "too_few_points")
    assert (found.path, found.value) == ("sections[0].charts[0].y", 2)
    assert "only 2 rows have both 'distance' and 'time'" in found.message


def test_empty_dataset() -> None:
    definition_ = definition()
    definition_["datasets"][0]["rows"] = []
    assert find(problems_of(definition_), "empty_dataset").path == "sections[0].charts[0].dataset"


@pytest.mark.parametrize(
    ("axis", "rows"),
    [
        ("x", [("a", 5.0, 1.0), ("b", 5.0, 2.0), ("c", 5.0, 4.0)]),
        ("y", [("a", 1.0, 3.0), ("b", 2.0, 3.0), ("c", 4.0, 3.0)]),
    ],
)
def test_a_fit_needs_variation(axis: str, rows: list[Row]) -> None:
    found = find(problems_of(definition(rows, fit=True)), "no_variation")
    assert found.path == f"sections[0].charts[0].{axis}"
    assert found.hint == "set 'fit' to false"
    run_checks(definition(rows))  # without a fit the same data are fine


# --- checks ---------------------------------------------------------------------------------------


@pytest.mark.parametrize("fit", [True, False])
def test_fit_on_request_passes(fit: bool) -> None:
    checked = run_checks(definition(fit=fit))
    found = result_of(checked, "fit-on-request")
    assert found.status is (Status.passed if fit else Status.not_applicable)
    plan = only_chart(checked).plan
    assert (plan.fit is not None) is fit
    if fit:
        assert plan.fit is not None
        assert found.measured_text == relationship.r2_text(plan.fit, "en-GB")
        assert found.measured_text in (plan.guide or "")
    assert result_of(checked, "reading-guide").status is Status.passed


def _broken(definition_: Json, **update: Any) -> tuple[ChartPlan, ChartPlan]:
    plan = plan_of(definition_)
    return plan, plan.model_copy(update=update)


def test_a_line_not_asked_for_is_removed() -> None:
    asked, _ = _broken(definition(fit=True))
    definition_ = definition()
    plan, bad = _broken(definition_, fit=asked.fit, guide=asked.guide)
    finding = checks.SPEC_FIT.measure(bad, context_for(intake(definition_)))
    assert (finding.ok, finding.shown) == (False, "line not asked for")
    result = guarded(definition_, bad)
    assert status_of(result, "fit-on-request") is Status.corrected
    assert result.plan.fit is None
    assert result.plan.guide == plan.guide
    assert "r²" not in (result.plan.guide or "")


@pytest.mark.parametrize(
    ("update", "shown"),
    [
        ({"fit": None}, "none"),  # asked, not drawn
        ({"guide": "Each dot is one row."}, "r² not shown"),
        ({"fit": Fit(slope=1.0, intercept=0.0, r2=0.5)}, "not the least-squares line"),
    ],
)
def test_an_asked_line_is_drawn_right_with_its_r2(update: dict[str, Any], shown: str) -> None:
    definition_ = definition(fit=True)
    plan, bad = _broken(definition_, **update)
    finding = checks.SPEC_FIT.measure(bad, context_for(intake(definition_)))
    assert (finding.ok, finding.shown) == (False, shown)
    result = guarded(definition_, bad)
    assert status_of(result, "fit-on-request") is Status.corrected
    assert (result.plan.fit, result.plan.guide) == (plan.fit, plan.guide)


def test_r2_in_a_note_counts_as_shown() -> None:
    definition_ = definition(fit=True)
    plan = plan_of(definition_)
    assert plan.fit is not None
    text = relationship.r2_text(plan.fit, "en-GB")
    moved = plan.model_copy(update={"guide": "Each dot is one row.", "notes": [f"Line: {text}."]})
    assert checks.SPEC_FIT.measure(moved, context_for(intake(definition_))).ok


def test_a_missing_scatter_guide_is_added() -> None:
    definition_ = definition(fit=True, label="team")
    plan, bad = _broken(definition_, guide=None)
    assert not checks.SPEC_GUIDE.measure(bad, context_for(intake(definition_))).ok
    result = guarded(definition_, bad)
    assert status_of(result, "reading-guide") is Status.corrected
    assert result.plan.guide == plan.guide


@pytest.mark.parametrize("check", ["fit-on-request", "reading-guide"])
def test_the_checks_cannot_be_waived(check: str) -> None:
    waiver = make_waiver(check, "distance-time")
    assert (
        find(problems_of(definition(waivers=[waiver])), "not_waivable").path == "waivers[0].check"
    )


# --- drawer ---------------------------------------------------------------------------------------


def test_scatter_draws_each_point_and_the_line() -> None:
    plan = only_chart(run_checks(definition(TRIPS + GAPS, fit=True, label="team"))).plan
    figure = charts.figure_for(plan)
    figure.canvas.draw()
    ax = figure.axes[0]
    (dots,) = [c for c in ax.collections if isinstance(c, PathCollection)]
    assert [tuple(o) for o in dots.get_offsets()] == [(p.x, p.y) for p in plan.points]
    (line,) = [line for line in ax.get_lines() if line.get_gid() == "fit"]
    (x0, x1), (y0, y1) = line.get_xdata(), line.get_ydata()
    assert plan.fit is not None
    assert (y1 - y0) / (x1 - x0) == pytest.approx(plan.fit.slope)
    assert y0 == pytest.approx(plan.fit.intercept + plan.fit.slope * x0)
    assert (x0, x1) == (min(XS), max(XS))  # the line stays within the data
    names = [t.get_text() for t in ax.texts if isinstance(t, Annotation)]
    assert names == [p.label for p in plan.points]
    assert all(not t.get_parse_math() for t in ax.texts)
    assert (ax.get_xlabel(), ax.get_ylabel()) == ("Distance (km)", "Time (min)")
    assert plan.x_axis is not None
    assert ax.get_xlim() == (plan.x_axis.lo, plan.x_axis.hi)
    assert ax.get_ylim() == (plan.value_axis.lo, plan.value_axis.hi)
    assert " ".join(figure.get_supxlabel().split()) == plan.guide
    assert ax.get_title(loc="left").split("\n")[0] == plan.notes[0]
    assert render_layout.measure(figure) == (0, 0)


def test_scatter_without_a_fit_has_no_line() -> None:
    plan = only_chart(run_checks(definition())).plan
    figure = charts.figure_for(plan)
    ax = figure.axes[0]
    assert not [line for line in ax.get_lines() if line.get_gid() == "fit"]
    assert not ax.texts
    pdf = charts.draw(plan)
    assert pdf.startswith(b"%PDF")
    text = " ".join(PdfReader(io.BytesIO(pdf)).pages[0].extract_text().split())
    assert "Each dot is one row" in text


# --- end to end -----------------------------------------------------------------------------------


def test_pipeline_builds_a_pack() -> None:
    built = pipeline.build(encode(definition(TRIPS + GAPS, fit=True, label="team")), Limits())
    assert not built.blocked
    statuses = {r["check"]: r["status"] for r in built.results}
    assert statuses["fit-on-request"] == statuses["reading-guide"] == "passed"
    text = " ".join(
        " ".join(page.extract_text().split()) for page in PdfReader(io.BytesIO(built.pdf)).pages
    )
    assert "Longer commutes take longer" in text
    assert "it shows association, not cause" in text
    assert "3 rows without both values are not shown." in text
