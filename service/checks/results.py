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
    parts = ", ".join(f"{n} {status}" for status, n in counts.items())
    return f"{len(results)} checks: {parts}"
