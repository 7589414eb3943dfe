"""Check results: the record every check yields for every chart it applies to."""

from __future__ import annotations

from datetime import date
from enum import StrEnum

from pydantic import BaseModel, ConfigDict


class Status(StrEnum):
    passed = "passed"
    corrected = "corrected"
    waived = "waived"
    failed = "failed"
    advice = "advice"
    """Worth a reader's attention, but not a breach of a rule: never blocks."""
    not_applicable = "not_applicable"
    """The rule cannot be broken by this chart's form (one value axis where no second can be
    drawn): recorded, never counted as a pass."""


class WaiverRecord(BaseModel):
    model_config = ConfigDict(frozen=True)

    reason: str
    by: str
    expires: date | None = None


class CheckResult(BaseModel):
    model_config = ConfigDict(frozen=True)

    check: str
    chart: str
    status: Status
    measured: float | int | str | None
    measured_text: str
    corrected_to: str | None = None
    """For a correction: the measured value after it (``measured_text`` is before)."""
    threshold: str
    explanation: str
    source: str
    waiver: WaiverRecord | None = None

    @property
    def blocking(self) -> bool:
        return self.status is Status.failed


def summary(results: list[CheckResult]) -> dict[str, int]:
    counts = {status.value: 0 for status in Status}
    for result in results:
        counts[result.status.value] += 1
    return counts


def summary_line(results: list[CheckResult]) -> str:
    counts = summary(results)
    optional = (Status.advice, Status.not_applicable)
    shown = [f"{counts[s.value]} {s.value}" for s in Status if s not in optional]
    if counts[Status.advice.value]:
        shown.append(f"{counts[Status.advice.value]} advice")
    applicable = len(results) - counts[Status.not_applicable.value]
    line = f"{applicable} checks: {', '.join(shown)}"
    if counts[Status.not_applicable.value]:
        line += f" ({counts[Status.not_applicable.value]} more not applicable to their chart)"
    return line
