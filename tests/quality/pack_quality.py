"""How publishable a drafted pack is, in figures: what a reader would find wrong on its pages.

``python -m tests.quality.pack_quality [definition.json ...]`` drafts each definition (by default
the demo and the generated gallery, ``tests/quality/gallery.py``) and prints one table of figures:

- **text over data**: labels drawn over a line, marker, bar or reference line, after mending, read
  from what the ``label-layout`` check reports on the drawn charts (not measured while that check
  reports no such count);
- **raw column identifiers**: a dataset or column name written as an identifier (with ``_``, a
  digit, or capitals inside a word: ``on_time``, ``q3sales``, ``onTime``) in the visible text of
  the pages (``pdftotext``), leaving out the chart, table and check ids of the appendix. A name
  that is a plain word (``boardings``) cannot be told from the same word in a narrative or a
  unit, so it is not counted; that table headers and axis titles use labels is held by the unit
  tests of labels;
- **missing table periods**: periods between a time-indexed table's first and last that its printed
  rows do not name (``pdftotext``, read from the table's title to the next heading);
- **key mismatches**: keys naming a mark kind that is not drawn, or missing one that is: the kinds
  the drawn key lists (the layout report's ``key_kinds``) against the kinds the checked plan asks
  for (``tests/quality/kinds.py``); not measured while either is missing;
- **sparse pages**: pages whose content ends in the top quarter of the text frame, other than the
  last page of a section, and every blank page (measured on a picture of each page, ``pdftoppm``);
- **complete-period height share**: on charts over time with a partial last period, the share of
  the plot height the complete periods span (from the zero line on an axis that starts at zero),
  computed from the checked plan's value axis and values; the smallest over the charts.

Nothing here changes the pack; it reads drafts the way a reviewer would.
"""

from __future__ import annotations

import argparse
import json
import math
import re
import subprocess
import sys
import tempfile
from collections.abc import Iterable, Iterator, Sequence
from contextlib import contextmanager
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd
from PIL import Image

from service import pipeline
from service.checks import engine, registry
from service.checks.outcome import Checked
from service.checks.results import CheckResult
from service.config import Limits
from service.data import periods
from service.definition.model import ReportDefinition
from service.intents.plan import ChartPlan, Scale, Series

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "sample_requests" / "bus-cooperative-monthly.json"
GALLERY = "gallery"
"""The name that stands for the generated gallery on the command line."""

SPARSE = 0.25
"""A page whose content ends above this share of the text frame is under a quarter full."""
HEIGHT_SHARE = 0.60
"""The complete periods must span at least this share of the plot height."""
APPENDIX_TITLES = ("Integrity checks", "Appendix", "Checks in detail")
"""Headings that begin the appendix (today's and the ones the pack may come to use)."""
_INK = 235
"""A pixel darker than this (0–255 grey) is ink; the pack's light bands are lighter."""
_DPI = 40


@dataclass(frozen=True)
class Figure:
    key: str
    title: str
    value: float | None
    """``None``: not measured."""
    target: str
    met: bool | None
    """``None`` for a figure that is only reported, or not measured."""
    detail: str = ""


@dataclass
class Draft:
    """One drafted pack and what its pages read as."""

    name: str
    checked: Checked
    pdf: bytes
    pages: list[str] = field(default_factory=list)
    """Each page's text, as ``pdftotext -layout`` reads it."""
    fill: list[float] = field(default_factory=list)
    """Each page's fill: where its lowest ink in the text frame lies, as a share of the frame."""
    reports: list[Any] = field(default_factory=list)
    """Each chart's layout report, as the renderer measured it (``render.measured``)."""


# --- drafting and reading back ---------------------------------------------------------------


@contextmanager
def _drawn_reports(into: list[Any]) -> Iterator[None]:
    """Keep the layout reports the renderer hands to the checks while a pack is drawn (the
    pipeline turns them into ``label-layout`` results and keeps nothing else of them)."""
    finish = engine.finish

    def keeping(checked: Checked, reports: Sequence[Any]) -> Checked:
        into.extend(reports)
        return finish(checked, reports)

    engine.finish = keeping
    try:
        yield
    finally:
        engine.finish = finish


def draft(raw: bytes, name: str) -> Draft:
    """Check and draw the definition as ``plumbline render`` does (serially, no cache)."""
    checked = pipeline.check(pipeline.intake(raw, Limits()))
    reports: list[Any] = []
    with _drawn_reports(reports):
        pdf, checked = pipeline.render(checked)
    found = Draft(name=name, checked=checked, pdf=pdf, reports=reports)
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "draft.pdf"
        path.write_bytes(pdf)
        text = subprocess.run(
            ["pdftotext", "-layout", str(path), "-"], check=True, capture_output=True, text=True
        ).stdout
        found.pages = text.split("\f")[: _page_count(text)]
        subprocess.run(
            ["pdftoppm", "-r", str(_DPI), "-gray", "-png", str(path), str(Path(folder) / "p")],
            check=True,
        )
        pictures = sorted(Path(folder).glob("p-*.png"), key=lambda p: int(p.stem.split("-")[1]))
        found.fill = [page_fill(np.asarray(Image.open(p).convert("L"))) for p in pictures]
    return found


def _page_count(text: str) -> int:
    return text.count("\f") or 1


def page_fill(grey: np.ndarray) -> float:
    """How far down the text frame the page's ink reaches (0: empty, 1: to the frame's foot).

    The frame is the page less its margins (``assemble.layout``); the footer, below the bottom
    margin, is not content."""
    from service.assemble import layout  # the page geometry the pack is laid out with

    height_pt = float(layout.PAGE[1])
    rows = grey.shape[0]
    top = round(rows * layout.MARGIN / height_pt)
    bottom = round(rows * (height_pt - layout.MARGIN) / height_pt)
    inked = np.flatnonzero((grey[top:bottom] < _INK).any(axis=1))
    if inked.size == 0:
        return 0.0
    return float(inked[-1] + 1) / float(bottom - top)


# --- the figures ---------------------------------------------------------------------------------


def _appendix_start(pages: Sequence[str]) -> int:
    """The index of the appendix's first page (``len(pages)`` if there is none)."""
    for i, page in enumerate(pages):
        lines = {line.strip() for line in page.splitlines()}
        if any(title in lines for title in APPENDIX_TITLES):
            return i
    return len(pages)


def _after_mending(result: CheckResult) -> str:
    """The text of what a check measured on the drawn chart after any mending."""
    if result.corrected_to:
        return result.corrected_to
    if result.status.value in ("failed", "waived"):
        return f"{result.explanation} {result.measured_text}"
    return result.measured_text


_COLLISIONS = re.compile(
    r"(\d+)\s+(?:text[- ]over[- ]data|(?:labels?|texts?)\s+over\s+data|over\s+data|"
    r"(?:text|label|data)?\s*collisions?)",
    re.IGNORECASE,
)


def text_over_data(done: Draft) -> Figure:
    title = "text over data (collisions)"
    counts: list[int] = []
    charts: list[str] = []
    for result in done.checked.results:
        if result.check != "label-layout" and "collision" not in result.check:
            continue
        match = _COLLISIONS.search(_after_mending(result))
        if match is None:
            continue
        counts.append(int(match.group(1)))
        if int(match.group(1)):
            charts.append(result.chart)
    if not counts:
        return Figure("text_over_data", title, None, "0", None, "label-layout reports no count")
    total = sum(counts)
    return Figure("text_over_data", title, total, "0", total == 0, ", ".join(charts[:6]))


def _raw_names(definition: ReportDefinition) -> set[str]:
    """The definition's identifiers a reader must not see: every dataset or column name written as
    an identifier rather than a word."""
    names = {d.name for d in definition.datasets}
    names |= {c.name for d in definition.datasets for c in d.columns}
    return {n for n in names if _IDENTIFIER.search(n)}


_IDENTIFIER = re.compile(r"_|\d|[a-z][A-Z]")
"""What marks a name as an identifier, not a word: an underscore, a digit, a capital inside it."""


def raw_identifiers(done: Draft) -> Figure:
    definition = done.checked.definition
    ids = {c.plan.chart_id for c in done.checked.charts} | set(registry.CHECKS)
    ids |= {t.id for s in definition.sections for t in s.tables}
    names = sorted(_raw_names(definition), key=len, reverse=True)
    named = re.compile("|".join(rf"(?<![\w-]){re.escape(n)}(?![\w-])" for n in names) or r"(?!)")
    appendix = _appendix_start(done.pages)
    seen: list[str] = []
    for i, page in enumerate(done.pages):
        text = page
        if i >= appendix:
            for known in sorted(ids, key=len, reverse=True):
                text = re.sub(rf"(?<![\w-]){re.escape(known)}(?![\w-])", " ", text)
        seen += [m.group(0) for m in named.finditer(text)]
    examples = ", ".join(sorted(set(seen))[:8])
    return Figure(
        "raw_identifiers", "raw column identifiers on the page", len(seen), "0", not seen, examples
    )


def _period_names(period: pd.Period, frequency: periods.Frequency, locale: str) -> set[str]:
    """The ways a table may name a period: its axis label, its first day, its full month name."""
    from babel.dates import format_date

    first = periods.start(period).date()
    names = {periods.label(period, frequency, locale), first.isoformat()}
    if frequency is periods.Frequency.month:
        names.add(str(format_date(first, "MMMM y", locale=locale.replace("-", "_"))))
    return names


def _line(text: str, words: str, after: int) -> int | None:
    """Where the first line after ``after`` that reads exactly ``words`` ends (a heading, not a
    chart title that begins with the same words)."""
    found = re.compile(rf"^[ \t]*{re.escape(words)}[ \t]*$", re.MULTILINE).search(text, after)
    return None if found is None else found.end()


def missing_table_periods(done: Draft) -> Figure:
    definition = done.checked.definition
    text = "\n".join(done.pages[: _appendix_start(done.pages)])
    headings = [s.heading for s in definition.sections]
    titles = [t.title for s in definition.sections for t in s.tables]
    missing: list[str] = []
    cursor = 0
    for section in definition.sections:
        for spec in section.tables:
            table = done.checked.tables[spec.dataset]
            if table.periods is None or table.frequency is None or len(table.periods) == 0:
                continue
            start = _line(text, spec.title, cursor)
            if start is None:
                missing.append(f"{spec.id}: table not found")
                continue
            cursor = start
            ends = [_line(text, h, cursor) for h in [*headings, *titles]]
            printed = text[cursor : min([e for e in ends if e is not None], default=len(text))]
            every = periods.expected(table.periods.min(), table.periods.max())
            locale = definition.report.locale
            for period in every:
                names = _period_names(period, table.frequency, locale)
                if not any(n in printed for n in names):
                    missing.append(f"{spec.id}: {periods.label(period, table.frequency, locale)}")
    return Figure(
        "missing_table_periods",
        "periods missing from time-indexed tables",
        len(missing),
        "0",
        not missing,
        ", ".join(missing[:6]),
    )


def key_mismatches(done: Draft) -> Figure:
    """Per chart, the kinds of mark its key lists (the layout report's ``key_kinds``) against the
    kinds its plan asks to be drawn (``tests.quality.kinds``): each kind in one and not the other
    counts once."""
    title = "keys naming marks not drawn, or missing drawn ones"
    try:
        from tests.quality.kinds import kinds_in_plan
    except ImportError:
        return Figure("key_mismatches", title, None, "0", None, "no reading of a plan's mark kinds")
    if len(done.reports) != len(done.checked.charts) or not all(
        hasattr(r, "key_kinds") for r in done.reports
    ):
        return Figure("key_mismatches", title, None, "0", None, "the drawing reports no key")
    wrong = 0
    charts = []
    for chart, report in zip(done.checked.charts, done.reports, strict=True):
        differ = set(kinds_in_plan(chart.plan)) ^ set(report.key_kinds)
        wrong += len(differ)
        if differ:
            charts.append(f"{chart.plan.chart_id} ({', '.join(sorted(differ))})")
    return Figure("key_mismatches", title, wrong, "0", wrong == 0, ", ".join(charts[:6]))


def _starts_section(page: str, headings: Iterable[str]) -> bool:
    first = next((line.strip() for line in page.splitlines() if line.strip()), "")
    return first in set(headings) | set(APPENDIX_TITLES)


def sparse_pages(done: Draft) -> Figure:
    headings = [s.heading for s in done.checked.definition.sections]
    sparse = []
    for i, fill in enumerate(done.fill):
        last = i == len(done.fill) - 1
        ends_section = last or _starts_section(done.pages[i + 1], headings)
        if fill == 0 or (fill < SPARSE and not ends_section):  # a blank page ends nothing
            sparse.append(f"p. {i + 1} ({fill:.0%})")
    return Figure(
        "sparse_pages",
        "pages under a quarter full (not ending a section)",
        len(sparse),
        "reported",
        None,
        ", ".join(sparse[:8]),
    )


def _axis_share(scale: Scale, series: Sequence[Series], partial: int) -> float | None:
    complete = [
        float(v)
        for s in series
        for i, v in enumerate(s.values)
        if i != partial and v is not None and math.isfinite(v)
    ]
    if not complete or scale.hi <= scale.lo:
        return None

    def at(value: float) -> float:
        return math.log10(value) if scale.log else value

    top = at(max(complete))
    bottom = at(scale.lo) if scale.lo == 0 and not scale.log else at(min(complete))
    return (top - bottom) / (at(scale.hi) - at(scale.lo))


def height_share_of(plan: ChartPlan) -> float | None:
    """The share of the plot height the complete periods span, on a chart with a partial period
    (the smallest over its panels); ``None`` when the chart has no partial period."""
    if plan.partial is None:
        return None
    axes = [(plan.value_axis, plan.series)] if plan.series else []
    axes += [(p.value_axis, p.series) for p in plan.panels]
    shares = [_axis_share(scale, series, plan.partial.index) for scale, series in axes]
    found = [s for s in shares if s is not None]
    return min(found) if found else None


def height_share(done: Draft) -> Figure:
    title = "complete-period plot height share (smallest)"
    shares = {
        c.plan.chart_id: share
        for c in done.checked.charts
        if (share := height_share_of(c.plan)) is not None
    }
    if not shares:
        return Figure("height_share", title, None, "≥ 60 %", None, "no chart with a partial period")
    low = min(shares.values())
    below = [f"{k} ({v:.0%})" for k, v in shares.items() if v < HEIGHT_SHARE]
    return Figure("height_share", title, low, "≥ 60 %", low >= HEIGHT_SHARE, ", ".join(below))


MEASURES = (
    text_over_data,
    raw_identifiers,
    missing_table_periods,
    key_mismatches,
    sparse_pages,
    height_share,
)


def measure(raw: bytes, name: str) -> list[Figure]:
    """Every figure of one definition's draft."""
    done = draft(raw, name)
    return [m(done) for m in MEASURES]


# --- the table -------------------------------------------------------------------------------------


def shown(figure: Figure) -> str:
    if figure.value is None:
        return "not measured"
    if figure.key == "height_share":
        return f"{figure.value:.0%}"
    return f"{figure.value:g}"


def verdict(figure: Figure) -> str:
    if figure.met is None:
        return "reported" if figure.value is not None else "—"
    return "met" if figure.met else "NOT MET"


def table(measured: dict[str, list[Figure]]) -> str:
    """One row per figure and pack: the value, the target, whether it is met, and examples."""
    rows = [("pack", "figure", "value", "target", "verdict", "where")]
    for name, figures in measured.items():
        rows += [(name, f.title, shown(f), f.target, verdict(f), f.detail) for f in figures]
    widths = [max(len(r[c]) for r in rows) for c in range(5)]
    lines = []
    for r, row in enumerate(rows):
        cells = [row[c].ljust(widths[c]) for c in range(5)]
        lines.append("  ".join([*cells, row[5]]).rstrip())
        if r == 0:
            lines.append("  ".join("-" * w for w in widths))
    return "\n".join(lines)


def _definition(name: str) -> tuple[str, bytes]:
    if name == GALLERY:
        from tests.quality import gallery

        return GALLERY, json.dumps(gallery.build()).encode()
    path = Path(name)
    return path.stem, path.read_bytes()


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description="Measure how publishable drafted packs are.")
    parser.add_argument(
        "definitions",
        nargs="*",
        help=f"definition files, or '{GALLERY}' for the generated gallery "
        f"(default: the demo and the gallery)",
    )
    args = parser.parse_args(argv)
    names = args.definitions or [str(DEMO), GALLERY]
    measured = {}
    for name in names:
        label, raw = _definition(name)
        measured[label] = measure(raw, label)
    sys.stdout.write(table(measured) + "\n")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
