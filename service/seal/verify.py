"""Verifying a sealed pack: one recorded step per check, each with a plain sentence.

The steps: the signature is present, intact (the signed bytes hash to the signed digest), valid
and trusted against the given certificates, who signed it, that it covers the whole file (nothing
appended after signing), that the signature's own bytes are exactly what the signer writes (one
canonical DER-encoded CMS structure followed by zero padding, in upper-case hex) and that every
certificate it carries is signed by its issuer, the file's SHA-256, the embedded attachments
(names, SHA-256 of each, and their recorded checksums), and — with ``rerender`` — that rendering
the attachments again gives the unsigned file byte for byte. Nothing here raises on a damaged
file: damage is a failed step.
"""

from __future__ import annotations

import hashlib
import io
import re
import warnings
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass, field
from typing import Any

import pikepdf
from asn1crypto import algos, cms, core, parser  # type: ignore[import-untyped]
from asn1crypto import x509 as asn1_x509
from cryptography import x509
from cryptography.exceptions import InvalidSignature, UnsupportedAlgorithm
from cryptography.hazmat.primitives import serialization
from cryptography.utils import CryptographyDeprecationWarning
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


CONTENTS_STEPS = ("signature encoding", "embedded certificates")
"""The steps on the signature's own bytes: the ``/ByteRange`` gap, which its digest leaves out."""


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
        for name in (*names, *CONTENTS_STEPS):
            report.add(
                name, False, f"the file cannot be read as a PDF: {type(exc).__name__}: {exc}"
            )
        return
    if len(found) != 1:
        for name in (*names, *CONTENTS_STEPS):
            report.add(name, False, f"expected one signature, found {len(found)}")
        return
    roots = [c for pem in trust_roots for c in load_certs_from_pemder_data(_pem(pem))]
    contents = signature_contents(
        signed, [int(n) for n in found[0].byte_range], roots, read=found[0].pkcs7_content
    )
    try:
        status = validate_pdf_signature(
            found[0], ValidationContext(trust_roots=roots, allow_fetching=False)
        )
    except Exception as exc:  # noqa: BLE001 - a malformed signature is a failed step
        for name in names:
            report.add(name, False, f"the signature cannot be checked: {type(exc).__name__}: {exc}")
        report.steps.extend(contents)
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
    report.steps.extend(contents)


_NOT_HEX = re.compile(rb"[^0-9A-F]")


class _Refused(ValueError):
    """The signature's bytes are not what the signer writes."""


def signature_contents(
    signed: bytes,
    byte_range: Sequence[int],
    roots: Iterable[asn1_x509.Certificate] = (),
    *,
    read: bytes | None = None,
) -> list[Step]:
    """The two steps on the signature's own bytes, which no digest covers.

    "signature encoding": the ``/ByteRange`` gap is ``<``, upper-case hex digits, ``>`` (the signer
    writes upper case, so a digit in lower case is a changed byte although it decodes to the same
    value); the hex decodes to one CMS SignedData in canonical DER (``der_problem``) followed by
    zero bytes only; and the fields no signature covers hold what the signer writes (versions, one
    signer whose identifier names a carried certificate, detached data, the digest algorithm list,
    a signature algorithm that names that digest, algorithm parameters absent or NULL).
    ``read`` is the ``/Contents`` value as the PDF reader read it: the gap must hold exactly it.

    "embedded certificates": every certificate in the signature is signed by its issuer — another
    certificate in the signature, itself when self-signed, or one of ``roots`` — so a changed byte
    inside a certificate fails even when no trust root is given.
    """
    try:
        signed_data, summary = _decode(signed, byte_range, read)
    except _Refused as exc:
        return [
            Step("signature encoding", False, str(exc)),
            Step("embedded certificates", False, "not judged: the signature's encoding is refused"),
        ]
    ok, detail = _certificates(signed_data, roots)
    return [Step("signature encoding", True, summary), Step("embedded certificates", ok, detail)]


def _decode(
    signed: bytes, byte_range: Sequence[int], read: bytes | None
) -> tuple[cms.SignedData, str]:
    if len(byte_range) != 4 or byte_range[0] != 0 or not 0 < byte_range[1] < byte_range[2]:
        raise _Refused(f"the signature's /ByteRange {list(byte_range)} has no gap to check")
    start, end = byte_range[1], byte_range[2]
    gap = signed[start:end]
    if len(gap) < 2 or gap[:1] != b"<" or gap[-1:] != b">":
        raise _Refused(
            f"bytes {start:,} to {end:,}, the gap in the signature's /ByteRange, are not one hex "
            "string <…>"
        )
    digits = gap[1:-1]
    stray = _NOT_HEX.search(digits)
    if stray is not None:
        raise _Refused(
            f"the signature's hex string has {stray.group().decode('latin-1')!r} at byte "
            f"{start + 1 + stray.start():,} of the file; the signer writes only the digits 0-9 "
            "and A-F"
        )
    if len(digits) % 2:
        raise _Refused(f"the signature's hex string has an odd number of digits ({len(digits):,})")
    raw = bytes.fromhex(digits.decode("ascii"))
    if read is not None and raw != read:
        raise _Refused("the hex string in the /ByteRange gap is not the signature's /Contents")
    try:
        length = parser.peek(raw)
    except ValueError as exc:
        raise _Refused(
            f"the signature's /Contents does not start with an ASN.1 value: {exc}"
        ) from exc
    der, padding = raw[:length], raw[length:]
    if padding.strip(b"\0"):
        nonzero = len(padding) - len(padding.lstrip(b"\0"))
        raise _Refused(
            f"byte {length + nonzero:,} of the signature's /Contents is not zero: only zero "
            f"padding may follow its {length:,}-byte CMS structure"
        )
    problem = der_problem(der)
    if problem is not None:
        raise _Refused(f"the signature's CMS structure is not canonical DER: {problem}")
    try:
        signed_data = _as_written(cms.ContentInfo.load(der, strict=True))
    except _Refused:
        raise
    except Exception as exc:  # a malformed structure is a refusal, not a crash
        said = " ".join(str(exc).split())
        raise _Refused(
            f"the signature's CMS structure cannot be read: {type(exc).__name__}: {said}"
        ) from exc
    count = len(signed_data["certificates"])
    return signed_data, (
        f"one CMS SignedData in canonical DER ({length:,} bytes: one signer, {count} "
        f"certificate{'s' if count != 1 else ''}) and {len(padding):,} zero bytes of padding, in "
        "upper-case hex, as the signer writes it"
    )


def der_problem(data: bytes) -> str | None:
    """Where ``data``, one ASN.1 value, breaks a rule of DER (X.690, clause 10), or None.

    Every tag and length is checked (low-tag form below 31, definite lengths in the fewest
    octets, contents that fill their parent exactly), universal types are constructed only when
    they are SEQUENCE or SET, and the universal primitives keep DER's one encoding: BOOLEAN 00 or
    FF, minimal INTEGER and ENUMERATED, empty NULL, minimal object identifier arcs, BIT STRING
    padding bits zero, UTCTime and GeneralizedTime in their canonical forms. Contents under a
    context-specific primitive tag are opaque here. (Re-encoding with asn1crypto would say the
    same, but once pyHanko has registered its attribute types it takes half a second a structure.)
    """
    todo = [(0, len(data))]
    while todo:
        at, end = todo.pop()
        while at < end:
            try:
                tag, constructed, start, stop = _header(data, at, end)
            except _Refused as exc:
                return str(exc)
            universal = data[at] >> 6 == 0
            if universal and tag == 0:
                return f"an end-of-contents marker (00) at byte {at:,}"
            if constructed and universal and tag not in (16, 17):
                return f"the universal type {tag} at byte {at:,} is constructed"
            if not constructed and universal:
                if tag in (16, 17):
                    return f"the SEQUENCE or SET at byte {at:,} is primitive"
                problem = _primitive_problem(tag, data[start:stop])
                if problem is not None:
                    return f"{problem} at byte {at:,}"
            if constructed:
                todo.append((start, stop))
            at = stop
    return None


def _header(data: bytes, at: int, end: int) -> tuple[int, bool, int, int]:
    """The tag number, whether constructed, and where the contents start and stop."""
    tag, constructed, pos = data[at] & 0x1F, bool(data[at] & 0x20), at + 1
    if tag == 0x1F:
        tag = 0
        while True:
            if pos >= end:
                raise _Refused(f"the tag at byte {at:,} is cut off")
            octet = data[pos]
            if tag == 0 and octet == 0x80:
                raise _Refused(f"the tag at byte {at:,} has a leading zero")
            tag, pos = tag << 7 | octet & 0x7F, pos + 1
            if not octet & 0x80:
                break
        if tag < 0x1F:
            raise _Refused(f"the tag at byte {at:,} uses the long form for a number below 31")
    if pos >= end:
        raise _Refused(f"the value at byte {at:,} has no length")
    first, pos = data[pos], pos + 1
    if first == 0x80:
        raise _Refused(f"the value at byte {at:,} has an indefinite length")
    length = first
    if first > 0x80:
        count = first & 0x7F
        octets = data[pos : pos + count]
        if len(octets) < count or pos + count > end:
            raise _Refused(f"the length at byte {at:,} is cut off")
        length, pos = int.from_bytes(octets, "big"), pos + count
        if octets[0] == 0 or length < 0x80:
            raise _Refused(f"the length at byte {at:,} is not in the fewest octets")
    if pos + length > end:
        raise _Refused(f"the value at byte {at:,} runs past the end of what holds it")
    return tag, constructed, pos, pos + length


def _minimal_integer(body: bytes) -> bool:
    return len(body) == 1 or (len(body) > 1 and (body[0], body[1] >> 7) not in ((0, 0), (0xFF, 1)))


def _bit_string(body: bytes) -> bool:
    if not body or body[0] > 7:
        return False
    if len(body) == 1:
        return body[0] == 0
    return not body[-1] & ((1 << body[0]) - 1)


def _minimal_arcs(body: bytes) -> bool:
    starts = (i for i in range(len(body)) if i == 0 or not body[i - 1] & 0x80)
    return bool(body) and not body[-1] & 0x80 and all(body[i] != 0x80 for i in starts)


def _form(pattern: bytes) -> Callable[[bytes], bool]:
    compiled = re.compile(pattern)
    return lambda body: compiled.fullmatch(body) is not None


_PRIMITIVES: dict[int, tuple[Callable[[bytes], bool], str]] = {
    1: (lambda body: body in (b"\x00", b"\xff"), "a BOOLEAN that is not 00 or FF"),
    2: (_minimal_integer, "an INTEGER not in the fewest octets"),
    3: (_bit_string, "a BIT STRING whose unused bits are not zero"),
    5: (lambda body: not body, "a NULL with contents"),
    6: (_minimal_arcs, "an object identifier whose arcs are not in the fewest octets"),
    10: (_minimal_integer, "an ENUMERATED not in the fewest octets"),
    13: (_minimal_arcs, "a relative object identifier whose arcs are not in the fewest octets"),
    23: (_form(rb"\d{12}Z"), "a UTCTime not in its canonical form"),
    24: (_form(rb"\d{14}(\.\d*[1-9])?Z"), "a GeneralizedTime not in its canonical form"),
}
"""DER's one encoding of each universal primitive type that has a choice of encodings."""


def _primitive_problem(tag: int, body: bytes) -> str | None:
    rule = _PRIMITIVES.get(tag)
    if rule is None or rule[0](body):
        return None
    return rule[1]


def _as_written(info: cms.ContentInfo) -> cms.SignedData:
    """The SignedData, once the fields that no signature covers are what the signer writes."""
    if info["content_type"].native != "signed_data":
        raise _Refused(
            f"the signature's CMS content is {info['content_type'].native}, not signed data"
        )
    signed_data = info["content"]
    signers = signed_data["signer_infos"]
    if len(signers) != 1:
        raise _Refused(f"the signature has {len(signers)} signer infos; the signer writes one")
    signer = signers[0]
    by_key = signer["sid"].name == "subject_key_identifier"
    version = "v3" if by_key else "v1"  # RFC 5652, 5.1 and 5.3, for detached data and certificates
    for what, value in (("SignedData", signed_data), ("SignerInfo", signer)):
        if value["version"].native != version:
            raise _Refused(
                f"the signature's {what} version is {value['version'].native}, not {version}"
            )
    encapsulated = signed_data["encap_content_info"]
    if encapsulated["content_type"].native != "data" or not isinstance(
        encapsulated["content"], core.Void
    ):
        raise _Refused("the signature does not sign detached data (encapsulated content present)")
    if not isinstance(signed_data["crls"], core.Void):
        raise _Refused("the signature carries revocation data; the signer writes none")
    certificates = signed_data["certificates"]
    if isinstance(certificates, core.Void) or not len(certificates):
        raise _Refused("the signature carries no certificate")
    if any(choice.name != "certificate" for choice in certificates):
        raise _Refused("the signature carries something other than an X.509 certificate")
    if not any(_identifies(signer["sid"], choice.chosen) for choice in certificates):
        raise _Refused("the signer's identifier names none of the certificates in the signature")
    _algorithms(signed_data, signer)
    if not isinstance(signer["signature"].native, bytes):
        raise _Refused("the signature value is not an octet string")
    return signed_data


def _algorithms(signed_data: cms.SignedData, signer: cms.SignerInfo) -> None:
    """The algorithm identifiers outside the signed attributes agree, with plain parameters."""
    digest, algorithm = signer["digest_algorithm"], signer["signature_algorithm"]
    for each in (*signed_data["digest_algorithms"], digest, algorithm):
        _plain_parameters(each)
    try:
        hashed = algorithm.hash_algo
    except ValueError:  # bare rsaEncryption or EdDSA: the identifier names no digest
        hashed = None
    if hashed != digest["algorithm"].native:
        raise _Refused(
            f"the signature algorithm {algorithm['algorithm'].native} does not name the signer's "
            f"digest algorithm {digest['algorithm'].native}, as the signer writes it"
        )
    if [a.dump() for a in signed_data["digest_algorithms"]] != [digest.dump()]:
        raise _Refused(
            "the signature's list of digest algorithms is not the one its signer uses "
            f"({digest['algorithm'].native})"
        )


def _plain_parameters(algorithm: algos.DigestAlgorithm | algos.SignedDigestAlgorithm) -> None:
    name = algorithm["algorithm"].native
    if name == "rsassa_pss":  # its parameters are required, and parsed by their own structure
        return
    parameters = algorithm["parameters"].dump()
    if parameters not in (b"", b"\x05\x00"):
        raise _Refused(
            f"the {name} algorithm identifier has parameters {parameters.hex().upper()}; the "
            "signer writes none or NULL"
        )


def _certificates(
    signed_data: cms.SignedData, roots: Iterable[asn1_x509.Certificate]
) -> tuple[bool, str]:
    carried = [choice.chosen for choice in signed_data["certificates"]]
    loaded: list[x509.Certificate] = []
    for number, cert in enumerate(carried, 1):
        try:
            loaded.append(_load(cert))
        except _UNREADABLE as exc:
            return False, f"certificate {number} of {len(carried)} cannot be read: {exc}"
    pool = [*loaded, *_loadable(roots)]
    said: list[str] = []
    for number, (cert, read) in enumerate(zip(carried, loaded, strict=True), 1):
        where = f"certificate {number} of {len(carried)}"
        try:
            subject = cert.subject.human_friendly
            problem = _certificate_problem(cert, read, pool)
            self_signed = read.issuer == read.subject
        except Exception as exc:  # noqa: BLE001 - a field that cannot be read is a failed step
            return False, f"{where} cannot be read: {type(exc).__name__}: {exc}"
        if problem is not None:
            return False, f"{where} ({subject}) {problem}"
        said.append(subject + (" (self-signed)" if self_signed else ""))
    plural = "s" if len(carried) != 1 else ""
    return True, (
        f"the signature's {len(carried)} certificate{plural} verify against their issuers' keys: "
        + "; ".join(said)
    )


def _identifies(sid: cms.SignerIdentifier, cert: asn1_x509.Certificate) -> bool:
    """Whether the signer's identifier names ``cert``, encoded exactly as the certificate has it."""
    if sid.name == "subject_key_identifier":
        return cert.key_identifier is not None and bool(cert.key_identifier == sid.chosen.native)
    tbs = cert["tbs_certificate"]
    return bool(
        tbs["issuer"].dump() == sid.chosen["issuer"].dump()
        and tbs["serial_number"].dump() == sid.chosen["serial_number"].dump()
    )


def _certificate_problem(
    cert: asn1_x509.Certificate, read: x509.Certificate, pool: Sequence[x509.Certificate]
) -> str | None:
    """What is wrong with one carried certificate (asn1crypto's and cryptography's reading)."""
    if cert["signature_algorithm"].dump() != cert["tbs_certificate"]["signature"].dump():
        return "names a signature algorithm that differs from the one it signed"
    if cert["signature_value"].contents[:1] != b"\x00":
        return "has a signature value that is not a whole number of octets"
    issuers = [c for c in pool if c.subject == read.issuer]
    if not issuers:
        return (
            f"names an issuer ({cert.issuer.human_friendly}) that is neither in the signature nor "
            "among the given trust roots, so its signature cannot be checked"
        )
    if not any(_issued_by(read, issuer) for issuer in issuers):
        return (
            f"is not signed by its issuer ({cert.issuer.human_friendly}): its bytes have changed "
            "since it was issued"
        )
    return None


_UNREADABLE = (ValueError, x509.InvalidVersion, CryptographyDeprecationWarning)


def _load(cert: asn1_x509.Certificate) -> x509.Certificate:
    """``cert`` read by cryptography, whose warnings about a malformed certificate are refusals."""
    with warnings.catch_warnings():
        warnings.simplefilter("error", CryptographyDeprecationWarning)
        return x509.load_der_x509_certificate(cert.dump())


def _loadable(roots: Iterable[asn1_x509.Certificate]) -> list[x509.Certificate]:
    loaded = []
    for root in roots:
        try:
            loaded.append(_load(root))
        except _UNREADABLE:
            continue  # a trust root the verifier cannot read vouches for nothing
    return loaded


def _issued_by(cert: x509.Certificate, issuer: x509.Certificate) -> bool:
    try:
        cert.verify_directly_issued_by(issuer)
    except (ValueError, TypeError, InvalidSignature, UnsupportedAlgorithm):
        return False
    return True


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


__all__ = [
    "CONTENTS_STEPS",
    "Rerender",
    "Step",
    "VerifyReport",
    "der_problem",
    "signature_contents",
    "verify",
]
