"""The key a pack is sealed with: the organisation's, or a development key made on first use.

``load`` reads the organisation's private key and certificate (PEM, optionally a CA chain) from the
paths it is given. ``development`` makes an RSA-2048 key and a self-signed certificate the first
time it is asked for one in a folder, and reuses it afterwards; the certificate names itself a
development key, and ``is_development`` lets the pack and the verifier say so plainly. ``resolve``
picks between them. Both certificates must allow non-repudiation (content commitment), which
pyHanko requires of a signing certificate by default.
"""

from __future__ import annotations

import datetime as dt
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path

from cryptography import x509
from cryptography.hazmat.primitives import hashes, serialization
from cryptography.hazmat.primitives.asymmetric import rsa
from cryptography.x509.oid import NameOID

from service.archive.files import write_once
from service.errors import PlumblineError

DEVELOPMENT_ORGANISATION = "Plumbline development key (not an organisational seal)"
DEVELOPMENT_FILE = "development-seal.pem"
_VALID_FOR = dt.timedelta(days=3650)


@dataclass(frozen=True)
class SigningKey:
    """A private key with its certificate (and chain), all PEM; never printed or logged."""

    key_pem: bytes
    cert_pem: bytes
    chain_pem: tuple[bytes, ...] = ()
    is_development: bool = False
    passphrase: bytes | None = None

    @property
    def certificate(self) -> x509.Certificate:
        return x509.load_pem_x509_certificate(self.cert_pem)

    @property
    def subject(self) -> str:
        return self.certificate.subject.rfc4514_string()

    def __repr__(self) -> str:  # keep the key out of logs and tracebacks
        kind = "development" if self.is_development else "organisation"
        return f"SigningKey({kind}, subject={self.subject!r})"


class KeyProblem(PlumblineError, ValueError):
    """The configured key or certificate cannot be used for sealing."""

    code = "seal_key"
    status = 500


def load(
    key_path: Path,
    cert_path: Path,
    *,
    chain_paths: Sequence[Path] = (),
    passphrase: bytes | None = None,
) -> SigningKey:
    """The organisation's key and certificate, checked to belong together and to allow signing."""
    key_pem, cert_pem = key_path.read_bytes(), cert_path.read_bytes()
    try:
        key = serialization.load_pem_private_key(key_pem, password=passphrase)
        cert = x509.load_pem_x509_certificate(cert_pem)
    except (ValueError, TypeError) as exc:
        raise KeyProblem(f"cannot read the signing key or certificate: {exc}") from exc
    if key.public_key().public_bytes(
        serialization.Encoding.DER, serialization.PublicFormat.SubjectPublicKeyInfo
    ) != cert.public_key().public_bytes(
        serialization.Encoding.DER, serialization.PublicFormat.SubjectPublicKeyInfo
    ):
        raise KeyProblem(f"the key in {key_path.name} does not belong to {cert_path.name}")
    _require_commitment(cert)
    chain = tuple(p.read_bytes() for p in chain_paths)
    return SigningKey(key_pem, cert_pem, chain, is_development=False, passphrase=passphrase)


def _require_commitment(cert: x509.Certificate) -> None:
    try:
        usage = cert.extensions.get_extension_for_class(x509.KeyUsage).value
    except x509.ExtensionNotFound:
        return  # no key usage extension: every usage is allowed
    if not (usage.digital_signature and usage.content_commitment):
        raise KeyProblem(
            "the certificate must allow digitalSignature and nonRepudiation (content "
            "commitment) for sealing"
        )


def development(folder: Path, *, now: dt.datetime | None = None) -> SigningKey:
    """The development key in ``folder``, made on first use (RSA-2048, self-signed).

    RSA, not ECDSA: for an ECDSA key on a NIST curve pyHanko registers the ISO 32002 extension and
    raises the catalog's /Version to 2.0, which a PDF/A-3 file (based on PDF 1.7) must not declare.
    """
    path = folder / DEVELOPMENT_FILE
    if not path.exists():
        folder.mkdir(parents=True, exist_ok=True)
        write_once(path, _make_development(now or dt.datetime.now(dt.UTC)))
    blob = path.read_bytes()
    marker = b"-----BEGIN CERTIFICATE-----"
    at = blob.find(marker)
    if at < 0:
        raise KeyProblem(f"{path} holds no certificate")
    return SigningKey(blob[:at], blob[at:], is_development=True)


def development_certificate(folder: Path) -> bytes | None:
    """The development certificate (PEM) in ``folder`` if one was made; never makes one."""
    path = folder / DEVELOPMENT_FILE
    if not path.exists():
        return None
    blob = path.read_bytes()
    at = blob.find(b"-----BEGIN CERTIFICATE-----")
    return blob[at:] if at >= 0 else None


def _make_development(now: dt.datetime) -> bytes:
    key = rsa.generate_private_key(public_exponent=65537, key_size=2048)
    name = x509.Name(
        [
            x509.NameAttribute(NameOID.COMMON_NAME, "Plumbline development seal"),
            x509.NameAttribute(NameOID.ORGANIZATION_NAME, DEVELOPMENT_ORGANISATION),
        ]
    )
    usage = x509.KeyUsage(
        digital_signature=True,
        content_commitment=True,
        key_encipherment=False,
        data_encipherment=False,
        key_agreement=False,
        key_cert_sign=True,
        crl_sign=False,
        encipher_only=False,
        decipher_only=False,
    )
    cert = (
        x509.CertificateBuilder()
        .subject_name(name)
        .issuer_name(name)
        .public_key(key.public_key())
        .serial_number(x509.random_serial_number())
        .not_valid_before(now - dt.timedelta(days=1))
        .not_valid_after(now + _VALID_FOR)
        .add_extension(x509.BasicConstraints(ca=True, path_length=0), critical=True)
        .add_extension(usage, critical=True)
        .add_extension(x509.SubjectKeyIdentifier.from_public_key(key.public_key()), critical=False)
        .sign(key, hashes.SHA256())
    )
    key_pem = key.private_bytes(
        serialization.Encoding.PEM,
        serialization.PrivateFormat.PKCS8,
        serialization.NoEncryption(),
    )
    return key_pem + cert.public_bytes(serialization.Encoding.PEM)


def resolve(*, key_path: Path | None, cert_path: Path | None, development_dir: Path) -> SigningKey:
    """The organisation's key when both paths are configured, else the development key."""
    if key_path is not None and cert_path is not None:
        return load(key_path, cert_path)
    if (key_path is None) != (cert_path is None):
        raise KeyProblem("configure both the signing key and its certificate, or neither")
    return development(development_dir)


__all__ = [
    "DEVELOPMENT_ORGANISATION",
    "KeyProblem",
    "SigningKey",
    "development",
    "development_certificate",
    "load",
    "resolve",
]
