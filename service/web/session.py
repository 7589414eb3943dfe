"""The review pages' session cookie and CSRF tokens, signed with HMAC-SHA256.

The cookie holds ``{"sid": <random id>, "exp": <unix seconds>}`` as base64url JSON and its
HMAC-SHA256 under the session secret; it names no key. Whether a session is signed in, and as which
key, is decided on the server on every request: signing in records the SHA-256 of a new session id
in the archive (:func:`service.workflow.keys.start_session`), and that row ends at sign-out, when
its key is revoked, and at its expiry, so a cookie captured earlier is worth nothing afterwards. A
visitor gets an anonymous session (no row) on the sign-in page, so the sign-in form carries a CSRF
token too; signing in issues a new session id (an id seen before sign-in is never used after it).

The secret is ``PLUMBLINE_SESSION_SECRET``, or else 32 random bytes made once in
``data_dir/web-session.key`` (mode 0600). Two processes starting at once write their own temporary
files and hard-link one into place: the first link wins and both read the winner's bytes.

This module knows nothing of pages or the workflow; it must not import the API.
"""

from __future__ import annotations

import base64
import binascii
import hashlib
import hmac
import json
import re
import secrets
import time
from dataclasses import dataclass

from service.archive.files import write_once
from service.config import Settings
from service.errors import PlumblineError

COOKIE = "plumbline_review"
PATH = "/review"
SECRET_FILE = "web-session.key"  # noqa: S105 (the file's name, not a secret)
SIGNED_IN_SECONDS = 8 * 3600
"""A signed-in session lasts one working day at most (common practice (no source))."""
ANONYMOUS_SECONDS = 3600
MIN_SECRET_CHARS = 32
_SID = re.compile(r"^[0-9a-f]{32}$")


class SessionSecretProblem(PlumblineError):
    code = "session_secret"
    status = 500


@dataclass(frozen=True)
class Session:
    """One visitor's session as the cookie carries it."""

    sid: str
    expires: int
    """Unix seconds."""

    @classmethod
    def anonymous(cls, *, now: float | None = None) -> Session:
        return cls(secrets.token_hex(16), int(now or time.time()) + ANONYMOUS_SECONDS)

    @classmethod
    def signed_in(cls, *, now: float | None = None) -> Session:
        """A new session id: never the id the visitor had before signing in."""
        return cls(secrets.token_hex(16), int(now or time.time()) + SIGNED_IN_SECONDS)

    @property
    def digest(self) -> str:
        """The SHA-256 of the id, as the archive's ``sessions`` table knows the session."""
        return hashlib.sha256(self.sid.encode()).hexdigest()


def secret_of(settings: Settings) -> bytes:
    """The signing secret: the configured one, else the data folder's (made on first use)."""
    if settings.session_secret is not None:
        value = settings.session_secret.get_secret_value()
        if len(value) < MIN_SECRET_CHARS:
            raise SessionSecretProblem(
                f"PLUMBLINE_SESSION_SECRET has {len(value)} characters; give at least "
                f"{MIN_SECRET_CHARS} random characters, or unset it to use {SECRET_FILE}"
            )
        return value.encode()
    path = settings.data_dir / SECRET_FILE
    if not path.exists():
        settings.data_dir.mkdir(parents=True, exist_ok=True)
        write_once(path, secrets.token_hex(32).encode() + b"\n")
    text = path.read_bytes().strip()
    try:
        secret = bytes.fromhex(text.decode("ascii"))
    except (UnicodeDecodeError, ValueError):
        secret = b""
    if len(secret) < 32:
        raise SessionSecretProblem(
            f"{path} does not hold 64 hexadecimal characters; delete it (every review session "
            "ends) and a new secret is made at the next request"
        )
    return secret


def _b64(data: bytes) -> str:
    return base64.urlsafe_b64encode(data).rstrip(b"=").decode("ascii")


def _unb64(text: str) -> bytes:
    return base64.urlsafe_b64decode(text + "=" * (-len(text) % 4))


def _mac(secret: bytes, purpose: str, message: str) -> str:
    return _b64(hmac.new(secret, f"{purpose}|{message}".encode(), hashlib.sha256).digest())


def encode(session: Session, secret: bytes) -> str:
    """The cookie value: payload and signature."""
    payload = json.dumps(
        {"sid": session.sid, "exp": session.expires},
        separators=(",", ":"),
        sort_keys=True,
    )
    body = _b64(payload.encode())
    return f"{body}.{_mac(secret, 'session', body)}"


def decode(value: str | None, secret: bytes, *, now: float | None = None) -> Session | None:
    """The session a cookie carries, or ``None`` if it is missing, altered, malformed or expired."""
    data = _verified(value, secret)
    if data is None:
        return None
    sid, expires = data.get("sid"), data.get("exp")
    valid = (
        set(data) == {"sid", "exp"}
        and isinstance(sid, str)
        and _SID.match(sid) is not None
        and isinstance(expires, int)
        and not isinstance(expires, bool)
        and expires > int(now or time.time())
    )
    if not valid:
        return None
    return Session(str(sid), int(str(expires)))


def _verified(value: str | None, secret: bytes) -> dict[str, object] | None:
    """The cookie's payload if its signature is right, else ``None``."""
    if not value or len(value) > 1024:
        return None
    body, _, signature = value.partition(".")
    if not hmac.compare_digest(signature.encode(), _mac(secret, "session", body).encode()):
        return None
    try:
        data = json.loads(_unb64(body))
    except (binascii.Error, ValueError):
        return None
    return data if isinstance(data, dict) else None


def csrf_token(session: Session, secret: bytes) -> str:
    """The token every POST form of this session carries: an HMAC of the session id."""
    return _mac(secret, "csrf", session.sid)


def csrf_ok(session: Session, secret: bytes, token: str | None) -> bool:
    return bool(token) and hmac.compare_digest(
        str(token).encode(), csrf_token(session, secret).encode()
    )
