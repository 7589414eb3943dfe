"""Text from the whole of Unicode in every text field: surrogates, format characters, controls,
astral planes, right-to-left script, very long words. ``POST /v1/check`` and ``plumbline check``
must refuse it with a problem (or accept it): never a 5xx, never exit 3.

Each example puts generated text into one text field of a small definition that uses every kind of
text field (report, period label, dataset and column descriptions, units, sources, CSV and JSON
cells, expected categories, table titles, waivers), and sends it both as escaped JSON and as raw
UTF-8 bytes (surrogates encoded as such).
"""

from __future__ import annotations

import contextlib
import copy
import io
import json
import tempfile
from collections import Counter
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import pytest
from fuzz_kit import Api, fuzz_settings, report
from hypothesis import given
from hypothesis import strategies as st

from service import cli

Json = dict[str, Any]

BASE: Json = {
    "version": 1,
    "report": {
        "id": "text-fuzz",
        "title": "Text fuzz",
        "owner": "Fuzz desk",
        "audience": "Testers",
        "period": {"start": "2026-06-01", "end": "2026-10-31", "label": "June to October"},
        "as_of": "2026-11-02T08:00:00+00:00",
    },
    "datasets": [
        {
            "name": "kinds",
            "description": "Loans by kind.",
            "source": "Ledger",
            "columns": [
                {"name": "kind", "type": "text", "description": "Kind of tool"},
                {"name": "loans", "type": "number", "unit": "loans"},
            ],
            "rows": [{"kind": "Garden", "loans": 60}, {"kind": "Drills", "loans": 40}],
        },
        {
            "name": "months",
            "source": "Ledger",
            "columns": [
                {"name": "month", "type": "date"},
                {"name": "label", "type": "text"},
                {"name": "loans", "type": "integer", "unit": "loans"},
            ],
            "time_column": "month",
            "frequency": "month",
            "csv": "month,label,loans\n2026-06-01,June,10\n2026-07-01,July,12\n2026-08-01,Aug,11\n",
        },
    ],
    "sections": [
        {
            "heading": "Loans",
            "narrative": "Loans rose.",
            "charts": [
                {
                    "id": "share",
                    "intent": "share",
                    "title": "Parts",
                    "subtitle": "By kind",
                    "dataset": "kinds",
                    "category": "kind",
                    "measure": "loans",
                    "expected_categories": ["Garden", "Drills"],
                    "note": "A note.",
                    "source": "Ledger",
                    "description": "Two parts.",
                },
                {
                    "id": "trend",
                    "intent": "trend",
                    "title": "By month",
                    "dataset": "months",
                    "measures": ["loans"],
                },
            ],
            "tables": [{"id": "table", "title": "Kinds", "dataset": "kinds"}],
        }
    ],
    "waivers": [
        {
            "check": "pie-parts",
            "chart": "share",
            "reason": "The committee reads this chart as a list of parts.",
            "by": "A reviewer",
        }
    ],
}


def _text_fields(node: Any, path: tuple[Any, ...] = ()) -> Iterator[tuple[Any, ...]]:
    """Every string of the base definition: free text, names, ids, dates and cells alike."""
    if isinstance(node, dict):
        for key, value in node.items():
            yield from _text_fields(value, (*path, key))
    elif isinstance(node, list):
        for i, value in enumerate(node):
            yield from _text_fields(value, (*path, i))
    elif isinstance(node, str):
        yield path


KEY = object()
"""In place of a field's name: the generated text becomes a key of the object."""

FIELDS = [*_text_fields(BASE), ("report", KEY), ("datasets", 0, "rows", 0, KEY)]
"""Every text field of the base definition, and keys of two objects."""

SPECIAL = [
    "\ud800",
    "\udfff",
    "\ufeff",
    "\u200b",
    "\u200e",
    "\u202e",
    "\u2028",
    "\u00ad",
    "\x00",
    "\x1b",
    "\t",
    "\r",
    "\u05d0",
    "\u0627",
    "\U0001f600",
    "\U00010000",
    "\U0010ffff",
    "\ufffe",
    "\ue000",
    ",",
    '"',
    "\n",
]
"""Characters that once broke something, mixed into the generated text."""

ANY_CHARACTER = st.characters(min_codepoint=0, max_codepoint=0x10FFFF, exclude_categories=())
"""The whole code space, surrogates included (Hypothesis leaves them out unless told)."""

TEXT = st.one_of(
    st.builds(  # a word with one character that once broke something
        lambda before, special, after: before + special + after,
        st.text(max_size=6),
        st.sampled_from(SPECIAL),
        st.text(max_size=6),
    ),
    st.text(ANY_CHARACTER, max_size=40),
    st.text(st.one_of(ANY_CHARACTER, st.sampled_from(SPECIAL)), min_size=1, max_size=20),
    st.builds(
        lambda word, times: word * times,
        st.text(st.one_of(ANY_CHARACTER, st.sampled_from(SPECIAL)), min_size=1, max_size=3),
        st.integers(1, 60_000),
    ),
)

COUNTS: Counter[str] = Counter()


@pytest.fixture(scope="module", autouse=True)
def _show_counts(request: pytest.FixtureRequest) -> Iterator[None]:
    yield
    report(
        request.config, f"text fuzz: {sum(COUNTS.values())} cases {dict(sorted(COUNTS.items()))}"
    )


def _with(path: tuple[Any, ...], text: str) -> Json:
    definition = copy.deepcopy(BASE)
    node: Any = definition
    for part in path[:-1]:
        node = node[part]
    if path[-1] is KEY:
        node[text] = "x"
    else:
        node[path[-1]] = text
    return definition


def _bodies(definition: Json) -> list[bytes]:
    escaped = json.dumps(definition).encode()
    raw = json.dumps(definition, ensure_ascii=False).encode("utf-8", "surrogatepass")
    return [escaped, raw]


@fuzz_settings(max_examples=60)
@given(path=st.sampled_from(FIELDS), text=TEXT)
def test_any_text_in_any_field_is_never_a_server_error(
    api: Api, path: tuple[Any, ...], text: str
) -> None:
    for body in _bodies(_with(path, text)):
        response = api.post_json("/v1/check", body)  # asserts < 500
        COUNTS[f"http {response.status_code}"] += 1
        if response.status_code == 422:
            assert all(e["path"] or e["code"] == "invalid_json" for e in response.json()["errors"])


@fuzz_settings(max_examples=40)
@given(path=st.sampled_from(FIELDS), text=TEXT)
def test_any_text_in_any_field_never_exits_3_from_the_cli(path: tuple[Any, ...], text: str) -> None:
    with tempfile.TemporaryDirectory() as folder:
        for n, body in enumerate(_bodies(_with(path, text))):
            file = Path(folder) / f"definition-{n}.json"
            file.write_bytes(body)
            # streams that encode as a terminal's do (UTF-8, strictly)
            out, err = _terminal(), _terminal()
            with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
                try:
                    code = cli.main(["check", str(file)])
                finally:
                    out.flush(), err.flush()
            COUNTS[f"cli exit {code}"] += 1
            assert code != cli.EXIT_INTERNAL, err.buffer.getvalue()[:2000]


def _terminal() -> io.TextIOWrapper:
    return io.TextIOWrapper(io.BytesIO(), encoding="utf-8", errors="strict")
