"""Month over month: what changed between two signed packs of one report.

Reviewers and auditors set this month's signed pack beside last month's: which checks changed
outcome, which waivers are new or gone, which key figures moved. Three layers, each testable alone:

- :func:`key_figures` re-runs the checks of a stored definition (``pipeline.intake`` and
  ``pipeline.check``, never drawing: the render and assemble stages stay unloaded) and reads
  from every chart's final plan the figures a reader takes from it.
- :func:`compare_packs` is pure: two :class:`SignedPack` values in, a JSON-ready dict out.
- :func:`compare` loads both packs from the archive, refuses what cannot be compared, and orders
  them so that ``earlier`` is the older one (by ``as_of``, then by when the pack was built).

Figures are matched by chart id and label and compared with a relative tolerance of 1e-9, so float
noise from a rebuild is not reported as movement. This module reads the archive; it changes nothing.
"""

from __future__ import annotations

import json
import math
from collections.abc import Iterable
from dataclasses import asdict, dataclass, replace
from datetime import datetime
from typing import Any, Literal

import numpy as np
from sqlalchemy import select
from sqlalchemy.orm import Session, sessionmaker

from service import pipeline
from service.archive.db import PackRow, ReviewRow, WaiverRow, utc
from service.archive.files import BlobStore
from service.config import Limits
from service.definition.model import DistributionChart
from service.errors import Conflict, InvalidDefinition, InvalidRequest, NotFound
from service.intents.forms import FORMS
from service.intents.plan import ChartPlan
from service.workflow.keys import Principal, can_see
from service.workflow.lifecycle import SIGNED_OFF, SUPERSEDED

REL_TOL = 1e-9
"""Two figures within this relative difference are the same figure (float noise, not movement)."""

SIGNED = frozenset({SIGNED_OFF, SUPERSEDED})


@dataclass(frozen=True)
class Figure:
    """A chart's key figure (``intents.forms.KeyFigure``, whose fields it repeats) with its chart."""

    chart: str
    title: str
    label: str
    value: float
    unit: str
    period: str | None = None
    estimate: bool = False
    partial: bool = False

    @property
    def key(self) -> tuple[str, str]:
        return (self.chart, self.label)

    def as_dict(self) -> dict[str, Any]:
        return asdict(self)


@dataclass(frozen=True)
class Outcome:
    """One check's result on one chart, as the pack recorded it."""

    check: str
    chart: str
    status: str
    measured: float | int | str | None
    measured_text: str

    @property
    def key(self) -> tuple[str, str]:
        return (self.check, self.chart)


@dataclass(frozen=True)
class Waiver:
    """A waiver on a pack: standing (it came with the definition; a reviewer confirms it for the
    reviewed PDF) or a reviewer's own waiver of a failed check on that PDF."""

    check: str
    chart: str
    kind: Literal["standing", "review"]
    by: str
    reason: str
    at: str | None = None
    """When a reviewer waived it (ISO 8601, UTC); ``None`` for a standing waiver."""
    expires: str | None = None
    """A standing waiver's expiry date, if it has one."""
    applied: bool = True
    """Whether the pack's checks used it: a standing waiver may name a check that passed, or have
    expired by ``as_of``."""
    confirmed_by: str | None = None
    """The reviewer who confirmed an applied standing waiver for the signed PDF."""
    confirmed_at: str | None = None
    confirmed_reason: str | None = None

    @property
    def key(self) -> tuple[str, str]:
        return (self.check, self.chart)

    def as_dict(self) -> dict[str, Any]:
        return asdict(self)


@dataclass(frozen=True)
class SignedPack:
    """What the comparison needs of one signed pack."""

    id: str
    report_id: str
    period: str
    as_of: str
    status: str
    signed_by: str | None
    signed_at: str | None
    outcomes: tuple[Outcome, ...]
    waivers: tuple[Waiver, ...]
    figures: tuple[Figure, ...]

    def heading(self) -> dict[str, Any]:
        return {
            "id": self.id,
            "report_id": self.report_id,
            "period": self.period,
            "as_of": self.as_of,
            "status": self.status,
            "signed_by": self.signed_by,
            "signed_at": self.signed_at,
        }


# --- key figures ---------------------------------------------------------------------------------


def key_figures(definition: bytes, limits: Limits) -> dict[str, list[Figure]]:
    """Per chart id, the figures a reader takes from the chart as the checks left it.

    Categories give their values (a deviation chart: actual minus target, as drawn); a series gives
    its latest value and that value's period, skipping a partly elapsed last period when the series
    has a complete one (a part-month against a whole month would show a fall that did not happen);
    a histogram or box gives n and the median; a scatter plot gives n and the fitted slope.
    """
    checked = pipeline.check(pipeline.intake(definition, limits))
    models = dict(checked.definition.charts())
    out: dict[str, list[Figure]] = {}
    for item in checked.charts:
        model = models[item.path]
        column = None
        if isinstance(model, DistributionChart):
            column = checked.tables[model.dataset].frame[model.measure].dropna()
        values = None if column is None else column.to_numpy(dtype=float)
        out[item.plan.chart_id] = _figures(item.plan, values)
    return out


def _figures(plan: ChartPlan, measure: np.ndarray[Any, Any] | None) -> list[Figure]:
    read = FORMS[plan.form].key_figures(plan, measure)
    # a figure is compared by its label; the column identifier behind it is not recorded
    return [
        Figure(plan.chart_id, plan.title, **{f: v for f, v in asdict(k).items() if f != "name"})
        for k in read
    ]


def compare_packs(earlier: SignedPack, later: SignedPack) -> dict[str, Any]:
    """What changed from ``earlier`` to ``later``, JSON-ready (see the module docstring)."""
    before = {o.key: o for o in earlier.outcomes}
    after = {o.key: o for o in later.outcomes}
    changed = [
        {
            "check": o.check,
            "chart": o.chart,
            "before": before[o.key].status,
            "after": o.status,
            "measured_before": before[o.key].measured,
            "measured_after": o.measured,
            "measured_text_before": before[o.key].measured_text,
            "measured_text_after": o.measured_text,
        }
        for o in later.outcomes
        if o.key in before and before[o.key].status != o.status
    ]
    added = [_outcome(o) for o in later.outcomes if o.key not in before]
    removed = [_outcome(o) for o in earlier.outcomes if o.key not in after]

    waived_before = {w.key for w in earlier.waivers}
    waived_after = {w.key for w in later.waivers}
    waivers_new = [w.as_dict() for w in later.waivers if w.key not in waived_before]
    waivers_dropped = [w.as_dict() for w in earlier.waivers if w.key not in waived_after]

    moved, new, gone = _figure_changes(earlier.figures, later.figures)
    counts = {
        "checks_changed": len(changed),
        "checks_added": len(added),
        "checks_removed": len(removed),
        "waivers_new": len(waivers_new),
        "waivers_dropped": len(waivers_dropped),
        "figures_moved": len(moved),
        "figures_new": len(new),
        "figures_gone": len(gone),
    }
    return {
        "report_id": later.report_id,
        "earlier": earlier.heading(),
        "later": later.heading(),
        "checks_changed": changed,
        "checks_added": added,
        "checks_removed": removed,
        "waivers_new": waivers_new,
        "waivers_dropped": waivers_dropped,
        "figures_moved": moved,
        "figures_new": new,
        "figures_gone": gone,
        "counts": counts,
        "summary": summary_line(counts),
    }


def summary_line(counts: dict[str, int]) -> str:
    """One line of counts, e.g. ``2 checks changed outcome, 0 added, 0 removed; …``."""

    def n(key: str, one: str, many: str) -> str:
        return f"{counts[key]} {one if counts[key] == 1 else many}"

    return (
        f"{n('checks_changed', 'check changed outcome', 'checks changed outcome')}, "
        f"{counts['checks_added']} added, {counts['checks_removed']} removed; "
        f"{n('waivers_new', 'waiver new', 'waivers new')}, {counts['waivers_dropped']} dropped; "
        f"{n('figures_moved', 'figure moved', 'figures moved')}, {counts['figures_new']} new, "
        f"{counts['figures_gone']} gone"
    )


def same_figure(a: float, b: float) -> bool:
    """Equal within :data:`REL_TOL` of the larger magnitude (exactly equal for zero)."""
    return math.isclose(a, b, rel_tol=REL_TOL, abs_tol=0.0)


def _outcome(o: Outcome) -> dict[str, Any]:
    return {"check": o.check, "chart": o.chart, "status": o.status, "measured": o.measured}


def _figure_changes(
    earlier: Iterable[Figure], later: Iterable[Figure]
) -> tuple[list[dict[str, Any]], list[dict[str, Any]], list[dict[str, Any]]]:
    """Moved, new and gone figures. A figure whose unit changed is not comparable: it is listed as
    gone (old unit) and new (new unit)."""
    before = {f.key: f for f in earlier}
    after = {f.key: f for f in later}
    comparable = {k for k in before.keys() & after.keys() if before[k].unit == after[k].unit}
    moved = []
    for key in comparable:
        old, now_ = before[key], after[key]
        if same_figure(old.value, now_.value):
            continue
        change = now_.value - old.value
        moved.append(
            {
                "chart": key[0],
                "title": now_.title,
                "label": key[1],
                "unit": now_.unit,
                "before": old.value,
                "after": now_.value,
                "period_before": old.period,
                "period_after": now_.period,
                "change": change,
                "change_pct": None if old.value == 0 else change / abs(old.value) * 100.0,
            }
        )
    moved.sort(key=_size_of_move)
    new = [f.as_dict() for k, f in after.items() if k not in comparable]
    gone = [f.as_dict() for k, f in before.items() if k not in comparable]
    return moved, new, gone


def _size_of_move(entry: dict[str, Any]) -> tuple[float, float, str, str]:
    """Largest relative change first; a move from zero (no relative change) counts as largest."""
    pct = entry["change_pct"]
    relative = math.inf if pct is None else abs(pct)
    return (-relative, -abs(entry["change"]), entry["chart"], entry["label"])


# --- from the archive ----------------------------------------------------------------------------


def compare(
    *,
    sessions: sessionmaker[Any],
    store: BlobStore,
    principal: Principal,
    pack_id: str,
    other_id: str,
    limits: Limits,
) -> dict[str, Any]:
    """Compare two signed packs of one report, whichever order their ids are given in."""
    with sessions() as session:
        rows = [_visible(session, principal, pid) for pid in (pack_id, other_id)]
        if pack_id == other_id:
            raise InvalidRequest(
                f"a pack cannot be compared with itself: both ids are '{pack_id}'; give the id "
                "of another signed pack of the same report"
            )
        for row in rows:
            if row.status not in SIGNED:
                raise Conflict(f"only signed packs are compared; '{row.id}' is {row.status}")
        first, second = rows
        if first.report_id != second.report_id:
            raise Conflict(
                f"only packs of one report are compared; '{first.id}' is of report "
                f"'{first.report_id}' and '{second.id}' of '{second.report_id}'"
            )
        loaded = [_signed_pack(session, store, row) for row in sorted(rows, key=_age)]
    # The checks re-run outside the session: a few hundred milliseconds of CPU per pack.
    earlier, later = (
        replace(pack, figures=_figures_of(pack.id, raw, limits)) for pack, raw in loaded
    )
    return compare_packs(earlier, later)


def _visible(session: Session, principal: Principal, pack_id: str) -> PackRow:
    """The pack, or "not found" for one the key may not see (as the lifecycle answers)."""
    row = session.get(PackRow, pack_id)
    if row is None or not can_see(principal, row.report_id):
        raise NotFound(f"there is no pack '{pack_id}'")
    return row


def _age(row: PackRow) -> tuple[datetime, datetime, str]:
    return (utc(datetime.fromisoformat(row.as_of)), utc(row.created_at), row.id)


def _figures_of(pack_id: str, definition: bytes, limits: Limits) -> tuple[Figure, ...]:
    try:
        figures = key_figures(definition, limits)
    except InvalidDefinition as exc:
        first = exc.problems[0].line() if exc.problems else ""
        raise Conflict(
            f"the stored definition of pack '{pack_id}' no longer passes intake with this "
            f"service's limits ({exc.message}; first: {first}); raise the limit it names to "
            "compare this pack"
        ) from None
    return tuple(f for found in figures.values() for f in found)


def _signed_pack(session: Session, store: BlobStore, row: PackRow) -> tuple[SignedPack, bytes]:
    """The pack as the archive recorded it (figures still to read), and its definition's bytes."""
    definition = store.get(row.definition_sha256)
    review = session.get(ReviewRow, row.id)
    outcomes = tuple(
        Outcome(
            check=r["check"],
            chart=r["chart"],
            status=r["status"],
            measured=r.get("measured"),
            measured_text=r.get("measured_text", ""),
        )
        for r in row.results
    )
    reviewed = _review_waivers(session, row)
    waived = {o.key for o in outcomes if o.status == "waived"}
    standing = []
    for item in json.loads(definition).get("waivers", []):
        key = (item["check"], item["chart"])
        applied = key in waived
        confirmation = reviewed.pop(key, None) if applied else None
        standing.append(
            Waiver(
                check=key[0],
                chart=key[1],
                kind="standing",
                by=item["by"],
                reason=item["reason"],
                expires=item.get("expires"),
                applied=applied,
                confirmed_by=None if confirmation is None else confirmation.by,
                confirmed_at=None if confirmation is None else confirmation.at,
                confirmed_reason=None if confirmation is None else confirmation.reason,
            )
        )
    signed_at = review.signed_off_at if review is not None else None
    pack = SignedPack(
        id=row.id,
        report_id=row.report_id,
        period=row.period,
        as_of=row.as_of,
        status=row.status,
        signed_by=review.signed_off_name if review is not None else None,
        signed_at=None if signed_at is None else utc(signed_at).isoformat(),
        outcomes=outcomes,
        waivers=(*standing, *reviewed.values()),
        figures=(),
    )
    return pack, definition


def _review_waivers(session: Session, row: PackRow) -> dict[tuple[str, str], Waiver]:
    """The reviewers' waivers and confirmations of the pack's signed PDF (a waiver of an earlier
    draft of the pack names another PDF and does not count), by check and chart."""
    rows = session.scalars(
        select(WaiverRow)
        .where(WaiverRow.pack_id == row.id, WaiverRow.pdf_sha256 == row.pdf_sha256)
        .order_by(WaiverRow.at, WaiverRow.id)
    )
    return {
        (w.check, w.chart): Waiver(
            check=w.check,
            chart=w.chart,
            kind="review",
            by=w.by_name,
            reason=w.reason,
            at=utc(w.at).isoformat(),
        )
        for w in rows
    }
