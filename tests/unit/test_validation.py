"""Validation reports every problem at once, each with a stable code and a path into the definition."""

from __future__ import annotations

from typing import Any

import pytest
from factories import (
    MONTHS,
    Json,
    encode,
    make_column,
    make_compare_definition,
    make_dataset,
    make_definition,
    make_monthly,
    make_report,
    make_trend_chart,
    make_waiver,
)

from service import pipeline
from service.config import Limits
from service.definition import validate
from service.errors import InvalidDefinition, PayloadTooLarge, Problem


def problems_of(definition: Json | bytes, limits: Limits | None = None) -> list[Problem]:
    """Every problem ``pipeline.intake`` reports (it runs ``validate.parse`` first)."""
    raw = definition if isinstance(definition, bytes) else encode(definition)
    with pytest.raises(InvalidDefinition) as caught:
        pipeline.intake(raw, limits or Limits())
    assert caught.value.status == 422
    return caught.value.problems


def codes(problems: list[Problem]) -> list[tuple[str, str]]:
    return [(p.code, p.path) for p in problems]


def find(problems: list[Problem], code: str) -> Problem:
    found = [p for p in problems if p.code == code]
    assert len(found) == 1, codes(problems)
    return found[0]


def test_valid_definition_parses_from_bytes_and_str() -> None:
    definition = make_definition()
    parsed = validate.parse(encode(definition), Limits())
    assert parsed.report.id == "test-pack"
    assert validate.parse(encode(definition).decode(), Limits()) == parsed


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


def test_unknown_intent_lists_the_intents() -> None:
    problem = find(
        problems_of(make_definition(charts=[make_trend_chart(intent="pie")])), "unknown_intent"
    )
    assert problem.path == "sections[0].charts[0]"
    assert "'compare'" in problem.hint
    assert "'trend'" in problem.hint


def test_unknown_dataset_with_close_match() -> None:
    problem = find(
        problems_of(make_definition(charts=[make_trend_chart(dataset="ridershp")])),
        "unknown_dataset",
    )
    assert problem.path == "sections[0].charts[0].dataset"
    assert problem.value == "ridershp"
    assert problem.hint == "did you mean 'ridership'?"


def test_unknown_column_with_close_match() -> None:
    problems = problems_of(make_definition(charts=[make_trend_chart(measures=["boarding"])]))
    problem = find(problems, "unknown_column")
    assert problem.path == "sections[0].charts[0].measures[0]"
    assert problem.hint == "did you mean 'boardings'?"


def test_unknown_compare_category_column() -> None:
    problems = problems_of(make_compare_definition({"a": 1.0}, category="rout"))
    assert codes(problems) == [("unknown_column", "sections[0].charts[0].category")]
    assert problems[0].hint == "did you mean 'route'?"


def test_text_measure_is_a_type_mismatch() -> None:
    columns = [make_column("month", "date"), make_column("boardings", "text", "boardings")]
    problems = problems_of(make_definition(datasets=[make_dataset(columns=columns)]))
    assert codes(problems) == [("column_type_mismatch", "sections[0].charts[0].measures[0]")]
    assert problems[0].value == "text"


def test_unit_missing() -> None:
    columns = [make_column("month", "date"), make_column("boardings", "integer")]
    problem = find(
        problems_of(make_definition(datasets=[make_dataset(columns=columns)])), "unit_missing"
    )
    assert problem.path == "sections[0].charts[0].measures[0]"
    assert "'unit'" in problem.hint


def test_duplicate_chart_ids() -> None:
    problems = problems_of(make_definition(charts=[make_trend_chart(), make_trend_chart()]))
    assert codes(problems) == [("duplicate_id", "sections[0].charts[1].id")]
    assert problems[0].value == "boardings-trend"


def test_duplicate_period_in_a_monthly_dataset() -> None:
    dataset = make_monthly(["2026-06-01", "2026-07-01", "2026-07-15"], [1, 2, 3])
    problems = problems_of(make_definition(datasets=[dataset]))
    assert codes(problems) == [("duplicate_period", "datasets[0].rows[2].month")]


def test_unparseable_values_in_records() -> None:
    dataset = make_monthly(MONTHS, [1, 2, 3, "12,5", "n/a"])
    problems = problems_of(make_definition(datasets=[dataset]))
    assert codes(problems) == [
        ("unparseable_value", "datasets[0].rows[3].boardings"),
        ("unparseable_value", "datasets[0].rows[4].boardings"),
    ]
    assert [p.value for p in problems] == ["12,5", "n/a"]


def test_unparseable_values_in_csv_name_the_line() -> None:
    csv = "month,boardings\n2026-06-01,5\n2026-07-01,abc\n2026-13-01,7\n"
    problems = problems_of(make_definition(datasets=[make_dataset(rows=None, csv=csv)]))
    assert codes(problems) == [
        ("unparseable_value", "datasets[0].csv"),
        ("unparseable_value", "datasets[0].csv"),
    ]
    by_column = {p.context["column"]: p for p in problems}
    assert by_column["boardings"].context["line"] == 3  # header is line 1
    assert by_column["boardings"].value == "abc"
    assert by_column["month"].context["line"] == 4


@pytest.mark.parametrize("bad", ["NaN", "nan", True, False, float("inf"), "Infinity"])
def test_nan_inf_and_bool_are_not_numbers(bad: Any) -> None:
    dataset = make_monthly(MONTHS, [1, bad, 3, 4, 5])
    problems = problems_of(make_definition(datasets=[dataset]))
    assert codes(problems) == [("unparseable_value", "datasets[0].rows[1].boardings")]


def test_csv_nan_and_true_are_not_numbers() -> None:
    csv = "month,boardings\n2026-06-01,5\n2026-07-01,NaN\n2026-08-01,true\n"
    problems = problems_of(make_definition(datasets=[make_dataset(rows=None, csv=csv)]))
    assert [(p.code, p.context["line"]) for p in problems] == [
        ("unparseable_value", 3),
        ("unparseable_value", 4),
    ]


def test_as_of_without_time_zone() -> None:
    problems = problems_of(make_definition(report=make_report(as_of="2026-11-09T07:30:00")))
    assert codes(problems) == [("timezone_missing", "report.as_of")]


def test_row_limit_for_records_and_csv() -> None:
    months = [*MONTHS, "2026-11-01"]
    csv = "month,boardings\n" + "".join(f"{m},1\n" for m in months)
    definition = make_definition(
        datasets=[make_monthly(months, [1] * 6), make_dataset(name="copy", rows=None, csv=csv)]
    )
    problems = problems_of(definition, Limits(max_rows=5))
    assert codes(problems) == [
        ("limit_exceeded", "datasets[0].rows"),
        ("limit_exceeded", "datasets[1].csv"),
    ]
    assert problems[0].value == 6
    assert problems[0].context == {"limit": 5, "setting": "max_rows"}


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


def test_mixed_units_in_a_trend() -> None:
    columns = [
        make_column("month", "date"),
        make_column("boardings", "integer", "boardings"),
        make_column("revenue", "number", "GBP"),
    ]
    rows = [{"month": m, "boardings": 1, "revenue": 2.5} for m in MONTHS]
    definition = make_definition(
        datasets=[make_dataset(columns=columns, rows=rows)],
        charts=[make_trend_chart(measures=["boardings", "revenue"])],
    )
    problem = find(problems_of(definition), "mixed_units")
    assert problem.path == "sections[0].charts[0].measures"
    assert problem.value == ["boardings", "GBP"]


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


def test_period_after_as_of() -> None:
    dataset = make_monthly([*MONTHS, "2026-11-01", "2026-12-01"], [1] * 7)
    problems = problems_of(make_definition(datasets=[dataset]))
    assert codes(problems) == [("period_after_as_of", "datasets[0].rows[6].month")]


def test_as_of_is_read_on_the_senders_clock() -> None:
    # 00:30 on 9 November at +01:00 is 9 November for the sender: a row for that day is allowed.
    report = make_report(as_of="2026-11-09T00:30:00+01:00")
    pipeline.intake(
        encode(
            make_definition(
                report=report, datasets=[make_monthly(["2026-11-09"], [1], frequency="day")]
            )
        ),
        Limits(),
    )
    late = make_report(as_of="2026-11-08T23:30:00+00:00")
    problems = problems_of(
        make_definition(report=late, datasets=[make_monthly(["2026-11-09"], [1], frequency="day")])
    )
    assert codes(problems) == [("period_after_as_of", "datasets[0].rows[0].month")]


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
    assert codes(problems_of(definition)) == [
        ("unit_missing", "sections[0].charts[0].measures[0]"),
        ("unknown_dataset", "sections[0].charts[1].dataset"),
    ]
    # Once the references hold, intake reports waiver and value problems in one exception.
    definition["datasets"][0]["columns"][1]["unit"] = "boardings"
    definition["sections"][0]["charts"].pop()
    assert codes(problems_of(definition)) == [
        ("not_waivable", "waivers[0].check"),
        ("unparseable_value", "datasets[0].rows[0].boardings"),
    ]
