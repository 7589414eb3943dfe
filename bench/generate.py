"""Generated packs for the benchmark: an invented water utility's operations pack, from a seed.

``sixty`` is a pack of mixed intents (every intent of version 1, in several variants) whose charts
draw 12 to 1,000 points each; ``million`` is one chart over a 1,000,000-row dataset given as CSV
text (the cheapest form to parse). The same seed gives the same bytes.

The scenario (Brackwater Vale Water, its works, zones and reservoirs) is invented.

Why ``million`` is not a trend: a trend needs a time column with a declared frequency of a day or
longer, one row per period. A million days is about 2,738 years, beyond the range of pandas'
nanosecond timestamps (1677-09-21 to 2262-04-11, about 213,000 days), so the dates cannot be read;
a million minutes in a day-frequency dataset are refused as duplicate periods. ``long_trend`` is the
longest daily trend Plumbline can take (200,000 days), and ``million`` draws a histogram of a
million minute readings, timestamps included, so the million rows are parsed and checked.
"""

from __future__ import annotations

import json
from datetime import date, timedelta
from typing import Any

import numpy as np

from service.config import Limits

AS_OF = "2026-11-09T07:30:00+00:00"
LAST_DAY = date(2026, 10, 31)

WORKS = (
    "Brackwater",
    "Elmfold",
    "Hatherby",
    "Kestle Moor",
    "Lowen Bridge",
    "Marrow Fen",
    "Northcote",
    "Oakhurst",
    "Pellin",
    "Quarrendon",
    "Rushmere",
    "Saltway",
    "Thornhythe",
    "Upper Wend",
    "Vennick",
    "Wistow",
)
KINDS = ("zone", "reservoir", "pumping station", "treatment works", "district meter area")

#: (intent, variant) of the dataset pairs, cycled: each dataset serves two charts.
PAIRS: tuple[tuple[str, dict[str, Any], dict[str, Any]], ...] = (
    ("trend", {"from_zero": True}, {"from_zero": False}),
    ("compare", {}, {"focus": "differences", "interval": {"sd": "sd", "n": "n"}}),
    ("share", {}, {"allow_pie": True}),
    ("relative_change", {"form": "index"}, {"form": "panels"}),
    ("movement", {}, {"run_length": 9}),
    ("target", {"form": "bars"}, {"form": "deviation"}),
    ("distribution", {"form": "histogram"}, {"form": "box", "group": "works"}),
    ("relationship", {"fit": True}, {"fit": False}),
)

CATEGORICAL = {"compare", "share", "target"}


def _names(count: int, rng: np.random.Generator) -> list[str]:
    names = [f"{w} {k}" for k in KINDS for w in WORKS]
    order = rng.permutation(len(names))[:count]
    return [names[i] for i in order]


def _days(count: int) -> list[str]:
    first = LAST_DAY - timedelta(days=count - 1)
    return [(first + timedelta(days=d)).isoformat() for d in range(count)]


def _csv(header: list[str], columns: list[list[Any]]) -> str:
    lines = [",".join(header)]
    lines += [",".join(str(v) for v in row) for row in zip(*columns, strict=True)]
    return "\n".join(lines) + "\n"


def _walk(rng: np.random.Generator, count: int, level: float, step: float) -> list[float]:
    values = level + np.cumsum(rng.normal(0.0, step, count))
    return [round(float(v), 1) for v in np.maximum(values, level * 0.2)]


def _dataset(intent: str, name: str, points: int, rng: np.random.Generator) -> dict[str, Any]:
    source = "Brackwater Vale Water operations systems (invented demo data)"
    if intent in {"trend", "movement", "relative_change"}:
        days = _days(points)
        supplied = _walk(rng, points, 180.0, 2.5)
        columns = [
            {"name": "day", "type": "date"},
            {"name": "supplied", "type": "number", "unit": "Ml"},
            {"name": "leakage", "type": "number", "unit": "Ml"},
            {"name": "energy", "type": "number", "unit": "MWh"},
        ]
        leakage = _walk(rng, points, 24.0, 0.6)
        energy = _walk(rng, points, 41.0, 0.9)
        return {
            "name": name,
            "source": source,
            "columns": columns,
            "time_column": "day",
            "frequency": "day",
            "csv": _csv(
                ["day", "supplied", "leakage", "energy"], [days, supplied, leakage, energy]
            ),
        }
    if intent in CATEGORICAL:
        labels = _names(points, rng)
        actual = [round(float(v), 1) for v in rng.uniform(40.0, 400.0, points)]
        target = [
            round(a * float(f), 1)
            for a, f in zip(actual, rng.uniform(0.85, 1.15, points), strict=True)
        ]
        sd = [round(float(v), 2) for v in rng.uniform(2.0, 9.0, points)]
        n = [int(v) for v in rng.integers(30, 400, points)]
        rows = [
            {"asset": a, "volume": v, "plan": t, "sd": s, "n": k}
            for a, v, t, s, k in zip(labels, actual, target, sd, n, strict=True)
        ]
        return {
            "name": name,
            "source": source,
            "columns": [
                {"name": "asset", "type": "text"},
                {"name": "volume", "type": "number", "unit": "Ml"},
                {"name": "plan", "type": "number", "unit": "Ml"},
                {"name": "sd", "type": "number", "unit": "Ml"},
                {"name": "n", "type": "integer", "unit": "samples"},
            ],
            "rows": rows,
        }
    if intent == "distribution":
        pressure = [round(float(v), 2) for v in rng.gamma(9.0, 0.45, points) + 1.0]
        works = [WORKS[int(i)] for i in rng.integers(0, 5, points)]
        return {
            "name": name,
            "source": source,
            "columns": [
                {"name": "pressure", "type": "number", "unit": "bar"},
                {"name": "works", "type": "text"},
            ],
            "csv": _csv(["pressure", "works"], [pressure, works]),
        }
    length = rng.uniform(2.0, 60.0, points)
    bursts = 0.8 * length + rng.normal(0.0, 6.0, points)
    return {
        "name": name,
        "source": source,
        "columns": [
            {"name": "main_length", "type": "number", "unit": "km"},
            {"name": "bursts", "type": "number", "unit": "bursts"},
        ],
        "csv": _csv(
            ["main_length", "bursts"],
            [[round(float(v), 2) for v in length], [round(float(v), 1) for v in bursts]],
        ),
    }


def _chart(intent: str, cid: str, dataset: str, variant: dict[str, Any]) -> dict[str, Any]:
    chart: dict[str, Any] = {"id": cid, "intent": intent, "dataset": dataset}
    title = {
        "trend": "Water put into supply by day",
        "compare": "Volume by asset, October 2026",
        "share": "Share of volume by asset, October 2026",
        "relative_change": "Leakage and pumping energy since the first day",
        "movement": "Daily leakage: signal or routine variation?",
        "target": "Volume against plan by asset, October 2026",
        "distribution": "Spread of network pressure readings",
        "relationship": "Length of mains and bursts per district",
    }[intent]
    chart["title"] = title
    if intent == "trend":
        chart |= {"measures": ["supplied"], **variant}
    elif intent in {"compare", "share"}:
        chart |= {"category": "asset", "measure": "volume", **variant}
    elif intent == "relative_change":
        chart |= {"measures": ["leakage", "energy"], **variant}
    elif intent == "movement":
        chart |= {"measure": "leakage", **variant}
    elif intent == "target":
        chart |= {"category": "asset", "actual": "volume", "target": "plan", **variant}
    elif intent == "distribution":
        chart |= {"measure": "pressure", "bins": 40, **variant}
    else:
        chart |= {"x": "main_length", "y": "bursts", **variant}
    return chart


def _report(pack_id: str, title: str) -> dict[str, Any]:
    return {
        "id": pack_id,
        "title": title,
        "period": {"start": "2026-10-01", "end": "2026-10-31", "label": "October 2026"},
        "as_of": AS_OF,
        "owner": "Network performance desk",
        "audience": "Operations board",
        "locale": "en-GB",
    }


def sixty(seed: int = 2026, charts: int = 60) -> dict[str, Any]:
    """A pack of ``charts`` charts (an even number), two per dataset, intents cycled."""
    rng = np.random.default_rng(seed)
    datasets: list[dict[str, Any]] = []
    sections: list[dict[str, Any]] = []
    for d in range(-(-charts // 2)):
        intent, first, second = PAIRS[d % len(PAIRS)]
        top = 60 if intent in CATEGORICAL else 1000
        points = int(rng.integers(12, top + 1))
        name = f"ds{d:02d}"
        datasets.append(_dataset(intent, name, points, rng))
        pair = [_chart(intent, f"c{2 * d:02d}", name, first)]
        if 2 * d + 1 < charts:
            pair.append(_chart(intent, f"c{2 * d + 1:02d}", name, second))
        sections.append({"heading": f"Part {d + 1}: {intent.replace('_', ' ')}", "charts": pair})
    return {
        "version": 1,
        "report": _report("brackwater-ops-bench", "Brackwater Vale Water — operations pack"),
        "datasets": datasets,
        "sections": sections,
    }


def million(seed: int = 2026, rows: int = 1_000_000) -> dict[str, Any]:
    """One histogram over ``rows`` minute readings of network pressure (timestamps parsed too)."""
    rng = np.random.default_rng(seed)
    start = np.datetime64("2026-10-31T00:00") - np.timedelta64(rows, "m")
    stamps = np.datetime_as_string(start + np.arange(rows).astype("timedelta64[m]"), unit="m")
    pressure = np.round(rng.gamma(9.0, 0.45, rows) + 1.0, 2)
    lines = "\n".join(f"{t},{p}" for t, p in zip(stamps.tolist(), pressure.tolist(), strict=True))
    dataset = {
        "name": "pressure_log",
        "source": "Network pressure loggers, one reading a minute (invented demo data)",
        "columns": [
            {"name": "read_at", "type": "timestamp"},
            {"name": "pressure", "type": "number", "unit": "bar"},
        ],
        "csv": "read_at,pressure\n" + lines + "\n",
    }
    chart = {
        "id": "pressure-spread",
        "intent": "distribution",
        "title": "Spread of a million network pressure readings",
        "dataset": "pressure_log",
        "measure": "pressure",
        "bins": 40,
    }
    return {
        "version": 1,
        "report": _report("brackwater-pressure-bench", "Brackwater Vale Water — pressure log"),
        "datasets": [dataset],
        "sections": [{"heading": "Pressure", "charts": [chart]}],
    }


def long_trend(seed: int = 2026, rows: int = 200_000) -> dict[str, Any]:
    """One trend over ``rows`` daily values: near the longest daily series pandas dates can hold."""
    rng = np.random.default_rng(seed)
    start = np.datetime64(LAST_DAY.isoformat()) - np.timedelta64(rows - 1, "D")
    days = np.datetime_as_string(start + np.arange(rows).astype("timedelta64[D]"), unit="D")
    supplied = np.round(180.0 + np.cumsum(rng.normal(0.0, 0.5, rows)), 1)
    supplied = np.maximum(supplied, 1.0)
    lines = "\n".join(f"{d},{v}" for d, v in zip(days.tolist(), supplied.tolist(), strict=True))
    dataset = {
        "name": "supply_log",
        "source": "Daily supply returns (invented demo data)",
        "columns": [
            {"name": "day", "type": "date"},
            {"name": "supplied", "type": "number", "unit": "Ml"},
        ],
        "time_column": "day",
        "frequency": "day",
        "csv": "day,supplied\n" + lines + "\n",
    }
    chart = {
        "id": "supply-trend",
        "intent": "trend",
        "title": "Water put into supply by day, since records began",
        "dataset": "supply_log",
        "measures": ["supplied"],
    }
    return {
        "version": 1,
        "report": _report("brackwater-supply-bench", "Brackwater Vale Water — supply history"),
        "datasets": [dataset],
        "sections": [{"heading": "Supply", "charts": [chart]}],
    }


def big_limits() -> Limits:
    """Limits that admit the long packs (the defaults stop at 200,000 rows and 10 MB)."""
    return Limits(max_rows=1_200_000, max_payload_bytes=60_000_000)


PACKS = {"sixty": sixty, "million": million, "long_trend": long_trend}


def encoded(pack: dict[str, Any]) -> bytes:
    return json.dumps(pack, ensure_ascii=False, separators=(",", ":")).encode()


__all__ = ["PACKS", "big_limits", "encoded", "long_trend", "million", "sixty"]
