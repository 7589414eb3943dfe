"""Signing a sealed pack and verifying it: every step passes, and any damage fails a named step."""

from __future__ import annotations

import hashlib
import io
import json
import re
from pathlib import Path

import pdfplumber
import pikepdf
import pytest
from factories import BOARDINGS, MONTHS, make_definition, make_monthly

from service import pipeline, seal
from service.config import Limits
from service.seal import keys, pdfa
from service.seal.sign import NotSealed, revisions, sign, unsigned_part
from service.seal.verify import VerifyReport, verify

DEMO = Path(__file__).resolve().parents[2] / "sample_requests" / "bus-cooperative-monthly.json"
STEPS = [
    "signature intact",
    "signature valid",
    "signer trusted",
    "signed by",
    "signature covers the whole file",
    "signature encoding",
    "embedded certificates",
    "file SHA-256",
    "attachments",
    "re-render matches",
]


def _draft(raw: bytes) -> bytes:
    return pipeline.build(raw, Limits()).pdf


RERENDER = seal.rerender_with(_draft)


@pytest.fixture(scope="module")
def definition() -> bytes:
    return json.dumps(make_definition()).encode()


@pytest.fixture(scope="module")
def key(tmp_path_factory: pytest.TempPathFactory) -> keys.SigningKey:
    return keys.development(tmp_path_factory.mktemp("data") / "keys")


@pytest.fixture(scope="module")
def sealed(definition: bytes, key: keys.SigningKey) -> seal.Sealed:
    return seal.seal(_draft(definition), definition, key)


def _flip(data: bytes, at: int) -> bytes:
    return data[:at] + bytes([data[at] ^ 0x01]) + data[at + 1 :]


def _failed(report: VerifyReport) -> set[str]:
    return {s.name for s in report.steps if not s.ok}


def test_every_step_passes_on_an_untouched_pack(
    sealed: seal.Sealed, key: keys.SigningKey, definition: bytes
) -> None:
    report = verify(sealed.signed, trust_roots=[key.cert_pem], rerender=RERENDER)
    assert [s.name for s in report.steps] == STEPS
    assert report.ok, report.as_dict()
    assert report.sha256 == hashlib.sha256(sealed.signed).hexdigest()
    assert report.attachments == {"definition.json": hashlib.sha256(definition).hexdigest()}
    assert report.development_key
    assert report.step("signed by").detail.startswith("a development key, not an organisational")


def test_signing_is_an_incremental_update_of_the_sealed_file(sealed: seal.Sealed) -> None:
    assert sealed.signed.startswith(sealed.unsigned)
    assert unsigned_part(sealed.signed) == sealed.unsigned
    assert revisions(sealed.signed) == 2
    assert sealed.pdfa.ok, sealed.pdfa  # checked before signing, as ENGINEERING.md says
    after = pdfa.check(sealed.signed)
    # pikepdf does not check the signature's form field, so its verdict is "not checked" — but it
    # finds no violation (an ECDSA key would raise /Version to 2.0, a PDF/A-3 violation).
    assert (after.verdict, after.messages) == ("not_checked", [])
    assert any("/AcroForm" in m for m in after.not_checked)


def test_unsigned_part_refuses_what_is_not_a_pdf() -> None:
    with pytest.raises(NotSealed):
        unsigned_part(b"not a pdf at all")


def test_a_flipped_byte_in_the_middle_breaks_the_signature(
    sealed: seal.Sealed, key: keys.SigningKey
) -> None:
    tampered = _flip(sealed.signed, len(sealed.signed) // 2)
    report = verify(tampered, trust_roots=[key.cert_pem], rerender=None)
    assert not report.ok
    assert not report.step("signature intact").ok
    assert "changed since signing" in report.step("signature intact").detail
    signer = report.step("signed by")  # the name in a broken signature is only a claim
    assert not signer.ok
    assert signer.detail.startswith("claims a development key")


def test_a_flipped_byte_in_the_attachment_fails_the_rerender(
    sealed: seal.Sealed, key: keys.SigningKey, definition: bytes
) -> None:
    with pikepdf.open(io.BytesIO(sealed.unsigned)) as pdf:
        raw = pdf.attachments["definition.json"].get_file().obj.read_raw_bytes()
    at = sealed.signed.find(raw)
    assert at > 0
    assert sealed.signed.count(raw) == 1
    tampered = _flip(sealed.signed, at + len(raw) // 2)
    report = verify(tampered, trust_roots=[key.cert_pem], rerender=RERENDER)
    assert not report.step("signature intact").ok
    assert not report.step("re-render matches").ok
    assert report.attachments.get("definition.json") != hashlib.sha256(definition).hexdigest()


def test_a_validly_signed_pack_whose_definition_does_not_match_fails_the_rerender(
    definition: bytes, key: keys.SigningKey
) -> None:
    """The signature proves who sealed the bytes; only the re-render proves they follow the data."""
    other = make_definition(datasets=[make_monthly(MONTHS, [b + 1000 for b in BOARDINGS])])
    mismatched = seal.seal(_draft(json.dumps(other).encode()), definition, key)
    report = verify(mismatched.signed, trust_roots=[key.cert_pem], rerender=RERENDER)
    assert _failed(report) == {"re-render matches"}
    assert "different bytes" in report.step("re-render matches").detail


def test_without_the_signers_certificate_the_signer_is_not_trusted(
    sealed: seal.Sealed, tmp_path: Path
) -> None:
    stranger = keys.development(tmp_path)
    report = verify(sealed.signed, trust_roots=[stranger.certificate], rerender=None)
    assert _failed(report) == {"signer trusted"}
    assert _failed(verify(sealed.signed, trust_roots=[], rerender=None)) == {"signer trusted"}


def test_bytes_appended_after_signing_are_reported(
    sealed: seal.Sealed, key: keys.SigningKey
) -> None:
    report = verify(sealed.signed + b"\n% appended\n", trust_roots=[key.cert_pem], rerender=None)
    assert "signature covers the whole file" in _failed(report)


def test_an_unsigned_or_unreadable_file_fails_every_signature_step(sealed: seal.Sealed) -> None:
    for data in (sealed.unsigned, b"%PDF-1.7\n garbage"):
        report = verify(data, trust_roots=[], rerender=None)
        assert not report.ok
        assert {"signature intact", "signature valid", "signer trusted"} <= _failed(report)


def test_organisation_key_signs_and_verifies(sealed: seal.Sealed, tmp_path: Path) -> None:
    from test_seal_pdfa import _organisation_key

    key_path, cert_path = _organisation_key(tmp_path)
    organisation = keys.load(key_path, cert_path)
    signed = sign(sealed.unsigned, organisation)
    report = verify(signed, trust_roots=[cert_path.read_bytes()], rerender=None)
    assert report.ok, report.as_dict()
    assert not report.development_key
    assert report.step("signed by").detail == "Common Name: Bus Cooperative seal"
    # Measured: for this ECDSA P-256 key pyHanko declares /Version /2.0 (ISO 32002), which
    # PDF/A-3 forbids; the development key is RSA for this reason.
    assert any("/Version" in m for m in pdfa.check(signed).messages)


def test_demo_pack_seals_and_verifies(key: keys.SigningKey) -> None:
    raw = DEMO.read_bytes()
    sealed = seal.seal(_draft(raw), raw, key)
    report = verify(sealed.signed, trust_roots=[key.cert_pem], rerender=RERENDER)
    assert report.ok, report.as_dict()


def test_demo_pack_passes_pikepdfs_pdfa_check() -> None:
    raw = DEMO.read_bytes()
    verdict = pdfa.check(seal.seal_unsigned(_draft(raw), raw))
    assert verdict.ok, verdict.messages


def test_single_line_chart_text_with_ligature_pairs_passes_pikepdfs_pdfa_check() -> None:
    definition = json.loads(DEMO.read_text())
    definition["sections"] = [definition["sections"][0]]  # the ridership section: one-line notes
    # The axis label, drawn by matplotlib on one line, now reads "boardings (office staff)".
    definition["datasets"][0]["columns"][1]["unit"] = "office staff"
    raw = json.dumps(definition).encode()
    verdict = pdfa.check(seal.seal_unsigned(_draft(raw), raw))
    assert verdict.ok, verdict.messages


def test_a_chart_label_beyond_latin_1_passes_pikepdfs_pdfa_check() -> None:
    definition = json.loads(DEMO.read_text())
    definition["datasets"][2]["rows"][0]["route"] = "7 Mill Lane \u2013 Station"
    raw = json.dumps(definition).encode()
    assert pdfa.check(seal.seal_unsigned(_draft(raw), raw)).ok


def test_multi_line_note_with_ligature_pairs_and_label_beyond_latin_1_pass_and_read_back() -> None:
    """The rating chart's two notes make its title two lines; its unit puts "ffi" and "fi" in the
    first, and one route's label has an en dash (U+2013) and an arrow (U+2192). pikepdf's PDF/A-3b
    check must find no .notdef (ISO 19005-3, 6.2.11.8), and pdfplumber must read the text back."""
    definition = json.loads(DEMO.read_text())
    rating = next(d for d in definition["datasets"] if d["name"] == "satisfaction")
    rating["columns"][1]["unit"] = "official fit points"
    rating["rows"][0]["route"] = "7 Mill Lane \u2013 Station \u2192 Depot"
    raw = json.dumps(definition).encode()
    plans = {c.plan.chart_id: c.plan for c in pipeline.check(pipeline.intake(raw, Limits())).charts}
    assert len(plans["rating-by-route"].notes) == 2  # so the notes are drawn as two lines
    sealed = seal.seal_unsigned(_draft(raw), raw)
    verdict = pdfa.check(sealed)
    assert verdict.ok, verdict.messages
    with pdfplumber.open(io.BytesIO(sealed)) as pdf:
        text = "\n".join(page.extract_text() or "" for page in pdf.pages)
    assert re.search(r"Scale starts at \d\.\d official fit points, not zero", text)
    assert "7 Mill Lane \u2013 Station \u2192 Depot" in text
