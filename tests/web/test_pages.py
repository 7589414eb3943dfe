"""The review pages over a real socket: sign-in, sessions, CSRF, the queue, the pack page and its
forms, refusals, downloads and escaping. Sealing runs for real in a worker process."""

from __future__ import annotations

import hashlib
import re
from pathlib import Path

import httpx
import pytest
from review_site import REPORT, Person, Site, controls, csrf_of, serving, unlabelled

from service.archive.db import PackRow, waived_checks
from service.config import Settings
from service.web import pages
from service.workflow import drafts, keys, lifecycle
from service.workflow.keys import Role


def _signed_in(site: Site, who: str) -> Person:
    person = site.person(who)
    answer = person.sign_in()
    assert answer.status_code == 303, answer.text
    return person


def _status(site: Site, pack_id: str) -> str:
    return drafts.get(sessions=site.services.sessions, pack_id=pack_id).status


def _message(page: str) -> str:
    found = re.search(r'id="message">(.*?)</p>', page, re.S)
    assert found is not None, "the page shows no message"
    return re.sub(r"<[^>]+>", "", found.group(1)).strip()


def test_pages_need_sign_in_and_come_back_after_it(site: Site) -> None:
    pack = site.draft(submit=False)
    person = site.person("reviewer")
    answer = person.http.get("/review")
    assert answer.status_code == 303
    assert answer.headers["location"] == "/review/sign-in?next=/review"
    answer = person.http.get(f"/review/packs/{pack['id']}")
    assert answer.headers["location"] == f"/review/sign-in?next=/review/packs/{pack['id']}"
    form = person.http.get(answer.headers["location"])
    assert f'name="next" value="/review/packs/{pack["id"]}"' in form.text
    signed = person.http.post(
        "/review/sign-in",
        data={
            "csrf": csrf_of(form.text),
            "key": person.secret,
            "next": f"/review/packs/{pack['id']}",
        },
    )
    assert signed.headers["location"] == f"/review/packs/{pack['id']}?done=signed_in"


def test_next_never_leaves_the_review_pages(site: Site) -> None:
    person = site.person("reviewer")
    for target in (
        "https://elsewhere.example/",
        "//elsewhere.example",
        "/v1/reports",
        "/review/../v1",
    ):
        form = person.http.get("/review/sign-in")
        answer = person.http.post(
            "/review/sign-in",
            data={"csrf": csrf_of(form.text), "key": person.secret, "next": target},
        )
        assert answer.headers["location"] == "/review?done=signed_in", target


def test_sign_in_sets_a_signed_http_only_cookie_for_the_review_path(site: Site) -> None:
    person = site.person("reviewer")
    answer = person.sign_in()
    cookie = answer.headers["set-cookie"]
    assert cookie.startswith("plumbline_review=")
    assert "HttpOnly" in cookie
    assert "Path=/review" in cookie
    assert "samesite=lax" in cookie.lower()
    assert "Secure" not in cookie  # secure_cookies is off in this site
    assert person.secret not in cookie
    assert person.secret.partition(".")[2] not in cookie
    queue = person.http.get(answer.headers["location"])
    assert queue.status_code == 200
    assert "Signed in as <strong>Rui Reviewer</strong> (reviewer)" in queue.text
    assert _message(queue.text) == pages.FLASH["signed_in"]


def test_the_cookie_is_secure_when_configured(tmp_path: Path) -> None:
    settings = Settings(data_dir=tmp_path, workers=1, secure_cookies=True)
    with serving(settings) as (_, base), httpx.Client(base_url=base) as http:
        answer = http.get("/review/sign-in")
    assert "Secure" in answer.headers["set-cookie"]


def test_a_failed_sign_in_says_the_same_whatever_the_cause(site: Site) -> None:
    sessions = site.services.sessions
    revoked_id, revoked = keys.create(
        sessions, name="Rev Oked", roles={Role.reviewer}, families={"hollin-vale"}, expires=None
    )
    keys.revoke(sessions, key_id=revoked_id)
    real_id = site.key_ids["reviewer"]
    tries = {
        "unknown key": "key_0000000000000000.abcdefghijklmnopqrstuvwxyz0123456789ABCDEFG",
        "wrong secret": f"{real_id}.abcdefghijklmnopqrstuvwxyz0123456789ABCDEFG",
        "revoked key": revoked,
        "not a key": "<script>alert(1)</script>",
        "too long": "k" * 500,
    }
    person = site.person("reviewer")
    errors = set()
    for cause, secret in tries.items():
        form = person.http.get("/review/sign-in")
        answer = person.http.post(
            "/review/sign-in", data={"csrf": csrf_of(form.text), "key": secret}
        )
        assert answer.status_code == 401, cause
        assert secret not in answer.text, cause
        assert "set-cookie" not in answer.headers or "key_" not in answer.headers["set-cookie"]
        found = re.search(r'id="sign-in-error">(.*?)</p>', answer.text)
        assert found is not None, cause
        errors.add(found.group(1))
        assert person.http.get("/review").status_code == 303, cause  # still signed out
    assert len(errors) == 1


def test_sign_out_ends_the_session(site: Site) -> None:
    person = _signed_in(site, "reviewer")
    queue = person.http.get("/review")
    out = person.http.post("/review/sign-out", data={"csrf": csrf_of(queue.text)})
    assert out.status_code == 303
    assert out.headers["location"] == "/review/sign-in?done=signed_out"
    assert 'plumbline_review=""' in out.headers["set-cookie"]
    assert "Max-Age=0" in out.headers["set-cookie"]
    assert person.http.get("/review").status_code == 303


def test_revoking_the_key_ends_its_session(site: Site) -> None:
    sessions = site.services.sessions
    key_id, secret = keys.create(
        sessions, name="Tem Porary", roles={Role.reviewer}, families={"hollin-vale"}, expires=None
    )
    person = Person(site.base, secret, "Tem Porary")
    site.opened.append(person)
    assert person.sign_in().status_code == 303
    assert person.http.get("/review").status_code == 200
    keys.revoke(sessions, key_id=key_id)
    answer = person.http.get("/review")
    assert answer.status_code == 303
    assert answer.headers["location"] == "/review/sign-in?next=/review&ended=1"
    page = person.http.get(answer.headers["location"])
    assert "Your session ended" in page.text


def _replay(site: Site, cookie: str) -> Person:
    """Another browser that sends a cookie captured from a signed-in one."""
    thief = Person(site.base, "", "thief")
    site.opened.append(thief)
    thief.http.cookies.set("plumbline_review", cookie, path="/review")
    return thief


def _waive_with(person: Person, pack_id: str, page: str) -> httpx.Response:
    return person.post(
        f"/review/packs/{pack_id}/waive",
        page,
        item="lie-factor/on-time",
        reason="A reason that is long enough to pass the rule.",
    )


@pytest.mark.parametrize("how", ["sign-out", "revocation"])
def test_a_cookie_captured_before_the_session_ended_is_refused(site: Site, how: str) -> None:
    """Sessions live on the server: replaying the cookie after sign-out or after the key's
    revocation reads no page and waives nothing."""
    sessions = site.services.sessions
    pack = site.draft()
    name = f"Rae Replay ({how})"  # one person per case: a second "Rae Replay" would be refused
    key_id, secret = keys.create(
        sessions, name=name, roles={Role.reviewer}, families={"hollin-vale"}, expires=None
    )
    person = Person(site.base, secret, name)
    site.opened.append(person)
    assert person.sign_in().status_code == 303
    page = person.http.get(f"/review/packs/{pack['id']}").text
    captured = person.http.cookies["plumbline_review"]
    if how == "sign-out":
        out = person.http.post("/review/sign-out", data={"csrf": csrf_of(page)})
        assert out.status_code == 303
    else:
        keys.revoke(sessions, key_id=key_id)
    thief = _replay(site, captured)
    assert thief.http.get("/review").status_code == 303
    assert thief.http.get(f"/review/packs/{pack['id']}").status_code == 303
    answer = _waive_with(thief, pack["id"], page)
    assert answer.status_code in {303, 403}
    assert answer.headers.get("location", "/review/sign-in").startswith("/review/sign-in")
    with sessions() as session:
        row = session.get(PackRow, pack["id"])
        assert row is not None
        assert waived_checks(session, row) == set()
    assert _status(site, pack["id"]) == "in_review"


def test_a_post_without_the_right_token_or_from_another_site_is_refused(site: Site) -> None:
    pack = site.draft()
    reviewer = _signed_in(site, "reviewer")
    author = _signed_in(site, "author")
    path = f"/review/packs/{pack['id']}/waive"
    page = reviewer.http.get(f"/review/packs/{pack['id']}").text
    fields = {"item": "lie-factor/on-time", "reason": "A reason that is long enough to pass."}
    refusals = {
        "no token": reviewer.http.post(path, data=fields),
        "wrong token": reviewer.http.post(path, data={"csrf": "x" * 43, **fields}),
        "another session's token": reviewer.post(
            path, author.http.get(f"/review/packs/{pack['id']}").text, **fields
        ),
        "another site (Origin)": reviewer.http.post(
            path,
            data={"csrf": csrf_of(page), **fields},
            headers={"Origin": "http://elsewhere.example"},
        ),
        "another site (Referer)": reviewer.http.post(
            path,
            data={"csrf": csrf_of(page), **fields},
            headers={"Referer": "http://elsewhere.example/form"},
        ),
        "an opaque origin": reviewer.http.post(
            path, data={"csrf": csrf_of(page), **fields}, headers={"Origin": "null"}
        ),
    }
    for cause, answer in refusals.items():
        assert answer.status_code == 403, cause
        assert answer.headers["content-type"].startswith("text/html"), cause
        assert "Form" in _message(answer.text) or "form" in _message(answer.text), cause
    anonymous = site.person("reviewer")
    assert anonymous.http.post("/review/sign-in", data={"key": anonymous.secret}).status_code == 403
    with site.services.sessions() as session:
        row = session.get(PackRow, pack["id"])
        assert row is not None
        assert not waived_checks(session, row)  # nothing was waived
    # The same form from this site, with the token, passes the guard.
    same_origin = reviewer.http.post(
        path, data={"csrf": csrf_of(page), **fields}, headers={"Origin": site.base}
    )
    assert same_origin.status_code == 303


def test_every_page_labels_every_field_and_carries_the_caution(site: Site) -> None:
    pack = site.draft()
    reviewer = _signed_in(site, "reviewer")
    approver = _signed_in(site, "approver")
    author = _signed_in(site, "author")
    seen = [
        site.person("reviewer").http.get("/review/sign-in").text,
        reviewer.http.get("/review").text,
        reviewer.http.get(f"/review/packs/{pack['id']}").text,
        approver.http.get(f"/review/packs/{pack['id']}").text,
        author.http.get(f"/review/packs/{pack['id']}").text,
        reviewer.http.get("/review/packs/pk_" + "0" * 32).text,
    ]
    for page in seen:
        assert pages.CAUTION.replace("'", "&#39;") in page
        assert unlabelled(page) == []
        assert '<html lang="en-GB">' in page
        assert 'href="#main"' in page  # the skip link
    assert any(c["tag"] == "textarea" for c in controls(seen[2]))  # the check finds fields


def test_the_queue_shows_what_each_key_may_see(site: Site) -> None:
    in_review = site.draft()
    own_draft = site.draft(submit=False)
    reviewer = _signed_in(site, "reviewer").http.get("/review").text
    awaiting = reviewer.split('id="awaiting"')[1].split('id="drafts"')[0]
    assert f'href="/review/packs/{in_review["id"]}"' in awaiting
    assert f'href="/review/packs/{own_draft["id"]}"' not in reviewer  # not the reviewer's draft
    author = _signed_in(site, "author").http.get("/review").text
    drafts_part = author.split('id="drafts"')[1].split('id="signed"')[0]
    assert f'href="/review/packs/{own_draft["id"]}"' in drafts_part
    assert "You authored this pack." in author.split('id="drafts"')[0]
    outsider = _signed_in(site, "outsider").http.get("/review").text
    assert in_review["id"] not in outsider
    assert own_draft["id"] not in outsider


def test_the_pack_page_puts_failed_checks_first_and_marks_them_in_words(site: Site) -> None:
    pack = site.draft()
    page = _signed_in(site, "reviewer").http.get(f"/review/packs/{pack['id']}").text
    rows = re.findall(r'<tr class="(\w+)" data-check="([\w-]+)" data-chart="([\w-]+)">', page)
    assert rows[0] == ("failed", "lie-factor", "on-time")
    assert rows[1] == ("waived", "bar-zero-baseline", "on-time")
    assert len(rows) == len(pack["checks"])
    first = page.split('data-check="lie-factor"')[1].split("</tr>")[0]
    assert "✗ Failed" in first
    assert "10.00" in first
    assert "0.95 to 1.05" in first
    assert "Not waived yet." in first
    assert 'id="waive-form"' in page
    assert f'minlength="{lifecycle.MIN_REASON}"' in page
    assert f"at least\n    {lifecycle.MIN_REASON} characters" in page
    options = re.findall(r'<option value="([^"]+)"', page)
    assert options == ["lie-factor/on-time", "bar-zero-baseline/on-time"]
    assert 'id="sign-off-form"' not in page  # a reviewer has no approver role
    assert f"/review/packs/{pack['id']}/draft.pdf" in page
    assert 'type="application/pdf"' in page  # the preview, with a text fallback link
    assert "pack.submitted" in page
    assert "pack.created" in page
    headers = _signed_in(site, "reviewer").http.get(f"/review/packs/{pack['id']}").headers
    assert "frame-ancestors 'none'" in headers["content-security-policy"]
    assert headers["cache-control"] == "no-store"


def test_the_approver_sees_why_sign_off_is_blocked(site: Site) -> None:
    pack = site.draft()
    page = _signed_in(site, "approver").http.get(f"/review/packs/{pack['id']}").text
    assert 'id="sign-off-form"' not in page
    blocked = page.split('id="sign-off-blocked"')[1].split("</div>")[0]
    assert "Failed and not waived: lie-factor on on-time" in blocked
    assert "Standing waiver not confirmed: bar-zero-baseline on on-time" in blocked


def test_another_familys_pack_is_not_found(site: Site) -> None:
    pack = site.draft()
    outsider = _signed_in(site, "outsider")
    for path in ("", "/draft.pdf", "/sealed.pdf"):
        answer = outsider.http.get(f"/review/packs/{pack['id']}{path}")
        assert answer.status_code == 404, path
        assert answer.headers["content-type"].startswith("text/html")
        assert "Pack not found" in answer.text
    page = outsider.http.get("/review").text
    answer = outsider.post(
        f"/review/packs/{pack['id']}/sign-off", page, content_sha256=pack["pdf"]["sha256"]
    )
    assert answer.status_code == 404
    assert outsider.http.get("/review/packs/not-a-pack").status_code == 404


def test_a_refused_waiver_shows_the_page_again_with_the_reason(site: Site) -> None:
    pack = site.draft()
    reviewer = _signed_in(site, "reviewer")
    page = reviewer.http.get(f"/review/packs/{pack['id']}").text
    answer = reviewer.post(
        f"/review/packs/{pack['id']}/waive",
        page,
        form="waive",
        item="lie-factor/on-time",
        reason="too short <b>",
    )
    assert answer.status_code == 422
    assert f"a waiver needs a reason of {lifecycle.MIN_REASON} to 2000 characters" in _message(
        answer.text
    )
    assert "too short &lt;b&gt;</textarea>" in answer.text  # kept, escaped, to fix and resend
    answer = reviewer.post(
        f"/review/packs/{pack['id']}/waive",
        page,
        item="no-dual-axis/on-time",
        reason="A reason that is long enough to pass the rule.",
    )
    assert answer.status_code == 409
    assert "did not fail" in _message(answer.text)


def test_the_author_cannot_sign_off(site: Site) -> None:
    pack = site.draft()
    digest = pack["pdf"]["sha256"]
    author = _signed_in(site, "author")
    page = author.http.get(f"/review/packs/{pack['id']}").text
    assert 'id="sign-off-form"' not in page
    assert 'id="waive-form"' not in page
    forged = author.post(f"/review/packs/{pack['id']}/sign-off", page, content_sha256=digest)
    assert forged.status_code == 403
    assert "does not have the approver role" in _message(forged.text)
    # The same person holding an approver key is still the author (separation of duties).
    _, secret = keys.create(
        site.services.sessions,
        name="Ada Author",
        roles={Role.approver},
        families={"hollin-vale"},
        expires=None,
        person=keys.person_of(site.services.sessions, site.key_ids["author"]),
    )
    twin = Person(site.base, secret, "Ada Author")
    site.opened.append(twin)
    twin.sign_in()
    page = twin.http.get(f"/review/packs/{pack['id']}").text
    assert 'id="sign-off-form"' not in page
    assert "You authored this pack" in page
    forged = twin.post(f"/review/packs/{pack['id']}/sign-off", page, content_sha256=digest)
    assert forged.status_code == 403
    assert "separation of duties" in _message(forged.text)
    assert _status(site, pack["id"]) == lifecycle.IN_REVIEW


def test_changes_are_requested_and_the_draft_submitted_again(site: Site) -> None:
    pack = site.draft()
    reviewer = _signed_in(site, "reviewer")
    page = reviewer.http.get(f"/review/packs/{pack['id']}").text
    answer = reviewer.post(
        f"/review/packs/{pack['id']}/request-changes",
        page,
        form="changes",
        reason="Start the bars at zero; the board can read the labels.",
    )
    assert answer.status_code == 303
    assert (
        answer.headers["location"] == f"/review/packs/{pack['id']}?done=changes_requested#message"
    )
    assert _status(site, pack["id"]) == lifecycle.DRAFT
    author = _signed_in(site, "author")
    page = author.http.get(f"/review/packs/{pack['id']}").text
    assert "Start the bars at zero; the board can read the labels." in page  # audit detail
    answer = author.post(f"/review/packs/{pack['id']}/submit", page)
    assert answer.status_code == 303
    assert _status(site, pack["id"]) == lifecycle.IN_REVIEW
    shown = author.http.get(answer.headers["location"]).text
    assert _message(shown) == pages.FLASH["submitted"]
    again = author.post(f"/review/packs/{pack['id']}/submit", page)
    assert again.status_code == 409
    assert "in review already" in _message(again.text)


def test_user_text_is_escaped(site: Site) -> None:
    title = "<script>alert('x')</script> & <b>Co</b>"
    pack = site.draft(title=title)
    reviewer = _signed_in(site, "reviewer")
    page = reviewer.http.get(f"/review/packs/{pack['id']}").text
    assert "<script>" not in page
    assert "<b>Co</b>" not in page
    assert "&lt;script&gt;alert(&#39;x&#39;)&lt;/script&gt; &amp; &lt;b&gt;Co&lt;/b&gt;" in page
    reason = 'An <img src=x onerror="alert(1)"> in the reason is only text.'
    answer = reviewer.post(
        f"/review/packs/{pack['id']}/waive", page, item="lie-factor/on-time", reason=reason
    )
    assert answer.status_code == 303
    page = reviewer.http.get(f"/review/packs/{pack['id']}").text
    assert "<img" not in page
    assert "An &lt;img src=x onerror=&#34;alert(1)&#34;&gt; in the reason is only text." in page


def test_static_style_sheet_is_served(site: Site) -> None:
    answer = site.client.get("/review/static/review.css")
    assert answer.status_code == 200
    assert answer.headers["content-type"].startswith("text/css")
    assert ":focus-visible" in answer.text


@pytest.fixture(scope="module")
def signed(site: Site) -> list[dict[str, object]]:
    """Two packs of one report, each waived, confirmed and signed off through the pages."""
    done = []
    for values, as_of in (
        ({"Route 7": 50, "Route 12": 55}, "2026-10-09T07:30:00+00:00"),
        ({"Route 7": 52, "Route 12": 55}, "2026-11-09T07:30:00+00:00"),
    ):
        pack = site.draft(values=values, as_of=as_of)
        reviewer = _signed_in(site, "reviewer")
        for item, done_code in (
            ("lie-factor/on-time", "waived"),
            ("bar-zero-baseline/on-time", "confirmed"),
        ):
            page = reviewer.http.get(f"/review/packs/{pack['id']}").text
            answer = reviewer.post(
                f"/review/packs/{pack['id']}/waive",
                page,
                item=item,
                reason="Agreed with the board: the spread above 45 % is what they track.",
            )
            assert answer.status_code == 303, answer.text
            shown = reviewer.http.get(answer.headers["location"]).text
            assert _message(shown) == pages.FLASH[done_code]
        approver = _signed_in(site, "approver")
        page = approver.http.get(f"/review/packs/{pack['id']}").text
        form = page.split('id="sign-off-form"')[1].split("</form>")[0]
        assert f'name="content_sha256" value="{pack["pdf"]["sha256"]}"' in form
        assert pack["pdf"]["sha256"] in re.sub(r"<[^>]+>", "", form)  # shown, not only hidden
        answer = approver.post(
            f"/review/packs/{pack['id']}/sign-off", page, content_sha256=pack["pdf"]["sha256"]
        )
        assert answer.status_code == 303, answer.text
        done.append(pack)
    return done


def test_a_signed_off_pack_offers_its_sealed_file(
    site: Site, signed: list[dict[str, object]]
) -> None:
    pack = signed[1]
    approver = _signed_in(site, "approver")
    page = approver.http.get(f"/review/packs/{pack['id']}?done=signed_off").text
    assert _message(page) == pages.FLASH["signed_off"]
    assert '<dd id="pack-status">Signed off</dd>' in page
    assert "by Ana Approver" in page
    sealed = drafts.seal_of(sessions=site.services.sessions, pack_id=str(pack["id"]))
    assert sealed is not None
    answer = approver.http.get(f"/review/packs/{pack['id']}/sealed.pdf")
    assert answer.status_code == 200
    assert answer.headers["content-type"] == "application/pdf"
    assert answer.headers["content-disposition"].startswith("attachment;")
    assert hashlib.sha256(answer.content).hexdigest() == sealed.sha256
    draft = approver.http.get(f"/review/packs/{pack['id']}/draft.pdf")
    assert draft.headers["content-disposition"].startswith("inline;")
    assert hashlib.sha256(draft.content).hexdigest() == pack["pdf"]["sha256"]  # type: ignore[index]
    for action in ("check.waived", "pack.signed_off"):
        assert action in page
    unsigned = site.draft()
    missing = approver.http.get(f"/review/packs/{unsigned['id']}/sealed.pdf")
    assert missing.status_code == 404
    assert "No sealed file" in missing.text


def test_month_over_month_compares_with_the_previous_signed_pack(
    site: Site, signed: list[dict[str, object]]
) -> None:
    earlier, later = signed
    auditor = _signed_in(site, "auditor")
    page = auditor.http.get(f"/review/packs/{later['id']}").text
    link = f"/review/packs/{later['id']}/compare/{earlier['id']}"
    assert f'href="{link}"' in page
    assert (
        f'href="/review/packs/{earlier["id"]}/compare/'
        not in auditor.http.get(f"/review/packs/{earlier['id']}").text
    )  # the earlier pack has no previous one
    answer = auditor.http.get(link)
    assert answer.status_code == 200
    moved = answer.text.split('id="figures-moved"')[1].split("</table>")[0]
    row = moved.split("<td>Route 7</td>")[1].split("</tr>")[0]
    assert "<td>50" in row
    assert "<td>52" in row
    assert "+2" in row
    assert "(+4.0 %)" in row
    assert "1 figure moved" in answer.text
    assert REPORT in answer.text
    assert pages.CAUTION.replace("'", "&#39;") in answer.text
    unsigned = site.draft()
    refused = auditor.http.get(f"/review/packs/{later['id']}/compare/{unsigned['id']}")
    assert refused.status_code == 409
    assert "only signed packs are compared" in refused.text
