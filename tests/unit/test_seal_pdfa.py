"""The seal's PDF/A-3b preparation and key handling, on a real pack built by the pipeline."""

from __future__ import annotations

import hashlib
import io
import json
import os
from datetime import UTC, datetime, timedelta, timezone
from pathlib import Path

import pikepdf
import pytest
from cryptography import x509
from cryptography.hazmat.primitives import hashes, serialization
from cryptography.hazmat.primitives.asymmetric import ec
from cryptography.x509.oid import NameOID
from factories import make_definition
from pypdf import PdfReader

from service import pipeline, seal
from service.archive import files
from service.config import Limits
from service.seal import keys, pdfa

CREATED = datetime(2026, 11, 9, 7, 30, tzinfo=UTC)


@pytest.fixture(scope="module")
def definition() -> bytes:
    return json.dumps(make_definition()).encode()


@pytest.fixture(scope="module")
def draft(definition: bytes) -> bytes:
    return pipeline.build(definition, Limits()).pdf


def _prepare(draft: bytes, definition: bytes, **extra: bytes) -> bytes:
    return pdfa.prepare(
        draft,
        attachments={"definition.json": definition, **extra},
        title="Test pack",
        author="Test desk",
        created=CREATED,
    )


def test_prepare_is_byte_identical_across_runs(draft: bytes, definition: bytes) -> None:
    first, second = _prepare(draft, definition), _prepare(draft, definition)
    assert hashlib.sha256(first).hexdigest() == hashlib.sha256(second).hexdigest()


def test_prepare_passes_pikepdfs_pdfa_3b_check(draft: bytes, definition: bytes) -> None:
    verdict = pdfa.check(_prepare(draft, definition))
    assert verdict.standard == "PDF/A-3b"
    assert "not a certification" in verdict.validator
    assert (verdict.ok, verdict.verdict, verdict.messages, verdict.not_checked) == (
        True,
        "pass",
        [],
        [],
    )


def test_raw_draft_is_not_reported_conformant(draft: bytes) -> None:
    verdict = pdfa.check(draft)
    assert not verdict.ok
    assert verdict.verdict == "fail"
    # No output intent: every DeviceRGB use is a violation (ISO 19005-3 6.2.4.3).
    assert any("OutputIntent" in m for m in verdict.messages)


def test_metadata_declares_part_3_b_with_the_given_dates(draft: bytes, definition: bytes) -> None:
    with pikepdf.open(io.BytesIO(_prepare(draft, definition))) as pdf:
        meta = pdf.open_metadata()
        assert (meta["pdfaid:part"], meta["pdfaid:conformance"]) == ("3", "B")
        for key in ("xmp:CreateDate", "xmp:ModifyDate", "xmp:MetadataDate"):
            assert datetime.fromisoformat(meta[key]) == CREATED, key
        assert meta["dc:title"] == "Test pack"
        assert str(pdf.docinfo.CreationDate).startswith("D:20261109073000+00'00")
        (intent,) = pdf.Root.OutputIntents
        assert intent.OutputConditionIdentifier == "sRGB"
        assert len(pdf.Root.AF) == 1


def _empty_entries(pdf_bytes: bytes) -> int:
    """Empty /Trans page entries and empty /Pattern or /Shading resource dicts."""
    found = 0
    with pikepdf.open(io.BytesIO(pdf_bytes)) as pdf:
        for page in pdf.pages:
            trans = page.obj.get("/Trans")
            found += isinstance(trans, pikepdf.Dictionary) and len(trans.keys()) == 0
        for obj in pdf.objects:
            holder = obj.stream_dict if isinstance(obj, pikepdf.Stream) else obj
            res = holder.get("/Resources") if isinstance(holder, pikepdf.Dictionary) else None
            if isinstance(res, pikepdf.Dictionary):
                for kind in ("/Pattern", "/Shading"):
                    value = res.get(kind)
                    found += isinstance(value, pikepdf.Dictionary) and len(value.keys()) == 0
    return found


def test_rejected_constructs_are_removed(draft: bytes, definition: bytes) -> None:
    assert _empty_entries(draft) > 0  # matplotlib's chart pages carry empty /Pattern, /Shading
    assert _empty_entries(_prepare(draft, definition)) == 0


def test_attachments_read_back_exactly_with_an_independent_parser(
    draft: bytes, definition: bytes
) -> None:
    data = b"month,boardings\n2026-06-01,53270\n"
    sealed = pdfa.prepare(
        draft,
        attachments={"definition.json": definition, "ridership.csv": data},
        title="Test pack",
        author="Test desk",
        created=CREATED,
        data_files=["ridership.csv"],
    )
    read = PdfReader(io.BytesIO(sealed)).attachments  # pypdf, not pikepdf
    assert dict(read.items()) == {
        "definition.json": [definition],
        "ridership.csv": [data],
    }
    with pikepdf.open(io.BytesIO(sealed)) as pdf:
        relationships = {str(f.Desc): str(f.AFRelationship) for f in pdf.Root.AF}
        mimes = {n: s.get_file().mime_type for n, s in pdf.attachments.items()}
    assert relationships == {"definition.json": "/Source", "ridership.csv": "/Data"}
    assert mimes == {"definition.json": "application/json", "ridership.csv": "text/csv"}
    assert pdfa.check(sealed).ok


def test_naive_date_and_unknown_data_file_are_refused(draft: bytes, definition: bytes) -> None:
    with pytest.raises(ValueError, match="time zone"):
        pdfa.prepare(draft, attachments={}, title="t", author="a", created=datetime(2026, 1, 1))
    with pytest.raises(ValueError, match="data_files"):
        pdfa.prepare(
            draft, attachments={}, title="t", author="a", created=CREATED, data_files=["x.csv"]
        )


def test_dates_are_written_in_utc_whatever_the_offset(draft: bytes, definition: bytes) -> None:
    paris = CREATED.astimezone(timezone(timedelta(hours=1)))
    same = pdfa.prepare(
        draft,
        attachments={"definition.json": definition},
        title="Test pack",
        author="Test desk",
        created=paris,
    )
    assert same == _prepare(draft, definition)


def test_seal_unsigned_takes_its_metadata_from_the_definition(
    draft: bytes, definition: bytes
) -> None:
    sealed = seal.seal_unsigned(draft, definition)
    with pikepdf.open(io.BytesIO(sealed)) as pdf:
        meta = pdf.open_metadata()
        assert meta["dc:title"] == "Test pack"
        assert meta["dc:creator"] == ["Test desk"]
        assert datetime.fromisoformat(meta["xmp:CreateDate"]) == CREATED


# --- keys ---------------------------------------------------------------------------------------


def test_development_key_is_made_once_and_reused(tmp_path: Path) -> None:
    assert keys.development_certificate(tmp_path / "keys") is None  # verifying makes no key
    first = keys.development(tmp_path / "keys")
    second = keys.development(tmp_path / "keys")
    assert first == second
    assert first.is_development
    assert keys.DEVELOPMENT_ORGANISATION in first.subject
    assert "PRIVATE KEY" not in repr(first)
    assert (tmp_path / "keys" / keys.DEVELOPMENT_FILE).stat().st_mode & 0o077 == 0
    usage = first.certificate.extensions.get_extension_for_class(x509.KeyUsage).value
    assert usage.content_commitment
    assert usage.digital_signature
    assert [p.name for p in (tmp_path / "keys").iterdir()] == [keys.DEVELOPMENT_FILE]
    assert keys.development_certificate(tmp_path / "keys") == first.cert_pem


def _organisation_key(folder: Path, *, commitment: bool = True) -> tuple[Path, Path]:
    key = ec.generate_private_key(ec.SECP256R1())
    name = x509.Name([x509.NameAttribute(NameOID.COMMON_NAME, "Bus Cooperative seal")])
    now = datetime.now(UTC)
    usage = x509.KeyUsage(True, commitment, False, False, False, False, False, False, False)
    cert = (
        x509.CertificateBuilder()
        .subject_name(name)
        .issuer_name(name)
        .public_key(key.public_key())
        .serial_number(7)
        .not_valid_before(now - timedelta(days=1))
        .not_valid_after(now + timedelta(days=30))
        .add_extension(usage, critical=True)
        .sign(key, hashes.SHA256())
    )
    key_path, cert_path = folder / "seal.key", folder / "seal.crt"
    key_path.write_bytes(
        key.private_bytes(
            serialization.Encoding.PEM,
            serialization.PrivateFormat.PKCS8,
            serialization.NoEncryption(),
        )
    )
    cert_path.write_bytes(cert.public_bytes(serialization.Encoding.PEM))
    return key_path, cert_path


def test_organisation_key_is_loaded_when_configured(tmp_path: Path) -> None:
    key_path, cert_path = _organisation_key(tmp_path)
    loaded = keys.resolve(key_path=key_path, cert_path=cert_path, development_dir=tmp_path / "dev")
    assert not loaded.is_development
    assert loaded.subject == "CN=Bus Cooperative seal"
    assert not (tmp_path / "dev").exists()


def test_unusable_keys_are_refused(tmp_path: Path) -> None:
    key_path, cert_path = _organisation_key(tmp_path, commitment=False)
    with pytest.raises(keys.KeyProblem, match="nonRepudiation"):
        keys.load(key_path, cert_path)
    other = tmp_path / "other"
    other.mkdir()
    other_key, _ = _organisation_key(other)
    with pytest.raises(keys.KeyProblem, match="does not belong"):
        keys.load(other_key, cert_path)
    with pytest.raises(keys.KeyProblem, match="both"):
        keys.resolve(key_path=key_path, cert_path=None, development_dir=tmp_path)


def test_a_second_writer_keeps_the_first_key(tmp_path: Path) -> None:
    first = keys.development(tmp_path)
    files.write_once(tmp_path / keys.DEVELOPMENT_FILE, b"not a key")
    assert keys.development(tmp_path) == first
    assert not [n for n in os.listdir(tmp_path) if n.startswith(".")]  # no temp file left
