"""The plain-library floor: the script an analyst would write for the same pack, with no checks.

It reads the same definition JSON (pandas for the rows), draws every chart's marks from the same
data with matplotlib's object API (``Figure``, no pyplot), all charts as pages of one vector PDF
(``PdfPages``, one font subset), lays the document out with reportlab (a title and a fixed-size
placeholder per chart) and places each chart page into its placeholder as a pikepdf form XObject:
the cheapest honest placement measured in ENGINEERING.md. Fonts as the house's: DejaVu Sans,
TrueType (type 42) subsets, ASCII minus. It imports nothing of Plumbline, on purpose.

What it leaves out is what Plumbline adds: validation, periods and gaps, checks and corrections,
notes, label-layout mending, the appendix, PDF/A.
"""

from __future__ import annotations

import io
import json
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import matplotlib
import numpy as np
import pandas as pd
import pikepdf
from matplotlib.axes import Axes
from matplotlib.backends.backend_pdf import PdfPages
from matplotlib.figure import Figure
from reportlab.lib.pagesizes import A4
from reportlab.lib.styles import getSampleStyleSheet
from reportlab.lib.units import mm
from reportlab.pdfbase import pdfmetrics
from reportlab.pdfbase.ttfonts import TTFont
from reportlab.platypus import Flowable, Paragraph, SimpleDocTemplate

WIDTH_IN = 6.69  # 170 mm, the text width of A4 with 20 mm margins
LINE_IN = 2.9
ROW_IN = 0.27
BLUE = "#1f5f8b"
INK = "#222222"
GREY = "#777777"

RC: dict[str, Any] = {
    "font.family": "DejaVu Sans",
    "font.size": 8.5,
    "pdf.fonttype": 42,
    "ps.fonttype": 42,
    "axes.unicode_minus": False,
    "path.simplify": True,
    "pdf.compression": 6,
    "text.parse_math": False,
}


@dataclass(frozen=True)
class Result:
    pdf: bytes
    charts: int
    pages: int


def frames(definition: dict[str, Any]) -> dict[str, pd.DataFrame]:
    out = {}
    for d in definition["datasets"]:
        if d.get("csv") is not None:
            frame = pd.read_csv(io.StringIO(d["csv"]))
        else:
            frame = pd.DataFrame.from_records(d["rows"])
        for column in d["columns"]:
            if column["type"] in {"date", "timestamp"}:
                frame[column["name"]] = pd.to_datetime(frame[column["name"]])
        out[d["name"]] = frame
    return out


def _bars_height(rows: int) -> float:
    return min(8.5, 0.75 + ROW_IN * max(rows, 2))


def _hbars(ax: Axes, labels: list[str], values: list[float], texts: list[str]) -> None:
    rows = np.arange(len(labels))[::-1]
    ax.barh(rows, values, height=0.62, color=BLUE, linewidth=0)
    for y, v, t in zip(rows, values, texts, strict=True):
        ax.text(v, y, " " + t, va="center", ha="left", fontsize=7.5, color=INK)
    ax.set_yticks(rows, labels)
    ax.grid(axis="x", color="#e5e5e5", linewidth=0.6)
    ax.set_axisbelow(True)


def draw(chart: dict[str, Any], frame: pd.DataFrame) -> Figure:  # noqa: PLR0912, PLR0915
    """The chart's figure: the same marks from the same data, plain."""
    intent = chart["intent"]
    if intent in {"compare", "share", "target"}:
        figure = Figure(figsize=(WIDTH_IN, _bars_height(len(frame))), layout="constrained")
    elif intent == "distribution" and chart.get("form") == "box":
        groups = frame[chart["group"]].nunique()
        figure = Figure(
            figsize=(WIDTH_IN, min(8.5, 1.0 + 2 * ROW_IN * groups)), layout="constrained"
        )
    elif intent == "relative_change" and chart.get("form") == "panels":
        height = min(9.0, 0.6 + 1.6 * len(chart["measures"]))
        figure = Figure(figsize=(WIDTH_IN, height), layout="constrained")
    else:
        figure = Figure(figsize=(WIDTH_IN, LINE_IN), layout="constrained")
    if intent == "relative_change" and chart.get("form") == "panels":
        axes = figure.subplots(len(chart["measures"]), 1, sharex=True)
        for ax, measure in zip(axes, chart["measures"], strict=True):
            ax.plot(frame["day"], frame[measure], color=BLUE, linewidth=1.6)
            ax.set_ylabel(measure)
            ax.grid(axis="y", color="#e5e5e5", linewidth=0.6)
        return figure
    ax = figure.add_subplot()
    if intent == "trend":
        for measure in chart["measures"]:
            ax.plot(frame["day"], frame[measure], color=BLUE, linewidth=1.6)
        if chart.get("from_zero"):
            ax.set_ylim(bottom=0)
        ax.grid(axis="y", color="#e5e5e5", linewidth=0.6)
    elif intent == "compare":
        ordered = frame.sort_values(chart["measure"], ascending=False)
        labels = ordered[chart["category"]].tolist()
        values = ordered[chart["measure"]].tolist()
        if chart.get("focus") == "differences":
            rows = np.arange(len(labels))[::-1]
            half = 1.96 * ordered["sd"] / np.sqrt(ordered["n"])
            ax.errorbar(values, rows, xerr=half, fmt="o", color=BLUE, ecolor=INK, capsize=2)
            for y, v in zip(rows, values, strict=True):
                ax.text(v, y + 0.28, f"{v:,.1f}", ha="center", va="bottom", fontsize=7)
            ax.set_yticks(rows, labels)
        else:
            _hbars(ax, labels, values, [f"{v:,.1f} Ml" for v in values])
    elif intent == "share":
        ordered = frame.sort_values(chart["measure"], ascending=False)
        values = ordered[chart["measure"]]
        shares = (100 * values / values.sum()).tolist()
        _hbars(ax, ordered[chart["category"]].tolist(), shares, [f"{s:.1f} %" for s in shares])
    elif intent == "relative_change":
        for measure in chart["measures"]:
            series = frame[measure]
            ax.plot(frame["day"], series * 100.0 / series.iloc[0], linewidth=1.6)
        ax.axhline(100, color=GREY, linewidth=0.8, linestyle="--")
    elif intent == "movement":
        values = frame[chart["measure"]]
        centre = values.mean()
        mr_bar = values.diff().abs().mean()
        ax.plot(frame["day"], values, color=BLUE, linewidth=1.6)
        for level in (centre - 2.66 * mr_bar, centre, centre + 2.66 * mr_bar):
            ax.axhline(level, color=GREY, linewidth=0.8)
        out = (values - centre).abs() > 2.66 * mr_bar
        ax.plot(frame["day"][out], values[out], "o", color="#b3261e", markersize=6)
    elif intent == "target":
        ordered = frame.sort_values(chart["actual"], ascending=False)
        labels = ordered[chart["category"]].tolist()
        actual = ordered[chart["actual"]].to_numpy()
        target = ordered[chart["target"]].to_numpy()
        rows = np.arange(len(labels))[::-1]
        if chart.get("form") == "deviation":
            gap = (actual - target).tolist()
            _hbars(ax, labels, gap, [f"{g:+,.1f}" for g in gap])
            ax.axvline(0, color=INK, linewidth=0.8)
        else:
            _hbars(ax, labels, actual.tolist(), [f"{a:,.1f}" for a in actual])
            for y, t in zip(rows, target, strict=True):
                ax.plot([t, t], [y - 0.42, y + 0.42], color=INK, linewidth=1.6)
    elif intent == "distribution":
        values = frame[chart["measure"]].dropna()
        if chart.get("form") == "box":
            names = sorted(frame[chart["group"]].unique())
            data = [frame.loc[frame[chart["group"]] == n, chart["measure"]] for n in names]
            ax.boxplot(data, orientation="horizontal", tick_labels=names)
        else:
            ax.hist(values, bins=chart.get("bins") or "auto", color=BLUE, edgecolor="white")
    elif intent == "relationship":
        x, y = frame[chart["x"]], frame[chart["y"]]
        ax.scatter(x, y, s=18, color=BLUE, linewidths=0)
        if chart.get("fit"):
            slope, intercept = np.polyfit(x, y, 1)
            ax.plot([x.min(), x.max()], [intercept + slope * x.min(), intercept + slope * x.max()])
    else:
        raise ValueError(f"the floor cannot draw intent {intent!r}")
    return figure


class Placeholder(Flowable):  # type: ignore[misc]
    """Room for one chart; records the page and position it landed on."""

    def __init__(self, width: float, height: float, found: list[tuple[int, float, float]]) -> None:
        super().__init__()
        self.width, self.height, self._found = width, height, found

    def wrap(self, avail_width: float, avail_height: float) -> tuple[float, float]:
        return self.width, self.height

    def draw(self) -> None:
        x, y = self.canv.absolutePosition(0, 0)
        self._found.append((self.canv.getPageNumber() - 1, x, y))


def _register_fonts() -> str:
    folder = Path(matplotlib.get_data_path()) / "fonts" / "ttf"
    pdfmetrics.registerFont(TTFont("FloorSans", str(folder / "DejaVuSans.ttf")))
    return "FloorSans"


def build(raw: bytes) -> Result:
    """The floor's pack from a definition's bytes."""
    definition = json.loads(raw)
    tables = frames(definition)
    charts = [c for s in definition["sections"] for c in s["charts"]]
    chart_pdf = io.BytesIO()
    sizes = []
    params: Any = RC  # the stubs accept only literal keys
    with (
        matplotlib.rc_context(params),
        PdfPages(chart_pdf, metadata={"CreationDate": None}) as pages,
    ):
        for chart in charts:
            figure = draw(chart, tables[chart["dataset"]])
            sizes.append(tuple(figure.get_size_inches() * 72))
            pages.savefig(figure)
    font = _register_fonts()
    styles = getSampleStyleSheet()
    for style in ("Title", "Heading2", "Heading3", "Normal"):
        styles[style].fontName = font
    found: list[tuple[int, float, float]] = []
    story: list[Flowable] = [Paragraph(definition["report"]["title"], styles["Title"])]
    k = 0
    for section in definition["sections"]:
        story.append(Paragraph(section["heading"], styles["Heading2"]))
        for chart in section["charts"]:
            story.append(Paragraph(chart["title"], styles["Heading3"]))
            story.append(Placeholder(sizes[k][0], sizes[k][1], found))
            k += 1
    document = io.BytesIO()
    margin = 20 * mm
    SimpleDocTemplate(
        document,
        pagesize=A4,
        leftMargin=margin,
        rightMargin=margin,
        topMargin=margin,
        bottomMargin=margin,
        initialFontName=font,
    ).build(story)
    out = io.BytesIO()
    with (
        pikepdf.open(io.BytesIO(document.getvalue())) as pdf,
        pikepdf.open(io.BytesIO(chart_pdf.getvalue())) as source,
    ):
        for number, (page_no, x, y) in enumerate(found):
            page = pdf.pages[page_no]
            form = pdf.copy_foreign(source.pages[number].as_form_xobject())
            name = page.add_resource(
                form, pikepdf.Name.XObject, name=pikepdf.Name(f"/Chart{number}")
            )
            width, height = sizes[number]
            rect = pikepdf.Rectangle(x, y, x + width, y + height)
            placement = page.calc_form_xobject_placement(form, pikepdf.Name(str(name)), rect)
            page.contents_add(pikepdf.Stream(pdf, placement), prepend=False)
        pdf.save(out)
        page_count = len(pdf.pages)
    return Result(pdf=out.getvalue(), charts=len(found), pages=page_count)


__all__ = ["Result", "build", "draw", "frames"]
