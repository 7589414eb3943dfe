"""Meta-tests of the tables of intents, forms, drawers and checks: every row works, not only exists.

A new intent or form is added in its own module plus one line in each table (DEVELOPERS.md, "Adding
an intent or a form"); these tests fail until every table has its line, and load what they test
themselves, so this file passes when it is run alone.
"""

from __future__ import annotations

import json
import re
from functools import cache
from pathlib import Path
from typing import get_args

import numpy as np
import pytest

from service import intents, pipeline
from service.checks import CHECKS, ORDER
from service.config import Limits
from service.definition.model import INTENTS, OVER_TIME, DistributionChart, local_wall_time
from service.intents.forms import FORMS, LENGTH_FORMS, POSITION_FORMS
from service.intents.geometry import size_in
from service.intents.plan import ChartPlan, Form
from service.render import charts, registry

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "sample_requests" / "bus-cooperative-monthly.json"

#: Charts of the demo redrawn in the forms the demo does not use.
VARIANTS = {
    "revenue-share": {"id": "revenue-pie", "allow_pie": True},
    "cost-vs-use": {"id": "cost-panels", "form": "panels"},
    "lateness-distribution": {"id": "lateness-box", "form": "box"},
}


@cache
def generated() -> dict[str, tuple[ChartPlan, np.ndarray | None]]:
    """Per chart id, the encoder's plan (the form as asked) and the measure's values: the demo's
    charts plus ``VARIANTS``, so that every form and every intent is drawn at least once."""
    raw = json.loads(DEMO.read_bytes())
    charts_ = {c["id"]: c for s in raw["sections"] for c in s["charts"]}
    extra = [{**charts_[source], **change} for source, change in VARIANTS.items()]
    raw["sections"].append({"heading": "Every form", "charts": extra})
    taken = pipeline.intake(json.dumps(raw).encode(), Limits())
    report = taken.definition.report
    env = intents.Env(locale=report.locale, as_of=local_wall_time(report.as_of))
    out: dict[str, tuple[ChartPlan, np.ndarray | None]] = {}
    for _, chart in taken.definition.charts():
        table = taken.tables[chart.dataset]
        plan = intents.ENCODERS[chart.intent].encode(chart, table, env)
        measure = None
        if isinstance(chart, DistributionChart):
            measure = table.frame[chart.measure].dropna().to_numpy(dtype=float)
        out[chart.id] = (plan, measure)
    return out


def one_of_each_form() -> dict[str, tuple[ChartPlan, np.ndarray | None]]:
    found: dict[str, tuple[ChartPlan, np.ndarray | None]] = {}
    for plan, measure in generated().values():
        found.setdefault(plan.form, (plan, measure))
    return found


def registering(folder: str, pattern: str) -> set[str]:
    """The modules of ``service/<folder>`` whose source matches ``pattern``."""
    return {
        path.stem
        for path in (ROOT / "service" / folder).glob("*.py")
        if re.search(pattern, path.read_text(encoding="utf-8"), re.MULTILINE)
    }


# --- the tables list the same names -------------------------------------------------------------


def test_every_form_has_one_row_and_encodes_by_length_or_position() -> None:
    assert set(FORMS) == set(get_args(Form))
    assert set(FORMS) == LENGTH_FORMS | POSITION_FORMS
    assert not LENGTH_FORMS & POSITION_FORMS


def test_every_intent_has_an_encoder_and_every_form_a_drawer() -> None:
    assert set(intents.ENCODERS) == set(INTENTS)
    assert set(registry.DRAWERS) == set(FORMS)
    for intent, encoder in intents.ENCODERS.items():
        assert encoder.forms <= set(FORMS), intent
        assert encoder.over_time == (intent in OVER_TIME)


def test_registries_load_every_module_on_disk() -> None:
    """A module that registers an encoder, a drawer or a check, but is not loaded, fails here."""
    assert registering("intents", r"^\w+ = register\(Encoder\(") == set(INTENTS)
    drawers = registering("render", r"^from service\.render\.drawer import .*\bdrawer\b")
    assert drawers == set(registry.MODULES)
    assert registering("checks", r"^(\w+ = )?register\(\s*CheckSpec\(") == set(ORDER)
    assert {spec.measure.__module__ for spec in CHECKS.values()} == {
        f"service.checks.{name}" for name in ORDER
    }


def test_every_intent_has_documented_checks_for_each_of_its_forms() -> None:
    for intent, encoder in intents.ENCODERS.items():
        for form in encoder.forms:
            own = [s for s in CHECKS.values() if intent in s.intents and form in s.forms]
            assert len(own) >= 5, (intent, form)  # the general checks plus its own
            assert all(s.title and s.source for s in own), (intent, form)


# --- every row works ------------------------------------------------------------------------------


def test_the_generated_charts_cover_every_form_and_intent() -> None:
    plans = [plan for plan, _ in generated().values()]
    assert {plan.form for plan in plans} == set(FORMS)
    assert {plan.intent for plan in plans} == set(INTENTS)


@pytest.mark.parametrize("form", sorted(get_args(Form)))
def test_every_form_gives_key_figures(form: str) -> None:
    plan, measure = one_of_each_form()[form]
    figures = FORMS[plan.form].key_figures(plan, measure)
    assert figures, form
    assert all(np.isfinite(f.value) and f.unit for f in figures), form


@pytest.mark.parametrize("intent", INTENTS)
def test_every_intent_renders_in_each_generated_form_at_its_size(intent: str) -> None:
    plans = [plan for plan, _ in generated().values() if plan.intent == intent]
    assert plans, intent
    for plan in plans:
        width, height = size_in(plan)
        assert 0 < height <= 9.0 < width * 2
        figure = charts.figure_for(plan)
        assert figure.axes, plan.chart_id
        assert tuple(figure.get_size_inches()) == pytest.approx((width, height))


def test_an_over_time_intent_plans_periods() -> None:
    for plan, _ in generated().values():
        assert bool(plan.periods) == (plan.intent in OVER_TIME), plan.chart_id
