"""The pipeline: definition → data → encoders → checks → render → assemble, run in one place.

``intake`` reads and validates (every problem at once), ``check`` plans and guards every chart
without drawing, ``render`` draws, finishes the checks that need the drawing, lays out the pack and
caches it. ``build`` runs all three and is the unit of work handed to a worker process, so it takes
and returns plain, picklable values. No stage calls the next: the order lives here.
"""

from __future__ import annotations

import hashlib
from collections.abc import Callable
from dataclasses import asdict, dataclass
from typing import TYPE_CHECKING, Any

from service import checks as _checks  # noqa: F401  (registers every check)
from service import intents
from service.checks import engine, registry
from service.checks.outcome import Checked, CheckedChart
from service.checks.results import summary, summary_line
from service.config import Limits
from service.data import frames, values
from service.data.frames import Table
from service.definition import validate
from service.definition.model import ReportDefinition, local_wall_time
from service.errors import InvalidDefinition, Problem

if TYPE_CHECKING:
    from service.render.options import RenderOptions


@dataclass(frozen=True)
class Intake:
    definition: ReportDefinition
    tables: dict[str, Table]
    fingerprint: str


def intake(raw: bytes | str, limits: Limits) -> Intake:
    data = raw.encode() if isinstance(raw, str) else raw
    definition, problems = validate.parse(data, limits)
    problems.extend(validate.locale_problems(definition))
    problems.extend(registry.waiver_problems(definition))
    declared = frozenset(
        d
        for d in range(len(definition.datasets))
        if any(p.path.startswith(f"datasets[{d}]") for p in problems)
    )
    tables, found = frames.load_all(definition, skip=declared, max_periods=limits.periods_limit)
    problems.extend(found)
    troubled = {p.path for p in problems}
    for path, chart in definition.charts():
        table = tables.get(chart.dataset)
        if chart.intent not in intents.ENCODERS:
            problems.append(
                Problem(
                    "intent_unavailable",
                    f"{path}.intent",
                    f"this build of Plumbline cannot draw intent '{chart.intent}' yet",
                    f"use one of: {', '.join(sorted(intents.ENCODERS))}",
                    chart.intent,
                )
            )
            continue
        if table is None or any(t == path or t.startswith(f"{path}.") for t in troubled):
            continue  # its dataset or its own fields are already reported
        problems.extend(intents.ENCODERS[chart.intent].problems(chart, table, path, limits))
    problems.extend(values.problems(definition, tables, problems, limits))
    if problems:
        raise InvalidDefinition(problems)
    return Intake(definition, tables, hashlib.sha256(data).hexdigest())


def check(taken: Intake) -> Checked:
    definition = taken.definition
    as_of = local_wall_time(definition.report.as_of)
    locale = definition.report.locale
    palette = tuple(definition.report.palette) if definition.report.palette else None
    env = intents.Env(locale=locale, as_of=as_of, palette=palette)
    charts: list[CheckedChart] = []
    for path, chart in definition.charts():
        table = taken.tables[chart.dataset]
        plan = intents.ENCODERS[chart.intent].encode(chart, table, env)
        if env.palette and not plan.palette:
            plan = plan.model_copy(update={"palette": list(env.palette)})
        ctx = registry.Context(
            chart=chart,
            table=table,
            as_of=as_of,
            locale=locale,
            owner=definition.report.owner,
            tables=taken.tables,
        )
        guarded = engine.guard(plan, ctx, definition.waivers)
        charts.append(CheckedChart(path=path, plan=guarded.plan, results=guarded.results))
    return Checked(
        definition=definition, tables=taken.tables, fingerprint=taken.fingerprint, charts=charts
    )


@dataclass(frozen=True)
class Built:
    """What a worker returns: plain data only."""

    pdf: bytes
    results: list[dict[str, Any]]
    blocked: bool
    counts: dict[str, int]
    summary: str
    fingerprint: str
    report: dict[str, Any]
    unused_waivers: list[str]


Progress = Callable[[str, int, int], None]
"""Told (stage, charts drawn, charts in the pack) as a build goes: reading, checking, drawing
(once per finished group of charts), assembling."""


def render(
    checked: Checked,
    *,
    status_line: str = "DRAFT — not signed off",
    options: RenderOptions | None = None,
    progress: Progress | None = None,
) -> tuple[bytes, Checked]:
    """The pack's PDF, and the report with the checks measured while drawing (label layout).

    The sequence after the checks, in this order and only here: draw every chart (the renderer
    hands back its bytes and what it measured), finish the checks that need the drawing, build
    the pack's content, lay it out around the drawn pages, and keep the finished pack in the cache
    (named by its content and the drawn charts' bytes, so an unchanged pack is not laid out again).

    ``options`` say how many processes draw and where drawn charts are cached; the bytes are the
    same whatever they say. The default draws serially in this process, with no cache.
    """
    from service.assemble import compose  # the drawing and layout stacks load only when drawing
    from service.render import cache, groups
    from service.render.options import RenderOptions

    options = options or RenderOptions()

    def drawn_so_far(done: int, of: int) -> None:
        if progress is not None:
            progress("drawing" if done < of else "assembling", done, of)

    if progress is not None:
        progress("drawing", 0, len(checked.charts))
    drawn = groups.draw_all([c.plan for c in checked.charts], options, drawn_so_far)
    checked = engine.finish(checked, drawn.reports)
    placement = {c.plan.chart_id: at for c, at in zip(checked.charts, drawn.pages, strict=True)}
    sizes = compose.sizes(drawn.files, placement)
    content = compose.content_for(checked, sizes, status_line=status_line)
    store = cache.ChartCache.of(options)
    if store is None:
        return compose.lay_out(content, drawn.files, placement), checked
    key = cache.pack_key(asdict(content), drawn.files)
    if (hit := store.get(key)) is not None:
        return hit[0], checked  # the same content and charts: the same file
    pdf = compose.lay_out(content, drawn.files, placement)
    store.put(key, pdf, [])
    return pdf, checked


def build(
    raw: bytes,
    limits: Limits,
    *,
    options: RenderOptions | None = None,
    progress: Progress | None = None,
) -> Built:
    if options is not None and options.workers > 1:
        from service.render import pool  # the drawing stack loads only when drawing

        pool.warm(options.workers - 1)  # the helpers start while this process reads and checks
    if progress is not None:
        progress("reading", 0, 0)
    taken = intake(raw, limits)
    if progress is not None:
        progress("checking", 0, sum(1 for _ in taken.definition.charts()))
    pdf, checked = render(check(taken), options=options, progress=progress)
    definition = checked.definition
    return Built(
        pdf=pdf,
        results=[r.model_dump(mode="json") for r in checked.results],
        blocked=checked.blocked,
        counts=summary(checked.results),
        summary=summary_line(checked.results),
        fingerprint=checked.fingerprint,
        report={
            "id": definition.report.id,
            "title": definition.report.title,
            "period": definition.period_text(),
            "as_of": definition.report.as_of.isoformat(),
        },
        unused_waivers=checked.unused_waivers,
    )


__all__ = [
    "Built",
    "Checked",
    "CheckedChart",
    "Intake",
    "Progress",
    "build",
    "check",
    "intake",
    "render",
]
