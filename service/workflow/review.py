"""What the review pages show of a pack and of the queue, worked out from the archive and plain
enough for a template.

Everything here reads; nothing changes a pack. What a key may do to a pack now is
``lifecycle.allowed`` (the forms a page offers), and every action applies the rules again.
"""

from __future__ import annotations

import json
from dataclasses import dataclass, field
from datetime import datetime
from typing import Any

from sqlalchemy.orm import sessionmaker

from service.archive import audit
from service.archive.db import PackRow, ReviewRow, SealRow, utc
from service.archive.files import BlobStore
from service.checks import CHECKS
from service.workflow import drafts, lifecycle
from service.workflow.keys import Principal

STATUS_NAMES = {
    lifecycle.DRAFT: "Draft",
    lifecycle.IN_REVIEW: "In review",
    lifecycle.SIGNED_OFF: "Signed off",
    lifecycle.SUPERSEDED: "Superseded",
}
_ORDER = {"failed": 0, "waived": 1, "corrected": 2, "advice": 3, "passed": 4, "not_applicable": 5}
_LABELS = {
    "failed": "✗ Failed",
    "waived": "Waived",
    "corrected": "Corrected",
    "advice": "Advice",
    "passed": "✓ Passed",
    "not_applicable": "Not applicable",
}
SIGNED = (lifecycle.SIGNED_OFF, lifecycle.SUPERSEDED)


def moment(value: datetime | None) -> str:
    """A stored time as the pages show it: UTC to the minute."""
    return "" if value is None else f"{utc(value):%Y-%m-%d %H:%M} UTC"


@dataclass(frozen=True)
class CheckRow:
    check: str
    title: str
    chart: str
    chart_title: str
    status: str
    label: str
    """The status in words (never shown by colour alone)."""
    css: str
    note: str
    """How a failure or waiver stands in review: waived by whom, awaiting confirmation."""
    blocking: bool
    measured: str
    threshold: str
    explanation: str


@dataclass(frozen=True)
class WaiveOption:
    value: str
    """``check/chart`` (ids are slugs, so ``/`` cannot occur in either)."""
    text: str
    confirm: bool
    """A standing waiver to confirm, rather than a failed check to waive."""


@dataclass
class PackPage:
    """Everything the pack page shows."""

    row: PackRow
    status_name: str
    review: ReviewRow | None
    sealed: SealRow | None
    authors: list[str]
    checks: list[CheckRow]
    waivers: list[dict[str, str]]
    trail: list[dict[str, Any]]
    waive_options: list[WaiveOption]
    blockers: list[str]
    is_author: bool
    can_submit: bool
    can_waive: bool
    can_request_changes: bool
    can_sign_off: bool
    previous_signed: PackRow | None
    facts: dict[str, str] = field(default_factory=dict)


def charts_of(store: BlobStore, row: PackRow) -> dict[str, tuple[str, str]]:
    """chart id → (intent, title), read from the stored definition."""
    definition = json.loads(store.get(row.definition_sha256))
    found: dict[str, tuple[str, str]] = {}
    for section in definition.get("sections", []):
        for item in section.get("charts", []):
            found[str(item.get("id"))] = (str(item.get("intent")), str(item.get("title", "")))
    return found


def pack_page(
    *, sessions: sessionmaker[Any], store: BlobStore, principal: Principal, pack_id: str
) -> PackPage:
    """The pack as a key may see it (another family's pack raises NotFound)."""
    row = drafts.visible(sessions=sessions, principal=principal, pack_id=pack_id)
    review = drafts.review(sessions=sessions, pack_id=row.id)
    sealed = drafts.seal_of(sessions=sessions, pack_id=row.id)
    charts = charts_of(store, row)
    given = drafts.waivers_of(sessions=sessions, pack_id=row.id)
    current = {(w.check, w.chart): w for w in given if w.pdf_sha256 == row.pdf_sha256}

    rows: list[tuple[int, int, CheckRow]] = []
    open_failures: list[str] = []
    unconfirmed: list[str] = []
    options: list[WaiveOption] = []
    for index, result in enumerate(row.results):
        check, chart, status = result["check"], result["chart"], result["status"]
        spec = CHECKS.get(check)
        intent, chart_title = charts.get(chart, ("", chart))
        waiver = current.get((check, chart))
        note, blocking, label, css = "", False, _LABELS.get(status, status), status
        if status == "failed":
            if waiver is not None:
                label, css = "✗ Failed, waived in review", "waived"
                note = f"Waived in review by {waiver.by_name} on {moment(waiver.at)}."
            else:
                blocking = True
                open_failures.append(f"{check} on {chart}")
                waivable = spec is not None and spec.waivable_for(intent)
                note = "Not waived yet." if waivable else "Cannot be waived: fix the data or chart."
                if waivable:
                    options.append(
                        WaiveOption(f"{check}/{chart}", f"Waive {check} on {chart}", False)
                    )
        elif status == "waived":
            by = (result.get("waiver") or {}).get("by", "")
            if waiver is not None:
                note = f"Standing waiver by {by}; confirmed by {waiver.by_name}."
            else:
                blocking = True
                unconfirmed.append(f"{check} on {chart}")
                note = f"Standing waiver by {by}; awaits a reviewer's confirmation."
                options.append(
                    WaiveOption(
                        f"{check}/{chart}",
                        f"Confirm the standing waiver of {check} on {chart}",
                        True,
                    )
                )
        measured = str(result.get("measured_text") or "")
        if result.get("corrected_to"):
            measured = f"{measured} → corrected to {result['corrected_to']}"
        check_row = CheckRow(
            check=check,
            title=spec.title if spec is not None else check,
            chart=chart,
            chart_title=chart_title,
            status=status,
            label=label,
            css=css,
            note=note,
            blocking=blocking,
            measured=measured,
            threshold=str(result.get("threshold") or ""),
            explanation=str(result.get("explanation") or ""),
        )
        rows.append((_ORDER.get(status, 9), index, check_row))

    blockers = [f"Failed and not waived: {item}" for item in open_failures]
    blockers += [f"Standing waiver not confirmed: {item}" for item in unconfirmed]
    may = lifecycle.allowed(principal, row, review, waivable=bool(options), blocked=bool(blockers))
    return PackPage(
        row=row,
        status_name=STATUS_NAMES.get(row.status, row.status),
        review=review,
        sealed=sealed,
        authors=[a["name"] for a in review.authors] if review is not None else [],
        checks=[r for _, _, r in sorted(rows, key=lambda item: item[:2])],
        waivers=[
            {
                "check": w.check,
                "chart": w.chart,
                "reason": w.reason,
                "by": w.by_name,
                "at": moment(w.at),
                "current": "this draft" if w.pdf_sha256 == row.pdf_sha256 else "an earlier draft",
            }
            for w in given
        ],
        trail=[
            {
                "seq": e.seq,
                "at": moment(e.at),
                "name": e.name,
                "action": e.action,
                "hash": (e.content_hash or "")[:12],
                "detail": _detail(e.detail),
            }
            for e in audit.trail(sessions, row.id)
        ],
        waive_options=sorted(options, key=lambda o: o.confirm),
        blockers=blockers,
        is_author=may.is_author,
        can_submit=may.submit,
        can_waive=may.waive,
        can_request_changes=may.request_changes,
        can_sign_off=may.sign_off,
        previous_signed=previous_signed(sessions=sessions, principal=principal, row=row),
    )


def _detail(detail: dict[str, Any]) -> str:
    """An audit record's detail in one line (every value is shown as text)."""
    parts = []
    for key in sorted(detail):
        value = detail[key]
        if isinstance(value, str) and len(value) == 64 and key.endswith("sha256"):
            value = value[:12] + "…"
        parts.append(f"{key}: {value}")
    return "; ".join(parts)


def previous_signed(
    *, sessions: sessionmaker[Any], principal: Principal, row: PackRow
) -> PackRow | None:
    """The newest signed pack of the same report that is older than this signed one."""
    if row.status not in SIGNED:
        return None
    found: list[PackRow] = []
    for status in SIGNED:
        query = drafts.Query(report=row.report_id, status=status, limit=drafts.MAX_PAGE)
        packs, _ = drafts.search(sessions=sessions, principal=principal, query=query)
        found += packs
    here = _age(row)
    older = [p for p in found if p.id != row.id and _age(p) < here]
    return max(older, key=_age) if older else None


def _age(row: PackRow) -> tuple[datetime, datetime, str]:
    """The order compare uses: ``as_of``, then when the pack was built."""
    return (utc(datetime.fromisoformat(row.as_of)), utc(row.created_at), row.id)


@dataclass(frozen=True)
class QueueItem:
    id: str
    title: str
    report_id: str
    period: str
    status: str
    failed: int
    note: str


def queue(*, sessions: sessionmaker[Any], principal: Principal) -> dict[str, list[QueueItem]]:
    """Packs awaiting review, the key's own drafts, and recent signed packs."""

    def items(status: str, limit: int) -> list[PackRow]:
        query = drafts.Query(status=status, limit=limit)
        rows, _ = drafts.search(sessions=sessions, principal=principal, query=query)
        return rows

    def item(row: PackRow, note: str = "") -> QueueItem:
        failed = sum(1 for r in row.results if r["status"] == "failed")
        return QueueItem(
            row.id, row.title, row.report_id, row.period, STATUS_NAMES[row.status], failed, note
        )

    def authored(row: PackRow) -> bool:
        review = drafts.review(sessions=sessions, pack_id=row.id)
        return review is not None and review.is_author(principal.key_id, principal.person)

    awaiting = [
        item(r, "You authored this pack." if authored(r) else "")
        for r in items(lifecycle.IN_REVIEW, 100)
    ]
    own = [item(r) for r in items(lifecycle.DRAFT, 100) if authored(r)]
    signed = sorted(
        items(lifecycle.SIGNED_OFF, 20) + items(lifecycle.SUPERSEDED, 20),
        key=lambda r: utc(r.created_at),
        reverse=True,
    )[:20]
    return {"awaiting": awaiting, "drafts": own, "signed": [item(r) for r in signed]}
