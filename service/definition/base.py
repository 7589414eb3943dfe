"""The base model and reusable constrained types for definition inputs.

Types are strict where JSON has a type of its own: a number is a JSON number (never ``"93.4"``), a
flag is ``true`` or ``false`` (never ``"yes"`` or ``1``), a whole number is written whole, and dates
and times are ISO 8601 text (never seconds). Dates lie where every period derived from them exists.
"""

from __future__ import annotations

from datetime import date, datetime
from typing import Annotated, Any, Literal

from pydantic import (
    AfterValidator,
    AwareDatetime,
    BaseModel,
    BeforeValidator,
    ConfigDict,
    StrictBool,
    StrictFloat,
    StrictInt,
    StringConstraints,
)
from pydantic_core import PydanticCustomError

Id = Annotated[
    str,
    StringConstraints(pattern=r"^[a-z0-9][a-z0-9_-]{0,63}$"),
]
"""Stable identifiers: lower-case letters, digits, ``-`` and ``_``; at most 64 characters."""

Name = Annotated[str, StringConstraints(min_length=1, max_length=200, strip_whitespace=True)]
"""A column or dataset name as it appears in the data."""

Label = Annotated[str, StringConstraints(min_length=1, strip_whitespace=True)]
"""Short human text (titles, headings). Length limits come from the configured ``Limits``."""

Text = Annotated[str, StringConstraints(strip_whitespace=True)]
"""Longer human text (narrative). Length limits come from the configured ``Limits``."""

Number = StrictFloat
"""A JSON number (an integer is a number too); text such as ``"93.4"`` is refused."""

Whole = StrictInt
"""A JSON whole number; ``8.0`` and ``"8"`` are refused."""

Flag = StrictBool
"""``true`` or ``false``; ``1`` and ``"true"`` are refused."""

EARLIEST = date(1678, 1, 1)
LATEST = date(2261, 12, 31)
"""Dates of a definition lie in these years: the clock the data is read on (pandas' nanosecond
timestamps, 1677-09-21 to 2262-04-11) holds every period derived from them, the one after the last
included."""


def _iso_text(kind: str) -> Any:
    """A check that a date (``kind`` 'date') or time ('datetime') is given as text."""

    def check(value: Any) -> Any:
        if not isinstance(value, str | date):  # JSON gives text; code may build with dates
            raise PydanticCustomError(
                f"{kind}_type",
                "a {what} is ISO 8601 text, not {kind}",
                {"what": "date" if kind == "date" else "time", "kind": _kind(value)},
            )
        return value

    return check


def _in_range(value: date) -> date:
    day = value.date() if isinstance(value, datetime) else value
    if not EARLIEST <= day <= LATEST:
        raise PydanticCustomError(
            "date_out_of_range",
            "the date lies outside {earliest} to {latest}",
            {"earliest": EARLIEST.isoformat(), "latest": LATEST.isoformat()},
        )
    return value


def _kind(value: Any) -> str:
    if isinstance(value, bool):
        return "true or false"
    if isinstance(value, int | float):
        return "a number"
    if isinstance(value, str):
        return "text"
    return "a list" if isinstance(value, list) else "an object" if value is not None else "null"


Day = Annotated[date, BeforeValidator(_iso_text("date")), AfterValidator(_in_range)]
"""A calendar date written as ISO 8601 text, within ``EARLIEST`` to ``LATEST``."""

Moment = Annotated[AwareDatetime, BeforeValidator(_iso_text("datetime")), AfterValidator(_in_range)]
"""A time with a zone written as ISO 8601 text, on a day within ``EARLIEST`` to ``LATEST``."""


def _exactly_one(value: Any) -> Any:
    if type(value) is not int:
        raise PydanticCustomError(
            "version_type", "the version is the whole number 1, not {kind}", {"kind": _kind(value)}
        )
    return value


Version = Annotated[Literal[1], BeforeValidator(_exactly_one)]
"""The definition's version, a JSON whole number (``true`` and ``1.0`` are refused)."""


class Input(BaseModel):
    """Every definition model: unknown fields are refused, and parsed inputs never change."""

    model_config = ConfigDict(
        extra="forbid", frozen=True, str_strip_whitespace=True, allow_inf_nan=False
    )
