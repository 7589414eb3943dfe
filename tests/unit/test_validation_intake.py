"""Text and types at intake: what once answered 500, or was taken loosely, is refused with a path.

Lone surrogates anywhere (escaped in JSON, or encoded as bytes), invisible format characters in
any drawn field, over-long text in any field, dates whose derived periods do not exist; and loose
JSON types: ``true`` or ``1.0`` as the version, numbers as text, seconds as times, lists in text
cells, repeated keys, UTF-16 bodies.
"""

from __future__ import annotations

import json
from typing import Any

import pytest
from factories import (
    codes,
    encode,
    find,
    intake,
    make_category_dataset,
    make_compare_definition,
    make_dataset,
    make_definition,
    make_waiver,
    problems_of,
)

from service.api.errors import problem
from service.errors import Problem

Json = dict[str, Any]


def _share(**chart: Any) -> Json:
    return make_definition(
        datasets=[make_category_dataset({"a": 60.0, "b": 40.0})],
        charts=[
            {
                "id": "parts",
                "intent": "share",
                "title": "Parts",
                "dataset": "punctuality",
                "category": "route",
                "measure": "on_time",
                **chart,
            }
        ],
    )


def _answerable(problems: list[Problem]) -> None:
    """The 422 answer of these problems can be written (as UTF-8 JSON)."""
    body = problem(422, "invalid_definition", "x", errors=[p.as_dict() for p in problems]).body
    json.loads(body)


# (a) surrogates ------------------------------------------------------------------------------

SURROGATE_PLACES = {
    "report.title": lambda d, t: d["report"].__setitem__("title", t),
    "report.period.label": lambda d, t: d["report"]["period"].__setitem__("label", t),
    "sections[0].heading": lambda d, t: d["sections"][0].__setitem__("heading", t),
    "datasets[0].columns[1].unit": lambda d, t: d["datasets"][0]["columns"][1].__setitem__(
        "unit", t
    ),
    "datasets[0].rows[0].route": lambda d, t: d["datasets"][0]["rows"][0].__setitem__("route", t),
    "sections[0].charts[0].category": lambda d, t: d["sections"][0]["charts"][0].__setitem__(
        "category", t
    ),
}


@pytest.mark.parametrize("path", sorted(SURROGATE_PLACES))
def test_a_lone_surrogate_is_refused_with_its_path(path: str) -> None:
    definition = make_compare_definition({"a": 1.0, "b": 2.0})
    SURROGATE_PLACES[path](definition, "Route \ud800 one")
    problems = problems_of(definition)
    assert codes(problems) == [("invalid_text", path)]
    assert problems[0].value == "Route \\ud800 one"
    _answerable(problems)


def test_a_surrogate_in_csv_text_is_refused_with_its_path() -> None:
    dataset = make_category_dataset({}, rows=None, csv="route,on_time\nA\udc00,1\n")
    problems = problems_of(make_definition(datasets=[dataset], charts=[]))
    assert codes(problems) == [("invalid_text", "datasets[0].csv")]
    _answerable(problems)


def test_surrogate_bytes_are_refused_with_their_path() -> None:
    raw = encode(make_compare_definition({"a": 1.0, "b": 2.0}))
    raw = raw.replace(b'"Test desk"', b'"Test \xed\xa0\x80desk"')
    problems = problems_of(raw)
    assert codes(problems) == [("invalid_text", "report.owner")]
    _answerable(problems)


def test_a_surrogate_in_a_key_is_refused() -> None:
    definition = make_compare_definition({"a": 1.0, "b": 2.0})
    definition["report"]["\udfff"] = 1
    problems = problems_of(definition)
    assert [p.code for p in problems] == ["invalid_text"]
    _answerable(problems)


# (b) one rule for drawn text: format characters ------------------------------------------------

FORMAT_CHARACTERS = ["\ufeff", "\u200b", "\u200d", "\u2060", "\u00ad", "\u2028"]


@pytest.mark.parametrize("character", FORMAT_CHARACTERS, ids=lambda c: f"U+{ord(c):04X}")
def test_format_characters_are_refused_in_chart_text(character: str) -> None:
    definition = make_compare_definition({f"a{character}b": 1.0, "c": 2.0})
    problem = find(problems_of(definition), "glyph_missing")
    assert problem.path == "datasets[0].rows[*].route"
    assert f"U+{ord(character):04X}" in problem.message


@pytest.mark.parametrize(
    ("place", "path"),
    [
        ("label", "report.period.label"),
        ("expected", "sections[0].charts[0].expected_categories[1]"),
        ("column", "datasets[0].columns[0].description"),
        ("dataset", "datasets[0].description"),
    ],
)
@pytest.mark.parametrize("text", ["a\ufeffb", "a\x00b", "a\x1bb", "\u05d0\u05d1", "a\U0001f600"])
def test_fields_that_skipped_the_character_checks_are_checked(
    place: str, path: str, text: str
) -> None:
    definition = _share(expected_categories=["a", "b"])
    if place == "label":
        definition["report"]["period"]["label"] = text
    elif place == "expected":
        definition["sections"][0]["charts"][0]["expected_categories"][1] = text
    elif place == "column":
        definition["datasets"][0]["columns"][0]["description"] = text
    else:
        definition["datasets"][0]["description"] = text
    found = [p for p in problems_of(definition) if p.path == path]
    assert [p.code for p in found] in (["glyph_missing"], ["right_to_left_text"]), codes(found)


# (c) length limits ----------------------------------------------------------------------------

LONG = "x" * 100_000


@pytest.mark.parametrize(
    "path",
    [
        "datasets[0].columns[1].unit",
        "datasets[0].source",
        "datasets[0].description",
        "datasets[0].columns[0].description",
        "report.period.label",
        "sections[0].charts[0].source",
        "sections[0].charts[0].description",
        "sections[0].charts[0].expected_categories[0]",
        "waivers[0].by",
    ],
)
def test_every_text_field_has_a_length_limit(path: str) -> None:
    definition = _share(expected_categories=["a", "b"])
    definition["waivers"] = [make_waiver("pie-parts", "parts")]
    node: Any = definition
    parts = path.replace("]", "").replace("[", ".").split(".")
    for part in parts[:-1]:
        node = node[int(part)] if part.isdigit() else node[part]
    last = parts[-1]
    node[int(last) if last.isdigit() else last] = LONG
    found = [p for p in problems_of(definition) if p.path == path]
    assert [p.code for p in found] == ["limit_exceeded"], codes(found)


def test_a_long_category_cell_is_refused() -> None:
    problems = problems_of(make_compare_definition({LONG: 1.0, "b": 2.0}))
    problem = find(problems, "limit_exceeded")
    assert problem.path == "datasets[0].rows[*].route"
    assert problem.context["setting"] == "max_label_chars"


# (d) dates whose periods exist ------------------------------------------------------------------


@pytest.mark.parametrize(
    ("field", "value"),
    [
        ("end", "9999-12-31"),
        ("start", "0001-01-01"),
    ],
)
def test_a_period_in_year_9999_is_refused_not_a_crash(field: str, value: str) -> None:
    report = {
        "id": "far",
        "title": "Far",
        "owner": "Desk",
        "period": {"start": "9999-01-01", "end": "9999-12-31"},
        "as_of": "9999-12-31T12:00:00+00:00",
    }
    report["period"][field] = value
    definition = make_definition(report=report)
    found = codes(problems_of(definition))
    assert ("date_out_of_range", f"report.period.{field}") in found
    assert ("date_out_of_range", "report.as_of") in found


# item 11: strict types --------------------------------------------------------------------------


@pytest.mark.parametrize("version", [True, 1.0, "1"])
def test_the_version_is_the_number_1(version: Any) -> None:
    definition = make_definition()
    definition["version"] = version
    assert codes(problems_of(definition)) == [("not_allowed", "version")]


@pytest.mark.parametrize(
    ("field", "value"),
    [("baseline", "85"), ("baseline", "1e3"), ("baseline", True), ("sort", 1)],
)
def test_numbers_and_flags_are_json_types(field: str, value: Any) -> None:
    definition = make_compare_definition({"a": 1.0, "b": 2.0}, **{field: value})
    found = codes(problems_of(definition))
    assert [path for _, path in found] == [f"sections[0].charts[0].{field}"]


def test_flags_and_whole_numbers_are_strict() -> None:
    dataset = make_dataset()
    dataset["columns"][1]["projectable"] = "true"
    chart = {"id": "m", "intent": "movement", "title": "M", "dataset": "ridership"}
    definition = make_definition(
        datasets=[dataset], charts=[{**chart, "measure": "boardings", "run_length": 8.0}]
    )
    assert sorted(codes(problems_of(definition))) == [
        ("invalid_value", "datasets[0].columns[1].projectable"),
        ("invalid_value", "sections[0].charts[0].run_length"),
    ]


@pytest.mark.parametrize("as_of", [1_793_000_000, 1_793_000_000.5])
def test_seconds_are_not_a_time(as_of: Any) -> None:
    definition = make_definition()
    definition["report"]["as_of"] = as_of
    assert codes(problems_of(definition)) == [("bad_timestamp", "report.as_of")]


@pytest.mark.parametrize("cell", [["Route 1"], {"name": "Route 1"}])
def test_a_list_or_object_in_a_text_cell_is_refused(cell: Any) -> None:
    definition = make_compare_definition({"a": 1.0, "b": 2.0})
    definition["datasets"][0]["rows"][0]["route"] = cell
    problem = find(problems_of(definition), "unparseable_value")
    assert problem.path == "datasets[0].rows[0].route"


@pytest.mark.parametrize("cell", ["93.4", "1e3", True])
def test_a_number_cell_of_json_rows_is_a_json_number(cell: Any) -> None:
    definition = make_compare_definition({"a": 1.0, "b": 2.0})
    definition["datasets"][0]["rows"][0]["on_time"] = cell
    problem = find(problems_of(definition), "unparseable_value")
    assert problem.path == "datasets[0].rows[0].on_time"


def test_numbers_in_csv_text_are_still_read() -> None:
    dataset = make_category_dataset({}, rows=None, csv="route,on_time\na,93.4\nb,1e1\n")
    taken = intake(make_definition(datasets=[dataset], charts=[]))
    assert list(taken.tables["punctuality"].frame["on_time"]) == [93.4, 10.0]


def test_a_date_cell_given_as_a_number_is_refused() -> None:
    definition = make_definition()
    definition["datasets"][0]["rows"][0]["month"] = 2026
    problem = find(problems_of(definition), "unparseable_value")
    assert problem.path == "datasets[0].rows[0].month"


def test_repeated_keys_are_refused_with_their_path() -> None:
    raw = encode(make_definition()).replace(b'"owner": "Test desk"', b'"owner": "A", "owner": "B"')
    problems = problems_of(raw)
    assert codes(problems) == [("duplicate_key", "report.owner")]


def test_repeated_keys_deep_inside_are_refused_with_their_path() -> None:
    raw = encode(make_definition()).replace(
        b'"boardings": 52010', b'"boardings": 1, "boardings": 2'
    )
    assert codes(problems_of(raw)) == [("duplicate_key", "datasets[0].rows[2].boardings")]


@pytest.mark.parametrize("encoding", ["utf-16", "utf-16-le", "utf-16-be", "utf-32"])
def test_a_utf16_body_is_refused(encoding: str) -> None:
    raw = json.dumps(make_definition()).encode(encoding)
    problems = problems_of(raw)
    assert codes(problems) == [("invalid_json", "")]
    assert "UTF-8" in problems[0].message


def test_a_utf8_byte_order_mark_is_still_read() -> None:
    taken = intake(make_definition())
    assert taken.definition.report.id == "test-pack"
    problems = problems_of(b"\xef\xbb\xbf" + encode(make_definition(version=2)))
    assert codes(problems) == [("not_allowed", "version")]
