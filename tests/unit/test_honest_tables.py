"""Tables keep the rules the charts keep: every expected period listed ("no data" where there is
none), the partial period and estimates marked, headers readable with units, numbers in the
report's locale, the options ``columns``, ``sort``, ``totals`` (of measures that add up only) and
``limit`` (rows left out said), a title that says "continued" over a table's next page, and
checks of their own in the appendix."""

from __future__ import annotations

import io
import re
from pathlib import Path
from typing import Any

import pytest
from pypdf import PdfReader

from service.assemble import compose, pack
from service.checks import registry
from service.config import Limits
from service.errors import InvalidDefinition
from tests.factories import Json, intake, make_column, make_report, run_checks

MONTHS = ["2026-01-01", "2026-02-01", "2026-04-01", "2026-05-01", "2026-06-01"]
"""January to June 2026 without March; June is partial at the as_of below."""
AS_OF = "2026-06-10T09:00:00+00:00"  # 9 whole days of June's 30 have elapsed


def sales(**table: Any) -> Json:
    """A definition with one section holding one table of the monthly dataset 'sales'."""
    rows = [
        {"month": m, "orders": o, "on_time": p, "forecast": f, "region": r}
        for m, o, p, f, r in zip(
            MONTHS,
            [1200, 1350, -40, 1410, 390],
            [91.5, 88.25, 90.0, 92.0, 93.5],
            [1250, 1300, 1380, 1400, 1450],
            ["North", "South", "North", "East", "South"],
            strict=True,
        )
    ]
    dataset = {
        "name": "sales",
        "columns": [
            make_column("month", "date"),
            make_column("orders", "integer", "orders"),
            make_column("on_time", "number", "%"),
            {**make_column("forecast", "integer", "orders"), "estimate": True},
            make_column("region", "text"),
        ],
        "time_column": "month",
        "frequency": "month",
        "rows": rows,
    }
    spec = {"id": "sales-table", "title": "Orders by month", "dataset": "sales", **table}
    return {
        "version": 1,
        "report": make_report(period={"start": "2026-01-01", "end": "2026-06-30"}, as_of=AS_OF),
        "datasets": [dataset],
        "sections": [{"heading": "Sales", "tables": [spec]}],
    }


def block(definition: Json) -> Any:
    content = compose.content_for(run_checks(definition), {}, status_line="DRAFT")
    (section,) = content.sections
    (table,) = section.blocks
    return table


def row_for(table: Any, month: str) -> list[str]:
    (row,) = [r for r in table.rows if r[0].split("\n")[0] == month]
    return list(row)


# --- every period listed, partial and estimates marked ------------------------------------------


def test_a_missing_period_is_a_row_reading_no_data() -> None:
    table = block(sales())
    assert [r[0].split("\n")[0] for r in table.rows] == [
        "Jan 2026",
        "Feb 2026",
        "Mar 2026",
        "Apr 2026",
        "May 2026",
        "Jun 2026",
    ]
    assert row_for(table, "Mar 2026")[1:4] == ["no data"] * 3


def test_the_partial_period_is_marked_with_its_completeness() -> None:
    table = block(sales())
    assert row_for(table, "Jun 2026")[0] == "Jun 2026\npartial: 9 of 30 days"
    assert "partial" not in row_for(table, "May 2026")[0]


def test_estimates_are_marked_in_the_header_and_listed_under_the_table() -> None:
    table = block(sales())
    assert table.header[3] == "Forecast (orders), estimate"
    assert "Estimates, not actuals: Forecast (orders)." in table.notes


# --- headers and numbers ------------------------------------------------------------------------


def test_headers_are_readable_labels_with_units() -> None:
    table = block(sales())
    assert table.header == [
        "Month",
        "Orders",  # the unit only repeats the name
        "On time (%)",
        "Forecast (orders), estimate",
        "Region",
    ]


def test_numbers_are_in_the_locale_integers_without_decimals_one_precision_a_column() -> None:
    table = block(sales())
    assert row_for(table, "Jan 2026")[1:4] == ["1,200", "91.50", "1,250"]
    assert row_for(table, "Feb 2026")[2] == "88.25"  # the column needs two decimals, so
    assert row_for(table, "Apr 2026")[2] == "90.00"  # every value has them and they line up
    german = sales()
    german["report"]["locale"] = "de-DE"
    table = block(german)
    assert (table.rows[0][1], table.rows[2][1]) == ("1.200", "keine Daten")
    assert table.rows[3][1] == "\u221240"  # the minus sign U+2212


# --- options --------------------------------------------------------------------------------------


def test_columns_choose_which_and_in_what_order() -> None:
    table = block(sales(columns=["orders", "month"]))
    assert table.header == ["Orders", "Month"]
    assert table.rows[0] == ["1,200", "Jan 2026"]


def test_sort_orders_rows_with_periods_without_data_last() -> None:
    table = block(
        sales(columns=["month", "orders"], sort={"column": "orders", "order": "descending"})
    )
    # negative numbers with the minus sign U+2212
    assert [r[1] for r in table.rows] == ["1,410", "1,350", "1,200", "390", "\u221240", "no data"]
    ascending = block(sales(columns=["month", "region"], sort={"column": "region"}))
    assert [r[1] for r in ascending.rows][:3] == ["East", "North", "North"]


def test_totals_add_the_rows_shown_and_say_when_periods_lack_data() -> None:
    table = block(sales(columns=["month", "orders"], totals=["orders"]))
    assert table.totals
    assert table.rows[-1] == ["Total (2 periods without data or partial)", "4,310"]


def test_limit_says_how_many_rows_were_left_out() -> None:
    table = block(sales(columns=["month", "orders"], limit=4, totals=["orders"]))
    assert len(table.rows) == 5  # four rows and the totals
    assert table.rows[-1] == [
        "Total of the 4 rows shown (1 period without data or partial)",
        "2,510",
    ]
    assert "2 more rows left out (the table shows the first 4)." in table.notes


@pytest.mark.parametrize(
    ("totals", "column"),
    [(["on_time"], "on_time"), (["orders", "region"], "region")],
)
def test_totals_of_what_does_not_add_up_are_refused_with_a_path_and_a_fix(
    totals: list[str], column: str
) -> None:
    with pytest.raises(InvalidDefinition) as raised:
        intake(sales(totals=totals))
    (problem,) = [p for p in raised.value.problems if p.code == "totals_not_additive"]
    assert problem.path == f"sections[0].tables[0].totals[{totals.index(column)}]"
    assert column in problem.message
    assert "additive" in problem.hint or "drop" in problem.hint


def test_a_mean_declared_not_additive_is_refused_and_a_rate_declared_additive_is_allowed() -> None:
    definition = sales(totals=["orders"])
    definition["datasets"][0]["columns"][1]["additive"] = False
    with pytest.raises(InvalidDefinition) as raised:
        intake(definition)
    assert [p.code for p in raised.value.problems] == ["totals_not_additive"]
    definition["datasets"][0]["columns"][1]["additive"] = True
    definition["datasets"][0]["columns"][2]["additive"] = True
    definition["sections"][0]["tables"][0]["totals"] = ["orders", "on_time"]
    intake(definition)


@pytest.mark.parametrize(
    ("option", "path"),
    [
        ({"sort": {"column": "ordrs"}}, "sections[0].tables[0].sort.column"),
        ({"totals": ["ordres"]}, "sections[0].tables[0].totals[0]"),
        ({"columns": ["month"], "sort": {"column": "orders"}}, "sections[0].tables[0].sort.column"),
        ({"columns": ["month"], "totals": ["orders"]}, "sections[0].tables[0].totals[0]"),
        ({"limit": 0}, "sections[0].tables[0].limit"),
    ],
)
def test_options_naming_unknown_or_hidden_columns_are_refused(option: Json, path: str) -> None:
    with pytest.raises(InvalidDefinition) as raised:
        intake(sales(**option))
    assert path in [p.path for p in raised.value.problems]


# --- a table across pages -------------------------------------------------------------------------


def long_table() -> Json:
    definition = sales(columns=["month", "orders"])
    months = [f"{2018 + m // 12}-{m % 12 + 1:02d}-01" for m in range(100)]
    definition["datasets"][0]["rows"] = [
        {"month": m, "orders": 1000 + i, "on_time": 90.0, "forecast": 1, "region": "North"}
        for i, m in enumerate(months)
    ]
    definition["report"]["as_of"] = "2026-06-10T09:00:00+00:00"
    return definition


def test_a_table_across_pages_repeats_its_title_marked_continued_and_its_header() -> None:
    content = compose.content_for(run_checks(long_table()), {}, status_line="DRAFT")
    pdf, _ = pack.build(content)
    pages = [p.extract_text() for p in PdfReader(io.BytesIO(pdf)).pages]
    holding = [i for i, text in enumerate(pages) if "Jan 2018" in text or "Apr 2026" in text]
    assert len(holding) == 2  # the cover, then the table across two pages
    first, second = (pages[i] for i in holding)
    assert "Orders by month" in first
    assert "continued" not in first
    assert "Orders by month (continued)" in second
    assert second.index("(continued)") < second.index("Month") < second.index("Orders\n")


# --- checks of tables -----------------------------------------------------------------------------


def results(definition: Json) -> dict[str, Any]:
    return {r.check: r for r in run_checks(definition).results if r.chart == "sales-table"}


def test_tables_have_their_own_checks_in_the_results() -> None:
    found = results(sales(totals=["orders"], limit=6))
    assert sorted(found) == [
        "table-estimates-marked",
        "table-missing-periods",
        "table-partial-marked",
        "table-rows-left-out",
        "table-totals-additive",
    ]
    assert {r.status.value for r in found.values()} == {"passed"}
    assert found["table-missing-periods"].measured_text == "1 of 6"
    assert found["table-partial-marked"].measured_text == "9 of 30 days"


def test_a_limit_that_leaves_out_a_period_without_data_is_corrected_by_naming_it() -> None:
    definition = sales(
        columns=["month", "orders"], sort={"column": "orders", "order": "descending"}
    )
    definition["sections"][0]["tables"][0]["limit"] = 3
    found = results(definition)
    missing = found["table-missing-periods"]
    assert missing.status.value == "corrected"
    assert "Mar 2026" in missing.explanation
    assert (missing.measured_text, missing.corrected_to) == ("1 not shown", "1 of 6")
    assert "table-partial-marked" not in found  # June is left out: nothing to mark
    assert "No data for Mar 2026, not among the rows shown." in block(definition).notes


def test_a_table_without_a_time_column_has_no_period_checks() -> None:
    definition = sales(columns=["region", "orders"])
    del definition["datasets"][0]["time_column"], definition["datasets"][0]["frequency"]
    assert results(definition) == {}


def test_table_checks_are_in_the_catalogue_and_never_waivable() -> None:
    listed = {c["id"]: c for c in registry.catalogue()}
    for check in registry.TABLE_CHECKS:
        assert listed[check]["forms"] == ["table"]
        assert listed[check]["waivable"] is False
    assert "## Table checks" in registry.markdown()
    assert "`table-missing-periods`" in registry.markdown()


def test_the_table_check_modules_on_disk_are_the_ones_loaded() -> None:
    from service.checks import TABLE_MODULES

    on_disk = {
        path.stem
        for path in (Path(__file__).resolve().parents[2] / "service" / "checks").glob("*.py")
        if re.search(r"^\w+ = register_table\(", path.read_text(encoding="utf-8"), re.MULTILINE)
    }
    assert on_disk == set(TABLE_MODULES)
    assert {spec.measure.__module__ for spec in registry.TABLE_CHECKS.values()} == {
        f"service.checks.{name}" for name in TABLE_MODULES
    }


def test_a_table_of_a_time_series_must_show_its_time_column() -> None:
    with pytest.raises(InvalidDefinition) as raised:
        intake(sales(columns=["orders", "region"]))
    (problem,) = raised.value.problems
    assert (problem.code, problem.path) == (
        "time_column_not_shown",
        "sections[0].tables[0].columns",
    )
    assert "'month'" in problem.hint


def test_the_table_row_limit_counts_the_rows_printed() -> None:
    """Rows of periods without data are printed, so they count; rows a ``limit`` leaves out are
    not printed, so they do not."""
    with pytest.raises(InvalidDefinition) as raised:
        intake(sales(), Limits(max_table_rows=5))  # five rows of data, six periods
    assert [p.path for p in raised.value.problems] == ["sections[0].tables[0]"]
    intake(sales(limit=5), Limits(max_table_rows=5))


def test_table_findings_name_columns_by_their_labels() -> None:
    found = results(sales(totals=["orders", "forecast"]))
    assert "Orders, Forecast" in found["table-totals-additive"].explanation
