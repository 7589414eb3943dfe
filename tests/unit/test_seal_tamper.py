"""One changed byte anywhere in a sealed pack fails verification, without the archive.

The signature's digest covers every byte of the file except the signature's own ``/Contents`` hex
string (the gap in ``/ByteRange``): a DER-encoded CMS structure, then zero padding. These tests
change bytes there as well as everywhere else. The pack is signed once per module and every
changed file is verified in process with the signer's certificate as the trust root (as
``plumbline verify --no-archive`` does with the development certificate), without re-rendering: a
re-render compares the first revision only, which does not hold the signature.

A full ``verify`` takes about 30 ms a changed file, too long for every hex digit (about 9,300
changes), so every digit is checked against the two steps on the signature's own bytes (the
function ``verify`` runs for them, on the same gap), except digits inside what the signer's
signature covers, which "signature valid" judges; a sample of about 450 changes, inside and
outside those parts, goes through the whole ``verify``. Measured on two shared cores: the module
takes about 30 s alone, 55 s with both cores busy.
"""

from __future__ import annotations

import io
import json
import random
from collections.abc import Iterator
from dataclasses import dataclass
from pathlib import Path

import pytest
from asn1crypto import cms
from factories import make_definition
from pyhanko.keys import load_certs_from_pemder_data
from pyhanko.pdf_utils.reader import PdfFileReader

from service import pipeline, seal
from service.config import Limits
from service.seal import keys
from service.seal import verify as verifying
from service.seal.sign import sign
from service.seal.verify import VerifyReport, verify

SEED = 12_08
HEX = b"0123456789ABCDEF"


@dataclass(frozen=True)
class Gap:
    """Where the signature's hex string lies in the signed file."""

    byte_range: list[int]
    start: int
    """The file offset of the first hex digit (after ``<``)."""
    der_digits: int
    """How many hex digits hold the CMS structure; the rest, up to ``end``, is zero padding."""
    end: int
    """The file offset of the closing ``>``."""
    signed_parts: tuple[range, ...]
    """The hex digits of what the signer's signature covers: signed attributes, signature value."""

    def digits(self) -> range:
        return range(self.start, self.end)


@pytest.fixture(scope="module")
def key(tmp_path_factory: pytest.TempPathFactory) -> keys.SigningKey:
    return keys.development(tmp_path_factory.mktemp("data") / "keys")


@pytest.fixture(scope="module")
def sealed(key: keys.SigningKey) -> seal.Sealed:
    definition = json.dumps(make_definition()).encode()
    return seal.seal(pipeline.build(definition, Limits()).pdf, definition, key)


@pytest.fixture(scope="module")
def signed(sealed: seal.Sealed) -> bytes:
    return sealed.signed


@pytest.fixture(scope="module")
def gap(signed: bytes) -> Gap:
    return _gap(signed)


def _gap(signed: bytes) -> Gap:
    (embedded,) = PdfFileReader(io.BytesIO(signed), strict=False).embedded_signatures
    byte_range = [int(n) for n in embedded.byte_range]
    info = cms.ContentInfo.load(embedded.pkcs7_content, strict=False)
    der = info.dump()
    assert signed[byte_range[1] : byte_range[1] + 1] == b"<"
    start = byte_range[1] + 1
    signer = info["content"]["signer_infos"][0]
    parts = []
    for value in (signer["signed_attrs"].dump(), signer["signature"].contents):
        assert der.count(value) == 1
        parts.append(range(start + 2 * der.find(value), start + 2 * (der.find(value) + len(value))))
    return Gap(byte_range, start, 2 * len(der), byte_range[2] - 1, tuple(parts))


def _replace(data: bytes, at: int, new: int) -> bytes:
    return data[:at] + bytes([new]) + data[at + 1 :]


def _failed(report: VerifyReport) -> set[str]:
    return {s.name for s in report.steps if not s.ok}


def _hex_changes(signed: bytes, positions: Iterator[int] | range) -> Iterator[tuple[int, int]]:
    """For each position: another hex digit (seeded), and for a letter the same one in lower
    case — it decodes to the same byte, but it is not what the signer wrote."""
    rng = random.Random(SEED)
    for at in positions:
        digit = signed[at]
        yield at, rng.choice([d for d in HEX if d != digit])
        if digit in b"ABCDEF":
            yield at, digit | 0x20


def test_the_untouched_pack_passes_the_steps_on_the_signatures_own_bytes(
    signed: bytes, key: keys.SigningKey, gap: Gap
) -> None:
    report = verify(signed, trust_roots=[key.cert_pem])
    assert report.ok, report.as_dict()
    encoding = report.step("signature encoding").detail
    assert f"({gap.der_digits // 2:,} bytes: one signer" in encoding
    assert "zero bytes of padding, in upper-case hex" in encoding
    assert "(self-signed)" in report.step("embedded certificates").detail
    # the signature's hex string is upper case: a lower-case digit is a changed byte
    assert set(signed[gap.start : gap.end]) <= set(HEX)


def test_every_hex_digit_of_the_contents_changed_fails_the_signatures_own_steps(
    signed: bytes, key: keys.SigningKey, gap: Gap
) -> None:
    """Each of the ~7,900 hex digits replaced by another (seeded), and each letter put in lower
    case: every change fails "signature encoding" or "embedded certificates" — except a digit
    changed inside what the signer's signature covers (the signed attributes and the signature
    value), which "signature valid" judges. The whole ``verify`` takes ~30 ms a file, so the next
    test checks a sample of those, and of the rest, end to end (all 1,060 digits of those two
    parts were measured once: each fails ``verify``)."""
    roots = load_certs_from_pemder_data(key.cert_pem)
    assert all(s.ok for s in verifying.signature_contents(signed, gap.byte_range, roots))
    tried, undetected = 0, []
    for at, new in _hex_changes(signed, gap.digits()):
        if new in HEX and any(at in part for part in gap.signed_parts):
            continue
        tried += 1
        steps = verifying.signature_contents(_replace(signed, at, new), gap.byte_range, roots)
        if all(s.ok for s in steps):
            undetected.append(at - gap.start)
    assert tried > gap.end - gap.start - sum(len(part) for part in gap.signed_parts)
    assert not undetected, f"{len(undetected)} of {tried} changes pass (hex digits {undetected})"


def test_changed_hex_digits_of_the_contents_fail_verification(
    signed: bytes, key: keys.SigningKey, gap: Gap
) -> None:
    """The whole ``verify`` on a sample: the first and last 20 digits of the DER part, of the
    padding, of the signed attributes and of the signature value, 150 seeded random digits inside
    those two (what "signature valid" judges) and 80 elsewhere."""
    der_end = gap.start + gap.der_digits
    edges = {
        at
        for part in (range(gap.start, der_end), range(der_end, gap.end), *gap.signed_parts)
        for at in (*part[:20], *part[-20:])
    }
    rng = random.Random(SEED)
    inside = sorted({at for part in gap.signed_parts for at in part} - edges)
    outside = sorted(set(gap.digits()) - edges - set(inside))
    sample = sorted([*edges, *rng.sample(inside, 150), *rng.sample(outside, 80)])
    tried, undetected = 0, []
    for at, new in _hex_changes(signed, iter(sample)):
        tried += 1
        if verify(_replace(signed, at, new), trust_roots=[key.cert_pem]).ok:
            undetected.append((at - gap.start, "padding" if at >= der_end else "DER"))
    assert tried > 400, tried
    assert not undetected, f"{len(undetected)} of {tried} changes pass verify: {undetected}"


def test_300_random_byte_flips_anywhere_fail_verification(
    signed: bytes, key: keys.SigningKey, gap: Gap
) -> None:
    rng = random.Random(SEED)
    flips = [(rng.randrange(len(signed)), rng.randrange(1, 256)) for _ in range(300)]
    inside = sum(gap.start - 1 <= at <= gap.end for at, _ in flips)
    assert inside > 10  # the signature's hex string is about 8 % of the file
    undetected = [
        (at, mask)
        for at, mask in flips
        if verify(_replace(signed, at, signed[at] ^ mask), trust_roots=[key.cert_pem]).ok
    ]
    assert not undetected, f"{len(undetected)} of 300 flips pass verify ({inside} in /Contents)"


def _certificate_signature(signed: bytes, gap: Gap) -> int:
    """The file offset of the first hex digit of the embedded certificate's signature value."""
    der = bytes.fromhex(signed[gap.start : gap.start + gap.der_digits].decode())
    cert = cms.ContentInfo.load(der)["content"]["certificates"][0].chosen
    value = cert["signature_value"].contents[1:]  # past the count of unused bits
    assert der.count(value) == 2  # the certificate is carried twice, as pyHanko writes it
    return gap.start + 2 * der.find(value)


@pytest.mark.parametrize("roots", ["signer's certificate", "no trust root"])
def test_a_changed_certificate_signature_fails_even_without_a_trust_root(
    signed: bytes, key: keys.SigningKey, gap: Gap, roots: str
) -> None:
    at = _certificate_signature(signed, gap) + 256  # the middle of an RSA-2048 signature
    tampered = _replace(signed, at, HEX[(HEX.index(signed[at]) + 1) % 16])
    report = verify(tampered, trust_roots=[key.cert_pem] if roots != "no trust root" else [])
    assert "embedded certificates" in _failed(report)
    detail = report.step("embedded certificates").detail
    assert "certificate 1 of 2" in detail
    assert "is not signed by its issuer" in detail
    assert report.step("signature encoding").ok  # the DER is still canonical


def test_a_certificate_signature_with_unused_bits_fails(
    sealed: seal.Sealed, tmp_path: Path
) -> None:
    """The count of unused bits before the certificate's signature value, 00, becomes 01. When
    the bit it drops is zero the DER stays canonical and the signature still verifies, so keys are
    made until the certificate's signature ends in a zero bit (about two tries). Measured before:
    the change passed ``verify``."""
    for attempt in range(64):
        key = keys.development(tmp_path / str(attempt))
        if not key.certificate.signature[-1] & 1:
            break
    signed = sign(sealed.unsigned, key)
    at = _certificate_signature(signed, _gap(signed)) - 1  # the count's second hex digit
    report = verify(_replace(signed, at, ord("1")), trust_roots=[key.cert_pem])
    assert "embedded certificates" in _failed(report), report.as_dict()
    assert "not a whole number of octets" in report.step("embedded certificates").detail
    assert report.step("signature encoding").ok


def _first_of(signed: bytes, gap: Gap, pattern: bytes) -> int:
    at = signed.find(pattern, gap.start, gap.start + gap.der_digits)
    assert at > 0
    return at


@pytest.mark.parametrize(
    ("change", "reason"),
    [
        ("lower case", "the signer writes only the digits 0-9 and A-F"),
        ("padding", "only zero padding may follow its"),
        ("digest list", "digest algorithms is not the one its signer uses (sha256)"),
        ("SignedData version", "SignedData version is v3, not v1"),
        ("non-minimal arc", "an object identifier whose arcs are not in the fewest octets"),
    ],
)
def test_each_refusal_names_its_reason(
    signed: bytes, key: keys.SigningKey, gap: Gap, change: str, reason: str
) -> None:
    der_end = gap.start + gap.der_digits
    if change == "lower case":
        at = next(i for i in gap.digits() if signed[i] in b"ABCDEF")
        tampered = _replace(signed, at, signed[at] | 0x20)
    elif change == "padding":
        tampered = _replace(signed, (der_end + gap.end) // 2, ord("1"))
    elif change == "digest list":  # SHA-256 becomes SHA-384 in the list of digest algorithms
        at = _first_of(signed, gap, b"6086480165030402010500") + len(b"608648016503040201") - 1
        tampered = _replace(signed, at, ord("2"))
    elif change == "SignedData version":  # INTEGER 1 -> 3, right after the SignedData header
        at = _first_of(signed, gap, b"020101310F") + len(b"02010")
        tampered = _replace(signed, at, ord("3"))
    else:  # SHA-256's first arc byte 60 (2.16) becomes 80: an arc with a leading zero octet
        at = _first_of(signed, gap, b"06096086480165030402010500")
        tampered = signed[: at + 4] + b"80" + signed[at + 6 :]
    report = verify(tampered, trust_roots=[key.cert_pem])
    assert "signature encoding" in _failed(report)
    assert reason in report.step("signature encoding").detail
    assert "not judged" in report.step("embedded certificates").detail


@pytest.mark.parametrize(
    ("der", "problem"),
    [
        (bytes.fromhex("3003020101"), None),
        (bytes.fromhex("30810302 0101".replace(" ", "")), "not in the fewest octets"),
        (bytes.fromhex("3080020101 0000".replace(" ", "")), "indefinite length"),
        (bytes.fromhex("300402020001"), "an INTEGER not in the fewest octets"),
        (bytes.fromhex("3003010101"), "a BOOLEAN that is not 00 or FF"),
        (bytes.fromhex("30020501"), "runs past the end"),
        (bytes.fromhex("3003050100"), "a NULL with contents"),
        (bytes.fromhex("300403020781"), "a BIT STRING whose unused bits are not zero"),
        (bytes.fromhex("2403040100"), "the universal type 4 at byte 0 is constructed"),
        (bytes.fromhex("1f0100"), "long form for a number below 31"),
        (bytes.fromhex("30050201010000"), "an end-of-contents marker (00) at byte 5"),
        (b"\x17\x0d" + b"360101000000+", "a UTCTime not in its canonical form"),
    ],
)
def test_der_problem_names_each_rule(der: bytes, problem: str | None) -> None:
    found = verifying.der_problem(der)
    assert (found is None) if problem is None else (found is not None and problem in found)
