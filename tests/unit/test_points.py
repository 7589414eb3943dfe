"""many-points: the M4 reducer against reference values and rasters, and through the pipeline."""

from __future__ import annotations

from datetime import date, timedelta

import matplotlib
import numpy as np
import numpy.typing as npt
import pytest
from factories import (
    context_for,
    find,
    intake,
    make_column,
    make_dataset,
    make_definition,
    make_trend_chart,
    make_waiver,
    only_chart,
    problems_of,
    result_of,
    run_checks,
)
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure
from matplotlib.lines import Line2D

from service.checks import points
from service.checks.outcome import Checked
from service.checks.results import Status
from service.intents.plan import Series
from service.render import charts, style

# --- the reducer -------------------------------------------------------------------------------


def _spikes() -> tuple[npt.NDArray[np.float64], npt.NDArray[np.float64]]:
    x = np.arange(10_000, dtype=float)
    y = np.zeros(10_000)
    y[5000], y[5003] = 10.0, -10.0
    return x, y


def test_m4_keeps_both_spikes_where_decimation_drops_them() -> None:
    x, y = _spikes()
    kept = points.m4_indexes(x, y, 100)
    # Source: computed with tsdownsample 0.1.5.1, M4Downsampler().downsample(x, y, n_out=400),
    # unique indexes: the first and last index of each of the 100 columns of 100 periods, plus the
    # minimum at 5003 (the maximum at 5000 is also that column's first point): 201 indexes.
    expected = sorted({*range(0, 10_000, 100), *range(99, 10_000, 100), 5003})
    assert kept.tolist() == expected
    assert len(kept) == 201
    assert y[kept].max() == 10.0
    assert y[kept].min() == -10.0
    # A naive every-n-th decimation to the same count (n = 10,000 // 201 = 49) misses both.
    naive = np.arange(0, 10_000, 10_000 // len(kept))[: len(kept)]
    assert len(naive) == len(kept)
    assert 5000 not in naive
    assert 5003 not in naive
    assert y[naive].max() == 0.0
    assert y[naive].min() == 0.0


def test_m4_column_mapping_and_ties() -> None:
    # Source: the M4 paper's pixel mapping, floor(w · (t − t_start) / (t_end − t_start)), with the
    # last point in column w − 1 (Jugel et al., PVLDB 7(10), 2014, section 4); ties: first wins.
    kept = points.m4_indexes([0, 1, 2, 3, 4, 5], [1.0, 1.0, 3.0, 3.0, 0.0, 2.0], 2)
    # columns: {0, 1, 2} (x < 2.5) and {3, 4, 5}: first, last, min, max of each
    assert kept.tolist() == [0, 2, 3, 4, 5]
    assert points.m4_indexes([], [], 10).tolist() == []
    assert points.m4_indexes([7], [1.0], 10).tolist() == [0]


def test_width_is_the_plot_width_at_300_dpi() -> None:
    # 6.69 in × 0.8 × 300 dpi = 1,605.6 → 1,606 px (the stated print resolution)
    assert points.width_px() == round(style.WIDTH_IN * 0.8 * 300) == 1606


def test_reduce_series_keeps_gaps_and_re_expresses_segments() -> None:
    rng = np.random.default_rng(7)
    values: list[float | None] = [float(v) for v in rng.normal(size=30_000)]
    values[12_000] = None
    series = Series(name="s", unit="", values=values, segments=[(0, 11_999), (12_001, 29_999)])
    reduced = points.reduce_series(series, 500, (0.0, 29_999.0))
    assert reduced.xs is not None
    assert len(reduced.values) == len(reduced.xs) <= 4 * 500 + 4
    assert None not in reduced.values
    assert reduced.xs == sorted(set(reduced.xs))
    (a0, b0), (a1, b1) = reduced.segments
    assert (a0, b1 + 1) == (0, len(reduced.values))
    assert a1 == b0 + 1
    assert (reduced.xs[b0], reduced.xs[a1]) == (11_999, 12_001)  # segment ends are kept
    assert not reduced.spans(12_000)
    assert reduced.at(12_000) is None
    assert reduced.at(0) == values[0]
    assert reduced.at(29_999) == values[-1]
    # every kept value is the original value at its period
    assert all(values[x] == v for x, v in zip(reduced.xs, reduced.values, strict=True))


# --- rasters -------------------------------------------------------------------------------------

_HEIGHT_PX = 400


def _raster(
    x: npt.NDArray[np.float64],
    y: npt.NDArray[np.float64],
    limits: tuple[float, float, float, float],
    linewidth: float,
) -> npt.NDArray[np.bool_]:
    """The line drawn one output pixel per column, aliased, as a boolean ink mask."""
    width_px = points.width_px()
    with matplotlib.rc_context({"path.simplify": False}):
        figure = Figure(figsize=(width_px / 72, _HEIGHT_PX / 72), dpi=72)  # 1 pt = 1 px
        FigureCanvasAgg(figure)
        ax = figure.add_axes((0.0, 0.0, 1.0, 1.0))
        ax.set_axis_off()
        ax.plot(x, y, color="black", linewidth=linewidth, antialiased=False)
        ax.set_xlim(limits[0], limits[1])
        ax.set_ylim(limits[2], limits[3])
        figure.canvas.draw()
        rgba = np.asarray(figure.canvas.buffer_rgba())  # type: ignore[attr-defined]
    mask: npt.NDArray[np.bool_] = rgba[:, :, 0] < 128
    return mask


def _extent(mask: npt.NDArray[np.bool_]) -> tuple[npt.NDArray[np.int64], npt.NDArray[np.int64]]:
    rows = np.arange(mask.shape[0])[:, None]
    return np.where(mask, rows, mask.shape[0]).min(0), np.where(mask, rows, -1).max(0)


def _near(a: npt.NDArray[np.bool_], b: npt.NDArray[np.bool_]) -> npt.NDArray[np.bool_]:
    """Pixels of ``a`` with no pixel of ``b`` in their 3 × 3 neighbourhood."""
    grown = np.zeros_like(b)
    h, w = b.shape
    padded = np.pad(b, 1)
    for dy in (0, 1, 2):
        for dx in (0, 1, 2):
            grown |= padded[dy : dy + h, dx : dx + w]
    return a & ~grown


@pytest.fixture(scope="module")
def noisy() -> tuple[npt.NDArray[np.float64], npt.NDArray[np.float64], npt.NDArray[np.intp]]:
    rng = np.random.default_rng(2014)
    x = np.arange(20_000, dtype=float)
    y = np.cumsum(rng.normal(size=20_000)) + 3.0 * rng.normal(size=20_000)
    return x, y, points.m4_indexes(x, y, points.width_px())


def test_m4_line_rasterises_like_the_full_line(
    noisy: tuple[npt.NDArray[np.float64], npt.NDArray[np.float64], npt.NDArray[np.intp]],
) -> None:
    """Source: Jugel et al., PVLDB 7(10), 2014, section 4: a line through the M4 points drawn at
    the reduction width rasterises without error (their 1-px line lights every pixel it crosses;
    here: an aliased hairline, one output pixel per M4 column)."""
    x, y, kept = noisy
    assert len(kept) <= 4 * points.width_px()
    limits = (0.0, 19_999.0, float(y.min()) - 1.0, float(y.max()) + 1.0)
    full = _raster(x, y, limits, linewidth=0.01)
    reduced = _raster(x[kept], y[kept], limits, linewidth=0.01)
    differ = int((full != reduced).sum())
    assert differ <= 0.005 * full.sum()  # measured: 8 of 27,848 line pixels
    assert (full.any(0) == reduced.any(0)).all()
    (top_f, bottom_f), (top_r, bottom_r) = _extent(full), _extent(reduced)
    assert np.abs(top_f - top_r).max() <= 1
    assert np.abs(bottom_f - bottom_r).max() <= 1


def test_m4_line_one_pixel_wide_differs_by_at_most_one_pixel_shift(
    noisy: tuple[npt.NDArray[np.float64], npt.NDArray[np.float64], npt.NDArray[np.intp]],
) -> None:
    """A 1 px stroke (1 pt at 72 dpi) reaches half a pixel into the next column, so points M4 drops
    near a column's edge still ink a neighbour: measured 4.5 % of line pixels differ. Every one of
    them lies next to a pixel of the other raster (Jugel et al., 2014: error-free up to that)."""
    x, y, kept = noisy
    limits = (0.0, 19_999.0, float(y.min()) - 1.0, float(y.max()) + 1.0)
    full = _raster(x, y, limits, linewidth=1.0)
    reduced = _raster(x[kept], y[kept], limits, linewidth=1.0)
    assert not _near(full, reduced).any()
    assert not _near(reduced, full).any()
    assert (full.any(0) == reduced.any(0)).all()


# --- through the pipeline ------------------------------------------------------------------------

_DAYS = 10_000
_LAST = date(2026, 10, 31)
_GAP = 6_000  # index of the day with no reading


def _water_demand() -> dict[str, object]:
    """A fictional water utility's daily demand in megalitres: 10,000 days, one day unread."""
    rng = np.random.default_rng(1999)
    first = _LAST - timedelta(days=_DAYS - 1)
    t = np.arange(_DAYS)
    demand = 412 + 38 * np.sin(2 * np.pi * t / 365.25) + rng.normal(0, 9, _DAYS) + t * 0.004
    rows = [
        {"day": (first + timedelta(days=i)).isoformat(), "demand": round(float(v), 1)}
        for i, v in enumerate(demand)
        if i != _GAP
    ]
    return make_definition(
        datasets=[
            make_dataset(
                name="supply",
                columns=[make_column("day", "date"), make_column("demand", "number", "ML")],
                time_column="day",
                frequency="day",
                rows=rows,
            )
        ],
        charts=[
            make_trend_chart(
                id="daily-demand",
                title="Daily demand, megalitres",
                dataset="supply",
                measures=["demand"],
            )
        ],
    )


@pytest.fixture(scope="module")
def long_run() -> Checked:
    return run_checks(_water_demand())


def test_a_long_daily_series_is_reduced_with_m4(long_run: Checked) -> None:
    checked = long_run
    found = result_of(checked, "many-points")
    plan = only_chart(checked).plan
    limit = 4 * points.width_px()
    assert found.status is Status.corrected
    assert found.measured == _DAYS - 1
    assert found.measured_text == "9,999 points"
    assert plan.reduction is not None
    assert (plan.reduction.before, plan.reduction.width_px) == (_DAYS - 1, 1606)
    (series,) = plan.series
    assert plan.reduction.after == len(series.values) <= limit
    assert found.corrected_to == f"{len(series.values):,} (M4 at 1,606 px)"
    assert "M4" in found.explanation
    assert len(plan.periods) == _DAYS  # the time axis keeps every day
    assert series.xs is not None
    assert len(series.xs) == len(series.values)


def test_a_gap_stays_a_gap_after_reduction(long_run: Checked) -> None:
    checked = long_run
    plan = only_chart(checked).plan
    (series,) = plan.series
    assert not series.spans(_GAP)
    assert series.at(_GAP) is None
    assert series.xs is not None
    assert {_GAP - 1, _GAP + 1} <= set(series.xs)  # both ends of the gap are kept
    assert [g.index for g in plan.gaps] == [_GAP]
    assert result_of(checked, "missing-periods").status is Status.passed
    assert result_of(checked, "time-proportional").status is Status.passed


def test_the_reduced_line_is_drawn_at_its_periods(long_run: Checked) -> None:
    plan = only_chart(long_run).plan
    ax = charts.figure_for(plan).axes[0]
    lines = [a for a in ax.lines if isinstance(a, Line2D) and len(a.get_xdata()) > 1]
    drawn = sum(len(a.get_xdata()) for a in lines)
    assert plan.reduction is not None
    assert drawn == plan.reduction.after
    for line in lines:
        xs = np.asarray(line.get_xdata(), dtype=float)
        assert not (xs.min() < _GAP < xs.max())  # no line crosses the gap


def test_a_short_series_passes_untouched() -> None:
    checked = run_checks(make_definition())
    found = result_of(checked, "many-points")
    assert (found.status, found.measured, found.measured_text) == (Status.passed, 5, "5 points")
    plan = only_chart(checked).plan
    assert plan.reduction is None
    assert plan.series[0].xs is None


def test_an_already_reduced_series_is_kept_as_it_is(long_run: Checked) -> None:
    plan = only_chart(long_run).plan
    again = points.reduce_series(plan.series[0], points.width_px(), (0.0, _DAYS - 1.0))
    assert again == plan.series[0]  # M4 is idempotent at the same width


def test_many_points_cannot_be_waived() -> None:
    definition = _water_demand()
    definition["waivers"] = [make_waiver("many-points", "daily-demand")]
    assert find(problems_of(definition), "not_waivable").path == "waivers[0].check"


def test_a_series_broken_everywhere_is_already_as_small_as_m4_can_make_it(
    long_run: Checked,
) -> None:
    plan = only_chart(long_run).plan
    values: list[float | None] = [None if i % 2 else 1.0 + i % 7 for i in range(2 * 7_000)]
    runs = [(i, i) for i in range(0, len(values), 2)]
    lonely = Series(name="lonely", unit="ML", values=values, segments=runs)
    periods = [str(i) for i in range(len(values))]
    broken = plan.model_copy(update={"periods": periods, "series": [lonely], "reduction": None})
    finding = points.SPEC.measure(broken, context_for(intake(_water_demand())))
    # 7,000 single points > 6,424, but no column holds more than one point per segment
    assert finding.ok
    assert finding.shown == "7,000 points"
    assert "without joining across a gap" in finding.detail
