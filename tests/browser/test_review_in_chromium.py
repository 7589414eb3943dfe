"""The review workflow in headless Chromium against a real server: an author submits a draft through
the JSON API; a reviewer signs in, finds it in the queue and waives its failed check (the reason
typed and the form sent with the keyboard alone); an approver signs it off; the sealed PDF downloads
and verifies; the author's key cannot sign off; a form with a wrong CSRF token is refused."""

from __future__ import annotations

import json
from concurrent.futures import ThreadPoolExecutor
from pathlib import Path
from typing import Any

import httpx
import pytest
from factories import make_compare_definition, make_report, make_waiver

from service.archive import db
from service.config import Limits
from service.seal import keys as seal_keys
from service.seal.verify import verify
from service.workflow import keys, sealing
from service.workflow.keys import Role

CAUTION = (
    "These checks support, but do not replace, the report owner's judgement, the reporting "
    "standards that apply, and professional review."
)
REASON = "The board tracks the spread above 45 % on this chart; agreed with the report owner."
# Every form control a person can use, with no label of any kind (hidden inputs excepted).
UNLABELLED = """() => [...document.querySelectorAll('input, select, textarea')]
  .filter(e => e.type !== 'hidden')
  .filter(e => !(e.labels && e.labels.length) && !e.getAttribute('aria-label')
               && !e.getAttribute('aria-labelledby'))
  .map(e => e.outerHTML)"""


def _definition() -> dict[str, Any]:
    """Bars asked to start at 45 % with a standing waiver of the zero baseline: the lie factor
    (Tufte's 50/55-from-45 case, 10.0) fails, and it is a waivable rule."""
    definition = make_compare_definition(
        {"Route 7": 50, "Route 12": 55},
        baseline=45,
        waivers=[make_waiver("bar-zero-baseline", "on-time")],
    )
    definition["report"] = make_report(id="hollin-vale-punctuality", title="Punctuality by route")
    return definition


@pytest.fixture(scope="module")
def people(server: dict[str, Any]) -> dict[str, str]:
    sessions = db.connect(f"sqlite:///{server['data_dir'] / 'plumbline.db'}")
    made = {}
    for who, roles in {
        "Ada Author": {Role.author},
        "Rui Reviewer": {Role.reviewer},
        "Ana Approver": {Role.approver},
    }.items():
        _, secret = keys.create(
            sessions, name=who, roles=roles, families={"hollin-vale"}, expires=None
        )
        made[who] = secret
    db.engine_of(sessions).dispose()
    return made


def _sign_in(context: Any, base: str, secret: str) -> Any:
    page = context.new_page()
    errors: list[str] = []
    page.on("console", lambda m: errors.append(m.text) if m.type == "error" else None)
    page.errors = errors
    page.goto(f"{base}/review")
    assert page.url.startswith(f"{base}/review/sign-in?next=/review")
    page.get_by_label("API key").fill(secret)
    page.get_by_role("button", name="Sign in").click()
    page.wait_for_url(f"{base}/review?done=signed_in")
    return page


def test_review_waive_and_sign_off_in_the_browser(
    browser: Any, server: dict[str, Any], people: dict[str, str], tmp_path: Path
) -> None:
    base = server["base"]
    author = {"Authorization": f"Bearer {people['Ada Author']}"}
    with httpx.Client(base_url=base, headers=author, timeout=120) as api:
        made = api.post("/v1/reports", json=_definition())
        assert made.status_code == 201, made.text
        pack = made.json()
        assert "lie-factor on on-time" in pack["failed"]
        assert api.post(f"/v1/reports/{pack['id']}/submit").status_code == 200
    pack_url = f"{base}/review/packs/{pack['id']}"
    digest = pack["pdf"]["sha256"]

    # The reviewer: sign in, find the pack in the queue, open it.
    reviewer_context = browser.new_context()
    page = _sign_in(reviewer_context, base, people["Rui Reviewer"])
    assert page.get_by_role("status").inner_text() == "You are signed in."
    awaiting = page.locator("table", has=page.get_by_text("Packs in review that your key may see"))
    awaiting.get_by_role("link", name="Punctuality by route").click()
    page.wait_for_url(pack_url)
    assert page.evaluate(UNLABELLED) == []
    assert CAUTION in page.locator("footer").inner_text()
    first_row = page.locator("#check-table tbody tr").first
    assert first_row.get_attribute("data-check") == "lie-factor"
    assert "✗ Failed" in first_row.inner_text()

    # A form whose CSRF token was tampered with is refused with a plain 403 page.
    page.evaluate(
        """() => { document.querySelector('#waive-form input[name=csrf]').value = 'x'; }"""
    )
    page.locator("#waive-reason").fill(REASON)
    with page.expect_response(lambda r: r.url.endswith("/waive")) as refused:
        page.get_by_role("button", name="Waive the check").click()
    assert refused.value.status == 403
    assert page.get_by_role("heading", level=1).inner_text() == "Form expired"
    assert page.errors == [
        "Failed to load resource: the server responded with a status of 403 (Forbidden)"
    ]
    page.errors.clear()
    page.goto(pack_url)

    # Waive the failed lie factor using the keyboard alone: Tab to the reason, type, Tab, Enter.
    assert page.locator("#waive-item").input_value() == "lie-factor/on-time"
    page.locator("body").focus()
    for _ in range(80):
        page.keyboard.press("Tab")
        if page.evaluate("document.activeElement.id") == "waive-reason":
            break
    else:
        pytest.fail("the reason field cannot be reached with the Tab key")
    outline = page.evaluate("getComputedStyle(document.activeElement).outlineStyle")
    assert outline == "solid"  # the focus is visible
    page.keyboard.type(REASON)
    page.keyboard.press("Tab")
    assert page.evaluate("document.activeElement.textContent") == "Waive the check"
    with page.expect_navigation():
        page.keyboard.press("Enter")
    assert page.get_by_role("status").inner_text() == "The check was waived for this draft."

    # Confirm the standing waiver that came with the definition.
    page.locator("#waive-item").select_option("bar-zero-baseline/on-time")
    page.locator("#waive-reason").fill(REASON)
    page.get_by_role("button", name="Waive the check").click()
    page.wait_for_url(f"{pack_url}?done=confirmed#message")
    assert page.locator("#waive-form").count() == 0  # nothing left to waive
    page.get_by_role("button", name="Sign out").click()
    page.wait_for_url(f"{base}/review/sign-in?done=signed_out")
    page.goto(pack_url)
    assert page.url.startswith(f"{base}/review/sign-in")  # signed out means signed out
    assert page.errors == []
    reviewer_context.close()

    # The author: no sign-off form, and a forged sign-off is refused.
    author_context = browser.new_context()
    page = _sign_in(author_context, base, people["Ada Author"])
    page.goto(pack_url)
    assert page.locator("#sign-off-form").count() == 0
    token = page.locator("input[name=csrf]").first.input_value()
    forged = author_context.request.post(
        f"{pack_url}/sign-off",
        form={"csrf": token, "content_sha256": digest},
        headers={"Origin": base},
    )
    assert forged.status == 403
    assert "does not have the approver role" in forged.text()
    author_context.close()

    # The approver: the reviewed hash is shown; sign off; the sealed PDF downloads.
    approver_context = browser.new_context(accept_downloads=True)
    page = _sign_in(approver_context, base, people["Ana Approver"])
    page.goto(pack_url)
    assert page.evaluate(UNLABELLED) == []
    form = page.locator("#sign-off-form")
    assert digest in form.inner_text()
    assert form.locator("input[name=content_sha256]").input_value() == digest
    form.get_by_role("button", name="Sign off and seal").click()
    page.wait_for_url(f"{pack_url}?done=signed_off#message", timeout=120_000)
    assert page.locator("#pack-status").inner_text() == "Signed off"
    with page.expect_download() as download:
        page.locator("#sealed-link").click()
    sealed = tmp_path / "sealed.pdf"
    download.value.save_as(sealed)
    assert page.errors == []
    approver_context.close()

    signed = sealed.read_bytes()
    certificate = seal_keys.development_certificate(server["data_dir"] / "keys")
    assert certificate is not None
    # Playwright's sync API keeps an event loop running in this thread, and verification runs
    # pyHanko's validation with asyncio.run: verify in a thread of its own.
    with ThreadPoolExecutor(1) as pool:
        report = pool.submit(
            verify, signed, trust_roots=[certificate], rerender=sealing.rerender(Limits())
        ).result()
    assert report.ok, json.dumps(report.as_dict(), indent=2)
    assert all(step.ok for step in report.steps)
    assert {"signature intact", "signer trusted", "file SHA-256"} <= {s.name for s in report.steps}
