"""Inputs that once crashed or slipped through validation."""

from __future__ import annotations

from factories import (
    encode,
    find,
    make_column,
    make_compare_definition,
    make_dataset,
    make_definition,
    problems_of,
)

from service import formatting


def test_misspelt_chart_field_names_the_close_field() -> None:
    problems = problems_of(make_compare_definition({"a": 1.0, "b": 2.0}, measur="on_time"))
    problem = find(problems, "unknown_field")
    assert problem.path == "sections[0].charts[0].measur"
    assert problem.hint == "did you mean 'measure'?"


def test_json_nan_in_a_number_column_is_refused_not_taken_as_missing() -> None:
    raw = encode(make_definition()).replace(b'"boardings": 52010', b'"boardings": NaN')
    assert b"NaN" in raw
    problem = find(problems_of(raw), "unparseable_value")
    assert problem.path == "datasets[0].rows[2].boardings"
    assert problem.value == "NaN"


def test_nan_baseline_is_refused() -> None:
    raw = encode(make_compare_definition({"a": 1.0, "b": 2.0}, baseline=0.5))
    raw = raw.replace(b'"baseline": 0.5', b'"baseline": NaN')
    problem = find(problems_of(raw), "invalid_value")
    assert problem.path == "sections[0].charts[0].baseline"


def test_undeclared_time_column_is_a_problem_not_a_crash() -> None:
    problems = problems_of(make_definition(datasets=[make_dataset(time_column="mnth")]))
    problem = find(problems, "unknown_column")
    assert problem.path == "datasets[0].time_column"
    assert problem.hint == "did you mean 'month'?"


def test_column_declared_twice_is_a_problem_not_a_crash() -> None:
    columns = [
        make_column("month", "date"),
        make_column("month", "date"),
        make_column("boardings", "integer", "boardings"),
    ]
    problems = problems_of(make_definition(datasets=[make_dataset(columns=columns)]))
    assert find(problems, "duplicate_id").path == "datasets[0].columns[1].name"


def test_tiny_negative_numbers_do_not_print_minus_zero() -> None:
    assert formatting.number(-0.001, "en-GB") == "0"
    assert formatting.number(-0.4, "en-GB", digits=0) == "0"
    assert formatting.number(-0.6, "en-GB", digits=0) == "\u22121"


def test_an_integer_of_more_than_4300_digits_is_a_problem_not_a_crash() -> None:
    """Python refuses to convert integers of more than 4,300 digits (CPython's
    ``sys.int_info.default_max_str_digits``, since 3.11): ``json.loads`` raises ValueError."""
    raw = b'{"version": 1, "report": {"id": "x", "title": ' + b"1" * 5000 + b"}}"
    problems = problems_of(raw)
    assert [p.code for p in problems] == ["invalid_json"]
    assert "4,300 digits" in problems[0].message


def test_a_json_integer_too_large_for_a_float_is_a_problem_not_a_crash() -> None:
    """10^400 in a number column answered 500 (found by re-running the outside attacks):
    pandas cannot make a float of it."""
    for exponent in (18, 309, 400):
        raw = encode(make_definition()).replace(
            b'"boardings": 52010', f'"boardings": {10**exponent}'.encode()
        )
        problem = find(problems_of(raw), "unparseable_value")
        assert problem.path == "datasets[0].rows[2].boardings"
        assert "10^18" in problem.hint or "10^18" in problem.message
