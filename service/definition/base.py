"""The base model and reusable constrained types for definition inputs."""

from __future__ import annotations

from typing import Annotated

from pydantic import BaseModel, ConfigDict, StringConstraints

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


class Input(BaseModel):
    """Every definition model: unknown fields are refused, and parsed inputs never change."""

    model_config = ConfigDict(
        extra="forbid", frozen=True, str_strip_whitespace=True, allow_inf_nan=False
    )
