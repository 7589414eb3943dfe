"""API keys: who may act on packs, in which roles, and on which report families.

A secret is ``<key id>.<43 random URL-safe characters>`` (256 bits from :mod:`secrets`). It is
returned once by :func:`create` and never stored: the ``keys`` table keeps a per-key random salt and
the scrypt hash of the secret (n=2**14, r=8, p=1: 16 MiB, tens of milliseconds). scrypt rather than
PBKDF2 because it is memory-hard, so a stolen table is costly to attack on GPUs even for a weaker
secret; with 256-bit random secrets the hash is defence in depth. The key id in the secret (the
part before the dot, not secret: it is printed, listed and in the audit trail) finds the row before
anything is hashed, so a secret whose key id is malformed or names no key is refused at the cost of
one indexed read, not 16 MiB of scrypt; the hash is compared with :func:`hmac.compare_digest`. Keys
issued before this rule carry the same id, so they keep working unchanged. Failures are counted
per client address (:class:`FailureLimit`): past ``MAX_FAILURES`` in ``FAILURE_WINDOW_S`` seconds
an address is answered 429 with Retry-After before any key is looked at.

Families are report-id prefixes on a word boundary: ``hollin-vale`` grants ``hollin-vale`` and
``hollin-vale-ops-monthly`` (or ``hollin-vale_…``) but not ``hollin-valley``; ``*`` grants every
report. Roles are explicit: ``admin`` manages keys and implies no other role (separation of duties
would mean little if one role could do everything).

Every key belongs to a person (``persons``): a new person unless the key is made for an existing
one (``person=``; several keys may belong to one person). Separation of duties compares person ids,
never names. A key's name is normalised and checked by :mod:`service.workflow.names`: one script, no
invisible characters, and not confusable with the name of another person or another person's key.
"""

from __future__ import annotations

import hashlib
import hmac
import math
import re
import secrets
import time
import uuid
from collections import OrderedDict, deque
from dataclasses import dataclass
from datetime import datetime
from enum import StrEnum
from typing import Any

from sqlalchemy import select, update
from sqlalchemy.orm import Session, sessionmaker

from service.archive import audit
from service.archive.db import KeyRow, PersonRow, SessionRow, now, utc
from service.errors import Forbidden, InvalidRequest, NotFound, TooBusy, Unauthorized
from service.workflow import names

KDF = "scrypt-n16384-r8-p1"
_N, _R, _P = 2**14, 8, 1
_FAMILY = re.compile(r"^(\*|[a-z0-9][a-z0-9_-]{0,63})$")
_KEY_ID = re.compile(r"^key_[0-9a-f]{16}$")
NOT_VALID = "the API key is not valid"
"""Why a secret is refused that names no key or does not match its hash (the failures counted by
:class:`FailureLimit`; a revoked or expired key is refused with its own words, and not counted)."""
MAX_FAILURES = 20
"""Failed authentications one client address may make in ``FAILURE_WINDOW_S`` seconds."""
FAILURE_WINDOW_S = 60
MAX_ADDRESSES = 10_000
"""Addresses remembered at once (the oldest is forgotten first), so a flood cannot grow memory."""


class Role(StrEnum):
    author = "author"
    reviewer = "reviewer"
    approver = "approver"
    auditor = "auditor"
    """Reads packs and the audit trail; changes nothing."""
    admin = "admin"
    """Creates and revokes keys."""


@dataclass(frozen=True)
class Principal:
    key_id: str
    name: str
    roles: frozenset[Role]
    families: frozenset[str]
    person_id: str | None = None
    """The person who holds the key; ``None`` only for a principal made without the archive."""

    @property
    def person(self) -> str:
        """Who the key stands for in separation of duties: its person, else the key itself."""
        return self.person_id or self.key_id

    def require(self, *roles: Role) -> None:
        """Raise :class:`Forbidden` unless the key holds one of ``roles``."""
        if not self.roles & set(roles):
            wanted = " or ".join(r.value for r in roles)
            raise Forbidden(
                f"the key '{self.key_id}' ({self.name}) does not have the {wanted} role"
            )


def create(
    sessions: sessionmaker[Any],
    *,
    name: str,
    roles: set[Role],
    families: set[str],
    expires: datetime | None,
    by: Principal | None = None,
    allow_expired: bool = False,
    person: str | None = None,
) -> tuple[str, str]:
    """A new key: returns ``(key_id, secret)``; the secret cannot be recovered later.

    ``by`` is the admin making it, or ``None`` from the command line (the operator's own console).
    A key that would be expired already is refused unless ``allow_expired`` (a key made to test
    refusals). ``person`` is the id of the person the key is for (another key of theirs); without
    it the key is for a new person, whose name must not read like any other person's.
    """
    if by is not None:
        by.require(Role.admin)
    _validate(name=name, roles=roles, families=families, expires=expires)
    name = names.normalise(name)
    if expires is not None and not allow_expired and utc(expires) <= now():
        raise InvalidRequest(
            f"the expiry time {utc(expires).isoformat()} has passed: the key could never be used; "
            "give a future time (or allow it explicitly: --allow-expired)"
        )
    key_id = f"key_{uuid.uuid4().hex[:16]}"
    secret = f"{key_id}.{secrets.token_urlsafe(32)}"
    salt = secrets.token_bytes(16)
    with sessions.begin() as session:
        person_id = _person_for(session, name, person, by)
        session.add(
            KeyRow(
                id=key_id,
                person_id=person_id,
                name=name,
                roles=sorted(r.value for r in roles),
                families=sorted(families),
                kdf=KDF,
                salt=salt.hex(),
                secret_hash=_hash(secret, salt).hex(),
                created_at=now(),
                expires_at=None if expires is None else utc(expires),
                revoked_at=None,
            )
        )
        detail: dict[str, Any] = {"key": key_id, "name": name, "person": person_id}
        detail["roles"] = sorted(r.value for r in roles)
        detail["families"] = sorted(families)
        detail["expires"] = None if expires is None else utc(expires).isoformat()
        _audit(session, by, "key.created", detail)
    return key_id, secret


def person_of(sessions: sessionmaker[Any], key_id: str) -> str:
    """The id of the person who holds a key (to give them another key: ``create(person=…)``)."""
    with sessions() as session:
        row = session.get(KeyRow, key_id)
    if row is None:
        raise NotFound(f"there is no key '{key_id}'")
    person: str = row.person_id
    return person


def person_named(sessions: sessionmaker[Any], name: str) -> str | None:
    """The id of the person of exactly this name (as stored: normalised), or ``None``."""
    with sessions() as session:
        found = session.scalars(select(PersonRow.id).where(PersonRow.name == names.normalise(name)))
        person: str | None = found.first()
    return person


def _person_for(session: Session, name: str, person: str | None, by: Principal | None) -> str:
    """The person a new key belongs to: ``person`` if it exists, else a new person named ``name``;
    refused if ``name`` reads like the name of anyone else or of a key of anyone else."""
    if person is not None and session.get(PersonRow, person) is None:
        raise NotFound(f"there is no person '{person}' (a key's person is printed with it)")
    others = [(p.id, p.name) for p in session.scalars(select(PersonRow))]
    others += [(k.person_id, k.name) for k in session.scalars(select(KeyRow))]
    clash = names.confusable(name, [(pid, other) for pid, other in others if pid != person])
    if clash is not None:
        raise InvalidRequest(
            f"the name '{name}' reads like '{clash[1]}', the name of person '{clash[0]}', who "
            "holds a key already: a different person needs a name that cannot be taken for "
            f"theirs; to give that person another key, make it for them (--person {clash[0]})"
        )
    if person is not None:
        return person
    person_id = f"person_{uuid.uuid4().hex[:16]}"
    session.add(PersonRow(id=person_id, name=name, created_at=now()))
    session.flush()
    return person_id


def authenticate(
    sessions: sessionmaker[Any], secret: str, *, at: datetime | None = None
) -> Principal:
    """The principal a secret belongs to; :class:`Unauthorized` if unknown, revoked or expired."""
    key_id, _, _ = secret.partition(".")
    row = None
    if _KEY_ID.match(key_id):
        with sessions() as session:
            row = session.get(KeyRow, key_id)
    if row is None:  # no hash: the key id is not secret, so its absence tells nothing of a secret
        raise Unauthorized(NOT_VALID)
    if not hmac.compare_digest(_hash(secret, bytes.fromhex(row.salt)).hex(), row.secret_hash):
        raise Unauthorized(NOT_VALID)
    return _principal(row, at)


class FailureLimit:
    """Failed authentications per client address in a sliding window (one process's memory)."""

    def __init__(
        self,
        *,
        max_failures: int = MAX_FAILURES,
        window_s: float = FAILURE_WINDOW_S,
        clock: Any = time.monotonic,
    ) -> None:
        self.max_failures, self.window_s, self.clock = max_failures, window_s, clock
        self._failures: OrderedDict[str, deque[float]] = OrderedDict()

    def check(self, address: str) -> None:
        """Raise :class:`TooBusy` (429) while the address has failed too often recently."""
        failures = self._recent(address)
        if len(failures) >= self.max_failures:
            wait = math.ceil(failures[0] + self.window_s - self.clock())
            raise TooBusy(
                f"too many failed sign-ins from this address ({len(failures)} in "
                f"{self.window_s:g} s); try again in {max(1, wait)} s",
                retry_after=max(1, wait),
            )

    def failed(self, address: str, refusal: Unauthorized) -> None:
        """Count a refusal if the secret itself was wrong (not a revoked or expired key)."""
        if refusal.message != NOT_VALID:
            return
        self._recent(address).append(self.clock())
        self._failures.move_to_end(address)
        while len(self._failures) > MAX_ADDRESSES:
            self._failures.popitem(last=False)

    def _recent(self, address: str) -> deque[float]:
        failures = self._failures.setdefault(address, deque())
        while failures and failures[0] <= self.clock() - self.window_s:
            failures.popleft()
        return failures


def principal_for(sessions: sessionmaker[Any], key_id: str) -> Principal:
    """The principal of a key already authenticated once (a signed-in web session): the key is
    looked up again on every request, so revoking it or its expiry ends the session."""
    with sessions() as session:
        row = session.get(KeyRow, key_id)
    if row is None:
        raise Unauthorized("the key of this session no longer exists; sign in again")
    return _principal(row, None)


def _principal(row: KeyRow, at: datetime | None) -> Principal:
    if row.revoked_at is not None:
        raise Unauthorized(f"the API key '{row.id}' was revoked")
    moment = utc(at) if at is not None else now()
    if row.expires_at is not None and utc(row.expires_at) <= moment:
        raise Unauthorized(f"the API key '{row.id}' expired at {utc(row.expires_at).isoformat()}")
    return Principal(
        key_id=row.id,
        name=row.name,
        roles=frozenset(Role(r) for r in row.roles),
        families=frozenset(row.families),
        person_id=row.person_id,
    )


def revoke(sessions: sessionmaker[Any], *, key_id: str, by: Principal | None = None) -> bool:
    """Revoke a key from now on; ``False`` if it was revoked already."""
    if by is not None:
        by.require(Role.admin)
    with sessions.begin() as session:
        row = session.get(KeyRow, key_id)
        if row is None:
            raise NotFound(f"there is no key '{key_id}'")
        if row.revoked_at is not None:
            return False
        row.revoked_at = now()
        _end_sessions(session, SessionRow.key_id == key_id, row.revoked_at)
        _audit(session, by, "key.revoked", {"key": key_id, "name": row.name})
    return True


# --- review sessions: signed in on the server, so that ending one ends every copy of its cookie ---


def start_session(
    sessions: sessionmaker[Any], *, digest: str, key_id: str, expires: datetime
) -> None:
    """Record a signed-in session by the SHA-256 of its id (the cookie carries the id only)."""
    with sessions.begin() as session:
        session.add(
            SessionRow(
                id=digest, key_id=key_id, created_at=now(), expires_at=utc(expires), ended_at=None
            )
        )


def session_principal(sessions: sessionmaker[Any], digest: str) -> Principal | None:
    """The principal of a signed-in session; ``None`` if the id was never signed in (an
    anonymous visitor); :class:`Unauthorized` if the session ended (signed out, its key revoked)
    or expired, or its key was revoked or expired."""
    with sessions() as session:
        row = session.get(SessionRow, digest)
    if row is None:
        return None
    if row.ended_at is not None or utc(row.expires_at) <= now():
        raise Unauthorized("this session has ended; sign in again")
    return principal_for(sessions, row.key_id)


def end_session(sessions: sessionmaker[Any], digest: str) -> None:
    """Sign out: the session ends now, for every copy of its cookie."""
    with sessions.begin() as session:
        _end_sessions(session, SessionRow.id == digest, now())


def _end_sessions(session: Session, which: Any, at: datetime) -> None:
    statement = update(SessionRow).where(which, SessionRow.ended_at.is_(None)).values(ended_at=at)
    session.execute(statement.execution_options(synchronize_session=False))


def can_see(principal: Principal, report_id: str) -> bool:
    """Whether the key's families include this report id (prefix on a ``-``/``_`` boundary)."""
    return any(_grants(family, report_id) for family in principal.families)


def _grants(family: str, report_id: str) -> bool:
    if family in ("*", report_id):
        return True
    return report_id.startswith(family) and report_id[len(family)] in "-_"


def _validate(*, name: str, roles: set[Role], families: set[str], expires: datetime | None) -> None:
    if not roles or not all(isinstance(r, Role) for r in roles):
        raise InvalidRequest(f"give one or more roles of: {', '.join(r.value for r in Role)}")
    bad = sorted(f for f in families if not _FAMILY.match(f))
    if not families or bad:
        raise InvalidRequest(
            f"give one or more report families (a report-id prefix, or '*'); not valid: {bad}"
        )
    if expires is not None and expires.tzinfo is None:
        raise InvalidRequest("the expiry time needs a time zone")


def _hash(secret: str, salt: bytes) -> bytes:
    return hashlib.scrypt(secret.encode(), salt=salt, n=_N, r=_R, p=_P, dklen=32)


def _audit(session: Session, by: Principal | None, action: str, detail: dict[str, Any]) -> None:
    who = (by.key_id, by.name) if by is not None else (None, "command line")
    audit.append(session, key_id=who[0], name=who[1], action=action, detail=detail)


__all__ = [
    "FailureLimit",
    "Forbidden",
    "InvalidRequest",
    "Principal",
    "Role",
    "Unauthorized",
    "authenticate",
    "can_see",
    "create",
    "end_session",
    "person_named",
    "person_of",
    "principal_for",
    "revoke",
    "session_principal",
    "start_session",
]
