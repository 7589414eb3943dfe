"""Verifying a sealed pack: one recorded step per check, each with a plain sentence.

The steps: the signature is present, intact (the signed bytes hash to the signed digest), valid
and trusted against the given certificates, who signed it, that it covers the whole file (nothing
appended after signing), the file's SHA-256, the embedded attachments (names, SHA-256 of each, and
their recorded checksums), and — with ``rerender`` — that rendering the attachments again gives the
unsigned file byte for byte. Nothing here raises on a damaged file: damage is a failed step.
"""

from __future__ import annotations

import hashlib
import io
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from typing import Any

import pikepdf
from cryptography import x509
from cryptography.hazmat.primitives import serialization
from pyhanko.keys import load_certs_from_pemder_data
from pyhanko.pdf_utils.reader import PdfFileReader
from pyhanko.sign.validation import validate_pdf_signature
from pyhanko_certvalidator import ValidationContext

from service.seal.keys import DEVELOPMENT_ORGANISATION
from service.seal.sign import unsigned_part

Rerender = Callable[[dict[str, bytes]], bytes]


@dataclass(frozen=True)
class Step:
    name: str
    ok: bool
    detail: str


@dataclass
class VerifyReport:
    steps: list[Step] = field(default_factory=list)
    sha256: str = ""
    attachments: dict[str, str] = field(default_factory=dict)
    signer: str | None = None
    development_key: bool = False

    @property
    def ok(self) -> bool:
        return bool(self.steps) and all(s.ok for s in self.steps)

    def step(self, name: str) -> Step:
        return next(s for s in self.steps if s.name == name)

    def add(self, name: str, ok: bool, detail: str) -> bool:
        self.steps.append(Step(name, ok, detail))
        return ok

    def as_dict(self) -> dict[str, Any]:
        return {
            "ok": self.ok,
            "sha256": self.sha256,
            "signer": self.signer,
            "development_key": self.development_key,
            "attachments": self.attachments,
            "steps": [{"name": s.name, "ok": s.ok, "detail": s.detail} for s in self.steps],
        }


def _pem(cert: bytes | x509.Certificate) -> bytes:
    return (
        cert.public_bytes(serialization.Encoding.PEM)
        if isinstance(cert, x509.Certificate)
        else cert
    )


def verify(
    signed_bytes: bytes,
    *,
    trust_roots: Sequence[bytes | x509.Certificate],
    rerender: Rerender | None = None,
) -> VerifyReport:
    """Every check of a sealed pack; ``report.ok`` only when each step passed."""
    report = VerifyReport(sha256=hashlib.sha256(signed_bytes).hexdigest())
    _signature(signed_bytes, trust_roots, report)
    report.add("file SHA-256", True, f"the file's SHA-256 is {report.sha256}")
    attachments = _attachments(signed_bytes, report)
    if rerender is not None:
        _rerender(signed_bytes, attachments, rerender, report)
    return report


def _signature(
    signed: bytes, trust_roots: Sequence[bytes | x509.Certificate], report: VerifyReport
) -> None:
    names = ("signature intact", "signature valid", "signer trusted", "signed by")
    try:
        reader = PdfFileReader(io.BytesIO(signed), strict=False)
        found = reader.embedded_signatures
    except Exception as exc:  # noqa: BLE001 - a damaged file is a failed step, not a crash
        for name in names:
            report.add(
                name, False, f"the file cannot be read as a PDF: {type(exc).__name__}: {exc}"
            )
        return
    if len(found) != 1:
        for name in names:
            report.add(name, False, f"expected one signature, found {len(found)}")
        return
    roots = [c for pem in trust_roots for c in load_certs_from_pemder_data(_pem(pem))]
    try:
        status = validate_pdf_signature(
            found[0], ValidationContext(trust_roots=roots, allow_fetching=False)
        )
    except Exception as exc:  # noqa: BLE001 - a malformed signature is a failed step
        for name in names:
            report.add(name, False, f"the signature cannot be checked: {type(exc).__name__}: {exc}")
        return
    report.add(
        "signature intact",
        status.intact,
        "the signed bytes are unchanged since signing"
        if status.intact
        else "the signed bytes have changed since signing (their digest does not match)",
    )
    sound = status.valid and status.intact
    report.add(
        "signature valid",
        sound,
        f"the {status.md_algorithm} / {status.pkcs7_signature_mechanism} signature is sound"
        if sound
        else "the signature does not vouch for these bytes"
        + ("" if status.valid else " (it does not verify against the signer's public key)"),
    )
    if not sound:
        trust = "not judged: the signature does not vouch for these bytes"
    elif status.trusted:
        trust = "the signer's certificate chains to a given trust root"
    else:
        trust = (
            f"the signer's certificate does not chain to any of the {len(roots)} given trust "
            f"root(s) ({status.trust_problem_indic})"
        )
    report.add("signer trusted", sound and status.trusted, trust)
    subject = status.signing_cert.subject.human_friendly
    organisation = status.signing_cert.subject.native.get("organization_name", "")
    report.signer = subject
    report.development_key = organisation == DEVELOPMENT_ORGANISATION
    prefix = "a development key, not an organisational seal: " if report.development_key else ""
    if sound:
        report.add("signed by", True, f"{prefix}{subject}")
    else:
        report.add(
            "signed by", False, f"claims {prefix}{subject}, but the signature does not vouch"
        )
    whole = str(status.coverage) == "SignatureCoverageLevel.ENTIRE_FILE"
    report.add(
        "signature covers the whole file",
        whole,
        "nothing was added after signing"
        if whole
        else f"bytes were added or left out of the signature ({status.coverage})",
    )


def _attachments(signed: bytes, report: VerifyReport) -> dict[str, bytes]:
    found: dict[str, bytes] = {}
    problems: list[str] = []
    try:
        with pikepdf.open(io.BytesIO(signed)) as pdf:
            for name, spec in sorted(pdf.attachments.items()):
                try:
                    stored = spec.get_file()
                    data = stored.read_bytes()
                except Exception as exc:  # noqa: BLE001 - a damaged stream is a failed step
                    problems.append(f"'{name}' cannot be read ({type(exc).__name__}: {exc})")
                    continue
                if stored.md5 and stored.md5 != hashlib.md5(data, usedforsecurity=False).digest():
                    problems.append(f"'{name}' does not match the checksum recorded with it")
                found[name] = data
    except Exception as exc:  # noqa: BLE001 - an unreadable file is a failed step
        problems.append(f"the file cannot be read: {type(exc).__name__}: {exc}")
    report.attachments = {n: hashlib.sha256(d).hexdigest() for n, d in found.items()}
    listed = "; ".join(f"{n} (SHA-256 {h})" for n, h in report.attachments.items())
    if not found and not problems:
        problems.append("the file has no embedded attachments to re-render from")
    detail = "; ".join([*problems, listed]) if listed else "; ".join(problems)
    report.add("attachments", not problems, detail)
    return found


def _rerender(
    signed: bytes, attachments: dict[str, bytes], rerender: Rerender, report: VerifyReport
) -> None:
    name = "re-render matches"
    try:
        expected = unsigned_part(signed)
    except ValueError as exc:
        report.add(name, False, str(exc))
        return
    try:
        again = rerender(attachments)
    except Exception as exc:  # noqa: BLE001 - a definition that no longer renders is a failure
        report.add(name, False, f"the attachments do not render: {type(exc).__name__}: {exc}")
        return
    if again == expected:
        report.add(
            name,
            True,
            f"rendering the attachments again gives the signed file's first revision byte for "
            f"byte (SHA-256 {hashlib.sha256(again).hexdigest()})",
        )
        return
    first = next((i for i, (a, b) in enumerate(zip(again, expected, strict=False)) if a != b), None)
    where = (
        f"first difference at byte {first}" if first is not None else "one is a prefix of the other"
    )
    report.add(
        name,
        False,
        f"rendering the attachments again gives different bytes ({len(again)} against "
        f"{len(expected)}; {where}; SHA-256 {hashlib.sha256(again).hexdigest()} against "
        f"{hashlib.sha256(expected).hexdigest()})",
    )


__all__ = ["Rerender", "Step", "VerifyReport", "verify"]
