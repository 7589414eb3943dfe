"""The sealed pack of a signed-off draft: rendered again with its status, sources attached, signed.

A sealed pack is rendered from two files that it then carries as attachments, so that anyone can
render it again and compare bytes:

- ``definition.json`` — the exact definition the draft was built from;
- ``review.json`` — the sign-off record: who signed off which draft hash and when, every review
  waiver and confirmation of a standing waiver (who, when, why), and which key sealed it.

Every dataset is attached too, as ``data/<dataset>.csv`` (PDF/A-3 associated files with
relationship /Data): CSV text exactly as the definition gave it, or the inline rows written as CSV
in the declared column order. The datasets are derived from the definition, so re-rendering
rebuilds them and a changed dataset file fails verification like any other byte.

Review waivers are applied by adding them to the definition's waivers before the checks run, so the
sealed appendix shows each as *waived*, with the reviewer's name and reason, where the draft showed
*failed*.
"""

from __future__ import annotations

import contextlib
import csv
import io
import json
from collections.abc import Callable, Mapping
from dataclasses import asdict, dataclass, replace
from datetime import datetime
from pathlib import Path
from typing import Any

from sqlalchemy import select
from sqlalchemy.orm import sessionmaker

from service import pipeline, seal
from service.archive.db import PackRow, SealRow
from service.archive.files import BlobStore
from service.config import Limits
from service.data.frames import Table
from service.definition.model import ReportDefinition, Waiver
from service.render.options import RenderOptions
from service.seal import keys
from service.seal.verify import VerifyReport
from service.workflow import lifecycle
from service.workflow.keys import Principal
from service.workflow.keys import can_see as keys_can_see

REVIEW = "review.json"
"""The attachment name of the sign-off record."""
DATA_FOLDER = "data/"


@dataclass(frozen=True)
class SealedPack:
    """What the sealing worker returns: plain, picklable values."""

    signed: bytes
    record: dict[str, Any]
    signer: str
    development_key: bool
    pdfa: dict[str, Any]


def record_bytes(record: Mapping[str, Any]) -> bytes:
    """The sign-off record as attached: canonical JSON, so the same record gives the same bytes."""
    return json.dumps(record, sort_keys=True, indent=2, ensure_ascii=False).encode() + b"\n"


def status_line(record: Mapping[str, Any]) -> str:
    """What every page of the sealed pack says about its status."""
    at = datetime.fromisoformat(str(record["signed_off_at"]))
    line = f"Signed off by {record['signed_off_by']} on {at:%Y-%m-%d %H:%M} UTC"
    if record.get("seal", {}).get("development_key", True):
        return f"{line} · signed with a DEVELOPMENT key, not an organisation's seal"
    return f"{line} · sealed by {record['seal']['signer']}"


def with_review_waivers(
    definition: ReportDefinition, record: Mapping[str, Any]
) -> ReportDefinition:
    """The definition with the review's waivers added and standing waivers marked as confirmed."""
    waivers = list(definition.waivers)
    for given in record.get("waivers", []):
        key = (given["check"], given["chart"])
        day = str(given["at"])[:10]
        if given["kind"] == "confirmed":
            waivers = [
                w.model_copy(update={"by": f"{w.by}; confirmed by {given['by']} on {day}"})
                if (w.check, w.chart) == key
                else w
                for w in waivers
            ]
        else:
            waivers.append(
                Waiver(
                    check=given["check"],
                    chart=given["chart"],
                    reason=given["reason"],
                    by=f"{given['by']} in review on {day}",
                )
            )
    return definition.model_copy(update={"waivers": waivers})


def data_files(definition: ReportDefinition, tables: Mapping[str, Table]) -> dict[str, bytes]:
    """Every dataset as a CSV file, in definition order."""
    files: dict[str, bytes] = {}
    for dataset in definition.datasets:
        if dataset.csv is not None:
            text = dataset.csv
        else:
            out = io.StringIO()
            names = [c.name for c in dataset.columns]
            writer = csv.DictWriter(out, fieldnames=names, lineterminator="\n")
            writer.writeheader()
            for row in dataset.rows or []:
                writer.writerow({n: _cell(row.get(n)) for n in names})
            text = out.getvalue()
        files[f"{DATA_FOLDER}{dataset.name}.csv"] = text.encode()
    del tables  # the files are what the definition says, not the typed frames
    return files


def _cell(value: Any) -> str:
    if value is None:
        return ""
    if isinstance(value, bool):
        return "true" if value else "false"
    return str(value)


def render(
    files: Mapping[str, bytes], limits: Limits, options: RenderOptions | None = None
) -> seal.Drafted:
    """The pack from its sources: a draft from ``definition.json`` alone, or the signed-off pack
    when ``review.json`` is given. Returns the PDF, the further sources and the data files.
    ``options`` (how many processes draw, which chart cache) never change the bytes."""
    raw = files[seal.DEFINITION]
    taken = pipeline.intake(raw, limits)
    review = files.get(REVIEW)
    if review is None:
        pdf, _ = pipeline.render(pipeline.check(taken), options=options)
        return pdf, {}, data_files(taken.definition, taken.tables)
    record = json.loads(review)
    definition = with_review_waivers(taken.definition, record)
    pdf, _ = pipeline.render(
        pipeline.check(replace(taken, definition=definition)),
        status_line=status_line(record),
        options=options,
    )
    return pdf, {REVIEW: review}, data_files(taken.definition, taken.tables)


def seal_pack(
    definition: bytes,
    record: dict[str, Any],
    *,
    key_path: Path | None,
    cert_path: Path | None,
    development_dir: Path,
    limits: Limits,
    options: RenderOptions | None = None,
) -> SealedPack:
    """Render, seal as PDF/A-3b, check and sign one signed-off pack (run it in a worker)."""
    key = keys.resolve(key_path=key_path, cert_path=cert_path, development_dir=development_dir)
    full = {**record, "seal": {"signer": key.subject, "development_key": key.is_development}}
    review = record_bytes(full)
    pdf, sources, data = render({seal.DEFINITION: definition, REVIEW: review}, limits, options)
    sealed = seal.seal(pdf, definition, key, sources, data)
    return SealedPack(
        signed=sealed.signed,
        record=full,
        signer=key.subject,
        development_key=key.is_development,
        pdfa=asdict(sealed.pdfa),
    )


def rerender(limits: Limits, workers: int = 1) -> seal.Rerender:
    """The ``rerender`` step of verification for drafts and signed-off packs alike: every chart
    drawn afresh (never from a cache), in ``workers`` processes."""
    options = RenderOptions(workers=workers)
    return seal.rerender_from(lambda files: render(files, limits, options))


__all__ = [
    "DATA_FOLDER",
    "REVIEW",
    "SealedPack",
    "Sealer",
    "compare_with_archive",
    "data_files",
    "record_bytes",
    "render",
    "rerender",
    "seal_pack",
    "sign_off_and_seal",
    "status_line",
    "with_review_waivers",
]


def compare_with_archive(
    report: VerifyReport, sessions: sessionmaker[Any], principal: Principal | None = None
) -> None:
    """Add the step that compares the file's SHA-256 with the archive's record of sealed packs.

    ``principal`` is the key asking (``None``: the operator's own console). A key whose families do
    not cover the pack's report learns only that a sealed pack matches, not which one, nor who
    signed it off."""
    with sessions() as session:
        found = session.scalars(select(SealRow).where(SealRow.sha256 == report.sha256)).first()
        pack = session.get(PackRow, found.pack_id) if found is not None else None
    if found is None or pack is None:
        report.add(
            "archived",
            False,
            f"the archive holds no sealed pack with SHA-256 {report.sha256}: this is not the "
            "file that was signed off, or it was signed off in another archive",
        )
        return
    if principal is not None and not keys_can_see(principal, pack.report_id):
        report.add("archived", True, "a sealed pack in the archive matches this file's SHA-256")
        return
    signed_at = found.record.get("signed_off_at", "")
    report.add(
        "archived",
        True,
        f"the archive's sealed pack {pack.id} ({pack.report_id}, {pack.period}), signed off by "
        f"{found.record.get('signed_off_by', '?')} at {signed_at}, has this SHA-256",
    )


Sealer = Callable[[bytes, dict[str, Any]], SealedPack]
"""Renders, seals and signs a pack from its definition and sign-off record (a worker, or inline)."""


def sign_off_and_seal(
    *,
    sessions: sessionmaker[Any],
    store: BlobStore,
    principal: Principal,
    pack_id: str,
    content_sha256: str,
    sealer: Sealer,
) -> SealRow:
    """Sign off a draft in review and archive its sealed pack.

    Every rule is applied before the slow part (so a refused sign-off costs nothing); the sealed
    file is written to the store before the transaction that moves the pack and records the seal,
    which applies every rule again. When that transaction does not record this seal (another
    sign-off won the race, the draft was sent back meanwhile), the sealed file is removed again:
    a signed "signed off" PDF that the archive does not record must not stay in the store."""
    plan = lifecycle.sign_off_preflight(
        sessions=sessions, principal=principal, pack_id=pack_id, content_sha256=content_sha256
    )
    sealed = sealer(store.get(plan.definition_sha256), plan.record())
    digest = store.put(sealed.signed)
    row = SealRow(
        pack_id=pack_id,
        sha256=digest,
        bytes=len(sealed.signed),
        signer=sealed.signer,
        development_key=sealed.development_key,
        pdfa=sealed.pdfa,
        record=sealed.record,
        sealed_at=plan.at,
    )
    try:
        lifecycle.sign_off(
            sessions=sessions,
            principal=principal,
            pack_id=pack_id,
            content_sha256=content_sha256,
            seal=row,
            at=plan.at,
        )
    except BaseException:
        with contextlib.suppress(Exception):  # the refusal is the answer, not a failed cleanup
            _discard_unclaimed(sessions, store, digest)
        raise
    return row


def _discard_unclaimed(sessions: sessionmaker[Any], store: BlobStore, digest: str) -> None:
    """Remove a sealed file unless a seal row claims it (the same bytes sealed by the winner)."""
    with sessions() as session:
        claimed = session.scalars(select(SealRow.pack_id).where(SealRow.sha256 == digest)).first()
    if claimed is None:
        store.discard(digest)
