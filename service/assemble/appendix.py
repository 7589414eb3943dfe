"""The appendix for reviewers, as content: what needs attention, each chart's passes, the rules.

:func:`content` sorts every check result of a report into three parts. First, one row for each
result that is not a plain pass (failed, waived, corrected, advice), worst first, with what was
measured, what was done and why. Then, per chart, its passed checks (what each measured) and the
checks its form cannot break, which are named but never counted as passes. Last, each check's rule
and threshold once for the whole pack, so rows refer to it by the check's id. Pages are not known
here: :mod:`service.assemble.pack` adds them while laying out. Nothing here draws.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass

from service.checks import engine, registry
from service.checks.outcome import Checked
from service.checks.results import CheckResult, Status, summary
from service.wording import CATALOGUES, say

ATTENTION = (Status.failed, Status.waived, Status.corrected, Status.advice)
"""The statuses a reviewer must look at, worst first."""


@dataclass(frozen=True)
class Attention:
    """One result that is not a plain pass."""

    chart_id: str
    chart_title: str
    check: str
    status: str
    status_text: str
    measured: str
    done: str
    why: str


@dataclass(frozen=True)
class ChartChecks:
    """One chart's passed checks (id, what was measured) and the checks its form cannot break."""

    chart_id: str
    title: str
    counts: str
    passed: list[tuple[str, str]]
    not_applicable: list[str]


@dataclass(frozen=True)
class Rule:
    check: str
    title: str
    threshold: str
    source: str


@dataclass(frozen=True)
class Appendix:
    attention: list[Attention]
    charts: list[ChartChecks]
    rules: list[Rule]


def counted(count: int, status: Status, locale: str) -> str:
    """``count`` results of a status, in the locale's words ("3 Hinweise", "1 Hinweis")."""
    key = f"appendix.status_{status.value}_many"
    if count != 1 and key in CATALOGUES["en"]:
        return f"{count} {say(key, locale)}"
    return f"{count} {status_text(status, locale)}"


def status_text(status: Status, locale: str) -> str:
    return say(f"appendix.status_{status.value}", locale)


def counts_text(results: Iterable[CheckResult], locale: str) -> str:
    """ "14 checks: 12 passed, 1 corrected, 1 advice; 3 not applicable" in the locale's words:
    statuses that occur, in the order of :class:`Status`; not applicable ones are not counted."""
    counts = summary(list(results))
    inapplicable = counts.pop(Status.not_applicable.value)
    shown = [
        counted(n, Status(s), locale)
        for s, n in counts.items()
        if n or s in (Status.passed.value, Status.failed.value)
    ]
    text = f"{say('appendix.count', locale, count=sum(counts.values()))}: {', '.join(shown)}"
    if inapplicable:
        text += f"; {counted(inapplicable, Status.not_applicable, locale)}"
    return text


def content(checked: Checked, locale: str) -> Appendix:
    titles = {c.plan.chart_id: c.plan.title for c in checked.charts}
    titles |= {t.plan.table_id: t.plan.title for t in checked.shown_tables}
    results = checked.results
    attention = [
        _attention(r, titles.get(r.chart, r.chart), locale)
        for status in ATTENTION
        for r in results
        if r.status is status
    ]
    charts = [_checks_of(c.plan.chart_id, c.plan.title, c.results, locale) for c in checked.charts]
    charts += [
        _checks_of(t.plan.table_id, t.plan.title, t.results, locale) for t in checked.shown_tables
    ]
    used = list(dict.fromkeys(r.check for r in results))
    rules = [_rule(registry.rule(check)) for check in used]
    return Appendix(attention=attention, charts=charts, rules=rules)


def _checks_of(block_id: str, title: str, results: list[CheckResult], locale: str) -> ChartChecks:
    """One chart's or table's passed checks and the checks its form cannot break."""
    return ChartChecks(
        chart_id=block_id,
        title=title,
        counts=counts_text(results, locale),
        passed=[(r.check, r.measured_text) for r in results if r.status is Status.passed],
        not_applicable=[r.check for r in results if r.status is Status.not_applicable],
    )


def _rule(spec: registry.CheckSpec | registry.TableCheckSpec) -> Rule:
    return Rule(check=spec.id, title=spec.title, threshold=spec.threshold, source=spec.source)


def _attention(result: CheckResult, title: str, locale: str) -> Attention:
    why = result.explanation
    measured = result.measured_text
    if result.status is Status.corrected:
        correction = engine.correction(registry.rule(result.check), locale)
        why = why.replace(correction, "").strip()
        done = say("appendix.done_corrected", locale, correction=correction)
        if result.corrected_to:
            measured = f"{measured} → {result.corrected_to}"
            done += " " + say("appendix.done_corrected_to", locale, after=result.corrected_to)
    elif result.status is Status.waived and result.waiver is not None:
        waiver = result.waiver
        why = why.removesuffix(f" Waived by {waiver.by}.")
        why += " " + say("appendix.reason", locale, reason=waiver.reason)
        if waiver.expires is not None:
            done = say(
                "appendix.done_waived_until", locale, by=waiver.by, until=waiver.expires.isoformat()
            )
        else:
            done = say("appendix.done_waived", locale, by=waiver.by)
    elif result.status is Status.failed:
        done = say("appendix.done_failed", locale)
    else:
        done = say("appendix.done_advice", locale)
    return Attention(
        chart_id=result.chart,
        chart_title=title,
        check=result.check,
        status=result.status.value,
        status_text=status_text(result.status, locale),
        measured=measured,
        done=done,
        why=why,
    )
