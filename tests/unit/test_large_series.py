"""A trend over two hundred thousand days: built within bounded memory, its line reduced with M4
before it is drawn, and a dataset far past ``max_rows`` refused after reading just past the limit.

The column-wise code paths that make this possible (period labels, the cycle's autocorrelation, the
gap checks, CSV columns) are also checked here against the per-value code they replace.
"""

from __future__ import annotations

import json
import math
import subprocess
import sys
import textwrap
import tracemalloc
from pathlib import Path
from typing import Any

import numpy as np
import numpy.typing as npt
import pandas as pd
import pytest
from factories import (
    encode,
    find,
    make_column,
    make_dataset,
    make_definition,
    make_report,
    make_trend_chart,
    only_chart,
    problems_of,
    result_of,
)
from matplotlib.lines import Line2D

from service import pipeline
from service.checks import cycle, points
from service.checks.outcome import Checked
from service.checks.results import Status
from service.config import Limits
from service.data import periods
from service.definition import validate
from service.definition.model import Frequency
from service.intents.plan import Series
from service.render import charts

ROOT = Path(__file__).resolve().parents[2]

#: Limits raised by configuration for long series (the defaults stop at 200,000 rows and 10 MB).
BIG = Limits(max_rows=2_000_000, max_payload_bytes=100_000_000)

FIRST_DAY = np.datetime64("1700-01-01")
LONG = 200_000
"""Days in the long series: dates stop at 2261 (pandas' nanosecond range), so a daily series can
span at most 213,300 days; a million days once ran to the year 4737."""
MISSING = (50_000, 50_001, 177_777)  # days with no reading: the line breaks there
SPIKES = {123_456: 4_000.0, 154_321: -4_000.0}  # single-day extremes M4 must keep


def long_days(n: int = LONG) -> dict[str, Any]:
    """An invented grid operator's daily load over ``n`` days from 1700-01-01 (as CSV text).

    Two hundred thousand days run to 1 August 2247, and ``as_of`` is noon of
    its last day (still running: a partial period). Three days have no row, two days spike."""
    rng = np.random.default_rng(1_000_000)
    load = 5_000.0 + np.cumsum(rng.normal(0.0, 4.0, n))
    for day, jump in SPIKES.items():
        load[day] += jump
    keep = np.ones(n, dtype=bool)
    keep[list(MISSING)] = False
    days = np.datetime_as_string(FIRST_DAY + np.arange(n), unit="D")
    lines = "\n".join(
        f"{d},{v:.2f}" for d, v in zip(days[keep].tolist(), load[keep].tolist(), strict=True)
    )
    last = str(days[-1])
    dataset = make_dataset(
        name="grid_load",
        source="Vale Grid control room (invented demo data)",
        columns=[make_column("day", "date"), make_column("load", "number", "MW")],
        time_column="day",
        frequency="day",
        rows=None,
        csv="day,load\n" + lines + "\n",
    )
    chart = make_trend_chart(
        id="load-trend", title="Daily peak load", dataset="grid_load", measures=["load"]
    )
    report = make_report(
        period={"start": "1700-01-01", "end": last}, as_of=f"{last}T12:00:00+00:00"
    )
    return make_definition(datasets=[dataset], charts=[chart], report=report)


@pytest.fixture(scope="module")
def pack() -> bytes:
    return encode(long_days())


@pytest.fixture(scope="module")
def checked(pack: bytes) -> Checked:
    return pipeline.check(pipeline.intake(pack, BIG))


def _loads(pack: bytes) -> npt.NDArray[np.float64]:
    """The load of every day on the full axis, NaN where a day has no row (read back plainly)."""
    csv = json.loads(pack)["datasets"][0]["csv"]
    rows = [line.split(",") for line in csv.splitlines()[1:]]
    index = (np.array([r[0] for r in rows], dtype="datetime64[D]") - FIRST_DAY).astype(np.int64)
    values = np.full(int(index[-1]) + 1, np.nan)
    values[index] = [float(r[1]) for r in rows]
    return values


def _m4_reference(y: npt.NDArray[np.float64], width: int) -> set[int]:
    """Plain M4: per drawn segment and pixel column, the first, last, lowest and highest point
    (the first of equal ones), over columns of the whole axis 0 .. len(y) − 1.

    Source: Jugel, Jerzak, Hackenbroich & Markl, 'M4: A Visualization-Oriented Time Series Data
    Aggregation', PVLDB 7(10), 2014, section 4 (column = floor(w · (t − t0) / (t1 − t0)), the last
    point in column w − 1). Computed here by sorting, not by the reducer's reductions."""
    x = np.flatnonzero(~np.isnan(y))
    segment = np.cumsum(np.r_[True, np.diff(x) > 1])  # a new segment after every gap
    column = np.minimum(width * x // (len(y) - 1), width - 1)
    key = segment * width + column
    v = y[x]
    first = np.unique(key, return_index=True)[1]
    last = len(key) - 1 - np.unique(key[::-1], return_index=True)[1]
    lowest = np.lexsort((v, key))  # stable: equal values keep their order
    highest = np.lexsort((-v, key))
    heads = np.flatnonzero(np.r_[True, np.diff(key[lowest]) != 0])  # same keys in both orders
    kept = {*first.tolist(), *last.tolist(), *lowest[heads].tolist(), *highest[heads].tolist()}
    return {int(x[i]) for i in kept}


# --- the long pack ----------------------------------------------------------------------------


def test_a_long_daily_trend_is_checked_and_reduced_with_m4(checked: Checked) -> None:
    plan = only_chart(checked).plan
    assert not checked.blocked
    assert len(plan.periods) == LONG  # every day keeps its place on the time axis
    assert plan.periods[0] == "1 Jan 1700"
    assert plan.periods[-1] == "1 Aug 2247"  # numpy: 1700-01-01 + 199,999 days
    found = result_of(checked, "many-points")
    assert found.status is Status.corrected
    assert found.measured == LONG - len(MISSING)
    assert plan.reduction is not None
    (series,) = plan.series
    width = points.width_px()
    assert len(series.segments) == 3  # broken at the two-day gap and at the one-day gap
    assert plan.reduction.after == len(series.values) <= 4 * width * len(series.segments)
    assert [g.index for g in plan.gaps] == list(MISSING)
    assert result_of(checked, "missing-periods").status is Status.passed
    assert result_of(checked, "time-proportional").status is Status.passed
    assert result_of(checked, "partial-period").status is Status.passed


def test_the_reduced_line_keeps_every_pixel_columns_extremes(pack: bytes, checked: Checked) -> None:
    (series,) = only_chart(checked).plan.series
    y = _loads(pack)
    assert series.xs is not None
    assert set(series.xs) == _m4_reference(y, points.width_px())
    assert all(y[x] == v for x, v in zip(series.xs, series.values, strict=True))
    drawn = np.asarray(series.values, dtype=float)
    assert drawn.max() == np.nanmax(y)  # the spikes are kept
    assert drawn.min() == np.nanmin(y)
    assert {*SPIKES} <= set(series.xs)


def test_the_drawing_gets_the_reduced_points_only(checked: Checked) -> None:
    plan = only_chart(checked).plan
    (series,) = plan.series
    ax = charts.figure_for(plan).axes[0]
    lines = [a for a in ax.lines if isinstance(a, Line2D) and len(a.get_xdata()) > 1]
    drawn = sum(len(a.get_xdata()) for a in lines)
    assert plan.reduction is not None
    # the partial last day is drawn as a hollow point of its own, not as part of a line
    assert plan.reduction.after - 1 <= drawn <= plan.reduction.after
    assert drawn <= 4 * points.width_px() * len(series.segments)
    for line in lines:
        xs = np.asarray(line.get_xdata(), dtype=float)
        assert not any(xs.min() < gap < xs.max() for gap in MISSING)  # never joined across


def test_the_long_pack_builds_under_300_mb(pack: bytes, tmp_path: Path) -> None:
    source = tmp_path / "long-days.json"
    source.write_bytes(pack)
    code = textwrap.dedent(
        f"""
        import json
        from pathlib import Path
        from service import pipeline
        from service.config import Limits
        raw = Path({str(source)!r}).read_bytes()
        built = pipeline.build(raw, Limits(max_rows=2_000_000, max_payload_bytes=100_000_000))
        # VmHWM: this process's peak resident set (ru_maxrss would carry over the parent's)
        status = Path("/proc/self/status").read_text()
        peak = int(next(ln for ln in status.splitlines() if ln.startswith("VmHWM:")).split()[1])
        print(json.dumps({{"peak_mib": peak / 1024, "blocked": built.blocked,
                           "counts": built.counts, "pdf": len(built.pdf)}}))
        """
    )
    done = subprocess.run(
        [sys.executable, "-c", code], cwd=ROOT, capture_output=True, text=True, check=True
    )
    report = json.loads(done.stdout)
    assert not report["blocked"]
    assert report["pdf"] > 10_000
    assert report["counts"]["failed"] == 0
    assert report["peak_mib"] < 300  # measured: about 195 MiB (bytes, frame, 200k labels, plan)


# --- refused early ----------------------------------------------------------------------------


def _readings(rows: int) -> dict[str, Any]:
    dataset = make_dataset(
        name="pressure_log",
        columns=[make_column("pressure", "number", "bar")],
        time_column=None,
        frequency=None,
        rows=None,
        csv="pressure\n" + "4.25\n" * rows,
    )
    chart = {
        "id": "pressure-spread",
        "intent": "distribution",
        "title": "Spread of pressure readings",
        "dataset": "pressure_log",
        "measure": "pressure",
    }
    for key in ("time_column", "frequency"):
        del dataset[key]
    return make_definition(datasets=[dataset], charts=[chart])


def test_a_csv_far_past_max_rows_is_read_only_just_past_the_limit() -> None:
    text = "pressure\n" + "4.25\n" * 3_000_000
    assert validate.csv_rows(text, 200_000) == 200_001  # the reader stopped there
    assert validate.csv_rows(text, 3_000_000) == 3_000_000  # few enough breaks: nothing read


def test_a_csv_far_past_max_rows_is_refused_naming_the_setting_in_little_memory() -> None:
    raw = encode(_readings(3_000_000))
    tracemalloc.start()
    try:
        problems = problems_of(raw, Limits(max_payload_bytes=100_000_000))
        _, peak = tracemalloc.get_traced_memory()
    finally:
        tracemalloc.stop()
    found = find(problems, "limit_exceeded")
    assert len(problems) == 1
    assert found.path == "datasets[0].csv"
    assert found.context == {"limit": 200_000, "setting": "max_rows"}
    assert found.value == 3_000_000
    assert "PLUMBLINE_LIMITS__MAX_ROWS" in found.hint
    # measured: about 30 MB (the JSON text, 15 MB, and 200,001 rows read); every row as a string
    # would take some 170 MB
    assert peak < 3 * len(raw) + 20_000_000


def test_rows_are_counted_as_the_reader_sees_them() -> None:
    quoted = 'note,v\n"two\nlines",1\n"and\nthree\nlines",2\n\n\n"x",3\n'
    assert validate.csv_rows(quoted, 3) == 3  # 7 line breaks, but 3 rows
    assert validate.csv_rows("v\r1\r2\r3\r", 2) == 3  # old Mac line ends are rows too
    assert validate.csv_rows("v\r\n1\r\n2\r\n", 2) == 2


def test_quoted_line_breaks_and_blank_lines_do_not_count_against_max_rows() -> None:
    columns = [
        make_column("month", "date"),
        make_column("boardings", "integer", "boardings"),
        make_column("note", "text"),
    ]
    csv = 'month,boardings,note\n2026-06-01,5,"closed\nfor\nworks"\n\n\n2026-07-01,6,"open"\n'
    definition = make_definition(datasets=[make_dataset(rows=None, csv=csv, columns=columns)])
    taken = pipeline.intake(encode(definition), Limits(max_rows=2))  # 6 line breaks, 2 rows
    assert len(taken.tables["ridership"].frame) == 2
    assert taken.tables["ridership"].frame["note"].tolist() == ["closed\nfor\nworks", "open"]


# --- column-wise code against the per-value code it replaces ------------------------------------


@pytest.mark.parametrize("frequency", list(Frequency))
@pytest.mark.parametrize("locale", ["en-GB", "de-DE", "fr-FR", "ru-RU", "el-GR"])
def test_period_labels_match_babel_one_by_one(frequency: Frequency, locale: str) -> None:
    # Reference: periods.label, which formats each period with babel's format_date.
    freq = periods.pandas_freq(frequency)
    for start in ("0999-12-20", "1968-11-30", "2262-03-01", "4737-01-01"):
        index = pd.period_range(start, periods=400, freq=freq)
        shuffled = index[np.random.default_rng(4).permutation(len(index))]
        for each in (index, shuffled):
            expected = [periods.label(p, frequency, locale) for p in each]
            assert periods.labels(pd.PeriodIndex(each), frequency, locale) == expected


@pytest.mark.parametrize("seed", range(12))
def test_the_cycle_found_through_the_fft_is_the_direct_rules(seed: int) -> None:
    rng = np.random.default_rng(seed)
    n = 3_000
    t = np.arange(n)
    kind = seed % 4
    if kind == 0:
        x = rng.normal(size=n)  # noise: mostly no cycle
    elif kind == 1:
        x = np.cumsum(rng.normal(size=n))  # a walk: a late, weak peak
    elif kind == 2:
        x = np.tile([5.0, 6.0, 7.0, 7.0, 6.0, 3.0, 2.0], n // 7 + 1)[:n]  # exact repeats: ties
    else:
        x = 40 * np.sin(2 * np.pi * t / 52) + rng.normal(0, 9, n)
        x[rng.choice(n, 150, replace=False)] = np.nan
    nlags = n // 2
    d = cycle.detrended(list(x))
    r = cycle.acf(d, nlags)
    bar = cycle.threshold(int(np.count_nonzero(~np.isnan(x))), nlags - 2)
    lag = cycle.first_peak(r, bar)
    deviations = np.array(d, dtype=float)
    deviations -= np.nanmean(deviations)
    deviations[np.isnan(deviations)] = 0.0
    found = cycle.peak_by_fft(deviations, nlags, bar)
    assert found == (None if lag is None else (lag, r[lag]))


def test_gap_checks_at_once_match_them_one_by_one() -> None:
    rng = np.random.default_rng(11)
    values: list[float | None] = [None if rng.random() < 0.2 else float(v) for v in range(400)]
    wanted = list(range(-3, 405))
    for segments in (
        [(0, 10), (12, 40), (41, 41), (100, 399)],
        [(50, 60), (0, 5), (55, 90), (300, 200)],  # out of order, overlapping, backwards
        [],
    ):
        plain = Series(name="s", unit="", values=values, segments=segments)
        assert plain.drawn_at(wanted) == [plain.at(p) is not None for p in wanted]
        assert plain.spanned(wanted) == [plain.spans(p) for p in wanted]
    xs = sorted(rng.choice(1_000, 400, replace=False).tolist())
    placed = Series(name="s", unit="", values=values, segments=[(0, 99), (150, 399)], xs=xs)
    wanted = list(range(-3, 1_003))
    assert placed.drawn_at(wanted) == [placed.at(p) is not None for p in wanted]
    assert placed.spanned(wanted) == [placed.spans(p) for p in wanted]


def test_csv_columns_load_as_the_same_rows_given_as_records() -> None:
    columns = [
        make_column("month", "date"),
        make_column("boardings", "integer", "boardings"),
        make_column("share", "number", "%"),
        make_column("route", "text"),
        make_column("stamp", "timestamp"),
    ]
    records = [
        {
            "month": "2026-06-01",
            "boardings": 5,
            "share": 1.5,
            "route": "A",
            "stamp": "2026-06-01T08:00:00+01:00",
        },
        {
            "month": "2026-07-01",
            "boardings": None,
            "share": -0.0,
            "route": None,
            "stamp": "2026-07-01T08:00",
        },
        {"month": "2026-08-01", "boardings": 7, "share": None, "route": "C, east", "stamp": None},
    ]
    csv = (
        "month,boardings,share,route,stamp\n"
        "2026-06-01,5,1.5,A,2026-06-01T08:00:00+01:00\n"
        "2026-07-01,,-0.0,,2026-07-01T08:00\n"
        '2026-08-01,7,,"C, east",\n'
    )
    tables = []
    for given in ({"rows": records}, {"rows": None, "csv": csv}):
        definition = make_definition(datasets=[make_dataset(columns=columns, **given)])
        tables.append(pipeline.intake(encode(definition), Limits()).tables["ridership"])
    from_rows, from_csv = (t.frame for t in tables)
    assert from_rows.dtypes.tolist() == from_csv.dtypes.tolist()
    for name in ("month", "boardings", "share", "stamp"):
        assert from_rows[name].equals(from_csv[name]), name
    assert from_csv["route"].tolist()[0::2] == ["A", "C, east"]
    assert pd.isna(from_csv["route"].iloc[1])
    assert math.copysign(1.0, from_csv["share"].iloc[1]) == -1.0


def test_a_bare_number_in_a_timestamp_column_is_a_problem_not_a_crash() -> None:
    columns = [
        make_column("month", "date"),
        make_column("boardings", "integer", "boardings"),
        make_column("stamp", "timestamp"),
    ]
    csv = "month,boardings,stamp\n2026-06-01,5,12\n2026-07-01,6,0300-01-01T00:00\n"
    problems = problems_of(
        make_definition(datasets=[make_dataset(rows=None, csv=csv, columns=columns)])
    )
    assert [(p.code, p.context["line"]) for p in problems] == [
        ("unparseable_value", 2),
        ("unparseable_value", 3),
    ]
