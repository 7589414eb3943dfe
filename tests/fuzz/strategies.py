"""Hypothesis strategies for report definitions: valid ones of every intent, and mutations of them.

``definitions()`` draws definitions that must pass ``/v1/check``: one to three charts of mixed
intents, each with a dataset made for it (time series for the intents over time, categories for
the others), plain or accented Latin, Greek and Cyrillic text (all in the house typeface), values
with gaps but never all missing. The shapes follow ``service/definition/model.py`` and
``tests/factories.py``.

``mutations()`` takes a valid definition and breaks it in one way a sender might: a field dropped,
a value of the wrong type, a huge number, NaN or ±Infinity (as bare JSON tokens, which Python's
parser accepts, and as strings), an empty dataset, a single row, a column with every value
missing, text the typeface lacks (emoji, CJK), right-to-left text, or 10,000 categories. Each
mutation says where it struck, so a test can look for that place among the problems reported.
"""

from __future__ import annotations

import copy
import json
from dataclasses import dataclass
from datetime import date
from typing import Any

from hypothesis import strategies as st

Json = dict[str, Any]

AS_OF = "2026-11-09T07:30:00+00:00"
"""9 November 2026 (as in ``tests/factories.py``): November is a partial month."""

SAFE_LETTERS = (
    "abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789"
    "éèüöøåçñßÉÅ"  # accented Latin
    "αβγδλμπΩ"  # Greek
    "жзийклмнД"  # Cyrillic
)
"""Letters DejaVu Sans draws (every face), so text built from them is never refused."""

UNITS = ("journeys", "GBP", "%", "boardings", "minutes", "kWh")


def labels(min_size: int = 1, max_size: int = 30) -> st.SearchStrategy[str]:
    """Short human text: words of safe letters separated by single spaces."""
    word = st.text(alphabet=SAFE_LETTERS, min_size=1, max_size=10)
    return (
        st.lists(word, min_size=1, max_size=4)
        .map(" ".join)
        .filter(lambda s: min_size <= len(s) <= max_size)
    )


def _value(lo: float, hi: float, *, integer: bool) -> st.SearchStrategy[float | int]:
    if integer:
        return st.integers(int(lo), int(hi))
    return st.floats(lo, hi, allow_nan=False, allow_infinity=False).map(lambda v: round(v, 2))


def _with_gaps(values: list[Any], gaps: list[bool]) -> list[Any]:
    """Some values missing (``None``), never all of them."""
    out = [None if g else v for v, g in zip(values, gaps, strict=False)]
    return out if any(v is not None for v in out) else values


# ---- time series ---------------------------------------------------------------------------

_LAST_MONTH = (2026, 11)  # the partial month of AS_OF


def _months(n: int, *, include_partial: bool) -> list[str]:
    year, month = _LAST_MONTH
    if not include_partial:
        year, month = (year, month - 1) if month > 1 else (year - 1, 12)
    out = []
    for _ in range(n):
        out.append(date(year, month, 1).isoformat())
        year, month = (year, month - 1) if month > 1 else (year - 1, 12)
    return out[::-1]


@st.composite
def time_dataset(
    draw: st.DrawFn,
    name: str,
    measures: int,
    *,
    min_rows: int = 1,
    positive: bool = False,
    one_unit: bool = True,
    full_first_row: bool = False,
) -> tuple[Json, list[str]]:
    """A monthly dataset named ``name`` with ``measures`` numeric columns; returns it and the
    measure names. ``full_first_row``: the first period has every measure (an index base)."""
    n = draw(st.integers(min_rows, 24))
    months = _months(n, include_partial=draw(st.booleans()))
    names = [f"m{i}" for i in range(measures)]
    unit = draw(st.sampled_from(UNITS))
    columns: list[Json] = [{"name": "month", "type": "date"}]
    rows: list[Json] = [{"month": m} for m in months]
    for i, measure in enumerate(names):
        integer = draw(st.booleans())
        column: Json = {
            "name": measure,
            "type": "integer" if integer else "number",
            "unit": unit if one_unit else UNITS[(UNITS.index(unit) + i) % len(UNITS)],
        }
        if draw(st.booleans()):
            column["projectable"] = True
        if draw(st.integers(0, 5)) == 0:
            column["estimate"] = True
        columns.append(column)
        lo = 1 if positive else draw(st.sampled_from([0, -500]))
        values = draw(st.lists(_value(lo, 60_000, integer=integer), min_size=n, max_size=n))
        gaps = draw(st.lists(st.integers(0, 6).map(lambda g: g == 0), min_size=n, max_size=n))
        if full_first_row:
            gaps[0] = False
        for row, value in zip(rows, _with_gaps(values, gaps), strict=True):
            row[measure] = value
    dataset: Json = {
        "name": name,
        "columns": columns,
        "time_column": "month",
        "frequency": "month",
    }
    if draw(st.booleans()):
        dataset["rows"] = rows
    else:
        dataset["csv"] = _csv(columns, rows)
    if draw(st.booleans()):
        dataset["source"] = draw(labels())
    return dataset, names


def _csv(columns: list[Json], rows: list[Json]) -> str:
    header = ",".join(c["name"] for c in columns)
    lines = [
        ",".join("" if r.get(c["name"]) is None else str(r[c["name"]]) for c in columns)
        for r in rows
    ]
    return "\n".join([header, *lines]) + "\n"


# ---- categories ----------------------------------------------------------------------------


@st.composite
def category_dataset(
    draw: st.DrawFn,
    name: str,
    *,
    min_rows: int = 1,
    max_rows: int = 12,
    extra: tuple[str, ...] = (),
    positive: bool = False,
    gaps: bool = True,
) -> Json:
    """Unique text categories ``label`` with a measure ``value`` (and ``extra`` numeric columns
    in the same unit)."""
    names = draw(st.lists(labels(max_size=24), min_size=min_rows, max_size=max_rows, unique=True))
    unit = draw(st.sampled_from(UNITS))
    columns: list[Json] = [{"name": "label", "type": "text"}]
    rows: list[Json] = [{"label": n} for n in names]
    for column_name in ("value", *extra):
        columns.append({"name": column_name, "type": "number", "unit": unit})
        values = draw(
            st.lists(
                _value(1 if positive else -100, 5_000, integer=False),
                min_size=len(names),
                max_size=len(names),
            )
        )
        missing = draw(
            st.lists(
                st.integers(0, 5).map(lambda g: g == 0 and gaps),
                min_size=len(names),
                max_size=len(names),
            )
        )
        for row, value in zip(rows, _with_gaps(values, missing), strict=True):
            row[column_name] = value
    return {"name": name, "columns": columns, "rows": rows}


# ---- charts of each intent -----------------------------------------------------------------


def _chart(draw: st.DrawFn, chart_id: str, intent: str, dataset: str, **fields: Any) -> Json:
    chart: Json = {
        "id": chart_id,
        "intent": intent,
        "title": draw(labels(max_size=60)),
        "dataset": dataset,
        **fields,
    }
    if draw(st.booleans()):
        chart["subtitle"] = draw(labels(max_size=60))
    if draw(st.integers(0, 3)) == 0:
        chart["note"] = draw(labels(max_size=80))
    return chart


@st.composite
def trend(draw: st.DrawFn, chart_id: str) -> tuple[Json, Json]:
    name = f"{chart_id}-data"
    series = draw(st.integers(1, 3))
    dataset, measures = draw(time_dataset(name, series, positive=True))
    fields: Json = {"measures": measures, "from_zero": draw(st.booleans())}
    if draw(st.booleans()):
        fields["scale"] = "log"
    if series > 1 and draw(st.booleans()):
        fields["focus"] = measures[0]
    return _chart(draw, chart_id, "trend", name, **fields), dataset


@st.composite
def relative_change(draw: st.DrawFn, chart_id: str) -> tuple[Json, Json]:
    name = f"{chart_id}-data"
    dataset, measures = draw(
        time_dataset(
            name, draw(st.integers(2, 3)), positive=True, one_unit=False, full_first_row=True
        )
    )
    fields: Json = {"measures": measures, "form": draw(st.sampled_from(["index", "panels"]))}
    if fields["form"] == "index":
        fields["index_as"] = draw(st.sampled_from(["base_100", "percent_change"]))
    return _chart(draw, chart_id, "relative_change", name, **fields), dataset


@st.composite
def movement(draw: st.DrawFn, chart_id: str) -> tuple[Json, Json]:
    name = f"{chart_id}-data"
    dataset, (measure,) = draw(time_dataset(name, 1))
    fields: Json = {"measure": measure, "run_length": draw(st.integers(6, 12))}
    return _chart(draw, chart_id, "movement", name, **fields), dataset


@st.composite
def compare(draw: st.DrawFn, chart_id: str) -> tuple[Json, Json]:
    name = f"{chart_id}-data"
    dataset = draw(category_dataset(name))
    fields: Json = {
        "category": "label",
        "measure": "value",
        "focus": draw(st.sampled_from(["totals", "differences"])),
        "sort": draw(st.sampled_from(["descending", "ascending", "as_given"])),
    }
    if draw(st.booleans()):
        fields["baseline"] = draw(st.sampled_from([0, 10, -50]))
    return _chart(draw, chart_id, "compare", name, **fields), dataset


@st.composite
def share(draw: st.DrawFn, chart_id: str) -> tuple[Json, Json]:
    name = f"{chart_id}-data"
    dataset = draw(category_dataset(name, positive=True, gaps=False, max_rows=8))
    fields: Json = {"category": "label", "measure": "value", "allow_pie": draw(st.booleans())}
    return _chart(draw, chart_id, "share", name, **fields), dataset


@st.composite
def target(draw: st.DrawFn, chart_id: str) -> tuple[Json, Json]:
    name = f"{chart_id}-data"
    by_column = draw(st.booleans())
    dataset = draw(category_dataset(name, extra=("plan",) if by_column else ()))
    fields: Json = {
        "category": "label",
        "actual": "value",
        "form": draw(st.sampled_from(["bars", "deviation"])),
    }
    if by_column:
        fields["target"] = "plan"
    else:
        fields["target_value"] = draw(st.integers(0, 5_000))
    return _chart(draw, chart_id, "target", name, **fields), dataset


@st.composite
def distribution(draw: st.DrawFn, chart_id: str) -> tuple[Json, Json]:
    name = f"{chart_id}-data"
    form = draw(st.sampled_from(["histogram", "box"]))
    grouped = form == "box" and draw(st.booleans())
    groups = draw(st.lists(labels(max_size=12), min_size=2, max_size=3, unique=True))
    n = draw(st.integers(5 * len(groups) if grouped else 5, 60))  # 5 values per group at least
    unit = draw(st.sampled_from(UNITS))
    values = draw(st.lists(_value(-100, 1_000, integer=False), min_size=n, max_size=n))
    rows = [
        {"value": v, **({"group": groups[i % len(groups)]} if grouped else {})}
        for i, v in enumerate(values)
    ]
    columns: list[Json] = [{"name": "value", "type": "number", "unit": unit}]
    if grouped:
        columns.append({"name": "group", "type": "text"})
    fields: Json = {"measure": "value", "form": form}
    if grouped:
        fields["group"] = "group"
    if form == "histogram" and draw(st.booleans()):
        fields["bins"] = draw(st.integers(2, 30))
    dataset = {"name": name, "columns": columns, "rows": rows}
    return _chart(draw, chart_id, "distribution", name, **fields), dataset


@st.composite
def relationship(draw: st.DrawFn, chart_id: str) -> tuple[Json, Json]:
    name = f"{chart_id}-data"
    n = draw(st.integers(3, 40))
    xs = draw(st.lists(st.integers(-1_000, 1_000), min_size=n, max_size=n, unique=True))
    ys = draw(st.lists(st.integers(0, 10_000), min_size=n, max_size=n, unique=True))
    rows = [{"x": x, "y": y} for x, y in zip(xs, ys, strict=True)]
    columns = [
        {"name": "x", "type": "integer", "unit": draw(st.sampled_from(UNITS))},
        {"name": "y", "type": "integer", "unit": draw(st.sampled_from(UNITS))},
    ]
    fields: Json = {"x": "x", "y": "y", "fit": draw(st.booleans())}
    dataset = {"name": name, "columns": columns, "rows": rows}
    return _chart(draw, chart_id, "relationship", name, **fields), dataset


INTENT_STRATEGIES = {
    "trend": trend,
    "relative_change": relative_change,
    "movement": movement,
    "compare": compare,
    "share": share,
    "target": target,
    "distribution": distribution,
    "relationship": relationship,
}


@st.composite
def definitions(draw: st.DrawFn, *, max_charts: int = 3) -> Json:
    """A valid definition: one to ``max_charts`` charts of mixed intents, each with its dataset."""
    intents = draw(
        st.lists(st.sampled_from(sorted(INTENT_STRATEGIES)), min_size=1, max_size=max_charts)
    )
    charts, datasets = [], []
    for i, intent in enumerate(intents):
        chart, dataset = draw(INTENT_STRATEGIES[intent](f"c{i}-{intent.replace('_', '-')}"))
        charts.append(chart)
        datasets.append(dataset)
    split = draw(st.integers(1, len(charts)))
    sections: list[Json] = [
        {"heading": draw(labels(max_size=40)), "charts": charts[:split]},
    ]
    if charts[split:]:
        sections.append({"heading": draw(labels(max_size=40)), "charts": charts[split:]})
    if draw(st.booleans()):
        sections[0]["narrative"] = draw(labels(max_size=200))
    if draw(st.integers(0, 3)) == 0:
        sections[-1]["tables"] = [
            {"id": "t0", "title": draw(labels(max_size=40)), "dataset": datasets[0]["name"]}
        ]
    report: Json = {
        "id": draw(st.from_regex(r"\Afuzz-[a-z0-9]{1,12}\Z")),
        "title": draw(labels(max_size=60)),
        "period": {"start": "2025-11-01", "end": "2026-11-30"},
        "as_of": AS_OF,
        "owner": draw(labels(max_size=40)),
        "locale": draw(st.sampled_from(["en-GB", "de-DE", "fr-FR", "en-US"])),
    }
    return {"version": 1, "report": report, "datasets": datasets, "sections": sections}


# ---- mutations -----------------------------------------------------------------------------


@dataclass(frozen=True)
class Mutated:
    """A broken definition as the bytes sent, what was done, and where (a definition path)."""

    kind: str
    body: bytes
    where: str

    def scope(self) -> str:
        """The top-level part the mutation struck, e.g. ``datasets[0]`` or ``report``."""
        return self.where.split(".", 1)[0]


def _paths(node: Any, path: str = "") -> list[str]:
    """Every path into ``node``, in the definition's own notation (``sections[0].charts[1].id``)."""
    out = [path] if path else []
    if isinstance(node, dict):
        for key, value in node.items():
            out += _paths(value, f"{path}.{key}" if path else key)
    elif isinstance(node, list):
        for i, value in enumerate(node):
            out += _paths(value, f"{path}[{i}]")
    return out


def _parse(path: str) -> list[str | int]:
    parts: list[str | int] = []
    for chunk in path.split("."):
        name, _, rest = chunk.partition("[")
        if name:
            parts.append(name)
        for index in rest.split("[") if rest else []:
            parts.append(int(index.rstrip("]")))
    return parts


def _parent(document: Any, path: str) -> tuple[Any, str | int]:
    parts = _parse(path)
    node = document
    for part in parts[:-1]:
        node = node[part]
    return node, parts[-1]


def _dump(document: Any) -> bytes:
    """JSON as Python writes it: NaN and ±Infinity as bare tokens (not valid JSON, but common)."""
    return json.dumps(document, allow_nan=True, ensure_ascii=False).encode()


def _numeric_cells(document: Json) -> list[str]:
    cells = []
    for d, dataset in enumerate(document["datasets"]):
        for r, row in enumerate(dataset.get("rows") or []):
            cells += [f"datasets[{d}].rows[{r}].{k}" for k, v in row.items() if _is_number(v)]
    return cells


def _is_number(value: Any) -> bool:
    return isinstance(value, int | float) and not isinstance(value, bool)


def _text_fields(document: Json) -> list[str]:
    return [
        p
        for p in _paths(document)
        if p.rsplit(".", 1)[-1] in {"title", "subtitle", "heading", "owner", "note", "narrative"}
    ]


def _rows_of(document: Json, d: int) -> list[Json]:
    """Dataset ``d``'s rows as records (a CSV dataset is turned into records first)."""
    dataset = document["datasets"][d]
    if "csv" in dataset:
        lines = dataset.pop("csv").strip("\n").split("\n")
        header = lines[0].split(",")
        types = {c["name"]: c["type"] for c in dataset["columns"]}
        dataset["rows"] = [
            {h: _typed(v, types.get(h)) for h, v in zip(header, line.split(","), strict=True)}
            for line in lines[1:]
        ]
    rows: list[Json] = dataset["rows"]
    return rows


def _typed(text: str, kind: str | None) -> Any:
    if text == "":
        return None
    if kind == "integer":
        return int(text)
    if kind == "number":
        return float(text)
    return text


OUTSIDE_FONT = ("📈 growth", "数据 report", "🚌", "名古屋")
RIGHT_TO_LEFT = ("שלום עולם", "مرحبا بالعالم", "תחבורה")
NON_FINITE_TOKENS = (float("nan"), float("inf"), float("-inf"))
NON_FINITE_STRINGS = ("NaN", "Infinity", "-Infinity", "nan", "inf")
HUGE = (1e308, -1e308, 10**30, 2**63, 1e18, -(10**19), 5e-324)
WRONG_TYPES: tuple[Any, ...] = ("text", 12, -1.5, True, None, [], {}, [1, "a"], {"a": 1})

KINDS = (
    "drop_field",
    "wrong_type",
    "huge_number",
    "non_finite_token",
    "non_finite_string",
    "empty_dataset",
    "single_row",
    "all_missing_column",
    "outside_font",
    "right_to_left",
    "ten_thousand_categories",
)


def _drop_field(draw: st.DrawFn, document: Json) -> str:
    where = draw(st.sampled_from([p for p in _paths(document) if not p.endswith("]")]))
    parent, key = _parent(document, where)
    del parent[key]
    return where


def _wrong_type(draw: st.DrawFn, document: Json) -> str:
    where = draw(st.sampled_from(_paths(document)))
    parent, key = _parent(document, where)
    current = parent[key]
    parent[key] = draw(st.sampled_from([v for v in WRONG_TYPES if type(v) is not type(current)]))
    return where


_NUMBER_POOLS: dict[str, tuple[Any, ...]] = {
    "huge_number": HUGE,
    "non_finite_token": NON_FINITE_TOKENS,
    "non_finite_string": NON_FINITE_STRINGS,
}

_DEFINITION_NUMBERS = (
    "sections[0].charts[0].baseline",
    "sections[0].charts[0].target_value",
    "sections[0].charts[0].bins",
    "sections[0].charts[0].whole",
    "report.palette",
)
"""Numbers of the definition itself (a field that the first chart may not have is then unknown)."""


def _bad_number(draw: st.DrawFn, document: Json, kind: str) -> str:
    for d in range(len(document["datasets"])):
        _rows_of(document, d)
    cells = _numeric_cells(document)
    value = draw(st.sampled_from(_NUMBER_POOLS[kind]))
    if cells and draw(st.integers(0, 3)) > 0:
        where = draw(st.sampled_from(cells))
    else:
        where = draw(st.sampled_from(_DEFINITION_NUMBERS))
    parent, key = _parent(document, where)
    parent[key] = value
    return where


def _reshape_rows(draw: st.DrawFn, document: Json, kind: str) -> str:
    d = draw(st.integers(0, len(document["datasets"]) - 1))
    rows = _rows_of(document, d)
    dataset = document["datasets"][d]
    if kind == "empty_dataset":
        dataset["rows"] = []
    elif kind == "single_row":
        dataset["rows"] = rows[:1]
    else:
        column = draw(st.sampled_from([c["name"] for c in dataset["columns"]]))
        for row in rows:
            row[column] = None
        return f"datasets[{d}].rows[0].{column}"
    return f"datasets[{d}]"


def _undrawable_text(draw: st.DrawFn, document: Json, kind: str) -> str:
    text = draw(st.sampled_from(OUTSIDE_FONT if kind == "outside_font" else RIGHT_TO_LEFT))
    categories = [
        (d, r)
        for d, dataset in enumerate(document["datasets"])
        if dataset["columns"][0]["type"] == "text"
        for r in range(len(dataset.get("rows") or []))
    ]
    if categories and draw(st.booleans()):
        d, r = draw(st.sampled_from(categories))
        document["datasets"][d]["rows"][r]["label"] = text
        return f"datasets[{d}].rows[{r}].label"
    where = draw(st.sampled_from(_text_fields(document)))
    parent, key = _parent(document, where)
    parent[key] = text
    return where


def _many_categories(draw: st.DrawFn, document: Json) -> str:
    document["datasets"].append(
        {
            "name": "many",
            "columns": [
                {"name": "label", "type": "text"},
                {"name": "value", "type": "number", "unit": "GBP"},
            ],
            "rows": [{"label": f"route {i:05d}", "value": i % 97} for i in range(10_000)],
        }
    )
    intent = draw(st.sampled_from(["compare", "share", "target"]))
    fields: Json = {"category": "label"}
    if intent == "target":
        fields.update(actual="value", target_value=50)
    else:
        fields["measure"] = "value"
    charts = document["sections"][0]["charts"]
    charts.append(
        {"id": "many-categories", "intent": intent, "title": "Every route", "dataset": "many"}
        | fields
    )
    return f"sections[0].charts[{len(charts) - 1}]"


@st.composite
def mutations(draw: st.DrawFn, base: st.SearchStrategy[Json] | None = None) -> Mutated:
    """One way of breaking a valid definition (``base``, default ``definitions()``)."""
    document = copy.deepcopy(draw(base if base is not None else definitions()))
    kind = draw(st.sampled_from(KINDS))
    if kind == "drop_field":
        where = _drop_field(draw, document)
    elif kind == "wrong_type":
        where = _wrong_type(draw, document)
    elif kind in _NUMBER_POOLS:
        where = _bad_number(draw, document, kind)
    elif kind in ("empty_dataset", "single_row", "all_missing_column"):
        where = _reshape_rows(draw, document, kind)
    elif kind in ("outside_font", "right_to_left"):
        where = _undrawable_text(draw, document, kind)
    else:
        where = _many_categories(draw, document)
    return Mutated(kind, _dump(document), where)
