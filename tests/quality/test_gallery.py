"""The generated gallery is a valid definition, the same for the same seed, and draws every intent in
every form (read from the tables, so a new intent or form fails here until the gallery draws it)."""

from __future__ import annotations

import json
from functools import cache

from service import intents, pipeline
from service.checks.outcome import Checked
from service.config import Limits
from service.definition.model import INTENTS
from service.intents.forms import FORMS
from tests.quality import gallery


@cache
def checked() -> Checked:
    return pipeline.check(pipeline.intake(json.dumps(gallery.build()).encode(), Limits()))


def test_the_gallery_is_seeded_and_deterministic() -> None:
    assert json.dumps(gallery.build()) == json.dumps(gallery.build())
    assert json.dumps(gallery.build(1)) != json.dumps(gallery.build(2))


def test_the_gallery_validates_with_at_least_forty_charts_and_none_blocked() -> None:
    done = checked()
    assert len(done.charts) >= 40
    assert not done.blocked, [r.check for r in done.results if r.blocking]


def test_the_gallery_draws_every_intent_in_every_form_of_its_encoder() -> None:
    drawn = {(c.plan.intent, c.plan.form) for c in checked().charts}
    assert {intent for intent, _ in drawn} == set(INTENTS)
    assert {form for _, form in drawn} == set(FORMS)
    wanted = {(name, form) for name, encoder in intents.ENCODERS.items() for form in encoder.forms}
    assert wanted <= drawn


def test_the_gallery_holds_the_hard_cases() -> None:
    plans = [c.plan for c in checked().charts]
    assert any(p.partial is not None for p in plans), "a partial last period"
    assert any(s.estimate and s.name.endswith("(estimate)") for p in plans for s in p.series), (
        "a run-rate projection"
    )
    assert any(s.estimate and not s.name.endswith("(estimate)") for p in plans for s in p.series), (
        "a column of estimates"
    )
    assert any(p.gaps for p in plans), "a missing period"
    assert any(p.intent == "target" for p in plans), "targets"
    assert any(p.form == "control" and p.verdicts for p in plans), "a control chart"
    assert any(p.periods and len(p.periods) == 1 for p in plans), "a one-point series"
    assert any(p.value_axis.log for p in plans), "a logarithmic scale"


def test_the_gallery_tells_one_story_where_datasets_share_a_measure() -> None:
    truth = [r for r in checked().results if r.check == "one-measure-one-truth"]
    compared = [r for r in truth if r.measured_text != "no other dataset"]
    assert compared, "no two datasets of the gallery share a measure"
    assert all(r.status.value == "passed" for r in truth)
