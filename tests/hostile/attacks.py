"""The attacks of the outside attacker's round (the second hardening round), re-run against a running
service: every answer must be a considered one, below 500, and no connection may be reset.

The attacker's own inputs, rebuilt: the 772-byte definition whose two rows lie ten thousand years
apart (and a span of six centuries that the date bounds let through), lone surrogates (escaped in
JSON, and as raw bytes), U+FEFF, zero-width and other invisible characters, NUL, ESC, right-to-left
text and emoji in every printed field, 100,000-character words, a last period in the year 9999,
loose types, duplicate keys, UTF-16 and UTF-32 bodies, wrong media types, 200 kB and 2 MB headers,
and bad keys; with a few more of the same kind (deep nesting, huge integers, junk paths and queries,
junk sealed packs). Each definition goes to ``POST /v1/check`` and ``POST /v1/reports``.

Run it against any service with a key that has the author role and the family ``test-pack``::

    python tests/hostile/attacks.py http://127.0.0.1:8000 key_0123456789abcdef.SECRET

It prints one line per answer that is 5xx or a reset connection, then the counts, and exits 1 if
there is any. ``test_attacks.py`` runs it against a ``plumbline serve`` started for the purpose.
The bad keys go last: past 20 wrong keys in a minute an address is answered 429 for everything.
"""

from __future__ import annotations

import copy
import json
import socket
import sys
from collections import Counter
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import httpx

if __name__ == "__main__":  # run as a script: the builders live in tests/
    sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from factories import (
    make_category_dataset,
    make_column,
    make_compare_chart,
    make_daily,
    make_dataset,
    make_definition,
    make_report,
    make_trend_chart,
    make_waiver,
)

Json = dict[str, Any]


@dataclass(frozen=True)
class Attack:
    name: str
    path: str = "/v1/check"
    body: bytes | None = None
    headers: dict[str, str] = field(default_factory=dict)
    method: str = "POST"
    key: bool = True
    """Send the good key (``Authorization`` in ``headers`` replaces it)."""
    raw: bool = False
    """Sent over a plain socket: the HTTP client refuses a URL past 64 kB itself."""


@dataclass(frozen=True)
class Outcome:
    attack: Attack
    status: int | None
    """``None``: no answer (the connection was reset or closed, or timed out)."""
    detail: str

    @property
    def failed(self) -> bool:
        return self.status is None or self.status >= 500


# --- definitions --------------------------------------------------------------------------------


def base() -> Json:
    """A valid definition with every field that is printed: a trend, a comparison, a share with
    expected parts, a table and a standing waiver."""
    ridership = make_dataset(
        description="Boardings counted by the ticket machines.",
        source="Ticket machine export",
    )
    ridership["columns"][1]["description"] = "Every boarding, transfers included."
    routes = make_category_dataset(
        {"Route 1": 30.0, "Route 2": 45.0, "Route 3": 25.0},
        description="Share of departures by route.",
        source="Timetable",
    )
    share = {
        "id": "route-share",
        "intent": "share",
        "title": "Departures by route",
        "dataset": "punctuality",
        "category": "route",
        "measure": "on_time",
        "expected_categories": ["Route 1", "Route 2", "Route 3"],
    }
    definition = make_definition(
        datasets=[ridership, routes],
        charts=[
            make_trend_chart(note="Counted at the doors.", source="Ticket machines"),
            make_compare_chart(description="Three routes compared."),
            share,
        ],
        waivers=[make_waiver("bar-zero-baseline", "on-time")],
        report=make_report(
            period={"start": "2026-06-01", "end": "2026-11-30", "label": "June to November"},
            audience="The board",
        ),
    )
    section = definition["sections"][0]
    section["narrative"] = "Boardings rose."
    section["tables"] = [{"id": "routes-table", "title": "Routes", "dataset": "punctuality"}]
    return definition


Setter = Callable[[Json, str], None]


def _at(*path: str | int) -> Setter:
    def put(definition: Json, text: str) -> None:
        where: Any = definition
        for step in path[:-1]:
            where = where[step]
        where[path[-1]] = text

    return put


def _category(definition: Json, text: str) -> None:
    definition["datasets"][1]["rows"][0]["route"] = text


def _csv_category(definition: Json, text: str) -> None:
    dataset = definition["datasets"][1]
    del dataset["rows"]
    dataset["csv"] = f"route,on_time\n{text},30\nRoute 2,45\nRoute 3,25\n"


FIELDS: dict[str, Setter] = {
    "report title": _at("report", "title"),
    "report owner": _at("report", "owner"),
    "period label": _at("report", "period", "label"),
    "section heading": _at("sections", 0, "heading"),
    "narrative": _at("sections", 0, "narrative"),
    "chart title": _at("sections", 0, "charts", 0, "title"),
    "chart note": _at("sections", 0, "charts", 0, "note"),
    "chart source": _at("sections", 0, "charts", 0, "source"),
    "chart description": _at("sections", 0, "charts", 1, "description"),
    "expected category": _at("sections", 0, "charts", 2, "expected_categories", 0),
    "table title": _at("sections", 0, "tables", 0, "title"),
    "dataset description": _at("datasets", 0, "description"),
    "dataset source": _at("datasets", 0, "source"),
    "column description": _at("datasets", 0, "columns", 1, "description"),
    "unit": _at("datasets", 0, "columns", 1, "unit"),
    "category": _category,
    "category in CSV": _csv_category,
    "waiver by": _at("waivers", 0, "by"),
    "waiver reason": _at("waivers", 0, "reason"),
}

TEXTS: dict[str, str] = {
    "lone surrogate": "Route \ud800 north",
    "U+FEFF": "Passenger\ufeffboardings",
    "zero-width space": "Passenger\u200bboardings",
    "NUL": "Passenger\x00boardings",
    "ESC": "Passenger\x1b[31mboardings",
    "right-to-left override": "Passenger \u202eboardings",
    "right-to-left text": "\u0631\u0643\u0627\u0628 passengers",
    "emoji": "Passengers \U0001f68c",
    "100,000-character word": "W" * 100_000,
}


def _text_attacks() -> Iterator[tuple[str, Json]]:
    for text_name, text in TEXTS.items():
        for field_name, put in FIELDS.items():
            definition = copy.deepcopy(base())
            put(definition, text)
            yield f"{text_name} in {field_name}", definition


def _dates_and_types() -> Iterator[tuple[str, Json | bytes]]:
    yield "ten thousand years of days (772 bytes)", make_daily("0001-01-01", "9999-12-30")
    yield "six centuries of days", make_daily("1678-01-01", "2261-12-30")
    last = make_dataset(
        rows=[{"month": "9999-11-01", "boardings": 5}, {"month": "9999-12-01", "boardings": 6}]
    )
    yield (
        "a last period in 9999",
        make_definition(
            datasets=[last],
            report=make_report(
                period={"start": "9999-11-01", "end": "9999-12-31"},
                as_of="9999-12-15T00:00:00+00:00",
            ),
        ),
    )
    loose: list[tuple[str, Callable[[Json], None]]] = [
        ("version true", lambda d: d.update(version=True)),
        ("version 1.0", lambda d: d.update(version=1.0)),
        ("version '1'", lambda d: d.update(version="1")),
        ("a number as text", lambda d: d["datasets"][0]["rows"][0].update(boardings="93.4")),
        ("an exponent as text", lambda d: d["datasets"][0]["rows"][0].update(boardings="1e3")),
        ("as_of in seconds", lambda d: d["report"].update(as_of=1_762_000_000)),
        ("a list in a text cell", lambda d: d["datasets"][1]["rows"][0].update(route=["a"])),
        ("an object in a text cell", lambda d: d["datasets"][1]["rows"][0].update(route={"a": 1})),
        ("a baseline as text", lambda d: d["sections"][0]["charts"][1].update(baseline="85")),
        ("a flag as text", lambda d: d["sections"][0]["charts"][0].update(from_zero="true")),
        ("NaN", lambda d: d["datasets"][0]["rows"][0].update(boardings=float("nan"))),
        ("infinity", lambda d: d["datasets"][0]["rows"][0].update(boardings=float("inf"))),
        ("10^400", lambda d: d["datasets"][0]["rows"][0].update(boardings=10**400)),
    ]
    for name, change in loose:
        definition = copy.deepcopy(base())
        change(definition)
        yield name, json.dumps(definition).encode()
    good = json.dumps(base())
    yield (
        "a duplicate key",
        good.replace('"title": "Test pack"', '"title": "A", "title": "B"', 1).encode(),
    )
    yield "UTF-16 with a BOM", good.encode("utf-16")
    yield "UTF-16 without a BOM", good.encode("utf-16-le")
    yield "UTF-32", good.encode("utf-32")
    yield "UTF-8 with a BOM", b"\xef\xbb\xbf" + good.encode()
    yield (
        "a surrogate as raw bytes",
        good.replace("Test pack", "Test \udcff", 1)
        .encode("utf-8", "surrogatepass")
        .replace(b"\xed\xb3\xbf", b"\xed\xa0\x80"),
    )
    yield "not UTF-8", good.encode().replace(b"Test pack", b"Test \xff\xfe pack")
    yield "an unclosed object", b"{"
    yield "nesting 100,000 deep", b"[" * 100_000 + b"]" * 100_000
    yield "an integer of 100,000 digits", b'{"version": ' + b"9" * 100_000 + b"}"
    yield "an empty body", b""
    yield "a JSON string", b'"hello"'
    yield (
        "a column with a 100,000-character name",
        json.dumps(
            make_definition(
                datasets=[
                    make_dataset(
                        columns=[
                            make_column("month", "date"),
                            make_column("b" * 100_000, "integer", "x"),
                        ]
                    )
                ]
            )
        ).encode(),
    )


def attacks() -> list[Attack]:
    found: list[Attack] = []
    definitions: list[tuple[str, Json | bytes]] = [*_text_attacks(), *_dates_and_types()]
    for name, definition in definitions:
        body = definition if isinstance(definition, bytes) else json.dumps(definition).encode()
        found.append(Attack(f"{name} → check", "/v1/check", body))
        found.append(Attack(f"{name} → reports", "/v1/reports", body))
    quick = json.dumps(make_definition()).encode()
    for media in (
        "text/plain",
        "application/x-www-form-urlencoded",
        "multipart/form-data",
        "application/json; charset=utf-16",
        "application/xml",
        "",
    ):
        found.append(
            Attack(f"Content-Type {media or '(none)'}", "/v1/check", quick, {"Content-Type": media})
        )
    found.append(
        Attack(
            "a sealed pack that is not a PDF",
            "/v1/verify",
            b"not a pdf",
            {"Content-Type": "application/pdf"},
        )
    )
    found.append(
        Attack("an empty sealed pack", "/v1/verify", b"", {"Content-Type": "application/pdf"})
    )
    found.append(
        Attack(
            "a PDF header and nothing else",
            "/v1/verify",
            b"%PDF-1.7\n%%EOF\n",
            {"Content-Type": "application/pdf"},
        )
    )
    for path in (
        "/v1/reports/" + "p" * 5_000,
        "/v1/reports?offset=99999999999999999999999",
        "/v1/reports?limit=-1",
        "/v1/reports?limit=1&limit=2",
        "/v1/jobs/..%2F..%2Fetc",
        "/v1/reports/%00",
        "/v1/reports/pk_%ff%fe/pdf",
        "/review/packs/" + "x" * 3_000,
    ):
        found.append(Attack(f"GET {path[:60]}", path, None, method="GET"))
    found.append(
        Attack(
            "a 200 kB Authorization header",
            "/v1/reports",
            None,
            {"Authorization": "Bearer " + "a" * 200_000},
            "GET",
        )
    )
    found.append(
        Attack(
            "a 2 MB Authorization header",
            "/v1/check",
            quick,
            {"Authorization": "Bearer " + "a" * 2_000_000},
        )
    )
    found.append(
        Attack(
            "200 headers of 1 kB",
            "/v1/health",
            None,
            {f"X-Filler-{i}": "v" * 1_000 for i in range(200)},
            "GET",
        )
    )
    found.append(Attack("a 100 kB path", "/v1/" + "x" * 100_000, None, method="GET", raw=True))
    found.append(
        Attack("a 100 kB query", "/v1/reports?q=" + "x" * 100_000, None, method="GET", raw=True)
    )
    for name, value in [
        ("no key", None),
        ("a bare bearer", "Bearer"),
        ("a basic credential", "Basic YWxpY2U6c2VjcmV0"),
        ("junk", "Bearer not-a-key"),
        ("an unknown key id", "Bearer key_0123456789abcdef." + "A" * 43),
        ("a key id with a dot only", "Bearer key_0123456789abcdef."),
        ("a surrogate-like escape", "Bearer key_\\ud800.x"),
        ("Latin-1 bytes", "Bearer key_caf\xe9.secret"),
        ("10 kB of key", "Bearer key_" + "f" * 10_000),
    ]:
        headers = {} if value is None else {"Authorization": value}
        found.append(Attack(f"bad key: {name}", "/v1/reports", None, headers, "GET", key=False))
    return found


# --- running them -------------------------------------------------------------------------------


def run(base_url: str, secret: str, *, timeout: float = 180) -> list[Outcome]:
    outcomes = []
    with httpx.Client(base_url=base_url, timeout=timeout) as http:
        for attack in attacks():
            outcomes.append(_send(http, attack, secret))
    return outcomes


def _send(http: httpx.Client, attack: Attack, secret: str) -> Outcome:
    if attack.raw:
        return _send_raw(str(http.base_url), attack, secret)
    headers = {"Content-Type": "application/json"} if attack.body is not None else {}
    if attack.key:
        headers["Authorization"] = f"Bearer {secret}"
    headers.update(attack.headers)
    if headers.get("Content-Type") == "":
        del headers["Content-Type"]
    encoded = [(k.encode("latin-1"), v.encode("latin-1")) for k, v in headers.items()]
    try:
        answer = http.request(attack.method, attack.path, content=attack.body, headers=encoded)
    except httpx.HTTPError as exc:
        return Outcome(attack, None, f"{type(exc).__name__}: {exc}")
    return Outcome(attack, answer.status_code, answer.text[:300])


def _send_raw(base_url: str, attack: Attack, secret: str) -> Outcome:
    url = httpx.URL(base_url)
    head = (
        f"{attack.method} {attack.path} HTTP/1.1\r\nHost: {url.host}:{url.port}\r\n"
        f"Authorization: Bearer {secret}\r\nConnection: close\r\n\r\n"
    )
    try:
        with socket.create_connection((url.host, url.port or 80), timeout=60) as sock:
            sock.sendall(head.encode())
            answer = b""
            while chunk := sock.recv(65_536):
                answer += chunk
    except OSError as exc:
        return Outcome(attack, None, f"{type(exc).__name__}: {exc}")
    status_line = answer.partition(b"\r\n")[0].split()
    if len(status_line) < 2 or not status_line[1].isdigit():
        return Outcome(attack, None, f"no status line: {answer[:100]!r}")
    return Outcome(attack, int(status_line[1]), answer.partition(b"\r\n\r\n")[2][:300].decode())


def summary(outcomes: list[Outcome]) -> str:
    statuses = Counter("no answer" if o.status is None else str(o.status) for o in outcomes)
    failed = [o for o in outcomes if o.failed]
    lines = [f"{o.status or 'no answer'}  {o.attack.name}: {o.detail}" for o in failed]
    taken = [o for o in outcomes if o.status is not None and o.status < 400]
    lines += [f"{o.status} (taken)  {o.attack.name}" for o in taken]
    counted = ", ".join(f"{n} × {s}" for s, n in sorted(statuses.items()))
    lines.append(
        f"{len(outcomes)} attacks: {sum(1 for o in outcomes if o.status and o.status >= 500)} × 5xx, "
        f"{statuses.get('no answer', 0)} without an answer ({counted})"
    )
    return "\n".join(lines)


def main(argv: list[str]) -> int:
    if len(argv) != 2:
        sys.stderr.write(f"{__doc__}\n")
        return 2
    outcomes = run(argv[0], argv[1])
    sys.stdout.write(f"{summary(outcomes)}\n")
    return 1 if any(o.failed for o in outcomes) else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
