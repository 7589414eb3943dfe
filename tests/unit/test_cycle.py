"""The check window-cycle: the ACF against statsmodels and its bundled reference series, then the
advice on charts whose window or comparison does not respect the data's cycle."""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np
import pandas as pd
import pytest
from factories import (
    Json,
    context_for,
    intake,
    make_column,
    make_definition,
    make_monthly,
    make_trend_chart,
    plan_of,
    result_of,
    run_checks,
)
from statsmodels.datasets import co2, nile, sunspots
from statsmodels.tsa.stattools import acf as statsmodels_acf

from service.checks import cycle
from service.checks.results import Status
from service.intents.trend import runs

# --- the autocorrelation function and the peak rule ---------------------------------------------


def sunspot_values() -> list[float | None]:
    # Source: statsmodels bundled dataset `sunspots` (yearly sunspot numbers, 1700–2008).
    return [float(v) for v in sunspots.load_pandas().data["SUNACTIVITY"]]


def test_acf_agrees_with_statsmodels() -> None:
    values = sunspot_values()
    ours = cycle.acf(values, 40)
    theirs = statsmodels_acf(np.array(values, dtype=float), nlags=40, fft=False)
    assert ours == pytest.approx(list(theirs), abs=1e-9)


def test_sunspots_first_peak_at_lag_ten() -> None:
    values = sunspot_values()
    r = cycle.acf(values, len(values) // 2)
    bar = cycle.threshold(len(values), len(values) // 2 - 2)
    # Source: statsmodels bundled `sunspots` (open data shipped in the package); first ACF peak
    # at lag 10, ACF 0.659 (computed with statsmodels.tsa.stattools.acf)
    # (the solar cycle of about 11 years).
    assert cycle.first_peak(r, bar) == 10
    assert r[10] == pytest.approx(0.659, abs=5e-4)
    found = cycle.dominant_cycle(values)
    assert found is not None
    assert found.lag == 10


def co2_monthly_change() -> list[float | None]:
    # Source: statsmodels bundled dataset `co2` (weekly Mauna Loa CO2, 1958–2001), resampled to
    # monthly means; months with no reading stay missing (never filled).
    weekly = co2.load_pandas().data["co2"]
    monthly = weekly.resample("MS").mean().diff().iloc[1:]
    return [None if pd.isna(v) else float(v) for v in monthly]


def test_co2_monthly_change_peaks_at_twelve_months() -> None:
    values = co2_monthly_change()
    r = cycle.acf(values, 24)
    # Source: statsmodels bundled `co2`; the yearly cycle of the growing season: the ACF of the
    # first difference of monthly means is largest, over lags 1–24, at lag 12.
    assert int(np.argmax(r[1:25])) + 1 == 12
    found = cycle.dominant_cycle(values)
    assert found is not None
    assert found.lag == 12


def test_nile_has_no_cycle() -> None:
    # Source: statsmodels bundled dataset `nile` (annual Nile flow at Aswan, 1871–1970): long memory
    # and a level shift around 1898, but no seasonal cycle (negative control).
    values = [float(v) for v in nile.load_pandas().data["volume"]]
    assert cycle.dominant_cycle(values) is None
    # The naive rule (first local peak above 2/√N, no line removed) finds a false cycle at lag 8:
    assert cycle.first_peak(cycle.acf(values, 50), 2 / math.sqrt(len(values))) == 8


def test_white_noise_rarely_shows_a_cycle() -> None:
    rng = np.random.default_rng(3)
    found = [cycle.dominant_cycle(list(rng.normal(size=120))) for _ in range(200)]
    assert sum(f is not None for f in found) <= 20  # about 5 % by design (Bonferroni), not 30 %


# --- the check ----------------------------------------------------------------------------------


def month_starts(n: int) -> list[str]:
    """``n`` month starts ending in October 2026 (complete at the factories' as_of)."""
    last = 2026 * 12 + 9
    return [f"{m // 12}-{m % 12 + 1:02d}-01" for m in range(last - n + 1, last + 1)]


def yearly(n: int) -> list[float | None]:
    """Boardings with a trend and a yearly cycle, plus a little noise."""
    noise = np.random.default_rng(5).normal(0, 1, n)
    return [
        round(1000 + 2 * t + 40 * math.sin(2 * math.pi * t / 12) + float(noise[t]), 1)
        for t in range(n)
    ]


def cycle_definition(values: Sequence[float | None], chart: Json | None = None) -> Json:
    columns = [make_column("month", "date"), make_column("boardings", "number", "boardings")]
    dataset = make_monthly(month_starts(len(values)), list(values), columns=columns)
    return make_definition(datasets=[dataset], charts=[chart or make_trend_chart()])


def test_thirty_six_months_show_three_cycles() -> None:
    found = result_of(run_checks(cycle_definition(yearly(36))), "window-cycle")
    assert (found.status, found.measured) == (Status.passed, 12)
    assert found.measured_text == "12 months cycle; 36 months shown"
    assert "the chart shows 3 cycles" in found.explanation


def test_twelve_month_window_of_a_yearly_cycle_is_advised() -> None:
    definition = cycle_definition(yearly(36))
    plan = plan_of(definition)
    (series,) = plan.series
    values = series.values[-12:]
    window = plan.model_copy(
        update={
            "periods": plan.periods[-12:],
            "series": [series.model_copy(update={"values": values, "segments": runs(values)})],
        }
    )
    finding = cycle.SPEC.measure(window, context_for(intake(definition)))
    assert not finding.ok
    assert finding.measured == 12
    assert "shows only 12 months, fewer than two cycles: show at least 24 months" in finding.detail
    assert cycle.SPEC.level == "advice"  # reported, never blocking


def test_month_over_month_change_in_a_yearly_cycle_is_advised() -> None:
    chart = {
        "id": "boardings-movement",
        "intent": "movement",
        "title": "Boardings: latest change",
        "dataset": "ridership",
        "measure": "boardings",
    }
    checked = run_checks(cycle_definition(yearly(36), chart))
    found = result_of(checked, "window-cycle")
    assert found.status is Status.advice  # advice: never fails, never flags the chart
    assert "compares Sept 2026 with Oct 2026" in found.explanation
    assert "compare with the same month a year earlier" in found.explanation
    assert not checked.charts[0].plan.flags


def test_noise_and_short_series_pass() -> None:
    noise = [round(float(v), 1) for v in 500 + np.random.default_rng(2).normal(0, 5, 36)]
    found = result_of(run_checks(cycle_definition(noise)), "window-cycle")
    assert (found.status, found.measured) == (Status.passed, "no cycle")
    short = result_of(run_checks(cycle_definition(yearly(7))), "window-cycle")
    assert (short.status, short.measured) == (Status.passed, "too short to test")


def test_missing_values_are_skipped_pair_by_pair() -> None:
    values = yearly(48)
    values[20] = None
    found = cycle.dominant_cycle(values)
    assert found is not None
    assert found.lag == 12
    assert cycle.acf([1.0, None, 1.0], 1) == [1.0, 0.0]  # a constant series has no correlation
