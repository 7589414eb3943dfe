"""Column labels and number formats in the definition: what readers see, checked like other text."""

from __future__ import annotations

from service.config import Limits
from service.definition import schema
from service.definition.model import Column
from tests.factories import (
    codes,
    make_column,
    make_dataset,
    make_definition,
    plan_of,
    problems_of,
)

MINUS = "\u2212"


def _with_columns(*columns: dict[str, object]) -> dict[str, object]:
    return make_definition(
        datasets=[make_dataset(columns=[make_column("month", "date"), *columns])]
    )


def test_the_label_is_what_readers_see_and_the_name_in_words_otherwise() -> None:
    assert Column(
        name="on_time", type="number", unit="%", label="On-time journeys"
    ).display_name == ("On-time journeys")
    assert Column(name="operating_cost", type="number", unit="GBP").display_name == "Operating cost"


def test_the_format_defaults_follow_type_and_unit() -> None:
    count = Column(name="loans", type="integer", unit="loans")
    assert count.shown(17739.47, "en-GB") == "17,739 loans"
    assert Column(name="on_time", type="number", unit="%").shown(94.6, "de-DE") == "94,6\u00a0%"
    assert (
        Column(name="cost", type="number", unit="GBP").shown(-84000, "en-GB") == f"{MINUS}£84,000"
    )
    fixed = Column(
        name="r", type="number", unit="points", format={"decimals": 2, "thousands": False}
    )
    assert fixed.shown(4321.5, "en-GB") == "4321.50 points"


def test_a_labelled_measure_is_named_by_its_label_on_the_chart() -> None:
    boardings = make_column("boardings", "integer", "boardings")
    boardings["label"] = "Passenger boardings"
    plan = plan_of(_with_columns(boardings))
    assert plan.value_axis.label == "Passenger boardings"
    assert [s.title for s in plan.series] == ["Passenger boardings"]
    assert [s.name for s in plan.series] == ["boardings"]  # the identifier the checks match


def test_a_label_is_held_to_the_label_rules() -> None:
    long = make_column("boardings", "integer", "boardings")
    long["label"] = "x" * 300
    hidden = make_column("boardings", "integer", "boardings")
    hidden["label"] = "Board\u200bings"
    assert ("limit_exceeded", "datasets[0].columns[1].label") in codes(
        problems_of(_with_columns(long), Limits(max_label_chars=200))
    )
    assert any(
        path == "datasets[0].columns[1].label"
        for _, path in codes(problems_of(_with_columns(hidden)))
    )


def test_a_format_needs_numbers_and_a_currency_style_needs_a_currency() -> None:
    month = make_column("boardings", "integer", "boardings")
    month["format"] = {"style": "currency"}
    found = codes(problems_of(_with_columns(month)))
    assert ("format_needs_currency", "datasets[0].columns[1].format") in found
    text = make_definition(
        datasets=[
            make_dataset(
                columns=[
                    {"name": "month", "type": "date", "format": {"decimals": 1}},
                    make_column("boardings", "integer", "boardings"),
                ]
            )
        ]
    )
    assert ("format_not_numeric", "datasets[0].columns[0].format") in codes(problems_of(text))


def test_the_schema_publishes_label_and_format() -> None:
    published = schema.definition_schema()
    column = published["$defs"]["Column"]["properties"]
    assert {"label", "format"} <= set(column)
    assert set(published["$defs"]["Format"]["properties"]) == {"decimals", "style", "thousands"}
