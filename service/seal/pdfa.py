"""Turning a rendered pack into a PDF/A-3b file with its sources attached, and checking it.

``prepare`` owns the archival form of a pack: an sRGB output intent, XMP metadata declaring PDF/A
part 3, conformance B, with the dates the caller gives (never the clock), every attachment embedded
as an associated file (listed in the catalog's /AF), and the two constructs of a reportlab +
matplotlib pack that PDF/A validators reject removed (reportlab's empty /Trans page entries,
matplotlib's empty /Pattern and /Shading resource dictionaries). The same inputs give the same bytes.

``check`` reports what pikepdf's allowlist validator says about a file. It is advisory and is not a
certification: veraPDF is the reference PDF/A validator. Check before signing: after signing, the
signature field is a construct pikepdf does not check.
"""

from __future__ import annotations

import io
from collections.abc import Collection, Mapping
from dataclasses import dataclass, field
from datetime import UTC, datetime
from typing import Any

import pikepdf
from pikepdf import Array, Dictionary, Name, Pdf, Stream

FLAVOUR = "3b"
STANDARD = "PDF/A-3b"
_MIME = {
    ".json": "application/json",
    ".csv": "text/csv",
    ".txt": "text/plain",
    ".pdf": "application/pdf",
}
"""A fixed table, not ``mimetypes``: the system MIME database differs between machines."""


@dataclass(frozen=True)
class PdfaVerdict:
    """pikepdf's verdict on one file: ``ok`` only when it found nothing at all.

    ``verdict`` is pikepdf's word (``pass``, ``fail`` or ``not_checked``); ``messages`` are the
    violations, ``not_checked`` the constructs it does not check (neither approved nor rejected).
    """

    ok: bool
    standard: str
    verdict: str
    messages: list[str] = field(default_factory=list)
    not_checked: list[str] = field(default_factory=list)
    validator: str = f"pikepdf {pikepdf.__version__} (allowlist validator; not a certification)"


def mime_type(name: str) -> str:
    dot = name.rfind(".")
    return (
        _MIME.get(name[dot:].lower(), "application/octet-stream")
        if dot >= 0
        else ("application/octet-stream")
    )


def pdf_date(when: datetime) -> str:
    """A PDF date string (``D:YYYYMMDDHHmmSS+HH'mm'``) in UTC; a naive time is refused."""
    if when.tzinfo is None:
        raise ValueError("the seal's date needs a time zone")
    return when.astimezone(UTC).strftime("D:%Y%m%d%H%M%S+00'00'")


def prepare(
    pdf_bytes: bytes,
    *,
    attachments: Mapping[str, bytes],
    title: str,
    author: str,
    created: datetime,
    data_files: Collection[str] = (),
) -> bytes:
    """The pack as PDF/A-3b with ``attachments`` embedded; byte-identical for the same inputs.

    Every attachment is an associated file with relationship ``/Source`` (what the pack was
    rendered from), except those named in ``data_files`` (``/Data``). ``created`` is used for
    every date in the file (document, metadata and attachments).
    """
    from pikepdf import pdfa  # the optional validator extra loads only when sealing

    unknown = set(data_files) - set(attachments)
    if unknown:
        raise ValueError(f"data_files names no attachment: {sorted(unknown)}")
    stamp = pdf_date(created)
    iso = created.astimezone(UTC).isoformat()
    with Pdf.open(io.BytesIO(pdf_bytes)) as pdf:
        _strip_rejected(pdf)
        _attach(pdf, attachments, data_files, stamp)
        info = pdf.trailer.get(Name.Info)
        if not isinstance(info, Dictionary):
            info = pdf.make_indirect(Dictionary())
            pdf.trailer.Info = info
        # declare_pdfa_metadata fills missing XMP from DocInfo, so DocInfo is set first.
        for key in ("/Title", "/Author", "/Subject", "/Keywords", "/Creator", "/Producer"):
            if key in info:
                del info[key]
        info.Title = pikepdf.String(title)
        info.Author = pikepdf.String(author)
        info.Creator = pikepdf.String("Plumbline")
        info.CreationDate = pikepdf.String(stamp)
        info.ModDate = pikepdf.String(stamp)
        if Name.Metadata in pdf.Root:
            del pdf.Root.Metadata
        pdfa.prepare(pdf, FLAVOUR, output_intent="sRGB")
        _fix_metadata_date(pdf, iso)
        out = io.BytesIO()
        pdf.save(out, **_save_kwargs())
        return out.getvalue()


def _save_kwargs() -> dict[str, Any]:
    from pikepdf import pdfa

    return dict(pdfa.resolve_save_kwargs(FLAVOUR, deterministic_id=True))


def _fix_metadata_date(pdf: Pdf, iso: str) -> None:
    """pikepdf's prepare stamps xmp:MetadataDate with the clock; put the given date there."""
    metadata = pdf.Root.Metadata
    assert isinstance(metadata, Stream)
    packet = metadata.read_bytes()
    start = packet.find(b"<xmp:MetadataDate>")
    end = packet.find(b"</xmp:MetadataDate>", start)
    if start < 0 or end < 0:
        raise RuntimeError("pikepdf wrote no xmp:MetadataDate; cannot fix the metadata date")
    start += len(b"<xmp:MetadataDate>")
    metadata.write(packet[:start] + iso.encode() + packet[end:])


def _strip_rejected(pdf: Pdf) -> None:
    """Remove empty /Trans page entries and empty /Pattern and /Shading resource dicts."""
    for page in pdf.pages:
        trans = page.obj.get(Name.Trans)
        if isinstance(trans, Dictionary) and len(trans.keys()) == 0:
            del page.obj[Name.Trans]
    for obj in pdf.objects:
        holder = obj.stream_dict if isinstance(obj, Stream) else obj
        if not isinstance(holder, Dictionary):
            continue
        resources = holder.get(Name.Resources)
        if not isinstance(resources, Dictionary):
            continue
        for kind in (Name.Pattern, Name.Shading):
            value = resources.get(kind)
            if isinstance(value, Dictionary) and len(value.keys()) == 0:
                del resources[kind]


def _attach(
    pdf: Pdf, attachments: Mapping[str, bytes], data_files: Collection[str], stamp: str
) -> None:
    associated = []
    for name in sorted(attachments):
        spec = pikepdf.AttachedFileSpec(
            pdf,
            attachments[name],
            description=name,
            filename=name,
            mime_type=mime_type(name),
            creation_date=stamp,
            mod_date=stamp,
            relationship=Name.Data if name in data_files else Name.Source,
        )
        pdf.attachments[name] = spec
        associated.append(pdf.attachments[name].obj)
    if associated:
        pdf.Root.AF = Array(associated)


def check(pdf_bytes: bytes) -> PdfaVerdict:
    """What pikepdf's PDF/A-3b validator says about these bytes, reported as it says it.

    This is not a certification: pikepdf's validator approves only what it recognises, and
    veraPDF is the reference validator. Constructs it does not check are listed in
    ``not_checked`` and keep ``ok`` False.
    """
    try:
        from pikepdf import pdfa
    except ImportError as exc:  # the extra is missing: say so rather than pass
        return PdfaVerdict(
            ok=False,
            standard=STANDARD,
            verdict="not_checked",
            not_checked=[f"the whole file: pikepdf's PDF/A validator is not installed ({exc})"],
        )
    report = pdfa.validate_written(io.BytesIO(pdf_bytes), FLAVOUR)
    return PdfaVerdict(
        ok=report.passed,
        standard=STANDARD,
        verdict=report.verdict,
        messages=[str(f) for f in report.violations],
        not_checked=[str(f) for f in report.unsupported],
    )


__all__ = ["STANDARD", "PdfaVerdict", "check", "mime_type", "pdf_date", "prepare"]
