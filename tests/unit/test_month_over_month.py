"""Month over month against a real SQLite file archive: two packs built from the demo definition,
taken through review and sign-off, then compared; the key figures read from the real pipeline; the
pure comparison's tolerance and ordering; and every refusal."""

from __future__ import annotations

import copy
import itertools
import json
import statistics
import subprocess
import sys
import uuid
from pathlib import Path
from typing import Any

import pytest
from factories import make_definition, make_report
from sqlalchemy import select, update
from sqlalchemy.orm import sessionmaker

from service import pipeline
from service.archive.db import PackRow, ReviewRow, WaiverRow, connect, utc
from service.archive.files import Store
from service.config import Limits
from service.errors import Conflict, InvalidRequest, NotFound
from service.workflow import drafts, lifecycle, month_over_month
from service.workflow.keys import Principal, Role
from service.workflow.month_over_month import Figure, Outcome, SignedPack, Waiver

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "sample_requests" / "bus-cooperative-monthly.json"
REPORT = "hollin-vale-ops-monthly"
OCTOBER_BEFORE, OCTOBER_AFTER = 57120, 59976
"""Boardings in October 2026: the demo's count, and the corrected count in the later pack."""
STANDING_REASON = "The route managers asked for the 85 % floor as the axis start this month."
REVIEW_REASON = "Accepted for this month only; the narrative says the bars start at 85 %."
CONFIRM_REASON = "Confirmed: the board was told the on-time bars start at 85 % this month."


def later_definition() -> dict[str, Any]:
    """The demo, issued two hours later with October's boardings corrected (in every dataset that
    carries them) and a standing waiver that keeps the on-time bars starting at 85 % (so the lie
    factor then fails)."""
    definition: dict[str, Any] = json.loads(DEMO.read_bytes())
    later = copy.deepcopy(definition)
    later["report"]["as_of"] = "2026-11-09T09:30:00+00:00"
    for dataset in later["datasets"]:
        for row in dataset.get("rows") or []:
            if row.get("month") == "2026-10-01" and "boardings" in row:
                assert row["boardings"] == OCTOBER_BEFORE
                row["boardings"] = OCTOBER_AFTER
    later["waivers"] = [
        {
            "check": "bar-zero-baseline",
            "chart": "on-time-by-route",
            "reason": STANDING_REASON,
            "by": "Head of operations",
        }
    ]
    return later


class Built:
    """Each definition built once (the real pipeline, PDF included) for the whole module."""

    def __init__(self) -> None:
        weekly = make_definition(report=make_report(id="hollin-vale-ops-weekly"))
        self.raw = {
            "earlier": DEMO.read_bytes(),
            "later": json.dumps(later_definition()).encode(),
            "weekly": json.dumps(weekly).encode(),
        }
        self.built = {name: pipeline.build(raw, Limits()) for name, raw in self.raw.items()}


@pytest.fixture(scope="module")
def built() -> Built:
    return Built()


class World:
    """A real SQLite file, a file store, one key per person, and the lifecycle to sign packs."""

    def __init__(self, tmp_path: Path, built: Built) -> None:
        self.sessions: sessionmaker[Any] = connect(f"sqlite:///{tmp_path / 'archive.db'}")
        self.store = Store(tmp_path / "files")
        self.built = built
        self.ann = self.key("Ann Author", Role.author)
        self.rui = self.key("Rui Reviewer", Role.reviewer)
        self.pat = self.key("Pat Approver", Role.approver)
        self.ada = self.key("Ada Auditor", Role.auditor)
        self.stranger = self.key("Mo Elsewhere", Role.auditor, family="marsh-end")

    def key(self, name: str, *roles: Role, family: str = "hollin-vale") -> Principal:
        return Principal(
            f"key_{uuid.uuid4().hex[:16]}", name, frozenset(roles), frozenset({family})
        )

    def draft(self, name: str) -> PackRow:
        built = self.built.built[name]
        return drafts.create(
            sessions=self.sessions,
            store=self.store,
            built=built,
            definition=self.built.raw[name],
            author=self.ann,
        )

    def submit(self, row: PackRow) -> None:
        lifecycle.submit(sessions=self.sessions, principal=self.ann, pack_id=row.id)

    def waive_failures(self, row: PackRow, note: str = "") -> None:
        """A reviewer waives every failed check and confirms every standing waiver used."""
        for result in row.results:
            if result["status"] in ("failed", "waived"):
                lifecycle.waive(
                    sessions=self.sessions,
                    store=self.store,
                    principal=self.rui,
                    pack_id=row.id,
                    check=result["check"],
                    chart=result["chart"],
                    reason=(REVIEW_REASON if result["status"] == "failed" else CONFIRM_REASON)
                    + note,
                )

    def sign(self, row: PackRow, digest: str | None = None) -> None:
        lifecycle.sign_off(
            sessions=self.sessions,
            principal=self.pat,
            pack_id=row.id,
            content_sha256=digest or row.pdf_sha256,
        )

    def signed(self, name: str) -> PackRow:
        row = self.draft(name)
        self.submit(row)
        self.waive_failures(row)
        self.sign(row)
        return row

    def compare(self, a: str, b: str, who: Principal | None = None) -> dict[str, Any]:
        return month_over_month.compare(
            sessions=self.sessions,
            store=self.store,
            principal=who or self.ada,
            pack_id=a,
            other_id=b,
            limits=Limits(),
        )

    def status(self, pack_id: str) -> str:
        with self.sessions() as session:
            row = session.get(PackRow, pack_id)
            assert row is not None
            return row.status

    def review(self, pack_id: str) -> ReviewRow:
        with self.sessions() as session:
            review = session.get(ReviewRow, pack_id)
            assert review is not None
            return review

    def review_waivers(self, pack_id: str) -> list[WaiverRow]:
        with self.sessions() as session:
            query = select(WaiverRow).where(WaiverRow.pack_id == pack_id).order_by(WaiverRow.id)
            return list(session.scalars(query))


@pytest.fixture
def w(tmp_path: Path, built: Built) -> World:
    return World(tmp_path, built)


@pytest.fixture
def pair(w: World) -> tuple[PackRow, PackRow]:
    """The earlier pack signed first; signing the later one (same period) supersedes it."""
    earlier = w.signed("earlier")
    later = w.signed("later")
    assert (w.status(earlier.id), w.status(later.id)) == ("superseded", "signed_off")
    return earlier, later


def result_of(row: PackRow, check: str, chart: str) -> dict[str, Any]:
    (found,) = [r for r in row.results if (r["check"], r["chart"]) == (check, chart)]
    return found


def tufte_lie_factor(values: list[float], base: float) -> float:
    """The lie factor furthest from 1 over every ordered pair of bars drawn from ``base``: the
    effect shown, (s_b - s_a) / s_a with s = v - base, over the effect in the data, (b - a) / a
    (Tufte, The Visual Display of Quantitative Information, 1983, p. 57)."""
    factors = []
    for a, b in itertools.permutations(values, 2):
        shown = ((b - base) - (a - base)) / (a - base)
        factors.append(shown / ((b - a) / a))
    return max(factors, key=lambda f: abs(f - 1.0))


# --- two signed packs of the demo ---------------------------------------------------------------


def test_two_signed_packs_compare_entry_by_entry(w: World, pair: tuple[PackRow, PackRow]) -> None:
    earlier, later = pair
    out = w.compare(earlier.id, later.id)

    for side, row in (("earlier", earlier), ("later", later)):
        review = w.review(row.id)
        assert review.signed_off_at is not None
        assert out[side] == {
            "id": row.id,
            "report_id": REPORT,
            "period": "Twelve months to November 2026",
            "as_of": row.as_of,
            "status": w.status(row.id),
            "signed_by": "Pat Approver",
            "signed_at": utc(review.signed_off_at).isoformat(),
        }
    assert out["earlier"]["as_of"] == "2026-11-09T07:30:00+00:00"
    assert out["later"]["as_of"] == "2026-11-09T09:30:00+00:00"
    assert out["report_id"] == REPORT

    # The standing waiver keeps the bars at 85 %: the baseline is waived instead of corrected, and
    # the lie factor of bars drawn from 85 fails. Bars from zero have a lie factor of exactly 1.
    on_time = [94.6, 93.4, 91.2, 90.8, 89.7, 88.9]  # the demo's punctuality rows
    lie = round(tufte_lie_factor(on_time, 85.0), 4)
    assert lie == pytest.approx(22.7949)  # worst pair 88.9 → 89.7: (0.8 / 3.9) / (0.8 / 88.9)
    assert round(tufte_lie_factor(on_time, 0.0), 4) == 1.0
    baseline_before = result_of(earlier, "bar-zero-baseline", "on-time-by-route")
    baseline_after = result_of(later, "bar-zero-baseline", "on-time-by-route")
    lie_before = result_of(earlier, "lie-factor", "on-time-by-route")
    lie_after = result_of(later, "lie-factor", "on-time-by-route")
    assert out["checks_changed"] == [
        {
            "check": "bar-zero-baseline",
            "chart": "on-time-by-route",
            "before": "corrected",
            "after": "waived",
            "measured_before": 85.0,
            "measured_after": 85.0,
            "measured_text_before": baseline_before["measured_text"],
            "measured_text_after": baseline_after["measured_text"],
        },
        {
            "check": "lie-factor",
            "chart": "on-time-by-route",
            "before": "passed",
            "after": "failed",
            "measured_before": 1.0,
            "measured_after": lie,
            "measured_text_before": lie_before["measured_text"],
            "measured_text_after": lie_after["measured_text"],
        },
    ]
    assert out["checks_added"] == []
    assert out["checks_removed"] == []

    # The reviewer confirmed the standing waiver and waived the failed lie factor: two rows.
    rows = {(r.check, r.chart): r for r in w.review_waivers(later.id)}
    confirmed = rows["bar-zero-baseline", "on-time-by-route"]
    waived = rows["lie-factor", "on-time-by-route"]
    assert len(rows) == 2
    assert out["waivers_new"] == [
        {
            "check": "bar-zero-baseline",
            "chart": "on-time-by-route",
            "kind": "standing",
            "by": "Head of operations",
            "reason": STANDING_REASON,
            "at": None,
            "expires": None,
            "applied": True,
            "confirmed_by": "Rui Reviewer",
            "confirmed_at": utc(confirmed.at).isoformat(),
            "confirmed_reason": CONFIRM_REASON,
        },
        {
            "check": "lie-factor",
            "chart": "on-time-by-route",
            "kind": "review",
            "by": "Rui Reviewer",
            "reason": REVIEW_REASON,
            "at": utc(waived.at).isoformat(),
            "expires": None,
            "applied": True,
            "confirmed_by": None,
            "confirmed_at": None,
            "confirmed_reason": None,
        },
    ]
    assert out["waivers_dropped"] == []

    # October's boardings: 57,120 → 59,976, a change of 59,976 − 57,120 = 2,856, and
    # 2,856 / 57,120 = 0.05 exactly, so +5 %. The index chart carries the same boardings, so its
    # October index moves by the same 5 %; no other figure of the pack moved.
    change = OCTOBER_AFTER - OCTOBER_BEFORE
    assert change == 2856
    moved, indexed = out["figures_moved"]
    assert (indexed["chart"], indexed["label"]) == ("cost-vs-use", "boardings")
    assert indexed["change_pct"] == pytest.approx(5.0, rel=1e-9)
    assert moved == {
        "chart": "boardings-trend",
        "title": "Passenger boardings by month",
        "label": "boardings",
        "unit": "boardings",
        "before": 57120.0,
        "after": 59976.0,
        "period_before": "Oct 2026",
        "period_after": "Oct 2026",
        "change": 2856.0,
        "change_pct": pytest.approx(change / OCTOBER_BEFORE * 100, rel=1e-12),
    }
    assert moved["change_pct"] == pytest.approx(5.0, rel=1e-12)
    assert out["figures_new"] == []
    assert out["figures_gone"] == []
    assert out["summary"] == (
        "2 checks changed outcome, 0 added, 0 removed; 2 waivers new, 0 dropped; "
        "2 figures moved, 0 new, 0 gone"
    )
    json.dumps(out, allow_nan=False)  # JSON-ready as it stands


def test_the_order_the_ids_are_given_in_does_not_matter(
    w: World, pair: tuple[PackRow, PackRow]
) -> None:
    earlier, later = pair
    forward = w.compare(earlier.id, later.id)
    backward = w.compare(later.id, earlier.id)
    assert backward == forward
    assert (forward["earlier"]["id"], forward["later"]["id"]) == (earlier.id, later.id)


def test_as_of_orders_the_packs_before_the_time_they_were_built(w: World) -> None:
    """The later-dated pack built and signed first: ``as_of`` still makes it the later one."""
    later = w.signed("later")
    earlier = w.signed("earlier")  # built afterwards, so signing it supersedes the other
    assert (w.status(later.id), w.status(earlier.id)) == ("superseded", "signed_off")
    with w.sessions() as session:
        created = {r.id: utc(r.created_at) for r in session.scalars(select(PackRow))}
    assert created[later.id] < created[earlier.id]
    out = w.compare(later.id, earlier.id)
    assert (out["earlier"]["id"], out["later"]["id"]) == (earlier.id, later.id)
    trend = [m for m in out["figures_moved"] if m["chart"] == "boardings-trend"]
    assert [(m["before"], m["after"]) for m in trend] == [(57120.0, 59976.0)]
    assert [(c["before"], c["after"]) for c in out["checks_changed"]] == [
        ("corrected", "waived"),
        ("passed", "failed"),
    ]


def test_a_waiver_of_an_earlier_draft_does_not_count(w: World) -> None:
    """A reviewer's waiver names one PDF: after the draft is rebuilt only the new waiver counts."""
    earlier = w.signed("earlier")
    later = w.draft("later")
    w.submit(later)
    w.waive_failures(later)
    lifecycle.request_changes(
        sessions=w.sessions, principal=w.rui, pack_id=later.id, reason="Say why bars start at 85."
    )
    rebuilt = w.store.put(b"%PDF-1.7 the rebuilt draft of the later pack")
    with w.sessions.begin() as session:  # the draft rebuilt under the same pack id
        session.execute(update(PackRow).where(PackRow.id == later.id).values(pdf_sha256=rebuilt))
    w.submit(later)
    w.waive_failures(later, note=" (rebuilt draft)")
    w.sign(later, rebuilt)
    assert len(w.review_waivers(later.id)) == 4
    out = w.compare(earlier.id, later.id)
    assert [(x["kind"], x["reason"], x["confirmed_reason"]) for x in out["waivers_new"]] == [
        ("standing", STANDING_REASON, CONFIRM_REASON + " (rebuilt draft)"),
        ("review", REVIEW_REASON + " (rebuilt draft)", None),
    ]


# --- refusals ------------------------------------------------------------------------------------


@pytest.mark.parametrize("state", ["draft", "in_review"])
def test_an_unsigned_pack_is_not_compared(w: World, state: str) -> None:
    signed = w.signed("earlier")
    other = w.draft("later")
    if state == "in_review":
        w.submit(other)
    for a, b in ((signed.id, other.id), (other.id, signed.id)):
        with pytest.raises(Conflict) as caught:
            w.compare(a, b)
        assert caught.value.status == 409
        assert caught.value.message == f"only signed packs are compared; '{other.id}' is {state}"


def test_packs_of_different_reports_are_not_compared(w: World) -> None:
    monthly = w.signed("earlier")
    weekly = w.signed("weekly")
    with pytest.raises(Conflict, match="only packs of one report are compared") as caught:
        w.compare(monthly.id, weekly.id)
    assert f"'{monthly.id}' is of report '{REPORT}'" in caught.value.message
    assert f"'{weekly.id}' of 'hollin-vale-ops-weekly'" in caught.value.message


def test_a_pack_outside_the_keys_families_is_not_found(
    w: World, pair: tuple[PackRow, PackRow]
) -> None:
    earlier, later = pair
    with pytest.raises(NotFound) as caught:
        w.compare(earlier.id, later.id, who=w.stranger)
    assert caught.value.status == 404
    assert caught.value.message == f"there is no pack '{earlier.id}'"
    with pytest.raises(NotFound, match="there is no pack 'pk_missing'"):
        w.compare(earlier.id, "pk_missing")


def test_a_pack_is_not_compared_with_itself(w: World) -> None:
    pack = w.signed("earlier")
    with pytest.raises(InvalidRequest, match="cannot be compared with itself") as caught:
        w.compare(pack.id, pack.id)
    assert caught.value.status == 422


# --- key figures from the real pipeline ----------------------------------------------------------


def test_key_figures_of_the_demo(built: Built) -> None:
    figures = month_over_month.key_figures(built.raw["earlier"], Limits())
    demo = json.loads(built.raw["earlier"])
    datasets = {d["name"]: d for d in demo["datasets"]}
    charts = [c["id"] for s in demo["sections"] for c in s["charts"]]
    assert list(figures) == charts

    # The series' latest complete month is October: November is 8 of 30 days old, so its count
    # (15,480) is not taken; the run-rate projection of November is 15,480 × 30 / 8 = 58,050.
    title = "Passenger boardings by month"
    assert figures["boardings-trend"] == [
        Figure("boardings-trend", title, "boardings", 57120.0, "boardings", "Oct 2026"),
        Figure(
            "boardings-trend",
            title,
            "boardings (estimate)",
            15480 * 30 / 8,
            "boardings",
            "Nov 2026",
            estimate=True,
        ),
    ]

    # Bars: every route's value, in the plan's order (largest first).
    rows = datasets["punctuality"]["rows"]
    expected = sorted(((r["route"], r["on_time"]) for r in rows), key=lambda p: -p[1])
    assert [(f.label, f.value, f.unit) for f in figures["on-time-by-route"]] == [
        (label, value, "%") for label, value in expected
    ]

    # A deviation chart's figure is what it draws: operated minus planned.
    depots = datasets["depot_delivery"]["rows"]
    assert [(f.label, f.value) for f in figures["depot-target"]] == [
        (r["depot"], float(r["operated"] - r["planned"])) for r in depots
    ]

    # A share drops the expected part that has no value (Group travel) rather than invent zero.
    assert [f.label for f in figures["revenue-share"]] == [
        "Single tickets",
        "Concessionary reimbursement",
        "Season tickets",
        "Day passes",
        "Contactless capped fares",
    ]

    # Histogram: n and the median of the data (Python's statistics module, not numpy).
    late = [float(v) for v in datasets["late_departures"]["csv"].split()[1:]]
    n, median = figures["lateness-distribution"]
    assert (n.label, n.value, n.unit) == ("n", float(len(late)), "observations")
    assert n.value == 240
    assert (median.label, median.unit) == ("median", "minutes")
    assert median.value == pytest.approx(statistics.median(late), rel=1e-12)

    # Scatter: n and the least-squares slope (Python's statistics.linear_regression).
    profile = datasets["route_profile"]["rows"]
    slope = statistics.linear_regression(
        [r["length_km"] for r in profile], [r["on_time"] for r in profile]
    ).slope
    points, fitted = figures["length-vs-punctuality"]
    assert (points.label, points.value) == ("n", 8.0)
    assert (fitted.label, fitted.unit) == ("slope of the fitted line", "% per km")
    assert fitted.value == pytest.approx(slope, rel=1e-9)

    # Index chart: October over December 2025, × 100.
    cost = {r["month"]: r["operating_cost"] for r in datasets["cost_and_use"]["rows"]}
    (operating, _boardings) = figures["cost-vs-use"]
    assert operating.value == pytest.approx(cost["2026-10-01"] / cost["2025-12-01"] * 100)
    assert (operating.unit, operating.period) == ("index (Dec 2025 = 100)", "Oct 2026")


def test_a_series_with_only_a_partial_period_gives_that_period_marked(limits: Limits) -> None:
    definition = make_definition(
        datasets=[
            {
                "name": "ridership",
                "columns": [
                    {"name": "month", "type": "date"},
                    {"name": "boardings", "type": "integer", "unit": "boardings"},
                ],
                "time_column": "month",
                "frequency": "month",
                "rows": [
                    {"month": "2026-10-01", "boardings": None},
                    {"month": "2026-11-01", "boardings": 15480},
                ],
            }
        ],
        report=make_report(period={"start": "2026-10-01", "end": "2026-11-30"}),
    )
    (figure,) = month_over_month.key_figures(json.dumps(definition).encode(), limits)[
        "boardings-trend"
    ]
    assert (figure.value, figure.period, figure.partial) == (15480.0, "Nov 2026", True)


def test_key_figures_never_load_the_drawing_stack() -> None:
    """No figure is drawn: the render and assemble stages, matplotlib's Figure and backends, and
    reportlab stay unloaded (``service.glyphs`` imports the matplotlib package itself, only to
    find the typeface's file)."""
    drawing = (
        "service.render",
        "service.assemble",
        "matplotlib.figure",
        "matplotlib.pyplot",
        "matplotlib.backends.backend_pdf",
        "reportlab",
    )
    code = (
        "import sys\n"
        "from pathlib import Path\n"
        "from service.config import Limits\n"
        "from service.workflow import month_over_month\n"
        f"raw = Path({str(DEMO)!r}).read_bytes()\n"
        "assert month_over_month.key_figures(raw, Limits())['boardings-trend']\n"
        f"print(sorted(m for m in sys.modules if m.startswith({drawing!r})))\n"
    )
    done = subprocess.run(
        [sys.executable, "-c", code], cwd=ROOT, capture_output=True, text=True, check=True
    )
    assert done.stdout.strip() == "[]"


# --- the pure comparison -------------------------------------------------------------------------


def fig(label: str, value: float, unit: str = "trips", chart: str = "c") -> Figure:
    return Figure(chart, "A chart", label, value, unit)


def pack(
    figures: list[Figure],
    outcomes: list[Outcome] | None = None,
    waivers: list[Waiver] | None = None,
    id_: str = "pk_a",
) -> SignedPack:
    return SignedPack(
        id=id_,
        report_id="r",
        period="p",
        as_of="2026-11-09T07:30:00+00:00",
        status="signed_off",
        signed_by="Pat Approver",
        signed_at="2026-11-10T09:00:00+00:00",
        outcomes=tuple(outcomes or []),
        waivers=tuple(waivers or []),
        figures=tuple(figures),
    )


def test_float_noise_is_not_movement() -> None:
    value = 0.1 + 0.2  # 0.30000000000000004
    noisy = pack([fig("a", 0.3), fig("b", 1000.0), fig("c", 0.0)])
    rebuilt = pack([fig("a", value), fig("b", 1000.0 * (1 + 5e-10)), fig("c", 0.0)])
    out = month_over_month.compare_packs(noisy, rebuilt)
    assert out["figures_moved"] == []
    moved = pack([fig("a", 0.3), fig("b", 1000.0 * (1 + 2e-9)), fig("c", 0.0)])
    (entry,) = month_over_month.compare_packs(noisy, moved)["figures_moved"]
    assert entry["label"] == "b"
    assert entry["change_pct"] == pytest.approx(2e-7, rel=1e-6)  # 2e-9 relative is 2e-7 %


def test_moves_are_sorted_by_relative_change_and_a_move_from_zero_leads() -> None:
    before = pack([fig("small", 200.0), fig("big", 10.0), fig("zero", 0.0), fig("down", -40.0)])
    after = pack([fig("small", 210.0), fig("big", 15.0), fig("zero", 3.0), fig("down", -50.0)])
    out = month_over_month.compare_packs(before, after)
    assert [(m["label"], m["change"], m["change_pct"]) for m in out["figures_moved"]] == [
        ("zero", 3.0, None),  # no relative change from zero
        ("big", 5.0, 50.0),  # (15 − 10) / 10
        ("down", -10.0, -25.0),  # (−50 − −40) / |−40|: falls further below zero
        ("small", 10.0, 5.0),  # (210 − 200) / 200
    ]


def test_charts_checks_and_figures_present_in_one_pack_only() -> None:
    kept = Outcome("source-line", "c", "passed", "Depot log", "Depot log")
    gone = Outcome("precision", "old-chart", "passed", None, "")
    came = Outcome("precision", "new-chart", "failed", 3, "3 decimals")
    before = pack(
        [fig("a", 1.0), fig("x", 5.0, chart="old-chart"), fig("u", 2.0, unit="trips")],
        outcomes=[kept, gone],
        waivers=[Waiver("precision", "old-chart", "review", "Rui Reviewer", "r" * 20, at="t")],
    )
    after = pack(
        [fig("a", 1.0), fig("y", 6.0, chart="new-chart"), fig("u", 2.0, unit="journeys")],
        outcomes=[kept, came],
        waivers=[Waiver("precision", "new-chart", "standing", "Head of operations", "s" * 20)],
    )
    out = month_over_month.compare_packs(before, after)
    assert out["checks_changed"] == []
    assert out["checks_added"] == [
        {"check": "precision", "chart": "new-chart", "status": "failed", "measured": 3}
    ]
    assert out["checks_removed"] == [
        {"check": "precision", "chart": "old-chart", "status": "passed", "measured": None}
    ]
    assert [(x["chart"], x["kind"]) for x in out["waivers_new"]] == [("new-chart", "standing")]
    assert [(x["chart"], x["kind"]) for x in out["waivers_dropped"]] == [("old-chart", "review")]
    # A figure whose unit changed is not comparable: gone in the old unit, new in the new one.
    assert out["figures_moved"] == []
    assert [(f["label"], f["unit"]) for f in out["figures_new"]] == [
        ("y", "trips"),
        ("u", "journeys"),
    ]
    assert [(f["label"], f["unit"]) for f in out["figures_gone"]] == [
        ("x", "trips"),
        ("u", "trips"),
    ]
    assert out["summary"] == (
        "0 checks changed outcome, 1 added, 1 removed; 1 waiver new, 1 dropped; "
        "0 figures moved, 2 new, 2 gone"
    )


def test_a_waiver_kept_under_another_kind_is_neither_new_nor_dropped() -> None:
    """Waivers are matched by check and chart: a standing waiver replacing a reviewer's is kept."""
    review = Waiver("lie-factor", "c", "review", "Rui Reviewer", "r" * 20, at="t")
    standing = Waiver("lie-factor", "c", "standing", "Head of operations", "s" * 20)
    out = month_over_month.compare_packs(pack([], waivers=[review]), pack([], waivers=[standing]))
    assert (out["waivers_new"], out["waivers_dropped"]) == ([], [])
