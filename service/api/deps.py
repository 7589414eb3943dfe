"""Dependencies: the app's services, and loaders that answer 404 inside the dependency."""

from __future__ import annotations

import hashlib
from typing import Annotated

from fastapi import Depends, Path, Request
from fastapi.dependencies.models import Dependant
from fastapi.routing import APIRoute
from fastapi.security import HTTPAuthorizationCredentials, HTTPBearer
from starlette.concurrency import run_in_threadpool

from service.errors import InvalidRequest, Unauthorized, UnsupportedMediaType
from service.runner.services import Services
from service.workflow import drafts, keys
from service.workflow.drafts import Pack
from service.workflow.keys import Principal


def _services(request: Request) -> Services:
    services = request.app.state.services
    assert isinstance(services, Services)
    return services


ServicesDep = Annotated[Services, Depends(_services)]

PackId = Annotated[str, Path(pattern=r"^pk_[0-9a-f]{32}$", description="A pack id, e.g. pk_3f…")]


KNOWN_KEYS = 4096

_bearer = HTTPBearer(
    auto_error=False,
    description="An API key made with `plumbline keys create`, as `Authorization: Bearer <key>`.",
)


async def _principal(
    request: Request,
    services: ServicesDep,
    credentials: Annotated[HTTPAuthorizationCredentials | None, Depends(_bearer)],
) -> Principal:
    if credentials is None or credentials.scheme.lower() != "bearer":
        raise Unauthorized("send an API key as 'Authorization: Bearer <key>'")
    address = request.client.host if request.client is not None else ""
    services.auth_failures.check(address)
    try:
        return await _checked(services, credentials.credentials)
    except Unauthorized as refused:
        services.auth_failures.failed(address, refused)
        raise


async def _checked(services: Services, secret: str) -> Principal:
    # scrypt is deliberately slow (tens of milliseconds): a secret that passed it once is known by
    # its SHA-256 (a 256-bit random secret cannot be guessed from it), and its key is still looked
    # up on every request, so a revoked or expired key is refused at once.
    digest = hashlib.sha256(secret.encode()).digest()
    known = services.known_keys.get(digest)
    if known is not None:
        services.known_keys.move_to_end(digest)
        return await run_in_threadpool(keys.principal_for, services.sessions, known)
    principal = await run_in_threadpool(keys.authenticate, services.sessions, secret)
    services.known_keys[digest] = principal.key_id
    while len(services.known_keys) > KNOWN_KEYS:
        services.known_keys.popitem(last=False)
    return principal


PrincipalDep = Annotated[Principal, Depends(_principal)]


def _pack(pack_id: PackId, services: ServicesDep, principal: PrincipalDep) -> Pack:
    return drafts.visible(sessions=services.sessions, principal=principal, pack_id=pack_id)


PackDep = Annotated[Pack, Depends(_pack)]


def single_query_values(request: Request) -> None:
    """A route's query parameters are the ones it declares, each given once: an unknown one (a
    typo such as ``?stauts=``) or a repeated one is refused rather than silently ignored or read
    as one of its values."""
    route = request.scope.get("route")
    declared = _query_names(route.dependant) if isinstance(route, APIRoute) else None
    given = request.query_params
    unknown = sorted(k for k in given if declared is not None and k not in declared)
    if unknown:
        takes = ", ".join(sorted(declared or ())) or "none"
        raise InvalidRequest(
            f"unknown query parameter(s) {', '.join(unknown)}: this route takes {takes}"
        )
    repeated = sorted({k for k in given if len(given.getlist(k)) > 1})
    if repeated:
        raise InvalidRequest(
            f"the query parameter(s) {', '.join(repeated)} were given more than once: give each once"
        )


def json_body(request: Request) -> None:
    """A JSON route reads UTF-8 JSON only: a body sent as another type (a form, plain text, a
    charset other than UTF-8) is refused with 415 rather than read as JSON anyway. A request that
    names no type is read as JSON."""
    given = request.headers.get("content-type")
    if given is None:
        return
    media, _, parameters = given.partition(";")
    media = media.strip().lower()
    charset = next(
        (
            value.strip().strip('"').lower()
            for name, _, value in (p.partition("=") for p in parameters.split(";"))
            if name.strip().lower() == "charset"
        ),
        "utf-8",
    )
    if (media != "application/json" and not media.endswith("+json")) or charset not in {
        "utf-8",
        "utf8",
    }:
        raise UnsupportedMediaType(
            f"this route reads JSON: send the body as 'Content-Type: application/json' (UTF-8), "
            f"not '{given[:100]}'"
        )


JsonBody = Depends(json_body)


def _query_names(dependant: Dependant) -> set[str]:
    """The query parameters a route takes: its own and its dependencies'."""
    names = {param.alias for param in dependant.query_params}
    for inner in dependant.dependencies:
        names |= _query_names(inner)
    return names
