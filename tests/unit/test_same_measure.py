"""One measure, one truth: two datasets of a pack never give one measure two values for a period."""

from __future__ import annotations

import copy
import json
from functools import cache
from pathlib import Path
from typing import Any

import pytest
from factories import (
    MONTHS,
    Json,
    codes,
    make_column,
    make_dataset,
    make_definition,
    make_trend_chart,
    make_waiver,
    problems_of,
    run_checks,
)

from service.checks import same_measure
from service.checks.registry import CHECKS
from service.checks.results import Status

DEMO = Path(__file__).parents[2] / "sample_requests" / "bus-cooperative-monthly.json"
CHECK = "one-measure-one-truth"


@cache
def demo() -> Json:
    loaded: Json = json.loads(DEMO.read_bytes())
    return loaded


def dataset_of(definition: Json, name: str) -> Json:
    found: Json = next(d for d in definition["datasets"] if d["name"] == name)
    return found


def results_for(definition: Json) -> dict[str, Any]:
    return {r.chart: r for r in run_checks(definition).results if r.check == CHECK}


def second(
    name: str = "cost_and_use", values: list[float | None] | None = None, **extra: Any
) -> Json:
    """Another monthly dataset carrying boardings (the factories' five months by default)."""
    boardings = values or [53270, 50860, 52010, 55730, 57120]
    column = {**make_column("boardings", "integer", "boardings"), **extra}
    return make_dataset(
        name=name,
        columns=[make_column("month", "date"), column],
        rows=[{"month": m, "boardings": b} for m, b in zip(MONTHS, boardings, strict=True)],
    )


def two_charts(other: Json) -> Json:
    return make_definition(
        datasets=[make_dataset(), other],
        charts=[
            make_trend_chart(),
            make_trend_chart(id="other-trend", dataset=other["name"]),
        ],
    )


def test_the_check_is_data_integrity_neither_waivable_nor_correctable() -> None:
    spec = CHECKS[CHECK]
    assert not spec.waivable
    assert not spec.correctable
    assert spec.level == "rule"


def test_the_demo_tells_one_story() -> None:
    found = results_for(demo())
    assert found["boardings-trend"].status is Status.passed
    assert found["cost-vs-use"].status is Status.passed
    assert "11 compared" in found["cost-vs-use"].measured_text


def test_the_check_catches_august_counted_on_one_page_and_missing_on_another() -> None:
    """The demo as it was: August has no count in 'ridership', 49,900 in 'cost_and_use'."""
    planted = copy.deepcopy(demo())
    for row in dataset_of(planted, "cost_and_use")["rows"]:
        if row["month"] == "2026-08-01":
            row["boardings"] = 49900
    found = results_for(planted)
    for chart in ("boardings-trend", "cost-vs-use"):
        assert found[chart].status is Status.failed
        assert found[chart].measured == 1
        assert "Aug 2026 has no data in dataset 'ridership'" in found[chart].explanation
        assert "49,900 boardings in dataset 'cost_and_use'" in found[chart].explanation
    assert run_checks(planted).blocked


def test_two_values_for_one_period_fail() -> None:
    found = results_for(two_charts(second(values=[53270, 50860, 52010, 55700, 57120])))
    assert found["boardings-trend"].status is Status.failed
    assert found["boardings-trend"].explanation.startswith(
        "The pack gives one measure two values for one period: boardings for Sept 2026 is "
        "55,730 boardings in dataset 'ridership' but 55,700 boardings in dataset 'cost_and_use'."
    )
    assert found["other-trend"].status is Status.failed


def test_values_that_agree_to_the_coarser_precision_pass() -> None:
    assert same_measure._agree(94.6, 94.62)
    assert same_measure._agree(57120.0, 57120.0)
    assert not same_measure._agree(94.6, 94.7)
    assert not same_measure._agree(57120.0, 57121.0)


def test_a_dataset_that_ends_earlier_says_nothing_about_later_periods() -> None:
    shorter = second()
    shorter["rows"] = shorter["rows"][:3]  # June to August only
    found = results_for(two_charts(shorter))
    assert found["boardings-trend"].status is Status.passed
    assert found["boardings-trend"].measured_text == "3 compared, all agree"


def test_a_null_where_the_other_has_a_value_fails() -> None:
    found = results_for(two_charts(second(values=[53270, None, 52010, 55730, 57120])))
    assert found["boardings-trend"].status is Status.failed
    assert "Jul 2026 has no data in dataset 'cost_and_use'" in found["boardings-trend"].explanation


def test_columns_of_one_name_but_another_unit_or_an_estimate_are_other_measures() -> None:
    other_unit = second(values=[1, 2, 3, 4, 5])
    other_unit["columns"][1]["unit"] = "thousand boardings"
    assert results_for(two_charts(other_unit))["boardings-trend"].status is Status.passed
    forecast = second(values=[1, 2, 3, 4, 5], estimate=True)
    assert results_for(two_charts(forecast))["boardings-trend"].status is Status.passed


def test_a_same_as_link_compares_columns_of_other_names() -> None:
    riders = second(values=[53270, 50860, 52010, 55730, 50000])
    riders["columns"][1]["name"] = "riders"
    for row in riders["rows"]:
        row["riders"] = row.pop("boardings")
    unlinked = two_charts(riders)
    unlinked["sections"][0]["charts"][1]["measures"] = ["riders"]
    assert results_for(unlinked)["boardings-trend"].measured_text == "no other dataset"
    linked = copy.deepcopy(unlinked)
    linked["datasets"][1]["columns"][1]["same_as"] = "ridership.boardings"
    found = results_for(linked)
    assert found["boardings-trend"].status is Status.failed  # linked from the other side
    assert found["other-trend"].status is Status.failed
    assert "riders for Oct 2026 is 50,000 boardings" in found["other-trend"].explanation


def test_a_waiver_of_the_check_is_refused() -> None:
    definition = two_charts(second())
    definition["waivers"] = [make_waiver(CHECK, "boardings-trend")]
    assert ("not_waivable", "waivers[0].check") in codes(problems_of(definition))


@pytest.mark.parametrize(
    ("link", "code"),
    [
        ("nowhere.boardings", "unknown_dataset"),
        ("ridership.riders", "unknown_column"),
        ("cost_and_use.boardings", "same_as_not_comparable"),  # its own dataset
        ("punctuality.on_time", "same_as_not_comparable"),  # not time-indexed
        ("ridership", "bad_format"),
    ],
)
def test_a_same_as_link_must_name_a_comparable_column(link: str, code: str) -> None:
    punctuality = {
        "name": "punctuality",
        "columns": [make_column("route", "text"), make_column("on_time", "number", "%")],
        "rows": [{"route": "A", "on_time": 90.0}],
    }
    definition = make_definition(
        datasets=[make_dataset(), second(same_as=link), punctuality],
        charts=[make_trend_chart()],
    )
    assert (code, "datasets[1].columns[1].same_as") in codes(problems_of(definition))


def test_the_finding_is_worded_in_the_report_language() -> None:
    definition = two_charts(second(values=[53270, 50860, 52010, 55700, 57120]))
    definition["report"]["locale"] = "de-DE"
    found = results_for(definition)
    text = found["boardings-trend"].explanation
    assert text.startswith("Der Bericht gibt einer Messgröße zwei Werte für dieselbe Periode")
    assert "55.730 boardings im Datensatz „ridership“" in text
    assert found["boardings-trend"].measured_text == "Widersprüche: 1"
