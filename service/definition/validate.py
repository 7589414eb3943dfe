"""Turn raw bytes into a :class:`ReportDefinition`, or into every problem found, each with a path.

Three passes, each reporting all it finds: size limits on the raw payload, the shape (pydantic, its
errors translated into our stable codes), then references between parts (unknown dataset or column, a
column of the wrong type for the intent, duplicate ids, missing units). ``locale_problems`` checks the
report's locale. Checks on the *values* of the data live in :mod:`service.data.frames` and
:mod:`service.data.values`; waiver references in :mod:`service.checks.registry`.
"""

from __future__ import annotations

import difflib
import io
import json
import re
from collections import Counter
from collections.abc import Callable, Iterable
from typing import Any

import pandas as pd
from pydantic import ValidationError

from service import formatting
from service.config import Limits
from service.definition import paths
from service.definition.model import (
    INTENTS,
    AnyChart,
    ColumnType,
    Dataset,
    RelativeChangeChart,
    ReportDefinition,
    Role,
    ShareChart,
    TrendChart,
    same_as_parts,
)
from service.errors import InvalidDefinition, PayloadTooLarge, Problem

NUMERIC = frozenset({ColumnType.number, ColumnType.integer})
TEMPORAL = frozenset({ColumnType.date, ColumnType.timestamp})

#: pydantic error types → our stable codes and hints. Anything unlisted becomes ``invalid_value``.
_PYDANTIC_CODES: dict[str, tuple[str, str]] = {
    "missing": ("required", "add this field"),
    "extra_forbidden": ("unknown_field", "remove it, or check its spelling against the schema"),
    "literal_error": ("not_allowed", "use one of the allowed values"),
    "enum": ("not_allowed", "use one of the allowed values"),
    "union_tag_invalid": ("unknown_intent", "use one of the intents listed in the schema"),
    "union_tag_not_found": ("required", "every chart names its 'intent'"),
    "string_too_short": ("too_short", "write more"),
    "string_too_long": ("too_long", "shorten the text"),
    "string_pattern_mismatch": ("bad_format", "follow the pattern given in the schema"),
    "too_short": ("too_few_items", "add at least the minimum number of items"),
    "timezone_aware": (
        "timezone_missing",
        "add a time zone offset, e.g. 2026-11-09T08:00:00+00:00",
    ),
    "datetime_from_date_parsing": ("bad_timestamp", "use ISO 8601, e.g. 2026-11-09T08:00:00+00:00"),
    "datetime_parsing": ("bad_timestamp", "use ISO 8601, e.g. 2026-11-09T08:00:00+00:00"),
    "datetime_type": ("bad_timestamp", "use ISO 8601, e.g. 2026-11-09T08:00:00+00:00"),
    "date_from_datetime_parsing": ("bad_date", "use ISO 8601 dates, e.g. 2026-10-31"),
    "date_parsing": ("bad_date", "use ISO 8601 dates, e.g. 2026-10-31"),
    "date_type": ("bad_date", "use ISO 8601 dates, e.g. 2026-10-31"),
    "value_error": ("invalid_value", ""),
    "version_type": ("not_allowed", "use 1"),
    "float_type": ("invalid_value", "write a JSON number, e.g. 93.4, not text"),
    "int_type": ("invalid_value", "write a JSON whole number, e.g. 8, not text or 8.0"),
    "bool_type": ("invalid_value", "write true or false"),
    "date_out_of_range": ("date_out_of_range", "use a date in the years 1678 to 2261"),
}


def parse(raw: bytes | str, limits: Limits) -> tuple[ReportDefinition, list[Problem]]:
    """Parse a definition sent as JSON.

    A definition whose *shape* is wrong raises :class:`InvalidDefinition` with every shape problem.
    Otherwise the definition is returned with the reference and size problems found, so the caller
    can add the data's problems and report them all together.
    """
    data = raw.encode() if isinstance(raw, str) else raw
    if len(data) > limits.max_payload_bytes:
        raise PayloadTooLarge(size=len(data), limit=limits.max_payload_bytes)
    repeated: list[_Object] = []
    try:
        text = _utf8(data)
        document = json.loads(
            text, parse_constant=_non_finite, object_pairs_hook=_Object.hook(repeated)
        )
    except (ValueError, RecursionError) as exc:  # JSONDecodeError and UnicodeDecodeError too
        raise InvalidDefinition([_json_problem(exc)]) from None
    if repeated or _SURROGATES.search(text) or _ESCAPED_SURROGATE.search(text):  # rare: walk
        unreadable = list(_unreadable(document))
        if unreadable:
            raise InvalidDefinition(unreadable)
    return validate(document, limits)


def _utf8(data: bytes) -> str:
    """The body as text: UTF-8 only (a byte-order mark aside). A UTF-16 or UTF-32 body, which
    Python's JSON reader would quietly accept, is refused; encoded surrogates (``ED A0 80``) are
    kept, so that they are refused with the path of the text that holds them."""
    if data.startswith((b"\xff\xfe", b"\xfe\xff")) or b"\x00" in data[:4]:
        raise UnicodeDecodeError("utf-8", data[:4], 0, 4, "UTF-16 or UTF-32")
    return data.removeprefix(b"\xef\xbb\xbf").decode("utf-8", "surrogatepass")


class _Object(dict[str, Any]):
    """A JSON object that remembers the keys it was given more than once (the last one wins in
    Python, while a stored copy of the body keeps both: an ambiguity, refused)."""

    repeated: tuple[str, ...] = ()

    @classmethod
    def hook(cls, found: list[_Object]) -> Callable[[list[tuple[str, Any]]], dict[str, Any]]:
        """An ``object_pairs_hook`` that adds each object with a repeated key to ``found``."""

        def make(pairs: list[tuple[str, Any]]) -> dict[str, Any]:
            made = dict(pairs)
            if len(made) == len(pairs):
                return made
            marked = cls(pairs)
            counts = Counter(key for key, _ in pairs)
            marked.repeated = tuple(key for key, n in counts.items() if n > 1)
            found.append(marked)
            return marked

        return make


def _unreadable(node: Any, path: tuple[int | str, ...] = ()) -> Iterable[Problem]:
    """Repeated keys, and text holding surrogate code points (half of a UTF-16 pair: no
    character at all, and impossible to print or to answer in UTF-8), each with its path."""
    stack: list[tuple[Any, tuple[int | str, ...]]] = [(node, path)]
    while stack:
        node, path = stack.pop()
        if isinstance(node, dict):
            for key in getattr(node, "repeated", ()):
                yield Problem(
                    "duplicate_key",
                    paths.join((*path, key)),
                    f"the key '{_escaped(key)}' is given more than once in this object",
                    "give each key once",
                )
            for key, value in node.items():
                if _SURROGATES.search(key):
                    yield _surrogate(paths.join((*path, _escaped(key))), key)
                stack.append((value, (*path, key)))
        elif isinstance(node, list):
            stack.extend((item, (*path, i)) for i, item in enumerate(node))
        elif isinstance(node, str) and _SURROGATES.search(node):
            yield _surrogate(paths.join(path), node)


_SURROGATES = re.compile("[\ud800-\udfff]")
_ESCAPED_SURROGATE = re.compile(r"\\u[dD][89a-fA-F]")
"""A surrogate written as a JSON escape (also half of a well-formed pair, which the walk passes)."""


def _escaped(text: str) -> str:
    """Text safe to echo in a UTF-8 answer: surrogates written as ``\\udxxx``."""
    return text.encode("utf-8", "backslashreplace").decode("utf-8")


def _surrogate(path: str, text: str) -> Problem:
    found = _SURROGATES.search(text)
    assert found is not None
    return Problem(
        "invalid_text",
        path,
        f"the text holds U+{ord(found.group()):04X}, half of a UTF-16 surrogate pair, which is "
        "not a character",
        "send Unicode text: a character beyond U+FFFF is written as a pair (\\ud83d\\ude00) "
        "or as itself in UTF-8",
        _escaped(text[:200]),
    )


def _non_finite(constant: str) -> str:
    """JSON has no NaN or Infinity; Python's parser accepts them. Keep them as text, so they are
    refused wherever a number is expected instead of passing as a missing value."""
    return constant


def validate(document: Any, limits: Limits) -> tuple[ReportDefinition, list[Problem]]:
    if not isinstance(document, dict):
        raise InvalidDefinition(
            [
                Problem(
                    "not_an_object", "", "a definition is a JSON object", 'send {"version": 1, …}'
                )
            ]
        )
    problems = list(_count_limits(document, limits))
    try:
        definition = ReportDefinition.model_validate(document)
    except ValidationError as exc:
        problems.extend(_translate(exc, document))
        raise InvalidDefinition(problems) from None
    problems.extend(_text_limits(definition, limits))
    problems.extend(references(definition))
    return definition, problems


def _json_problem(exc: Exception) -> Problem:
    if isinstance(exc, json.JSONDecodeError):
        return Problem(
            "invalid_json",
            "",
            f"the body is not valid JSON: {exc.msg} at line {exc.lineno} column {exc.colno}",
            "send a JSON object; check for a missing comma or quote near that place",
        )
    if isinstance(exc, RecursionError):
        return Problem("too_deep", "", "the JSON is nested too deeply", "flatten the document")
    if isinstance(exc, UnicodeDecodeError):
        return Problem("invalid_json", "", "the body is not UTF-8 text", "send UTF-8 encoded JSON")
    # Python refuses integers of more than 4,300 digits (sys.int_info.default_max_str_digits)
    return Problem(
        "invalid_json",
        "",
        "a number in the body has more than 4,300 digits",
        "send shorter numbers (no measure needs more than a few dozen digits)",
    )


def _translate(exc: ValidationError, document: dict[str, Any]) -> Iterable[Problem]:
    for error in exc.errors(include_url=False):
        code, hint = _PYDANTIC_CODES.get(error["type"], ("invalid_value", ""))
        loc = error["loc"]
        message = str(error["msg"])
        if message.startswith("Value error, "):
            message = message.removeprefix("Value error, ")
        ctx = {k: str(v) for k, v in (error.get("ctx") or {}).items() if k != "error"}
        if code == "unknown_field":
            hint = _suggest_field(document, loc) or hint
            message = f"'{loc[-1]}' is not a field here"
        elif code == "required":
            message = f"'{loc[-1]}' is required here"
        elif code == "not_allowed" and "expected" in ctx:
            hint = f"use one of: {ctx['expected']}"
        elif code == "unknown_intent" and "expected_tags" in ctx:
            hint = f"use one of: {ctx['expected_tags']}"
        value = error.get("input") if code not in {"required"} else None
        if isinstance(value, dict | list):
            value = None  # the path says where; echoing a whole object helps no one
        yield Problem(code, paths.join(loc), message, hint, value, ctx)


def _suggest_field(document: dict[str, Any], loc: tuple[int | str, ...]) -> str:
    """For a misspelt field, name the closest allowed one."""
    from service.definition import model  # local: only needed on this error path

    owner = _owner_model(loc[:-1], document, model)
    if owner is None:
        return ""
    close = difflib.get_close_matches(str(loc[-1]), list(owner.model_fields), n=1)
    return f"did you mean '{close[0]}'?" if close else ""


def _owner_model(loc: tuple[int | str, ...], document: Any, model: Any) -> Any:
    """The model class that owns the last field of ``loc`` (None when it cannot be told)."""
    current: Any = model.ReportDefinition
    node: Any = document
    for part in loc:
        if isinstance(part, int):
            node = node[part] if isinstance(node, list) and 0 <= part < len(node) else None
            if current is _CHART:  # the list index picks the chart; its intent picks the model
                intent = node.get("intent") if isinstance(node, dict) else None
                current = _chart_models(model).get(str(intent))
            if current is None:
                return None
            continue
        if part in INTENTS:
            continue
        if current is _CHART:
            return None
        node = node.get(part) if isinstance(node, dict) else None
        current = _FIELD_MODELS.get((current.__name__, part))
        if current is None:
            return None
    return None if current is _CHART else current


_CHART = object()


def _chart_models(model: Any) -> dict[str, Any]:
    return {
        typ.model_fields["intent"].annotation.__args__[0]: typ for typ in model.AnyChart.__args__
    }


def _init_field_models() -> dict[tuple[str, str], Any]:
    from service.definition import model

    return {
        ("ReportDefinition", "report"): model.Report,
        ("ReportDefinition", "datasets"): model.Dataset,
        ("ReportDefinition", "sections"): model.Section,
        ("ReportDefinition", "waivers"): model.Waiver,
        ("Report", "period"): model.Period,
        ("Dataset", "columns"): model.Column,
        ("Section", "charts"): _CHART,
        ("Section", "tables"): model.Table,
    }


_FIELD_MODELS = _init_field_models()


def _count_limits(document: dict[str, Any], limits: Limits) -> Iterable[Problem]:
    """Sizes checked on the raw document, so an oversized part is refused before deeper work."""

    def over(path: str, what: str, size: int, limit: int, setting: str) -> Problem:
        return Problem.over_limit(
            path, what, size, setting=setting, limit=limit, advice="split the report"
        )

    datasets = document.get("datasets")
    if isinstance(datasets, list):
        if len(datasets) > limits.max_datasets:
            yield over(
                "datasets", "too many datasets", len(datasets), limits.max_datasets, "max_datasets"
            )
        for i, dataset in enumerate(datasets):
            if not isinstance(dataset, dict):
                continue
            rows = dataset.get("rows")
            if isinstance(rows, list) and len(rows) > limits.max_rows:
                yield over(
                    f"datasets[{i}].rows", "too many rows", len(rows), limits.max_rows, "max_rows"
                )
            csv_text = dataset.get("csv")
            if isinstance(csv_text, str) and csv_rows(csv_text, limits.max_rows) > limits.max_rows:
                lines = csv_text.count("\n") + (0 if csv_text.endswith("\n") else 1) - 1
                yield over(
                    f"datasets[{i}].csv",
                    "too many rows",
                    max(lines, limits.max_rows + 1),
                    limits.max_rows,
                    "max_rows",
                )
            columns = dataset.get("columns")
            if isinstance(columns, list) and len(columns) > limits.max_columns:
                yield over(
                    f"datasets[{i}].columns",
                    "too many columns",
                    len(columns),
                    limits.max_columns,
                    "max_columns",
                )
    sections = document.get("sections")
    if isinstance(sections, list):
        if len(sections) > limits.max_sections:
            yield over(
                "sections", "too many sections", len(sections), limits.max_sections, "max_sections"
            )
        charts = sum(
            len(s["charts"])
            for s in sections
            if isinstance(s, dict) and isinstance(s.get("charts"), list)
        )
        if charts > limits.max_charts:
            yield over("sections", "too many charts", charts, limits.max_charts, "max_charts")


def csv_rows(text: str, limit: int) -> int:
    """The data rows of a CSV text, as far as the limit needs them: ``limit + 1`` when there are
    more than ``limit``, else a count no greater than ``limit``.

    Every row ends at a line break or at the end, so when the breaks are few enough the rows are
    too, and nothing is read (the breaks are returned). Otherwise the reader the data stage uses
    reads at most ``limit + 1`` rows (quoted line breaks and blank lines are not rows), so a CSV
    far past the limit is refused after reading just past it, never parsed whole. A CSV the reader
    cannot read counts 0 here: the data stage reports why, at the place it stops.
    """
    breaks = text.count("\n") + text.count("\r")
    if breaks <= limit:
        return breaks
    try:
        frame = pd.read_csv(
            _Chunks(text),
            dtype=str,
            keep_default_na=False,
            na_values=[""],
            on_bad_lines="error",
            skipinitialspace=True,
            nrows=limit + 1,
        )
    except (pd.errors.ParserError, pd.errors.EmptyDataError, ValueError):
        return 0
    return len(frame)


class _Chunks(io.TextIOBase):
    """A text read in slices, so counting rows copies no more of it than the reader asks for (an
    ``io.StringIO`` would first copy all of it, four bytes per character)."""

    def __init__(self, text: str) -> None:
        super().__init__()
        self._text = text
        self._at = 0

    def readable(self) -> bool:
        return True

    def read(self, size: int | None = -1, /) -> str:
        end = len(self._text) if size is None or size < 0 else self._at + size
        piece = self._text[self._at : end]
        self._at += len(piece)
        return piece


def _text_limits(definition: ReportDefinition, limits: Limits) -> Iterable[Problem]:
    def check(path: str, text: str | None, limit: int, setting: str) -> Iterable[Problem]:
        if text is not None and len(text) > limit:
            yield Problem.over_limit(
                path,
                "characters of text",
                len(text),
                setting=setting,
                limit=limit,
                advice="shorten it",
            )

    label, text = limits.max_label_chars, limits.max_text_chars
    for path, value, long in texts(definition):
        if long:
            yield from check(path, value, text, "max_text_chars")
        else:
            yield from check(path, value, label, "max_label_chars")


def texts(definition: ReportDefinition) -> list[tuple[str, str | None, bool]]:
    """Every piece of free text a definition gives (data cells aside), with its path and whether it
    is long text (narrative, notes, descriptions, sources, reasons) rather than a label."""
    r = definition.report
    out: list[tuple[str, str | None, bool]] = [
        ("report.title", r.title, False),
        ("report.owner", r.owner, False),
        ("report.audience", r.audience, False),
        ("report.period.label", r.period.label, False),
    ]
    for d, dataset in enumerate(definition.datasets):
        out += [
            (f"datasets[{d}].description", dataset.description, True),
            (f"datasets[{d}].source", dataset.source, True),
        ]
        for c, column in enumerate(dataset.columns):
            base = f"datasets[{d}].columns[{c}]"
            out += [
                (f"{base}.unit", column.unit, False),
                (f"{base}.description", column.description, True),
            ]
    for s, section in enumerate(definition.sections):
        out += [
            (f"sections[{s}].heading", section.heading, False),
            (f"sections[{s}].narrative", section.narrative, True),
        ]
        out += [
            (f"sections[{s}].tables[{t}].title", table.title, False)
            for t, table in enumerate(section.tables)
        ]
    for path, chart in definition.charts():
        out += [
            (f"{path}.title", chart.title, False),
            (f"{path}.subtitle", chart.subtitle, False),
            (f"{path}.note", chart.note, True),
            (f"{path}.source", chart.source, True),
            (f"{path}.description", chart.description, True),
        ]
        if isinstance(chart, ShareChart):
            out += [
                (f"{path}.expected_categories[{i}]", category, False)
                for i, category in enumerate(chart.expected_categories or [])
            ]
    for w, waiver in enumerate(definition.waivers):
        out += [
            (f"waivers[{w}].reason", waiver.reason, True),
            (f"waivers[{w}].by", waiver.by, False),
        ]
    return out


def locale_problems(definition: ReportDefinition) -> Iterable[Problem]:
    """The report's locale must be one the formatter knows (numbers and dates are written in it)."""
    locale = definition.report.locale
    if not formatting.known_locale(locale):
        yield Problem(
            "unknown_locale",
            "report.locale",
            f"'{locale}' is not a known locale",
            "use a language and region such as 'en-GB', 'de-DE' or 'fr-FR'",
            locale,
        )


def references(definition: ReportDefinition) -> Iterable[Problem]:
    """Problems between parts of a structurally valid definition."""
    yield from _duplicates(definition)
    for d, dataset in enumerate(definition.datasets):
        yield from _dataset_problems(f"datasets[{d}]", dataset)
    yield from _same_as_problems(definition)
    names = [d.name for d in definition.datasets]
    for path, chart in definition.charts():
        source = definition.dataset(chart.dataset)
        if source is None:
            yield _unknown(f"{path}.dataset", "dataset", chart.dataset, names)
            continue
        yield from _chart_problems(path, chart, source)
    for s, section in enumerate(definition.sections):
        for t, table in enumerate(section.tables):
            path = f"sections[{s}].tables[{t}]"
            shown = definition.dataset(table.dataset)
            if shown is None:
                yield _unknown(f"{path}.dataset", "dataset", table.dataset, names)
                continue
            known = [c.name for c in shown.columns]
            for i, column in enumerate(table.columns or []):
                if column not in known:
                    yield _unknown(f"{path}.columns[{i}]", "column", column, known, shown.name)


def _duplicates(definition: ReportDefinition) -> Iterable[Problem]:
    ids: list[tuple[str, str]] = [(p, c.id) for p, c in definition.charts()]
    ids += [
        (f"sections[{s}].tables[{t}]", table.id)
        for s, section in enumerate(definition.sections)
        for t, table in enumerate(section.tables)
    ]
    yield from _repeated(ids, "id", "chart and table ids must be unique within a report")
    yield from _repeated(
        [(f"datasets[{d}]", ds.name) for d, ds in enumerate(definition.datasets)],
        "name",
        "dataset names must be unique",
    )
    for d, dataset in enumerate(definition.datasets):
        yield from _repeated(
            [(f"datasets[{d}].columns[{i}]", c.name) for i, c in enumerate(dataset.columns)],
            "name",
            "column names must be unique within a dataset",
        )


def _repeated(items: list[tuple[str, str]], field: str, hint: str) -> Iterable[Problem]:
    counts = Counter(value for _, value in items)
    seen: set[str] = set()
    for path, value in items:
        if counts[value] > 1:
            if value in seen:
                where = f"{path}.{field}" if field else path
                yield Problem(
                    "duplicate_id", where, f"'{value}' is used more than once", hint, value
                )
            seen.add(value)


def _dataset_problems(path: str, dataset: Dataset) -> Iterable[Problem]:
    if dataset.time_column is None:
        return
    column = next((c for c in dataset.columns if c.name == dataset.time_column), None)
    known = [c.name for c in dataset.columns]
    if column is None:
        yield _unknown(f"{path}.time_column", "column", dataset.time_column, known, dataset.name)
    elif column.type not in TEMPORAL:
        yield Problem(
            "column_type_mismatch",
            f"{path}.time_column",
            f"the time column '{column.name}' has type '{column.type}'",
            "declare it as type 'date' or 'timestamp'",
            column.type.value,
        )


def _same_as_problems(definition: ReportDefinition) -> Iterable[Problem]:
    """A ``same_as`` link names a numeric column of another time-indexed dataset of the same
    frequency (else no period of the two could be compared)."""
    names = [d.name for d in definition.datasets]
    for d, dataset in enumerate(definition.datasets):
        for i, column in enumerate(dataset.columns):
            if column.same_as is None:
                continue
            path = f"datasets[{d}].columns[{i}].same_as"
            name, column_name = same_as_parts(column.same_as)
            other = definition.dataset(name)
            if other is None:
                yield _unknown(path, "dataset", name, names)
                continue
            target = next((c for c in other.columns if c.name == column_name), None)
            if target is None:
                known = [c.name for c in other.columns]
                yield _unknown(path, "column", column_name, known, other.name)
                continue
            if other is dataset:
                yield Problem(
                    "same_as_not_comparable",
                    path,
                    "'same_as' names a column of the same dataset",
                    "link a column of another dataset that carries the same measure",
                    column.same_as,
                )
            elif (
                dataset.frequency is None
                or dataset.frequency != other.frequency
                or column.type not in NUMERIC
                or target.type not in NUMERIC
            ):
                yield Problem(
                    "same_as_not_comparable",
                    path,
                    f"'{dataset.name}.{column.name}' and '{column.same_as}' cannot be compared "
                    "period by period",
                    "link numeric columns of two time-indexed datasets of the same frequency",
                    column.same_as,
                )


def _role_problems(
    path: str, dataset: Dataset, name: str, role: Role, intent: str
) -> Iterable[Problem]:
    column = next((c for c in dataset.columns if c.name == name), None)
    if column is None:
        yield _unknown(path, "column", name, [c.name for c in dataset.columns], dataset.name)
        return
    if role is Role.category:
        if column.type is not ColumnType.text:
            yield Problem(
                "column_type_mismatch",
                path,
                f"'{name}' has type '{column.type}', but categories are text",
                "choose a column of type 'text', or use intent 'trend' for values over time",
                column.type.value,
            )
        return
    if column.type not in NUMERIC:
        yield Problem(
            "column_type_mismatch",
            path,
            f"'{name}' has type '{column.type}', but {intent} needs a number here",
            "choose a column of type 'number' or 'integer'",
            column.type.value,
        )
    if role is Role.measure and not column.unit:
        yield Problem(
            "unit_missing",
            path,
            f"the measure '{name}' has no unit, and a chart must say what its numbers count",
            f"give the column '{name}' a 'unit' in dataset '{dataset.name}' (e.g. 'GBP', '%', "
            "'journeys')",
            name,
        )


def _chart_problems(path: str, chart: AnyChart, dataset: Dataset) -> Iterable[Problem]:
    for field, name, role in chart.columns():
        yield from _role_problems(f"{path}.{field}", dataset, name, role, chart.intent)
    if chart.over_time and dataset.time_column is None:
        yield Problem(
            "time_column_missing",
            f"{path}.dataset",
            f"'{chart.intent}' draws values over time, but dataset '{dataset.name}' declares no "
            "time column",
            f"give dataset '{dataset.name}' a 'time_column' and a 'frequency'",
            dataset.name,
        )
    if isinstance(chart, TrendChart | RelativeChangeChart):
        yield from _repeated(
            [(f"{path}.measures[{i}]", m) for i, m in enumerate(chart.measures)],
            "",
            "name each measure once",
        )
    if isinstance(chart, TrendChart):
        yield from _trend_problems(path, chart, dataset)


def _trend_problems(path: str, chart: TrendChart, dataset: Dataset) -> Iterable[Problem]:
    columns = {c.name: c for c in dataset.columns}
    units = {m: columns[m].unit for m in chart.measures if m in columns and columns[m].unit}
    if len(set(units.values())) > 1:
        listed = ", ".join(f"{m} ({u})" for m, u in units.items())
        yield Problem(
            "mixed_units",
            f"{path}.measures",
            f"the measures have different units: {listed}; one axis cannot honestly carry them",
            "use intent 'relative_change' (indexed, or aligned panels): Plumbline never draws "
            "two y-axes",
            list(units.values()),
        )
    if chart.focus is not None and chart.focus not in chart.measures:
        yield _unknown(f"{path}.focus", "measure", chart.focus, list(chart.measures))
    if chart.projection is not None:
        for i, measure in enumerate(chart.measures):
            column = columns.get(measure)
            if column is not None and not column.projectable:
                yield Problem(
                    "not_projectable",
                    f"{path}.measures[{i}]",
                    f"'{measure}' is not declared projectable, so its partial period cannot be "
                    "estimated",
                    f"declare 'projectable': true on column '{measure}' if a run rate is "
                    "meaningful for it, or drop 'projection'",
                    measure,
                )


def _unknown(path: str, what: str, value: str, known: list[str], owner: str = "") -> Problem:
    close = difflib.get_close_matches(value, known, n=1)
    where = f" in dataset '{owner}'" if owner else ""
    hint = f"did you mean '{close[0]}'?" if close else f"known: {', '.join(known) or 'none'}"
    return Problem(f"unknown_{what}", path, f"there is no {what} '{value}'{where}", hint, value)
