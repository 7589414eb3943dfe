"""Every operation of the API fuzzed against its own OpenAPI document with schemathesis.

Requests reach the real app over ASGI (schemathesis runs its lifespan: real workers, a real SQLite
file). Each operation gets schema-valid requests and schema-violating ones, and every answer is
held to schemathesis' default checks: no server error, a documented status, content type and
headers, a body matching the documented schema, auth not ignored, valid data not refused and
invalid data not accepted.

Two things of the definition routes are told to schemathesis rather than left for it to guess:

- A schema-valid definition may still be refused with 422: the rules between its parts (a chart
  names a dataset that exists, a column of the right type and unit, …) and the data's values are
  beyond what a JSON Schema says. ``test_definition_fuzz`` holds valid definitions to acceptance.
- ``POST /v1/reports`` is fuzzed with ``wait=true``: with ``wait=false`` every body is accepted
  with a 202 and judged by the job (``test_definition_fuzz`` follows those jobs to their end).
"""

from __future__ import annotations

from collections import Counter
from typing import Any

import pytest
import schemathesis
from factories import make_definition
from fastapi import FastAPI
from fuzz_kit import REQUEST_TIMEOUT_S, fuzz_settings, report
from hypothesis import given
from hypothesis import strategies as st
from schemathesis import GenerationMode

schemathesis.serializer.alias("application/pdf", "application/octet-stream")

CONFIG: dict[str, Any] = {
    "request-timeout": REQUEST_TIMEOUT_S,
    "operations": [
        {
            "include-path": ["/v1/check", "/v1/reports"],
            "include-method": "POST",
            "checks": {
                "positive_data_acceptance": {
                    "expected-statuses": ["2xx", "401", "403", "404", "409", "422", "429"]
                }
            },
        }
    ],
}

EXAMPLES = {"POST /v1/reports": 6, "POST /v1/verify": 6, "POST /v1/check": 15}
"""Examples per operation and mode; the rest get ``DEFAULT_EXAMPLES``. A definition that passes
validation is drawn (seconds each), so the rendering routes get fewer."""
DEFAULT_EXAMPLES = 25

IDEMPOTENCY = "Idempotency-Key"
_FALSE = (False, "false", "False", "0", 0, "off", "no", "f", "n")
"""Spellings of false a boolean query parameter takes (pydantic's)."""


def _has_inputs(operation: schemathesis.APIOperation) -> bool:
    """An operation with no parameters and no body has nothing to make invalid."""
    return bool(list(operation.iter_parameters())) or bool(operation.body)


def _stored_pack(schema: schemathesis.BaseSchema, auth: dict[str, str]) -> str:
    """A real draft to aim at, posted through the same checks (so pack routes can answer 200)."""
    operation = schema["/v1/reports"]["POST"]
    case = operation.Case(body=make_definition(), query={"wait": True})
    response = case.call_and_validate(headers=auth, timeout=REQUEST_TIMEOUT_S)
    assert response.status_code == 201, response.text
    pack_id = response.json()["id"]
    assert isinstance(pack_id, str)
    return pack_id


def _fuzz(
    operation: schemathesis.APIOperation,
    *,
    mode: GenerationMode,
    auth: dict[str, str],
    pack_id: str,
    cases: Counter[str],
    statuses: Counter[int],
) -> str | None:
    """Fuzz one operation in one mode; the failure found (shrunk by Hypothesis), or None."""
    label = f"{operation.label} [{mode.value}]"
    aims_at_pack = mode is GenerationMode.POSITIVE and "{pack_id}" in operation.path

    @given(
        case=operation.as_strategy(generation_mode=mode),
        real=st.booleans() if aims_at_pack else st.just(False),
    )
    @fuzz_settings(EXAMPLES.get(operation.label, DEFAULT_EXAMPLES))
    def fuzz(case: schemathesis.Case, real: bool) -> None:
        if real:  # half the time, the pack that exists
            case.path_parameters["pack_id"] = pack_id
        cases[label] += 1
        if operation.label == "POST /v1/reports" and case.query.get("wait") in _FALSE:
            case.query["wait"] = True  # see the module's docstring
        key = case.headers.get(IDEMPOTENCY) if mode is GenerationMode.POSITIVE else None
        if key is not None:  # a reused key is refused (422), as it should be: keep each unique
            case.headers[IDEMPOTENCY] = f"{key[:200]}-{sum(cases.values())}"
        response = case.call_and_validate(headers=auth, timeout=REQUEST_TIMEOUT_S)
        statuses[response.status_code] += 1

    try:
        fuzz()
    except (Exception, BaseExceptionGroup) as exc:  # noqa: BLE001  (one report names them all)
        return f"{label}: {exc}"
    return None


def test_every_operation_conforms_to_its_openapi_document(
    fuzz_app: FastAPI, fuzz_keys: dict[str, str], request: pytest.FixtureRequest
) -> None:
    schema = schemathesis.openapi.from_asgi(
        "/openapi.json", fuzz_app, config=schemathesis.Config.from_dict(CONFIG)
    )
    auth = {"Authorization": f"Bearer {fuzz_keys['everything']}"}
    pack_id = _stored_pack(schema, auth)
    cases: Counter[str] = Counter()
    statuses: Counter[int] = Counter()
    failures: list[str] = []

    for result in schema.get_all_operations():
        operation = result.ok()
        for mode in (GenerationMode.POSITIVE, GenerationMode.NEGATIVE):
            if mode is GenerationMode.NEGATIVE and not _has_inputs(operation):
                continue
            failure = _fuzz(
                operation, mode=mode, auth=auth, pack_id=pack_id, cases=cases, statuses=statuses
            )
            if failure is not None:
                failures.append(failure)

    total = sum(cases.values())
    report(
        request.config,
        f"schemathesis: {total} cases over {len(cases)} operation modes; "
        f"statuses {dict(sorted(statuses.items()))}",
    )
    assert not failures, "\n\n".join(failures)
    assert statuses[201] + statuses[200] > 0, "no request was accepted: the fuzz proves little"
    assert total >= len(cases) * 2
