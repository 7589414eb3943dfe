"""End to end: the CLI renders the demo, and independent tools read the PDF back.

pypdf and pdfplumber (independent PDF parsers) read the text; ``pdffonts`` from poppler-utils reads the
font table. None of them shares code with the renderer.
"""

from __future__ import annotations

import hashlib
import json
import re
import subprocess
import sys
from pathlib import Path
from typing import Any

import pdfplumber
import pytest
from pypdf import PdfReader

ROOT = Path(__file__).parents[2]
DEMO = ROOT / "sample_requests" / "bus-cooperative-monthly.json"
#: What the demo is built to show: one chart per intent, and the guards it exercises.
EXPECTED = {
    ("on-time-by-route", "bar-zero-baseline"): "corrected",  # asked for bars from 85 %
    ("revenue-share", "expected-parts-shown"): "corrected",  # "Group travel" has no data
    ("rating-by-route", "uncertainty"): "corrected",  # intervals and the ANOVA verdict added
    ("boardings-trend", "missing-periods"): "passed",  # August drawn as a gap
    ("boardings-trend", "partial-period"): "passed",  # November 8 of 30 days
    ("boardings-trend", "estimates-distinct"): "passed",  # run-rate estimate apart from actuals
    ("revenue-share", "parts-sum-to-whole"): "passed",
    ("cost-vs-use", "no-dual-axis"): "passed",
    ("complaints-movement", "delta-verdict"): "passed",
    ("depot-target", "lie-factor"): "passed",
    ("lateness-distribution", "histogram-bins-even"): "passed",
    ("length-vs-punctuality", "fit-on-request"): "passed",
    ("boardings-table", "table-missing-periods"): "passed",  # August listed as "no data"
    ("boardings-table", "table-partial-marked"): "passed",  # November marked 8 of 30 days
}


def plumbline(
    *args: str | Path, cwd: Path | None = None, env: dict[str, str] | None = None
) -> subprocess.CompletedProcess[str]:
    return subprocess.run(
        [sys.executable, "-m", "service.cli", *map(str, args)],
        capture_output=True,
        text=True,
        check=False,
        cwd=cwd or ROOT,
        env=env,
        timeout=120,
    )


@pytest.fixture(scope="module")
def demo_pdf(tmp_path_factory: pytest.TempPathFactory) -> Path:
    out = tmp_path_factory.mktemp("demo") / "demo.pdf"
    run = plumbline("render", DEMO, "-o", out)
    assert run.returncode == 0, run.stderr
    # the three corrections of the checks, and the control chart's centre-line label, which the
    # series leaves no room for, drawn in the key (label-layout)
    assert re.search(r"^\d+ checks: \d+ passed, 4 corrected, 0 waived, 0 failed", run.stdout, re.M)
    return out


def page_texts(path: Path) -> list[str]:
    return [page.extract_text() or "" for page in PdfReader(path).pages]


def test_cover_says_draft_and_carries_the_caution(demo_pdf: Path) -> None:
    cover = page_texts(demo_pdf)[0]
    assert "Hollin Vale Community Buses" in cover
    assert "DRAFT — not signed off" in cover
    assert "Twelve months to November 2026" in cover
    assert "9 November 2026, 07:30 UTC" in cover  # written for people, not an ISO timestamp
    assert "do not replace" in re.sub(r"\s+", " ", cover)


def test_every_page_is_numbered(demo_pdf: Path) -> None:
    texts = page_texts(demo_pdf)
    for number, text in enumerate(texts, start=1):
        assert f"Page {number} of {len(texts)}" in text


def test_chart_text_is_extractable_vector_text(demo_pdf: Path) -> None:
    with pdfplumber.open(demo_pdf) as pdf:
        images = sum(len(page.images) for page in pdf.pages)
    text = "\n".join(page_texts(demo_pdf))
    assert images == 0  # charts are vector drawings, not pictures
    for expected in (
        "no data",
        "Nov 2026 so far:",
        "8 of 30 days",
        "21 Market express",
        "Scale starts at 3.7 points, not zero",
        "1,601 journeys, below the scale",  # the partial month, off a scale it does not decide
        "expected, no data",  # the expected part the data lacks
        "Differences between routes are beyond chance (one-way ANOVA",
        "r² =",
        "94.6%",
        "Scheduled journeys",  # a series named by its label
        "Operated journeys",
    ):
        assert expected in text, expected


def _appendix_rows(path: Path, source: Path = DEMO) -> dict[tuple[str, str], str]:
    """The status of every (chart id, check) the appendix lists, on however many pages it runs:
    the rows needing attention (a six-column table naming the chart by its title and page), then
    each chart's passed checks (a grid under a line naming the chart) and the checks not
    applicable to it (a sentence under the grid)."""
    definition = json.loads(source.read_text())
    ids = {c["title"]: c["id"] for s in definition["sections"] for c in s.get("charts", [])}
    ids |= {t["title"]: t["id"] for s in definition["sections"] for t in s.get("tables", [])}
    known = {r["id"] for r in json.loads(plumbline("checks", "--json").stdout)}
    found: dict[tuple[str, str], str] = {}
    with pdfplumber.open(path) as pdf:
        start = next(
            i for i, p in enumerate(pdf.pages) if (p.extract_text() or "").startswith("Integrity")
        )
        pages = pdf.pages[start:]
        for page in pages:
            for table in page.extract_tables():
                for row in table:
                    cells = [re.sub(r"\s+", " ", cell or "").strip() for cell in row]
                    if len(cells) == 6 and cells[:3] != ["Chart", "Check", "Status"]:
                        title = re.sub(r" \(page \d+\)$", "", cells[0])
                        found[(ids[title], cells[1])] = cells[2]
        text = "\n".join(p.extract_text() or "" for p in pages)
    grids = text[text.index("\nPassed checks by chart\n") : text.index("\nRules\n")]
    chart, status = "", "passed"
    for line in grids.splitlines():
        heading = re.match(r"^(.*) · page \d+ · \d+ checks", line)
        if heading:
            chart, status = ids[heading.group(1)], "passed"
            continue
        words = line
        if line.startswith("Not applicable to this chart's form"):
            status, words = "not_applicable", line.split(":", 1)[1]
        for token in re.split(r"[\s,.]+", words):
            if chart and token in known:
                found[(chart, token)] = status
    return found


def test_appendix_lists_every_check_of_every_chart(demo_pdf: Path) -> None:
    rows = _appendix_rows(demo_pdf)
    # The CLI's own JSON, minus the check measured only while drawing, is the full list.
    report = json.loads(plumbline("check", DEMO, "--json").stdout)
    listed = {(r["chart"], r["check"]): r["status"] for r in report["results"]}
    drawn = {key: rows.pop(key) for key in list(rows) if key[1] == "label-layout"}
    assert rows == listed
    charts = {chart for chart, check in listed if not check.startswith("table-")}
    assert len(drawn) == len(charts) == 10
    assert drawn.pop(("complaints-movement", "label-layout")) == "corrected"
    assert set(drawn.values()) == {"passed"}  # no text over data, nothing cut off
    for key, status in EXPECTED.items():
        assert rows[key] == status, key
    text = " ".join(" ".join(page_texts(demo_pdf)).split())  # the rules table wraps its cells
    assert "Tufte, The Visual Display of Quantitative Information (1983), p. 57" in text


def test_every_font_is_embedded(demo_pdf: Path) -> None:
    listing = subprocess.run(
        ["pdffonts", str(demo_pdf)], capture_output=True, text=True, check=True
    ).stdout.splitlines()[2:]
    assert listing, "pdffonts listed no fonts"
    for line in listing:
        emb, _sub, uni = line.split()[-5:-2]
        assert (emb, uni) == ("yes", "yes"), line
    assert not any("Helvetica" in line for line in listing)


def test_same_definition_gives_the_same_bytes(tmp_path: Path, demo_pdf: Path) -> None:
    other = tmp_path / "again.pdf"
    env = {
        "PATH": "/usr/bin:/bin",
        "TZ": "Pacific/Auckland",
        "LANG": "de_DE.UTF-8",
        "HOME": str(tmp_path),
        "MPLCONFIGDIR": str(tmp_path / "mpl"),
    }
    run = plumbline("render", DEMO, "-o", other, cwd=tmp_path, env=env)
    assert run.returncode == 0, run.stderr
    assert (
        hashlib.sha256(other.read_bytes()).hexdigest()
        == hashlib.sha256(demo_pdf.read_bytes()).hexdigest()
    )


def _with_waiver() -> dict[str, Any]:
    definition: dict[str, Any] = json.loads(DEMO.read_text())
    definition["waivers"] = [
        {
            "check": "bar-zero-baseline",
            "chart": "on-time-by-route",
            "by": "A. Reviewer",
            "reason": "The board asked to see the spread above the 85 % floor this month.",
        }
    ]
    return definition


def test_unwaived_failure_exits_1_and_still_writes_a_marked_draft(tmp_path: Path) -> None:
    source = tmp_path / "waived.json"
    source.write_text(json.dumps(_with_waiver()))
    out = tmp_path / "blocked.pdf"
    run = plumbline("render", source, "-o", out)
    assert run.returncode == 1
    assert "BLOCKED" in run.stderr
    assert "lie-factor on on-time-by-route" in run.stderr
    text = "\n".join(page_texts(out))
    assert "CHECK FAILED — lie-factor" in text  # on the chart itself
    assert "Bars start at 85%, not zero" in text
    rows = _appendix_rows(out, source)
    assert rows[("on-time-by-route", "bar-zero-baseline")] == "waived"
    assert rows[("on-time-by-route", "lie-factor")] == "failed"


def test_check_command_json_and_exit_codes(tmp_path: Path) -> None:
    run = plumbline("check", DEMO, "--json")
    assert run.returncode == 0
    report = json.loads(run.stdout)
    assert report["blocked"] is False
    assert report["summary"]["corrected"] == 3
    assert report["summary"]["failed"] == 0
    assert report["summary"]["passed"] > 80
    assert report["summary"]["not_applicable"] > 0  # named, never counted among the passes
    source = tmp_path / "waived.json"
    source.write_text(json.dumps(_with_waiver()))
    assert plumbline("check", source).returncode == 1


def test_invalid_definition_exits_2_with_paths(tmp_path: Path) -> None:
    definition = json.loads(DEMO.read_text())
    definition["sections"][1]["charts"][0]["measure"] = "route"
    definition["datasets"][0]["rows"][2]["boardings"] = "lots"
    source = tmp_path / "bad.json"
    source.write_text(json.dumps(definition))
    run = plumbline("check", source)
    assert run.returncode == 2
    assert "sections[1].charts[0].measure: [column_type_mismatch]" in run.stderr
    assert "datasets[0].rows[2].boardings: [unparseable_value]" in run.stderr
    assert "Traceback" not in run.stderr
    missing = plumbline("check", tmp_path / "nope.json")
    assert missing.returncode == 2
    assert "cannot read" in missing.stderr


def test_markup_and_mathtext_in_user_text_are_shown_literally(tmp_path: Path) -> None:
    definition = json.loads(DEMO.read_text())
    hostile = "<b>Boarding</b> $x^2$ & <img src='/etc/passwd'/> <font color=red>"
    definition["report"]["title"] = hostile
    definition["sections"][0]["narrative"] = hostile
    definition["datasets"][2]["rows"][0]["route"] = "$\\alpha$ <i>route</i>"
    source = tmp_path / "hostile.json"
    source.write_text(json.dumps(definition))
    out = tmp_path / "hostile.pdf"
    run = plumbline("render", source, "-o", out)
    assert run.returncode == 0, run.stderr
    text = "\n".join(page_texts(out))
    assert "<b>Boarding</b> $x^2$ & <img src='/etc/passwd'/>" in text.replace("\n", " ")
    assert "$\\alpha$ <i>route</i>" in text
