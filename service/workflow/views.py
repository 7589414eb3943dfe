"""What a client is shown: the HTTP API's answers as pydantic models, shared by the API (its
``response_model``s, so the OpenAPI document describes them) and the review pages, and built here
from the archive's rows. Field names and values are the API's JSON, exactly.
"""

from __future__ import annotations

from datetime import datetime
from typing import Any

from pydantic import BaseModel, ConfigDict, Field
from sqlalchemy.orm import sessionmaker

from service.archive import audit
from service.archive.db import PackRow, SealRow, WaiverRow
from service.workflow import drafts
from service.workflow.keys import Principal


class View(BaseModel):
    model_config = ConfigDict(populate_by_name=True)

    def json_body(self) -> dict[str, Any]:
        """The answer as JSON values, as the API sends it (fields left unset are left out)."""
        return self.model_dump(mode="json", by_alias=True, exclude_unset=True)


class ReportRef(View):
    id: str
    title: str
    period: str
    as_of: str


class PdfRef(View):
    sha256: str
    bytes: int


class ReviewView(View):
    authors: list[str]
    submitted_sha256: str | None
    submitted_at: str | None
    signed_off_by: str | None
    signed_off_at: str | None
    signed_off_sha256: str | None
    superseded_by: str | None


class SealView(View):
    sha256: str
    bytes: int
    signer: str
    development_key: bool
    pdfa: dict[str, Any]
    sealed_at: str | None


class PackLinks(View):
    self_: str = Field(alias="self")
    pdf: str
    checks: str
    audit: str
    sealed: str
    compare: str


class WaiverView(View):
    check: str
    chart: str
    reason: str
    by: str
    at: str
    pdf_sha256: str


class PackSummary(View):
    """A pack: its report, status, check summary, review, seal and links."""

    id: str
    report: ReportRef
    status: str
    blocked: bool
    summary: dict[str, Any]
    failed: list[str]
    unused_waivers: list[str]
    pdf: PdfRef
    definition_sha256: str
    created_at: str
    review: ReviewView | None
    sealed: SealView | None
    links: PackLinks


class PackDetail(PackSummary):
    """A pack with every check result and the waivers given in review."""

    checks: list[dict[str, Any]]
    waivers: list[WaiverView]


class PackList(View):
    total: int
    limit: int
    offset: int
    packs: list[PackSummary]


class PackChecks(View):
    id: str
    blocked: bool
    summary: dict[str, Any]
    checks: list[dict[str, Any]]
    waivers: list[WaiverView]


class AuditEntry(View):
    seq: int
    at: str
    key_id: str | None
    name: str
    action: str
    content_hash: str | None
    detail: dict[str, Any]


class PackAudit(View):
    id: str
    entries: list[AuditEntry]


def _iso(moment: datetime | None) -> str | None:
    return None if moment is None else moment.isoformat()


def links(row: PackRow) -> PackLinks:
    base = f"/v1/reports/{row.id}"
    return PackLinks(
        self_=base,
        pdf=f"{base}/pdf",
        checks=f"{base}/checks",
        audit=f"{base}/audit",
        sealed=f"{base}/sealed",
        compare=f"{base}/compare/{{other_id}}",
    )


def seal_view(sealed: SealRow) -> SealView:
    return SealView(
        sha256=sealed.sha256,
        bytes=sealed.bytes,
        signer=sealed.signer,
        development_key=sealed.development_key,
        pdfa=sealed.pdfa,
        sealed_at=_iso(sealed.sealed_at),
    )


def waiver_view(w: WaiverRow) -> WaiverView:
    return WaiverView(
        check=w.check,
        chart=w.chart,
        reason=w.reason,
        by=w.by_name,
        at=w.at.isoformat(),
        pdf_sha256=w.pdf_sha256,
    )


def _fields(sessions: sessionmaker[Any], row: PackRow) -> dict[str, Any]:
    review = drafts.review(sessions=sessions, pack_id=row.id)
    sealed = drafts.seal_of(sessions=sessions, pack_id=row.id)
    return {
        "id": row.id,
        "report": ReportRef(id=row.report_id, title=row.title, period=row.period, as_of=row.as_of),
        "status": row.status,
        "blocked": row.blocked,
        "summary": row.summary,
        "failed": [f"{r['check']} on {r['chart']}" for r in row.results if r["status"] == "failed"],
        "unused_waivers": row.unused_waivers,
        "pdf": PdfRef(sha256=row.pdf_sha256, bytes=row.pdf_bytes),
        "definition_sha256": row.definition_sha256,
        "created_at": row.created_at.isoformat(),
        "review": None
        if review is None
        else ReviewView(
            authors=[a["name"] for a in review.authors],
            submitted_sha256=review.submitted_sha256,
            submitted_at=_iso(review.submitted_at),
            signed_off_by=review.signed_off_name,
            signed_off_at=_iso(review.signed_off_at),
            signed_off_sha256=review.signed_off_sha256,
            superseded_by=review.superseded_by,
        ),
        "sealed": None if sealed is None else seal_view(sealed),
        "links": links(row),
    }


def pack_summary(sessions: sessionmaker[Any], row: PackRow) -> PackSummary:
    return PackSummary(**_fields(sessions, row))


def pack_detail(sessions: sessionmaker[Any], row: PackRow) -> PackDetail:
    waivers = [waiver_view(w) for w in drafts.waivers_of(sessions=sessions, pack_id=row.id)]
    return PackDetail(**_fields(sessions, row), checks=row.results, waivers=waivers)


def pack_checks(sessions: sessionmaker[Any], row: PackRow) -> PackChecks:
    return PackChecks(
        id=row.id,
        blocked=row.blocked,
        summary=row.summary,
        checks=row.results,
        waivers=[waiver_view(w) for w in drafts.waivers_of(sessions=sessions, pack_id=row.id)],
    )


def pack_audit(sessions: sessionmaker[Any], row: PackRow) -> PackAudit:
    return PackAudit(
        id=row.id,
        entries=[
            AuditEntry(
                seq=e.seq,
                at=e.at.isoformat(),
                key_id=e.key_id,
                name=e.name,
                action=e.action,
                content_hash=e.content_hash,
                detail=e.detail,
            )
            for e in audit.trail(sessions, row.id)
        ],
    )


def pack_list(sessions: sessionmaker[Any], principal: Principal, query: drafts.Query) -> PackList:
    """The packs the key may see that match ``query``, newest first."""
    rows, total = drafts.search(sessions=sessions, principal=principal, query=query)
    return PackList(
        total=total,
        limit=query.limit,
        offset=query.offset,
        packs=[pack_summary(sessions, r) for r in rows],
    )
