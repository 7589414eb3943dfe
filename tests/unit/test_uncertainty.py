"""The ``uncertainty`` check: ANOVA from summary statistics, the non-overlap rule, and the pipeline."""

from __future__ import annotations

from typing import Any

import numpy as np
import pytest
from factories import (
    Json,
    context_for,
    find,
    guarded,
    intake,
    make_column,
    make_compare_definition,
    make_definition,
    make_waiver,
    only_chart,
    plan_of,
    problems_of,
    result_of,
    run_checks,
    status_of,
)
from scipy import stats

from service.checks import uncertainty
from service.checks.results import Status

# An invented survey of a fictional housing association's tenants: mean satisfaction rating
# (0 to 10) per estate, with its standard deviation and number of replies.
APART = {"Ashgrove": (6.1, 1.8, 120), "Brookside": (7.4, 1.6, 95), "Cedar Court": (6.8, 2.0, 140)}
CLOSE = {"Ashgrove": (6.9, 2.1, 25), "Brookside": (7.1, 1.9, 30), "Cedar Court": (7.0, 2.2, 20)}


def survey(estates: dict[str, tuple[float, float, int]]) -> Json:
    return {
        "name": "tenants",
        "source": "Tenant survey, autumn 2026 (invented)",
        "columns": [
            make_column("estate", "text"),
            make_column("rating", "number", "points"),
            make_column("sd", "number"),
            make_column("n", "integer"),
        ],
        "rows": [{"estate": e, "rating": m, "sd": s, "n": n} for e, (m, s, n) in estates.items()],
    }


def survey_chart(**overrides: Any) -> Json:
    chart: Json = {
        "id": "satisfaction",
        "intent": "compare",
        "title": "Tenant satisfaction by estate",
        "dataset": "tenants",
        "category": "estate",
        "measure": "rating",
        "interval": {"sd": "sd", "n": "n"},
    }
    chart.update(overrides)
    return chart


def survey_definition(
    estates: dict[str, tuple[float, float, int]], waivers: list[Json] | None = None, **chart: Any
) -> Json:
    return make_definition(
        datasets=[survey(estates)], charts=[survey_chart(**chart)], waivers=waivers
    )


def samples_with(mean: float, sd: float, n: int, seed: int) -> np.ndarray:
    """A sample of size n with exactly the given mean and standard deviation (n − 1 divisor)."""
    raw = np.random.default_rng(seed).normal(size=n)
    return mean + sd * (raw - raw.mean()) / raw.std(ddof=1)


@pytest.mark.parametrize("groups", [APART, CLOSE, {"a": (10.0, 3.0, 4), "b": (14.0, 2.5, 7)}])
def test_anova_from_summary_statistics_matches_scipy_on_raw_samples(
    groups: dict[str, tuple[float, float, int]],
) -> None:
    samples = [samples_with(m, s, n, seed) for seed, (m, s, n) in enumerate(groups.values())]
    means, sds, ns = zip(*groups.values(), strict=True)
    found = uncertainty.anova(list(means), list(sds), [float(n) for n in ns])
    # Source: scipy.stats.f_oneway (the reference library) on raw samples built to have exactly
    # these means, standard deviations and sizes.
    reference = stats.f_oneway(*samples)
    assert found.f == pytest.approx(reference.statistic, rel=1e-9)
    assert found.p == pytest.approx(reference.pvalue, rel=1e-9)
    assert (found.df_between, found.df_within) == (len(groups) - 1, sum(ns) - len(groups))


def test_anova_without_spread_inside_groups() -> None:
    assert uncertainty.anova([1.0, 2.0], [0.0, 0.0], [3.0, 3.0]).p == 0.0
    assert uncertainty.anova([1.0, 1.0], [0.0, 0.0], [3.0, 3.0]).p == 1.0


@pytest.mark.parametrize(
    ("intervals", "apart"),
    [
        ({"a": (1.0, 2.0), "b": (3.0, 4.0)}, [("a", "b")]),  # disjoint
        ({"a": (3.0, 4.0), "b": (1.0, 2.0)}, [("a", "b")]),  # disjoint, either order
        ({"a": (1.0, 3.0), "b": (2.0, 4.0)}, []),  # partly overlapping
        ({"a": (1.0, 5.0), "b": (2.0, 3.0)}, []),  # one inside the other
        ({"a": (1.0, 2.0), "b": (2.0, 3.0)}, []),  # touching ends count as overlapping
        ({"a": (1.0, 2.0), "b": (1.5, 3.0), "c": (2.5, 4.0)}, [("a", "c")]),
    ],
)
def test_non_overlapping_intervals_rule(
    intervals: dict[str, tuple[float, float]], apart: list[tuple[str, str]]
) -> None:
    # Non-overlap implies a difference; overlap does not prove equality (Schenker & Gentleman
    # 2001, The American Statistician 55(3); from memory).
    found, pairs = uncertainty.separate_pairs(intervals)
    assert found == apart
    assert pairs == len(intervals) * (len(intervals) - 1) // 2


def test_plural_of_category_names() -> None:
    assert [uncertainty.plural(w) for w in ("estate", "category", "bus", "day")] == [
        "estates",
        "categories",
        "buses",
        "days",
    ]


def _expected(groups: dict[str, tuple[float, float, int]]) -> Any:
    samples = [samples_with(m, s, n, seed) for seed, (m, s, n) in enumerate(groups.values())]
    return stats.f_oneway(*samples)  # Source: scipy.stats.f_oneway, the reference library


def test_distinguishable_estates_are_said_so_on_the_chart() -> None:
    checked = run_checks(survey_definition(APART))
    found = result_of(checked, "uncertainty")
    reference = _expected(APART)
    assert (
        found.status is Status.corrected
    )  # the encoder draws intervals; the check adds the verdict
    assert found.measured == pytest.approx(reference.pvalue, abs=1e-6)
    assert found.measured_text.startswith("distinguishable (p ")
    f_text = f"{reference.statistic:.2f}"
    assert f"Differences between estates are distinguishable: one-way ANOVA F = {f_text}" in (
        found.explanation
    )
    plan = only_chart(checked).plan
    (note,) = [n for n in plan.notes if n.startswith("Differences between estates")]
    assert (
        note
        == f"Differences between estates are beyond chance (one-way ANOVA F = {f_text}, "
        + ("p < 0.0001)." if reference.pvalue < 1e-4 else f"p = {reference.pvalue:.4f}).")
    )
    assert "\n" not in note
    assert all(c.lo is not None and c.hi is not None for c in plan.categories)


def test_close_estates_are_not_distinguishable() -> None:
    checked = run_checks(survey_definition(CLOSE))
    found = result_of(checked, "uncertainty")
    reference = _expected(CLOSE)
    assert reference.pvalue > 0.05
    assert found.status is Status.corrected
    assert found.measured == pytest.approx(reference.pvalue, abs=1e-6)
    assert found.measured_text == f"not distinguishable (p = {reference.pvalue:.4f})"
    assert "not distinguishable from chance" in found.explanation
    plan = only_chart(checked).plan
    assert any(n.endswith("do not rank them.") for n in plan.notes)


def test_the_level_sets_alpha() -> None:
    # p ≈ 0.073: not distinguishable at the 95% level, distinguishable at 90 %
    groups = {
        "Ashgrove": (6.5, 1.9, 60),
        "Brookside": (7.3, 1.9, 60),
        "Cedar Court": (6.9, 1.9, 60),
    }
    assert 0.05 < _expected(groups).pvalue < 0.10
    texts = [
        result_of(
            run_checks(survey_definition(groups, interval={"sd": "sd", "n": "n", "level": level})),
            "uncertainty",
        ).measured_text
        for level in (0.95, 0.90)
    ]
    assert texts[0].startswith("not distinguishable")
    assert texts[1].startswith("distinguishable")


def test_a_plan_with_the_note_and_intervals_passes() -> None:
    definition = survey_definition(APART)
    done = only_chart(run_checks(definition)).plan
    result = guarded(definition, done)
    assert status_of(result, "uncertainty") is Status.passed


def test_missing_intervals_fail_the_measure_and_are_put_back() -> None:
    definition = survey_definition(APART)
    done = only_chart(run_checks(definition)).plan
    bare = [c.model_copy(update={"lo": None, "hi": None}) for c in done.categories]
    broken = done.model_copy(update={"categories": bare})
    finding = uncertainty.SPEC.measure(broken, context_for(intake(definition)))
    assert not finding.ok
    assert "the intervals of" in finding.detail
    result = guarded(definition, broken)
    assert status_of(result, "uncertainty") is Status.corrected
    assert [(c.lo, c.hi) for c in result.plan.categories] == [(c.lo, c.hi) for c in done.categories]


def bounds_definition(bounds: dict[str, tuple[float, float, float]]) -> Json:
    """Routes with an on-time share and the bounds of its interval."""
    dataset = {
        "name": "punctuality",
        "columns": [
            make_column("route", "text"),
            make_column("on_time", "number", "%"),
            make_column("low", "number"),
            make_column("high", "number"),
        ],
        "rows": [
            {"route": r, "on_time": v, "low": lo, "high": hi} for r, (v, lo, hi) in bounds.items()
        ],
    }
    chart = {
        "id": "on-time",
        "intent": "compare",
        "title": "Departures on time by route",
        "dataset": "punctuality",
        "category": "route",
        "measure": "on_time",
        "interval": {"lower": "low", "upper": "high"},
    }
    return make_definition(datasets=[dataset], charts=[chart])


def test_bounds_only_use_the_non_overlap_rule() -> None:
    bounds = {"1": (91.0, 89.0, 93.0), "2": (84.0, 81.0, 87.0), "3": (88.0, 85.0, 90.0)}
    checked = run_checks(bounds_definition(bounds))
    found = result_of(checked, "uncertainty")
    assert found.status is Status.corrected
    assert (found.measured, found.measured_text) == (1, "1 of 3 pairs apart")
    assert "1–2" in found.explanation
    assert "overlapping intervals do not prove the values equal" in found.explanation
    plan = only_chart(checked).plan
    assert (
        "Intervals (95%) do not overlap for 1 of 3 pairs of routes (1–2); overlap does not "
        "prove equality." in plan.notes
    )


def test_overlapping_bounds_are_not_distinguishable() -> None:
    bounds = {"1": (91.0, 85.0, 97.0), "2": (84.0, 78.0, 90.0)}
    found = result_of(run_checks(bounds_definition(bounds)), "uncertainty")
    assert (found.measured, found.measured_text) == (0, "0 of 1 pair apart")
    assert found.explanation.startswith("Every pair of routes has overlapping 95% intervals")


def test_chart_without_interval_passes() -> None:
    checked = run_checks(make_compare_definition({"a": 93.4, "b": 88.9}))
    found = result_of(checked, "uncertainty")
    assert (found.status, found.measured_text) == (Status.passed, "no uncertainty given")


def test_too_few_intervals_cannot_be_judged() -> None:
    checked = run_checks(survey_definition({"Ashgrove": (6.1, 1.8, 120)}))
    found = result_of(checked, "uncertainty")
    assert found.measured_text == "too few intervals"


def test_uncertainty_cannot_be_waived() -> None:
    waiver = make_waiver("uncertainty", "satisfaction")
    problem = find(problems_of(survey_definition(APART, waivers=[waiver])), "not_waivable")
    assert problem.path == "waivers[0].check"
    assert plan_of(survey_definition(APART)).form == "bars"
