"""Every generated sentence of every intent reads as written for people, in English and German.

A set of generated charts covers every intent and form (percent, currency, count and plain units;
gaps, partial periods, estimates, projections, short and long histories, intervals, missing parts,
dropped rows). Their column names are identifiers (``on_time_share``, ``kpiTotal``) and every
measure has a label, so a generated text that prints a column instead of its label is caught. The
visible text of each checked plan (title aside: the author's) and every check's finding must carry
no identifier with ``_``, no labelled column's own name, no double space and no doubled
punctuation.
"""

from __future__ import annotations

import math
import random
import re
from typing import Any

import pytest

from service.checks.outcome import Checked
from service.checks.registry import CHECKS
from service.wording import en
from tests.factories import Json, make_definition, make_report, run_checks

LABELS = {
    "on_time_share": "On-time journeys",
    "op_cost": "Operating cost",
    "fare_gbp": "Fare revenue",
    "kpiTotal": "Passenger boardings",
    "late_min": "Minutes late",
    "route_km": "Route length",
    "resp_n": "Responses",
    "rating_sd": "Rating spread",
    "rating_mean": "Satisfaction rating",
    "plan_trips": "Planned journeys",
    "done_trips": "Operated journeys",
    "est_trips": "Forecast journeys",
    "ticket_type": "Ticket",
    "route_name": "Route",
    "depot_name": "Depot",
    "month_start": "Month",
    "complaint_count": "Complaints",
}

MONTHS = [f"{2024 + (m // 12)}-{m % 12 + 1:02d}-01" for m in range(10, 35)]  # Nov 2024 – Nov 2026
ROUTES = ["7 Mill Lane", "21 Market express", "3 Upper Hollin", "9 College", "12 Hospital loop"]


def _column(name: str, type_: str, unit: str | None = None, **extra: Any) -> Json:
    column: Json = {"name": name, "type": type_, "label": LABELS[name], **extra}
    if unit is not None:
        column["unit"] = unit
    return column


def _monthly(rng: random.Random) -> Json:
    rows = []
    for i, month in enumerate(MONTHS):
        gap = i == 20  # one month without data
        rows.append(
            {
                "month_start": month,
                "kpiTotal": None if gap else int(50000 + 900 * math.sin(i) + rng.randint(0, 800)),
                "op_cost": None if gap else round(80000 + 450.5 * i + rng.random() * 300, 2),
                "on_time_share": None if gap else round(88 + 4 * rng.random(), 1),
                "complaint_count": 40 + rng.randint(0, 12) + (25 if i == 23 else 0),
                "plan_trips": 6000 + 10 * i,
                "done_trips": 5900 + 9 * i - (60 if i % 5 == 0 else 0),
                "est_trips": 6100 + 11 * i,
            }
        )
    return {
        "name": "monthly_ops",
        "columns": [
            _column("month_start", "date"),
            _column("kpiTotal", "integer", "boardings", projectable=True),
            _column("op_cost", "number", "GBP"),
            _column("on_time_share", "number", "%"),
            _column("complaint_count", "integer", "complaints"),
            _column("plan_trips", "integer", "journeys"),
            _column("done_trips", "integer", "journeys"),
            _column("est_trips", "integer", "journeys", estimate=True),
        ],
        "time_column": "month_start",
        "frequency": "month",
        "source": "Operations export",
        "rows": rows,
    }


def _routes(rng: random.Random) -> Json:
    rows = [
        {
            "route_name": route,
            "on_time_share": round(85 + 10 * rng.random(), 1),
            "route_km": round(5 + 20 * rng.random(), 1),
            "rating_mean": round(3.5 + rng.random(), 2),
            "rating_sd": round(0.6 + 0.3 * rng.random(), 2),
            "resp_n": rng.randint(80, 300),
            "plan_trips": 1500 + 100 * i,
            "done_trips": 1500 + 100 * i + rng.randint(-90, 40),
        }
        for i, route in enumerate(ROUTES)
    ]
    rows.append({"route_name": "99 Night bus", "on_time_share": None, "route_km": 30.2})
    return {
        "name": "route_stats",
        "columns": [
            _column("route_name", "text"),
            _column("on_time_share", "number", "%"),
            _column("route_km", "number", "km"),
            _column("rating_mean", "number", "points"),
            _column("rating_sd", "number", "points"),
            _column("resp_n", "integer", "responses"),
            _column("plan_trips", "integer", "journeys"),
            _column("done_trips", "integer", "journeys"),
        ],
        "rows": rows,
    }


def _tickets() -> Json:
    values = {"Single": 118420.0, "Season": 97650.0, "Day pass": 64310.0, "Capped": 28040.0}
    return {
        "name": "ticket_mix",
        "columns": [_column("ticket_type", "text"), _column("fare_gbp", "number", "£")],
        "rows": [{"ticket_type": k, "fare_gbp": v} for k, v in values.items()],
    }


def _lateness(rng: random.Random) -> Json:
    values = [round(rng.lognormvariate(2.0, 0.5), 1) for _ in range(120)] + [None, None]
    groups = ["North", "South", "Central"]
    return {
        "name": "late_runs",
        "columns": [_column("depot_name", "text"), _column("late_min", "number", "minutes")],
        "rows": [{"depot_name": groups[i % 3], "late_min": v} for i, v in enumerate(values)],
    }


def _chart(id_: str, intent: str, dataset: str, **fields: Any) -> Json:
    return {"id": id_, "intent": intent, "title": f"Chart {id_}", "dataset": dataset, **fields}


CHARTS: list[Json] = [
    _chart("trend-one", "trend", "monthly_ops", measures=["kpiTotal"]),
    _chart(
        "trend-projected",
        "trend",
        "monthly_ops",
        measures=["kpiTotal"],
        projection={"method": "run_rate"},
        from_zero=True,
    ),
    _chart("trend-two", "trend", "monthly_ops", measures=["plan_trips", "done_trips"]),
    _chart("trend-estimate", "trend", "monthly_ops", measures=["done_trips", "est_trips"]),
    _chart("trend-log", "trend", "monthly_ops", measures=["op_cost"], scale="log"),
    _chart("trend-percent", "trend", "monthly_ops", measures=["on_time_share"]),
    _chart("index", "relative_change", "monthly_ops", measures=["op_cost", "kpiTotal"]),
    _chart(
        "change",
        "relative_change",
        "monthly_ops",
        measures=["op_cost", "kpiTotal"],
        index_as="percent_change",
    ),
    _chart(
        "panels",
        "relative_change",
        "monthly_ops",
        measures=["op_cost", "on_time_share"],
        form="panels",
    ),
    _chart("movement", "movement", "monthly_ops", measure="complaint_count"),
    _chart("movement-percent", "movement", "monthly_ops", measure="on_time_share"),
    _chart("movement-short", "movement", "monthly_ops", measure="op_cost", min_history=30),
    _chart("compare", "compare", "route_stats", category="route_name", measure="on_time_share"),
    _chart(
        "compare-dots",
        "compare",
        "route_stats",
        category="route_name",
        measure="rating_mean",
        focus="differences",
        interval={"sd": "rating_sd", "n": "resp_n"},
    ),
    _chart(
        "compare-baseline",
        "compare",
        "route_stats",
        category="route_name",
        measure="route_km",
        baseline=4,
    ),
    _chart("share", "share", "ticket_mix", category="ticket_type", measure="fare_gbp"),
    _chart(
        "share-pie",
        "share",
        "ticket_mix",
        category="ticket_type",
        measure="fare_gbp",
        allow_pie=True,
        expected_categories=["Single", "Season", "Group"],
    ),
    _chart(
        "target",
        "target",
        "route_stats",
        category="route_name",
        actual="done_trips",
        target="plan_trips",
    ),
    _chart(
        "target-value",
        "target",
        "route_stats",
        category="route_name",
        actual="on_time_share",
        target_value=90,
        form="deviation",
    ),
    _chart(
        "target-deviation",
        "target",
        "route_stats",
        category="route_name",
        actual="done_trips",
        target="plan_trips",
        form="deviation",
    ),
    _chart("histogram", "distribution", "late_runs", measure="late_min"),
    _chart("box", "distribution", "late_runs", measure="late_min", form="box", group="depot_name"),
    _chart("scatter", "relationship", "route_stats", x="route_km", y="on_time_share", fit=True),
    _chart(
        "scatter-named",
        "relationship",
        "route_stats",
        x="route_km",
        y="rating_mean",
        label="route_name",
    ),
]


def definition(locale: str, seed: int) -> Json:
    rng = random.Random(seed)
    datasets = [_monthly(rng), _routes(rng), _tickets(), _lateness(rng)]
    report = make_report(locale=locale, period={"start": "2024-11-01", "end": "2026-11-30"})
    return make_definition(datasets=datasets, charts=CHARTS, report=report)


def visible(checked: Checked) -> list[tuple[str, str]]:
    """Every generated text a reader sees, as (where, text): the plan's words and the findings."""
    found: list[tuple[str, str]] = []
    for chart in checked.charts:
        plan = chart.plan
        texts = [
            plan.description,
            plan.guide,
            plan.value_axis.label,
            plan.x_axis.label if plan.x_axis else None,
            plan.partial.text if plan.partial else None,
            *plan.notes,
            *plan.flags,
            *(v.text for v in plan.verdicts),
            *(r.label for r in plan.references),
            *(s.title for s in plan.series),
            *(p.title for p in plan.panels),
            *(n for p in plan.panels for n in p.notes),
            *(s.title for p in plan.panels for s in p.series),
        ]
        for result in chart.results:
            texts += [result.explanation, result.measured_text]
        found += [(plan.chart_id, t) for t in texts if t]
    return found


IDENTIFIER = re.compile(r"\b\w*_\w*\b")
DOUBLED = re.compile(r"[.,;:!?]\s*[.,;:!?]")


def faults(checked: Checked) -> list[str]:
    bad = []
    plain_names = [n for n in LABELS if "_" not in n]
    for where, text in visible(checked):
        line = text.replace("\n", " ")
        if IDENTIFIER.search(line):
            bad.append(f"{where}: identifier {IDENTIFIER.search(line)!r} in {text!r}")
        for name in plain_names:
            if re.search(rf"\b{re.escape(name)}\b", line):
                bad.append(f"{where}: column name {name!r} instead of its label in {text!r}")
        if "  " in line:
            bad.append(f"{where}: double space in {text!r}")
        if DOUBLED.search(line):
            bad.append(f"{where}: doubled punctuation {DOUBLED.search(line)!r} in {text!r}")
    return bad


@pytest.mark.parametrize("locale", ["en-GB", "de-DE"])
@pytest.mark.parametrize("seed", [1, 2])
def test_generated_sentences_name_labels_and_read_cleanly(locale: str, seed: int) -> None:
    checked = run_checks(definition(locale, seed))
    assert {c.plan.intent for c in checked.charts} == {
        "trend",
        "relative_change",
        "movement",
        "compare",
        "share",
        "target",
        "distribution",
        "relationship",
    }
    assert faults(checked) == []


def test_the_sentences_are_in_the_reports_language() -> None:
    english = run_checks(definition("en-GB", 1))
    german = run_checks(definition("de-DE", 1))
    for en_chart, de_chart in zip(english.charts, german.charts, strict=True):
        assert en_chart.plan.description != de_chart.plan.description
    histogram = next(c.plan for c in german.charts if c.plan.form == "histogram")
    assert histogram.description is not None
    assert histogram.description.startswith("Histogramm: ")
    assert "Werte" in (histogram.guide or "")


def test_the_check_catches_what_it_is_for() -> None:
    """The measurement itself: a raw identifier, a double space and doubled punctuation are found."""
    checked = run_checks(definition("en-GB", 1))
    chart = checked.charts[0]
    broken = chart.plan.model_copy(
        update={"notes": ["Scale of on_time_share  starts here.."], "description": "kpiTotal rose."}
    )
    spoilt = Checked(
        definition=checked.definition,
        tables=checked.tables,
        fingerprint=checked.fingerprint,
        charts=[type(chart)(path=chart.path, plan=broken, results=[])],
    )
    found = " | ".join(faults(spoilt))
    assert "identifier" in found
    assert "column name 'kpiTotal'" in found
    assert "double space" in found
    assert "doubled punctuation" in found


def test_every_finding_is_in_the_reports_language() -> None:
    english = run_checks(definition("en-GB", 1))
    german = run_checks(definition("de-DE", 1))
    same = [
        f"{e.chart} {e.check}: {e.explanation}"
        for en_chart, de_chart in zip(english.charts, german.charts, strict=True)
        for e, d in zip(en_chart.results, de_chart.results, strict=True)
        if e.explanation == d.explanation
    ]
    assert same == []


def test_the_catalogue_holds_each_correction_as_the_registry_states_it() -> None:
    for spec in CHECKS.values():
        if spec.correction is not None:
            assert en.WORDS[f"finding.correction.{spec.id}"] == spec.correction
