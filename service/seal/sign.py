"""Signing a sealed pack (PAdES baseline B-B with pyHanko), and finding what was signed.

Signing appends an incremental update to the sealed PDF/A file, so the unsigned file is a
byte-for-byte prefix of the signed one: ``unsigned_part`` returns that prefix (the first revision),
which verification compares with a fresh re-render.
"""

from __future__ import annotations

import io

from pyhanko.keys import (
    load_certs_from_pemder_data,
    load_private_key_from_pemder_data,
)
from pyhanko.pdf_utils.incremental_writer import (
    IncrementalPdfFileWriter,
)
from pyhanko.pdf_utils.reader import PdfFileReader
from pyhanko.sign import fields, signers
from pyhanko_certvalidator.registry import SimpleCertificateStore

from service.errors import PlumblineError
from service.seal.keys import SigningKey

FIELD_NAME = "PlumblineSeal"


def signer_for(key: SigningKey) -> signers.SimpleSigner:
    (cert,) = load_certs_from_pemder_data(key.cert_pem)
    chain = [c for pem in key.chain_pem for c in load_certs_from_pemder_data(pem)]
    return signers.SimpleSigner(
        signing_cert=cert,
        signing_key=load_private_key_from_pemder_data(key.key_pem, passphrase=key.passphrase),
        cert_registry=SimpleCertificateStore.from_certs([cert, *chain]),  # type: ignore[no-untyped-call]
    )


def sign(pdf_bytes: bytes, key: SigningKey, *, reason: str | None = None) -> bytes:
    """``pdf_bytes`` with one PAdES B-B signature (SHA-256) covering the whole file.

    Use an RSA key for a PDF/A-3 pack: for ECDSA on a NIST curve (and for EdDSA) pyHanko raises the
    catalog's /Version to 2.0, which PDF/A-3 (based on PDF 1.7) does not allow.
    """
    meta = signers.PdfSignatureMetadata(
        field_name=FIELD_NAME,
        subfilter=fields.SigSeedSubFilter.PADES,
        md_algorithm="sha256",
        reason=reason
        or ("sealed with a development key" if key.is_development else "sealed report pack"),
    )
    writer = IncrementalPdfFileWriter(io.BytesIO(pdf_bytes), strict=False)
    out = signers.sign_pdf(writer, meta, signer=signer_for(key))
    signed: bytes = out.getvalue()
    assert signed.startswith(pdf_bytes), "an incremental update must keep the original bytes"
    return signed


class NotSealed(PlumblineError, ValueError):
    """The bytes are not a sealed pack: no readable first revision."""

    code = "not_sealed"
    status = 422


def unsigned_part(signed_bytes: bytes) -> bytes:
    """The first revision of ``signed_bytes``: the sealed file exactly as it was before signing.

    It ends at the first revision's ``%%EOF`` marker (with its end-of-line), found after that
    revision's cross-reference data — so a ``%%EOF`` inside a stream cannot be mistaken for it.
    """
    try:
        reader = PdfFileReader(io.BytesIO(signed_bytes), strict=False)
        info = reader.xrefs.get_xref_container_info(0)
    except Exception as exc:  # any parse failure means: not a readable seal
        raise NotSealed(f"cannot read the file's revisions: {type(exc).__name__}: {exc}") from exc
    at = signed_bytes.find(b"%%EOF", info.end_location)
    if at < 0:
        raise NotSealed("the first revision has no %%EOF marker")
    end = at + len(b"%%EOF")
    if signed_bytes[end : end + 2] == b"\r\n":
        end += 2
    elif signed_bytes[end : end + 1] in (b"\n", b"\r"):
        end += 1
    return signed_bytes[:end]


def revisions(signed_bytes: bytes) -> int:
    reader = PdfFileReader(io.BytesIO(signed_bytes), strict=False)
    return int(reader.xrefs.total_revisions)


__all__ = ["FIELD_NAME", "NotSealed", "revisions", "sign", "signer_for", "unsigned_part"]
