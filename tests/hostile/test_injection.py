"""Hostile text in every field a pack prints: shown literally, or refused with a clear problem.

Each entry of ``CORPUS`` is one payload. Its test builds one definition that carries the payload in
every text field that reaches a page (report title, owner and audience; section heading and
narrative; chart title, subtitle, note, source and description; dataset source; column names and
units; category values in CSV data; table title; standing waiver reason and signer), each behind its
own tag, then seals it as a signed-off pack whose sign-off record carries the payload as the
approver's key name and in a review waiver's reason. The test then reads the sealed PDF back with
poppler's ``pdftotext`` and finds every tagged payload there literally, reads the chart drawing
alone to show matplotlib drew it as text (no mathtext), checks that nothing was fetched from a
loopback listener named in the payloads, that no file was written outside the data folder, and
that verification re-renders the sealed pack byte for byte.

Exported CSV and formula prefixes (``=``, ``+``, ``-``, ``@``, tab, carriage return)
--------------------------------------------------------------------------------------
The only CSV files Plumbline exports are the sealed pack's ``data/<dataset>.csv`` attachments; no
route serves CSV (``test_authorisation_matrix`` classifies every route). Those attachments are kept
**verbatim**, not neutralised, because:

1. they are archival evidence of the data an approver signed off; a leading ``'`` added to a cell
   would make the archived data differ from the reviewed data;
2. ``-`` and ``+`` start ordinary numbers (``-4.5``, ``+3``): rewriting them would corrupt the
   data for every program that reads CSV as data (pandas, R, a database loader), which is what the
   attachments are for;
3. verification re-renders every attachment from ``definition.json`` and compares bytes, so a
   rewrite of cells would have to be applied identically forever (a rule change would break
   verification of every pack sealed before it);
4. the attachments are reached only by opening a signed PDF's attachment list, not by a download
   meant for a spreadsheet.

A future export meant for spreadsheets (a CSV download route) must neutralise cells that start with
those characters, as OWASP's "CSV Injection" page advises (prefix a ``'``), and document it;
``test_no_route_serves_csv`` in the matrix fails when such a route appears, so the decision is
taken again then.
"""

from __future__ import annotations

import csv
import io
import json
import time
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import pikepdf
import pytest
from factories import make_column, make_compare_chart, make_report
from hostile_kit import Listener, listing, pdf_text, squeezed

from service import pipeline
from service.config import Limits
from service.errors import InvalidDefinition, Problem
from service.render import groups
from service.seal import verify
from service.workflow import sealing

LABEL_CHARS = Limits().max_label_chars
MARKER = "plumbline_marker"
"""The file the code-injection payloads would create if they ran."""


def cve_2023_33733(marker: Path) -> str:
    """The colour expression of CVE-2023-33733 (reportlab < 3.6.13 evaluated it), rewritten to
    create ``marker`` if it ever runs. Shape after the public proof of concept (c53elyas,
    "CVE-2023-33733" on GitHub, 2023); from memory."""
    return (
        "<para><font color=\"[ [ getattr(pow,Word('__globals__'))['os'].system('touch "
        f"{marker}') for Word in [orgTypeFun('Word', (str,), {{ 'mutated': 1, 'startswith': "
        "lambda self, x: False, '__eq__': lambda self,x: self.mutate() and self.mutated < 0 and "
        "str(self) == x, 'mutate': lambda self: {setattr(self, 'mutated', self.mutated - 1)}, "
        "'__hash__': lambda self: hash(str(self)) })] ] for orgTypeFun in [type(type(1))] ] "
        "and 'red'\">exploit</font></para>"
    )


@dataclass(frozen=True)
class Entry:
    name: str
    payload: Callable[[Listener, Path], str]
    """The hostile text, given the loopback listener and the marker file's path."""
    refused: str = ""
    """``charts``: refused (``glyph_missing``) where a chart would draw it (column names, units,
    category values); ``everywhere``: refused in every field."""


CORPUS = [
    Entry("img-file", lambda ls, m: '<img src="/etc/passwd" width="40" height="40"/>'),
    Entry("img-url", lambda ls, m: f'<img src="{ls.url("img.png")}" width="9" height="9"/>'),
    Entry("link-file", lambda ls, m: '<a href="file:///etc/passwd">open the file</a>'),
    Entry("link-url", lambda ls, m: f'<link href="{ls.url("link")}">a link</link>'),
    Entry("font-colour", lambda ls, m: '<font color="red" size="40" face="Courier">big</font>'),
    Entry("unclosed-tags", lambda ls, m: "<b><i>never closed <u"),
    Entry("para", lambda ls, m: '<para autoLeading="max" fontSize="60">para</para>'),
    Entry("cve-2023-33733", lambda ls, m: cve_2023_33733(m)),
    Entry("entities", lambda ls, m: "&amp; &lt;b&gt; &#x41; &nbsp; &unknown; & <"),
    Entry("mathtext-frac", lambda ls, m: r"$\frac{1}{0}$"),
    Entry("mathtext-power", lambda ls, m: r"$x^{2}$ and $\sqrt{2}$ cost $5"),
    Entry("formula-equals", lambda ls, m: '=HYPERLINK("http://x.invalid","see")'),
    Entry("formula-plus", lambda ls, m: "+1+cmd|' /C calc'!A0"),
    Entry("formula-minus", lambda ls, m: "-2+3"),
    Entry("formula-at", lambda ls, m: "@SUM(1,2)"),
    Entry("formula-tab", lambda ls, m: "\t=1+1", refused="charts"),
    Entry("formula-cr", lambda ls, m: "\r=1+1", refused="charts"),
    Entry("escape-sequence", lambda ls, m: "\x1b[31mred\x1b[0m \x00 \x07", refused="everywhere"),
    Entry("path-like", lambda ls, m: "../../etc/passwd"),
    Entry("url", lambda ls, m: ls.url("fetch-me.csv")),
    Entry("file-url", lambda ls, m: "file:///etc/passwd"),
    Entry("template", lambda ls, m: "{{ 7*7 }} {% raw %} ${7*7} #{7*7}"),
]


# --- the definition -----------------------------------------------------------------------------


def _csv(header: list[str], rows: list[list[str]]) -> str:
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow(header)
    writer.writerows(rows)
    return out.getvalue()


def _fits(text: str) -> bool:
    return len(text) <= LABEL_CHARS


def hostile_definition(payload: str) -> tuple[dict[str, Any], dict[str, str]]:
    """A definition with ``payload`` in every printed field, and what each field should show.

    Every field gets ``<tag>`` + payload, so finding the tag shows which field printed it. Short
    fields (labels, names: at most ``max_label_chars``) take the payload only when it fits.
    """
    shown: dict[str, str] = {}

    def text(tag: str, *, short: bool = False, fallback: str = "") -> str:
        value = f"{tag}{payload}"
        if short and not _fits(value):
            return fallback or tag
        # what a reader sees: definition text is stripped of outer white space
        shown[tag] = value.strip() if value.strip().startswith(tag) else value
        return value

    category = text("Qcat", short=True, fallback="route")
    measure = text("Qmea", short=True, fallback="on_time")
    route = text("Qrow", short=True, fallback="Route 7")
    data = _csv([category, measure], [[route, "50"], ["Route 12", "55"]])
    report = make_report(
        id="hollin-vale-hostile",
        title=text("Qtit", short=True, fallback="Hostile"),
        owner=text("Qown", short=True, fallback="Owner"),
        audience=text("Qaud", short=True, fallback="Audience"),
    )
    dataset = {
        "name": "punctuality",
        "source": f"Qdso{payload}",  # printed only where a chart names no source of its own
        "columns": [
            make_column(category, "text"),
            make_column(measure, "number", text("Quni", short=True, fallback="%")),
        ],
        "csv": data,
    }
    chart = make_compare_chart(
        category=category,
        measure=measure,
        baseline=45,
        title=text("Qctt", short=True, fallback="Chart"),
        subtitle=text("Qcst", short=True, fallback="Subtitle"),
        note=text("Qcno"),
        source=text("Qcso"),
        description=text("Qcde"),
    )
    waiver = {
        "check": "bar-zero-baseline",
        "chart": chart["id"],
        "reason": text("Qwre") + " (the board asked for the spread)",
        "by": text("Qwby", short=True, fallback="Desk"),
    }
    definition = {
        "version": 1,
        "report": report,
        "datasets": [dataset],
        "sections": [
            {
                "heading": text("Qhea", short=True, fallback="Heading"),
                "narrative": text("Qnar"),
                "charts": [chart],
                "tables": [
                    {
                        "id": "routes",
                        "title": text("Qtab", short=True, fallback="T"),
                        "dataset": "punctuality",
                    }
                ],
            }
        ],
        "waivers": [waiver],
    }
    return definition, shown


def record(taken: pipeline.Intake, definition: bytes, payload: str) -> dict[str, Any]:
    """A sign-off record as ``lifecycle.sign_off_preflight`` makes it, with the payload as the
    approver's key name and in a review waiver of the failed lie factor."""
    checked = pipeline.check(taken)
    failed = [(r.check, r.chart) for r in checked.results if r.status.value == "failed"]
    assert ("lie-factor", "on-time") in failed, failed
    at = "2026-11-10T09:00:00+00:00"
    return {
        "pack": "pk_" + "0" * 32,
        "report": taken.definition.report.id,
        "reviewed_sha256": "0" * 64,
        "definition_sha256": seal_digest(definition),
        "signed_off_by": f"Qkey{payload}",
        "signed_off_at": at,
        "waivers": [
            {
                "check": "bar-zero-baseline",
                "chart": "on-time",
                "reason": "confirmed",
                "by": f"Qcby{payload}",
                "at": at,
                "kind": "confirmed",
            },
            {
                "check": "lie-factor",
                "chart": "on-time",
                "reason": f"Qrre{payload} (the spread is the point of this chart)",
                "by": f"Qrby{payload}",
                "at": at,
                "kind": "review",
            },
        ],
    }


def seal_digest(data: bytes) -> str:
    import hashlib

    return hashlib.sha256(data).hexdigest()


# --- the tests ----------------------------------------------------------------------------------


@pytest.mark.parametrize("entry", CORPUS, ids=[e.name for e in CORPUS])
def test_hostile_text_is_shown_literally(
    entry: Entry, listener: Listener, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    work, data_dir = tmp_path / "work", tmp_path / "data"
    work.mkdir()
    monkeypatch.chdir(work)  # a relative path a payload names would land here
    marker = tmp_path / MARKER
    payload = entry.payload(listener, marker)
    definition, shown = hostile_definition(payload)
    raw = json.dumps(definition).encode()
    before, asked = listing(tmp_path), len(listener.seen)

    if entry.refused:
        problems = [p for p in _problems(raw) if p.code == "glyph_missing"]
        on_charts = {p.path for p in problems if p.path.startswith("datasets[0].")}
        assert on_charts >= {"datasets[0].columns[1].name", "datasets[0].columns[1].unit"}
        elsewhere = {p.path for p in problems} - on_charts
        if entry.refused == "everywhere":
            assert elsewhere >= {
                "report.title",
                "sections[0].narrative",
                "report.owner",
                "waivers[0].reason",
            }
        else:
            assert not elsewhere, elsewhere  # a tab or carriage return is white space there
        assert all("cannot be printed" in p.message for p in problems), problems
        assert listener.seen[asked:] == []
        assert listing(tmp_path) == before
        return
    taken = pipeline.intake(raw, Limits())
    sign_off = record(taken, raw, payload)
    sealed = sealing.seal_pack(
        raw,
        sign_off,
        key_path=None,
        cert_path=None,
        development_dir=data_dir / "keys",
        limits=Limits(),
    )

    text = squeezed(pdf_text(sealed.signed))
    shown |= {
        "Qkey": f"Qkey{payload}",
        "Qcby": f"Qcby{payload}",
        "Qrre": f"Qrre{payload}",
        "Qrby": f"Qrby{payload}",
    }
    missing = sorted(tag for tag, value in shown.items() if squeezed(value) not in text)
    assert not missing, f"not shown literally: {missing}"

    # The chart drawing alone: matplotlib drew the category value and the axis label as text.
    plans = [c.plan for c in pipeline.check(taken).charts]
    drawn = groups.draw_all(plans)
    chart_text = squeezed("".join(pdf_text(f) for f in drawn.files))
    if _fits(f"Quni{payload}"):  # the unit is on every value label, so always drawn whole
        assert squeezed(f"Quni{payload}") in chart_text, chart_text[:400]

    # The PDF's own metadata carries the title and owner as text, not markup.
    with pikepdf.open(io.BytesIO(sealed.signed)) as pdf:
        meta = pdf.open_metadata()
        assert meta.get("dc:title") == definition["report"]["title"]
        assert str(pdf.docinfo["/Author"]) == definition["report"]["owner"]

    # Nothing fetched, executed, or written outside the data folder.
    assert listener.seen[asked:] == []
    assert not marker.exists()
    assert not (work / MARKER).exists()
    assert listing(tmp_path, skip=("data",)) == before

    # The data attachment is the CSV text exactly as given (see the module docstring).
    with pikepdf.open(io.BytesIO(sealed.signed)) as pdf:
        attached = pdf.attachments["data/punctuality.csv"].get_file().read_bytes()
    assert attached == definition["datasets"][0]["csv"].strip().encode()  # text is stripped

    # Verification renders it again from its attachments, byte for byte.
    report = verify.verify(sealed.signed, trust_roots=[], rerender=sealing.rerender(Limits()))
    rerendered = report.step("re-render matches")
    assert rerendered.ok, rerendered.detail


# --- refused, with a clear problem --------------------------------------------------------------


def _problems(raw: bytes) -> list[Problem]:
    with pytest.raises(InvalidDefinition) as caught:
        pipeline.intake(raw, Limits())
    assert caught.value.status == 422
    return caught.value.problems


def _base() -> dict[str, Any]:
    definition, _ = hostile_definition("")
    return definition


REFUSED = {
    "dataset-name-path": (("datasets", 0, "name"), "../../etc/passwd", "datasets[0].name"),
    "chart-id-path": (
        ("sections", 0, "charts", 0, "id"),
        "../../etc/passwd",
        "sections[0].charts[0].id",
    ),
    "report-id-path": (("report", "id"), "../../etc/passwd", "report.id"),
    "table-id-path": (
        ("sections", 0, "tables", 0, "id"),
        "..%2F..%2Fetc",
        "sections[0].tables[0].id",
    ),
    "csv-is-a-url": (("datasets", 0, "csv"), "URL", "datasets[0]"),
    "csv-is-a-file-url": (("datasets", 0, "csv"), "file:///etc/passwd", "datasets[0]"),
    "csv-is-a-path": (("datasets", 0, "csv"), "/etc/passwd", "datasets[0]"),
}


def _set(document: dict[str, Any], where: tuple[str | int, ...], value: str) -> None:
    node: Any = document
    for step in where[:-1]:
        node = node[step]
    node[where[-1]] = value


@pytest.mark.parametrize("name", sorted(REFUSED))
def test_names_and_sources_that_are_not_data_are_refused(
    name: str, listener: Listener, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    where, value, path = REFUSED[name]
    monkeypatch.chdir(tmp_path)
    value = listener.url("data.csv") if value == "URL" else value
    document = _base()
    _set(document, where, value)
    asked = len(listener.seen)
    problems = _problems(json.dumps(document).encode())
    found = [p for p in problems if p.path.startswith(path)]
    assert found, [p.as_dict() for p in problems]
    for p in found:
        assert p.message
        assert p.code
    assert listener.seen[asked:] == []
    assert listing(tmp_path) == set()


DEEP = {
    "100000-arrays": b"[" * 100_000,
    "100000-objects": b'{"a":' * 100_000,
    "deep-inside-a-definition": b'{"version":1,"report":' + b"[" * 50_000 + b"]" * 50_000 + b"}",
}


@pytest.mark.parametrize("name", sorted(DEEP))
def test_deeply_nested_json_is_refused_quickly(name: str) -> None:
    started = time.monotonic()
    problems = _problems(DEEP[name])
    assert time.monotonic() - started < 2
    assert [p.code for p in problems] == ["too_deep"]
