"""Validation reports every problem at once, each with a stable code and a path."""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

import pytest
from factories import (
    MONTHS,
    Json,
    codes,
    encode,
    make_column,
    make_compare_definition,
    make_dataset,
    make_definition,
    make_monthly,
    make_report,
    make_trend_chart,
    make_waiver,
    problems_of,
)

from service.config import Limits
from service.definition import validate
from service.errors import InvalidDefinition, PayloadTooLarge


def test_valid_definition_parses_from_bytes_and_str() -> None:
    definition = make_definition()
    parsed, problems = validate.parse(encode(definition), Limits())
    assert problems == []
    assert parsed.report.id == "test-pack"
    assert validate.parse(encode(definition).decode(), Limits()) == (parsed, [])


def test_parse_returns_reference_problems_for_the_caller_to_add_to() -> None:
    definition = make_definition(charts=[make_trend_chart(dataset="nowhere")])
    parsed, problems = validate.parse(encode(definition), Limits())
    assert parsed.sections[0].charts[0].dataset == "nowhere"
    assert codes(problems) == [("unknown_dataset", "sections[0].charts[0].dataset")]


def test_unknown_field_suggests_the_close_name() -> None:
    definition = make_definition()
    definition["report"]["titel"] = "Typo"
    definition["datasets"][0]["columns"][1]["unti"] = "boardings"
    problems = problems_of(definition)
    assert codes(problems) == [
        ("unknown_field", "report.titel"),
        ("unknown_field", "datasets[0].columns[1].unti"),
    ]
    assert [p.hint for p in problems] == ["did you mean 'title'?", "did you mean 'unit'?"]
    assert problems[0].value == "Typo"


def test_unknown_field_on_a_chart_has_the_chart_path() -> None:
    problems = problems_of(make_definition(charts=[make_trend_chart(colour="red")]))
    assert codes(problems) == [("unknown_field", "sections[0].charts[0].colour")]


def test_missing_required_field() -> None:
    definition = make_definition()
    del definition["report"]["owner"]
    del definition["datasets"][0]["columns"][0]["type"]
    problems = problems_of(definition)
    assert codes(problems) == [
        ("required", "report.owner"),
        ("required", "datasets[0].columns[0].type"),
    ]
    assert all(p.value is None for p in problems)


def with_boardings(type: str = "integer", unit: str | None = "boardings") -> Json:
    """The default definition, its 'boardings' column declared with ``type`` and ``unit``."""
    columns = [make_column("month", "date"), make_column("boardings", type, unit)]
    return make_definition(datasets=[make_dataset(columns=columns)])


def mixed_units() -> Json:
    columns = [
        make_column("month", "date"),
        make_column("boardings", "integer", "boardings"),
        make_column("revenue", "number", "GBP"),
    ]
    rows = [{"month": m, "boardings": 1, "revenue": 2.5} for m in MONTHS]
    return make_definition(
        datasets=[make_dataset(columns=columns, rows=rows)],
        charts=[make_trend_chart(measures=["boardings", "revenue"])],
    )


CHART = "sections[0].charts[0]"


@pytest.mark.parametrize(
    ("build", "code", "path", "value", "hint"),
    [
        pytest.param(
            lambda: make_definition(charts=[make_trend_chart(intent="pie")]),
            "unknown_intent",
            CHART,
            None,
            "use one of: 'compare', 'trend'",
            id="intent",
        ),
        pytest.param(
            lambda: make_definition(charts=[make_trend_chart(dataset="ridershp")]),
            "unknown_dataset",
            f"{CHART}.dataset",
            "ridershp",
            "did you mean 'ridership'?",
            id="dataset",
        ),
        pytest.param(
            lambda: make_definition(charts=[make_trend_chart(measures=["boarding"])]),
            "unknown_column",
            f"{CHART}.measures[0]",
            "boarding",
            "did you mean 'boardings'?",
            id="measure-column",
        ),
        pytest.param(
            lambda: make_compare_definition({"a": 1.0}, category="rout"),
            "unknown_column",
            f"{CHART}.category",
            "rout",
            "did you mean 'route'?",
            id="category-column",
        ),
        pytest.param(
            lambda: with_boardings(type="text"),
            "column_type_mismatch",
            f"{CHART}.measures[0]",
            "text",
            "of type 'number' or 'integer'",
            id="text-measure",
        ),
        pytest.param(
            lambda: with_boardings(unit=None),
            "unit_missing",
            f"{CHART}.measures[0]",
            "boardings",
            "give the column 'boardings' a 'unit'",
            id="unit",
        ),
        pytest.param(
            lambda: make_definition(charts=[make_trend_chart(), make_trend_chart()]),
            "duplicate_id",
            "sections[0].charts[1].id",
            "boardings-trend",
            "must be unique",
            id="chart-id",
        ),
        pytest.param(
            mixed_units,
            "mixed_units",
            f"{CHART}.measures",
            ["boardings", "GBP"],
            "never draws two y-axes",
            id="mixed-units",
        ),
    ],
)
def test_one_reference_problem(
    build: Callable[[], Json], code: str, path: str, value: Any, hint: str
) -> None:
    (problem,) = problems_of(build())
    assert (problem.code, problem.path, problem.value) == (code, path, value)
    assert hint in problem.hint
    assert problem.message


def test_as_of_without_time_zone() -> None:
    problems = problems_of(make_definition(report=make_report(as_of="2026-11-09T07:30:00")))
    assert codes(problems) == [("timezone_missing", "report.as_of")]


def test_text_length_limits() -> None:
    definition = make_definition(report=make_report(title="x" * 201))
    definition["sections"][0]["narrative"] = "y" * 5001
    problems = problems_of(definition)
    assert codes(problems) == [
        ("limit_exceeded", "report.title"),
        ("limit_exceeded", "sections[0].narrative"),
    ]
    assert [p.value for p in problems] == [201, 5001]


def test_payload_too_large_before_parsing() -> None:
    with pytest.raises(PayloadTooLarge) as caught:
        validate.parse(b"{" * 2000, Limits(max_payload_bytes=1000))
    assert (caught.value.size, caught.value.limit, caught.value.status) == (2000, 1000, 413)


@pytest.mark.parametrize("raw", [b'{"version": 1,', b"\xff\xfe{}", b""])
def test_invalid_json(raw: bytes) -> None:
    problems = problems_of(raw)
    assert codes(problems) == [("invalid_json", "")]


def test_waiver_problems() -> None:
    waivers = [
        make_waiver("bar-zero-baseln", "boardings-trend"),
        make_waiver("missing-periods", "boardings-trnd"),
        make_waiver("bar-zero-baseline", "boardings-trend"),
    ]
    problems = problems_of(make_definition(waivers=waivers))
    assert codes(problems) == [
        ("unknown_check", "waivers[0].check"),
        ("not_waivable", "waivers[1].check"),
        ("unknown_chart", "waivers[1].chart"),
        ("check_not_applicable", "waivers[2].check"),
    ]
    assert problems[0].hint == "did you mean 'bar-zero-baseline'?"
    assert problems[2].hint == "did you mean 'boardings-trend'?"


def test_shape_problems_are_reported_together_with_limits() -> None:
    definition = make_definition(
        report=make_report(as_of="2026-11-09T07:30:00", locale="english"),
        datasets=[make_monthly([*MONTHS, "2026-11-01"], [1] * 6)],
        charts=[make_trend_chart(intent="pie")],
    )
    del definition["report"]["owner"]
    with pytest.raises(InvalidDefinition) as caught:
        validate.parse(encode(definition), Limits(max_rows=5))
    assert set(codes(caught.value.problems)) == {
        ("limit_exceeded", "datasets[0].rows"),
        ("required", "report.owner"),
        ("timezone_missing", "report.as_of"),
        ("bad_format", "report.locale"),
        ("unknown_intent", "sections[0].charts[0]"),
    }
    assert str(caught.value) == "the report definition has 5 problems"


def test_reference_data_and_waiver_problems_are_reported_together() -> None:
    columns = [make_column("month", "date"), make_column("boardings", "integer")]
    dataset = make_dataset(columns=columns, rows=[{"month": "2026-06-01", "boardings": "x"}])
    definition = make_definition(
        datasets=[dataset],
        charts=[make_trend_chart(), make_trend_chart(id="second", dataset="nowhere")],
        waivers=[make_waiver("missing-periods", "boardings-trend")],
    )
    problems = problems_of(definition)
    assert codes(problems) == [
        ("unit_missing", "sections[0].charts[0].measures[0]"),
        ("unknown_dataset", "sections[0].charts[1].dataset"),
        ("not_waivable", "waivers[0].check"),
        ("unparseable_value", "datasets[0].rows[0].boardings"),
    ]
    assert str(InvalidDefinition(problems)) == "the report definition has 4 problems"
