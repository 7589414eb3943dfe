"""The review workflow over HTTP against a running server: keys, object-level authorisation,
waivers, four-eyes sign-off, the sealed pack and its verification, idempotent retries, races."""

from __future__ import annotations

import concurrent.futures
import hashlib
import json
import uuid
from pathlib import Path
from typing import Any

import httpx
from factories import Clients

DEMO = Path(__file__).parents[2] / "sample_requests" / "bus-cooperative-monthly.json"
REASON = "The board asked to see the spread above the 85 % floor this month."
STANDING = {
    "check": "bar-zero-baseline",
    "chart": "on-time-by-route",
    "by": "Scheduling desk",
    "reason": "The board asked to see the spread above the 85 % floor this month.",
}


def definition(*, period: str | None = None, waived: bool = True) -> dict[str, Any]:
    """The demo pack with a standing waiver of the zero baseline on one bar chart: its bars then
    start at 85 %, so the lie factor fails there (a failure a reviewer may waive)."""
    out = json.loads(DEMO.read_text())
    out["report"]["id"] = "hollin-vale-ops-monthly"
    if waived:
        out["waivers"] = [STANDING]
    if period is not None:
        out["report"]["period"]["label"] = period
    return out


def unique_period() -> str:
    return f"Review test {uuid.uuid4().hex[:8]}"


def created(http: httpx.Client, body: dict[str, Any]) -> dict[str, Any]:
    response = http.post("/v1/reports", json=body)
    assert response.status_code == 201, response.text
    return dict(response.json())


def in_review(people: Clients, **kwargs: Any) -> dict[str, Any]:
    pack = created(people("author"), definition(period=unique_period(), **kwargs))
    submitted = people("author").post(f"/v1/reports/{pack['id']}/submit")
    assert submitted.status_code == 200, submitted.text
    return dict(submitted.json())


def waive_all(people: Clients, pack: dict[str, Any]) -> None:
    reviewer = people("reviewer")
    for check, chart in (
        ("lie-factor", "on-time-by-route"),
        ("bar-zero-baseline", "on-time-by-route"),
    ):
        r = reviewer.post(
            f"/v1/reports/{pack['id']}/waivers",
            json={"check": check, "chart": chart, "reason": REASON},
        )
        assert r.status_code == 200, r.text


def sign_off(http: httpx.Client, pack: dict[str, Any]) -> httpx.Response:
    return http.post(
        f"/v1/reports/{pack['id']}/sign-off", json={"content_sha256": pack["pdf"]["sha256"]}
    )


def test_every_pack_route_needs_a_key(anonymous: httpx.Client) -> None:
    missing = anonymous.get("/v1/reports")
    assert missing.status_code == 401
    assert missing.headers["WWW-Authenticate"].startswith("Bearer")
    assert "Authorization: Bearer" in missing.json()["detail"]
    wrong = anonymous.get("/v1/reports", headers={"Authorization": "Bearer key_0000.nonsense"})
    assert wrong.status_code == 401
    assert wrong.json()["detail"] == "the API key is not valid"
    assert anonymous.post("/v1/reports", json=definition()).status_code == 401
    assert anonymous.get("/v1/health").status_code == 200  # the catalogue stays public
    assert anonymous.get("/v1/checks").status_code == 200


def test_roles_and_families_are_enforced(people: Clients) -> None:
    refused = people("reviewer").post("/v1/reports", json=definition())
    assert refused.status_code == 403
    assert "author role" in refused.json()["detail"]
    outside = definition()
    outside["report"]["id"] = "marsh-end-monthly"
    other_family = people("author2").post("/v1/reports", json=outside)
    assert other_family.status_code == 403
    assert "family" in other_family.json()["detail"]

    pack = created(people("author"), definition(period=unique_period()))
    # another family's pack is "not found", exactly like a pack that does not exist
    hidden = people("stranger").get(f"/v1/reports/{pack['id']}")
    missing = people("stranger").get("/v1/reports/pk_" + "0" * 32)
    assert hidden.status_code == missing.status_code == 404
    assert hidden.json()["detail"] == f"there is no pack '{pack['id']}'"
    for path in ("pdf", "checks", "audit", "sealed"):
        assert people("stranger").get(f"/v1/reports/{pack['id']}/{path}").status_code == 404
    assert people("stranger").post(f"/v1/reports/{pack['id']}/submit").status_code == 404
    listed = people("stranger").get("/v1/reports").json()
    assert pack["id"] not in {p["id"] for p in listed["packs"]}
    assert pack["id"] in {p["id"] for p in people("auditor").get("/v1/reports").json()["packs"]}
    # an auditor reads but changes nothing
    assert people("auditor").post(f"/v1/reports/{pack['id']}/submit").status_code == 403


def test_review_sign_off_seal_and_verify(people: Clients) -> None:
    pack = in_review(people)
    pid = pack["id"]
    assert pack["status"] == "in_review"
    assert pack["failed"] == ["lie-factor on on-time-by-route"]
    assert pack["review"]["authors"] == ["Ann Author"]

    approver = people("approver")
    open_failure = sign_off(approver, pack)
    assert open_failure.status_code == 409
    assert "failed checks are not waived: lie-factor on on-time-by-route" in open_failure.text

    reviewer = people("reviewer")
    short = reviewer.post(
        f"/v1/reports/{pid}/waivers",
        json={"check": "lie-factor", "chart": "on-time-by-route", "reason": "fine"},
    )
    assert short.status_code == 422
    integrity = reviewer.post(
        f"/v1/reports/{pid}/waivers",
        json={"check": "missing-periods", "chart": "riders-by-month", "reason": REASON},
    )
    assert integrity.status_code == 409
    reviewer.post(
        f"/v1/reports/{pid}/waivers",
        json={"check": "lie-factor", "chart": "on-time-by-route", "reason": REASON},
    ).raise_for_status()
    unconfirmed = sign_off(approver, pack)
    assert unconfirmed.status_code == 409
    assert "standing waivers need a reviewer's confirmation" in unconfirmed.text
    reviewer.post(
        f"/v1/reports/{pid}/waivers",
        json={"check": "bar-zero-baseline", "chart": "on-time-by-route", "reason": REASON},
    ).raise_for_status()

    wrong_hash = approver.post(f"/v1/reports/{pid}/sign-off", json={"content_sha256": "0" * 64})
    assert wrong_hash.status_code == 409
    assert "changed since it was reviewed" in wrong_hash.text

    signed = sign_off(approver, pack)
    assert signed.status_code == 200, signed.text
    body = signed.json()
    assert body["status"] == "signed_off"
    assert body["review"]["signed_off_by"] == "Pat Approver"
    assert body["sealed"]["development_key"] is True
    assert body["sealed"]["pdfa"]["validator"].endswith("not a certification)")

    sealed = approver.get(f"/v1/reports/{pid}/sealed")
    assert sealed.status_code == 200
    assert hashlib.sha256(sealed.content).hexdigest() == body["sealed"]["sha256"]
    assert sealed.headers["ETag"] == f'"{body["sealed"]["sha256"]}"'

    auditor = people("auditor")
    headers = {"content-type": "application/pdf"}
    report = auditor.post("/v1/verify", content=sealed.content, headers=headers).json()
    assert report["ok"] is True, report
    steps = {s["name"]: s for s in report["steps"]}
    assert steps["archived"]["ok"]
    assert pid in steps["archived"]["detail"]
    assert steps["re-render matches"]["ok"]
    # a key not granted the report's family learns only that a sealed pack matches
    outsider = people("stranger").post("/v1/verify", content=sealed.content, headers=headers)
    archived = {s["name"]: s for s in outsider.json()["steps"]}["archived"]
    assert archived["ok"]
    assert archived["detail"] == "a sealed pack in the archive matches this file's SHA-256"
    datasets = {f"data/{d['name']}.csv" for d in definition()["datasets"]}
    assert set(report["attachments"]) == {"definition.json", "review.json"} | datasets

    tampered = bytearray(sealed.content)
    tampered[len(tampered) // 2] ^= 0x01
    failed = auditor.post("/v1/verify", content=bytes(tampered), headers=headers).json()
    assert failed["ok"] is False
    failed_steps = {s["name"] for s in failed["steps"] if not s["ok"]}
    assert "archived" in failed_steps

    trail = auditor.get(f"/v1/reports/{pid}/audit").json()["entries"]
    actions = [e["action"] for e in trail]
    assert actions == [
        "pack.created",
        "pack.submitted",
        "check.waived",
        "check.waived",
        "pack.signed_off",
    ]
    assert trail[-1]["name"] == "Pat Approver"
    assert trail[-1]["detail"]["sealed_sha256"] == body["sealed"]["sha256"]

    found = auditor.get("/v1/reports", params={"signer": "pat appr", "status": "signed_off"}).json()
    assert pid in {p["id"] for p in found["packs"]}
    by_period = auditor.get("/v1/reports", params={"period": pack["report"]["period"]}).json()
    assert [p["id"] for p in by_period["packs"]] == [pid]

    again = approver.post(f"/v1/reports/{pid}/request-changes", json={"reason": "too late"})
    assert again.status_code == 409
    assert again.json()["detail"] == "a signed-off pack cannot be sent back to draft"


def test_an_author_cannot_sign_off_their_own_pack(people: Clients) -> None:
    everything = people("everything")
    pack = created(everything, definition(period=unique_period(), waived=False))
    everything.post(f"/v1/reports/{pack['id']}/submit").raise_for_status()
    refused = sign_off(everything, pack)
    assert refused.status_code == 403
    assert "separation of duties" in refused.json()["detail"]


def test_two_concurrent_sign_offs_exactly_one_wins(people: Clients) -> None:
    pack = in_review(people, waived=False)
    pair = [people("approver"), people("approver2")]
    with concurrent.futures.ThreadPoolExecutor(2) as pool:
        answers = list(pool.map(lambda http: sign_off(http, pack), pair))
    assert sorted(a.status_code for a in answers) == [200, 409]
    final = people("auditor").get(f"/v1/reports/{pack['id']}").json()
    winner = next(a for a in answers if a.status_code == 200).json()
    assert final["review"]["signed_off_by"] == winner["review"]["signed_off_by"]
    trail = people("auditor").get(f"/v1/reports/{pack['id']}/audit").json()["entries"]
    assert [e["action"] for e in trail].count("pack.signed_off") == 1


def test_a_later_sign_off_supersedes_the_earlier_pack(people: Clients) -> None:
    period = unique_period()
    packs = []
    for _ in range(2):
        pack = created(people("author"), definition(period=period, waived=False))
        people("author").post(f"/v1/reports/{pack['id']}/submit").raise_for_status()
        packs.append(pack)
    for pack in packs:
        sign_off(people("approver"), pack).raise_for_status()
    first = people("auditor").get(f"/v1/reports/{packs[0]['id']}").json()
    assert first["status"] == "superseded"
    assert first["review"]["superseded_by"] == packs[1]["id"]


def test_a_retried_post_with_the_same_idempotency_key_returns_the_first_result(
    people: Clients,
) -> None:
    author = people("author")
    body = json.dumps(definition(period=unique_period(), waived=False)).encode()
    headers = {"content-type": "application/json", "Idempotency-Key": uuid.uuid4().hex}
    first = author.post("/v1/reports", content=body, headers=headers)
    retry = author.post("/v1/reports", content=body, headers=headers)
    assert first.status_code == retry.status_code == 201
    assert retry.json()["id"] == first.json()["id"]
    assert retry.headers["Location"] == first.headers["Location"]
    assert retry.headers["Idempotent-Replayed"] == "true"
    assert "Idempotent-Replayed" not in first.headers
    period = json.loads(body)["report"]["period"]["label"]
    stored = people("auditor").get("/v1/reports", params={"period": period}).json()
    assert stored["total"] == 1  # one draft, not two

    changed = author.post(
        "/v1/reports", content=body.replace(b"Review test", b"Other"), headers=headers
    )
    assert changed.status_code == 422
    assert "different request" in changed.json()["detail"]
    # the key belongs to its sender: another key's request with it is a new request
    other = people("everything").post("/v1/reports", content=body, headers=headers)
    assert other.status_code == 201
    assert other.json()["id"] != first.json()["id"]


def test_a_refused_action_is_not_replayed(people: Clients) -> None:
    pack = created(people("author"), definition(period=unique_period(), waived=False))
    headers = {"Idempotency-Key": uuid.uuid4().hex}
    early = sign_off_with(people("approver"), pack, headers)
    assert early.status_code == 409  # still a draft
    people("author").post(f"/v1/reports/{pack['id']}/submit").raise_for_status()
    later = sign_off_with(people("approver"), pack, headers)
    assert later.status_code == 200, later.text


def sign_off_with(
    http: httpx.Client, pack: dict[str, Any], headers: dict[str, str]
) -> httpx.Response:
    return http.post(
        f"/v1/reports/{pack['id']}/sign-off",
        json={"content_sha256": pack["pdf"]["sha256"]},
        headers=headers,
    )


def test_malformed_action_bodies_are_422_with_the_field(people: Clients) -> None:
    pack = in_review(people, waived=False)
    bad = people("approver").post(f"/v1/reports/{pack['id']}/sign-off", json={"sha": "x"})
    assert bad.status_code == 422
    assert {e["path"] for e in bad.json()["errors"]} == {"body.content_sha256", "body.sha"}
