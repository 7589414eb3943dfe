"""The shape of the package, read from its imports: no package cycle, and no import that runs back
up the layer order below.

Every module under ``service/`` is parsed with ``ast`` and every import in it counts — at module
level, inside functions, and under ``TYPE_CHECKING`` — because a late import is still a
dependency. Each module belongs to a *unit*: its subpackage (``service/render/…`` → ``render``) or,
for a module directly under ``service/``, its own name (``service/pipeline.py`` → ``pipeline``).

To place a new package or top-level module, add its name to one row of ``LAYERS``; to let two
edge packages know each other (think twice), take them out of ``APART``.
"""

from __future__ import annotations

import ast
from collections.abc import Iterator
from dataclasses import dataclass
from itertools import pairwise
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2] / "service"

SHARED = (
    "service",
    "errors",
    "config",
    "logs",
    "formatting",
    "wording",
    "glyphs",
    "palette",
    "colour_math",
)
"""Modules every layer may use; they import no stage (``service`` is the package's own
``__init__``: the version)."""

LAYERS: tuple[tuple[str, ...], ...] = (
    SHARED,
    # Storage: the database, the file store and the audit trail know nothing of packs' contents,
    # so they sit below every stage; the render stage's chart cache writes its files through them.
    ("archive",),
    # The archival form of a pack (PDF/A, signing, verification) takes the renderer as an
    # argument and imports no stage.
    ("seal",),
    # The pipeline's stages, in their order.
    ("definition",),
    ("data",),
    ("intents",),
    ("checks",),
    # The renderer draws a plan and hands back plain measurements; the checks that need the
    # drawing read those through a protocol of their own, so neither imports the other.
    ("render",),
    ("assemble",),
    ("pipeline",),
    # Around the pipeline: review and archive (workflow), then the job runner that runs the
    # pipeline and the workflow in worker processes.
    ("workflow",),
    ("runner",),
    # The edges: HTTP API, review pages, queue workers (apart: see APART).
    ("api", "web", "distributed"),
    # The composition root, then the commands.
    ("app",),
    ("cli", "bench"),
)
"""Lowest first. A unit may import units of its own row or of rows above it, never below."""

APART = frozenset({"api", "web", "distributed"})
"""Units of one row that must not import one another: each edge imports the runner and the
workflow, never another edge."""


@dataclass(frozen=True)
class Arrow:
    where: str
    """The importing file, relative to the repository."""
    line: int
    importer: str
    imported: str

    @property
    def source(self) -> str:
        return unit(self.importer)

    @property
    def target(self) -> str:
        return unit(self.imported)

    def __str__(self) -> str:
        return f"{self.where}:{self.line}: {self.importer} imports {self.imported}"


def module_name(path: Path, root: Path = ROOT) -> str:
    parts = list(path.relative_to(root.parent).with_suffix("").parts)
    if parts[-1] == "__init__":
        parts.pop()
    return ".".join(parts)


def unit(module: str) -> str:
    parts = module.split(".")
    return parts[1] if len(parts) > 1 else parts[0]


def arrows(root: Path = ROOT) -> Iterator[Arrow]:
    """Every import of a ``service`` module by a ``service`` module, where it is written."""
    paths = sorted(root.rglob("*.py"))
    known = {module_name(p, root) for p in paths}
    for path in paths:
        importer = module_name(path, root)
        where = str(path.relative_to(root.parent))
        package = importer if path.name == "__init__.py" else importer.rpartition(".")[0]
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"), str(path))):
            targets: list[str] = []
            if isinstance(node, ast.Import):
                targets = [alias.name for alias in node.names]
            elif isinstance(node, ast.ImportFrom):
                base = node.module or ""
                if node.level:
                    anchor = package.split(".")[: len(package.split(".")) - node.level + 1]
                    base = ".".join([*anchor, *([node.module] if node.module else [])])
                for alias in node.names:
                    name = f"{base}.{alias.name}"
                    targets.append(name if name in known else base)
            for target in dict.fromkeys(targets):  # one arrow per imported module and line
                if target == "service" or target.startswith("service."):
                    yield Arrow(where, node.lineno, importer, target)


def crossing(root: Path = ROOT) -> list[Arrow]:
    """The imports from one unit into another."""
    return [a for a in arrows(root) if a.source != a.target]


def rank() -> dict[str, int]:
    return {name: level for level, row in enumerate(LAYERS) for name in row}


def back_arrows(found: list[Arrow]) -> list[str]:
    levels = rank()
    wrong = []
    for arrow in found:
        if arrow.source not in levels or arrow.target not in levels:
            continue  # reported by test_every_unit_has_a_layer
        if levels[arrow.target] > levels[arrow.source]:
            wrong.append(
                f"{arrow}: '{arrow.source}' (layer {levels[arrow.source]}) may not import "
                f"'{arrow.target}' (layer {levels[arrow.target]}), which is further along"
            )
        elif arrow.source in APART and arrow.target in APART:
            wrong.append(
                f"{arrow}: the edges '{arrow.source}' and '{arrow.target}' may not import each "
                "other; move what they share into the runner or the workflow"
            )
    return wrong


def cycles(found: list[Arrow]) -> list[list[str]]:
    """The package cycles: strongly connected groups of units (Tarjan), each sorted."""
    graph: dict[str, set[str]] = {}
    for arrow in found:
        graph.setdefault(arrow.source, set()).add(arrow.target)
        graph.setdefault(arrow.target, set())
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    stack: list[str] = []
    on_stack: set[str] = set()
    groups: list[list[str]] = []

    def visit(node: str) -> None:
        index[node] = low[node] = len(index)
        stack.append(node)
        on_stack.add(node)
        for nxt in sorted(graph[node]):
            if nxt not in index:
                visit(nxt)
                low[node] = min(low[node], low[nxt])
            elif nxt in on_stack:
                low[node] = min(low[node], index[nxt])
        if low[node] == index[node]:
            group = []
            while True:
                member = stack.pop()
                on_stack.discard(member)
                group.append(member)
                if member == node:
                    break
            if len(group) > 1:
                groups.append(sorted(group))

    for node in sorted(graph):
        if node not in index:
            visit(node)
    return sorted(groups)


def test_every_unit_has_a_layer() -> None:
    levels = rank()
    units = {unit(module_name(p)) for p in ROOT.rglob("*.py")}
    missing = sorted(units - set(levels))
    assert not missing, f"add each of these to a row of LAYERS in {__file__}: {missing}"


def test_no_import_runs_back_up_the_layers() -> None:
    wrong = back_arrows(crossing())
    assert not wrong, "imports against the layer order:\n" + "\n".join(wrong)


def loop(group: list[str], found: list[Arrow]) -> list[Arrow]:
    """One closed path through a cycle's units, as one import per step (shortest, from the
    group's first unit)."""
    members = set(group)
    first: dict[tuple[str, str], Arrow] = {}
    for arrow in found:
        if arrow.source in members and arrow.target in members:
            first.setdefault((arrow.source, arrow.target), arrow)
    start = group[0]
    paths: dict[str, list[str]] = {start: [start]}
    queue = [start]
    while queue:
        here = queue.pop(0)
        for (source, target), _ in sorted(first.items()):
            if source != here:
                continue
            if target == start:
                steps = [*paths[here], start]
                return [first[(a, b)] for a, b in pairwise(steps)]
            if target not in paths:
                paths[target] = [*paths[here], target]
                queue.append(target)
    return []


def test_no_package_cycle() -> None:
    found = crossing()
    groups = cycles(found)
    lines = []
    for group in groups:
        lines.append(f"cycle between {', '.join(group)}, e.g.:")
        lines += [f"  {arrow}" for arrow in loop(group, found)]
    assert not groups, "package cycles:\n" + "\n".join(lines)


EDGES_WITHOUT_SQL = ("api", "web")
"""Route and page modules: every query and every permission rule is the workflow's."""
NO_SQL = ("sqlalchemy", "service.archive.db")


def test_routes_and_pages_hold_no_sql() -> None:
    wrong = []
    for edge in EDGES_WITHOUT_SQL:
        for path in sorted((ROOT / edge).rglob("*.py")):
            for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"), str(path))):
                names: list[str] = []
                if isinstance(node, ast.Import):
                    names = [alias.name for alias in node.names]
                elif isinstance(node, ast.ImportFrom) and node.module:
                    names = [node.module, *(f"{node.module}.{a.name}" for a in node.names)]
                for name in names:
                    if any(name == banned or name.startswith(banned + ".") for banned in NO_SQL):
                        where = path.relative_to(ROOT.parent)
                        wrong.append(f"{where}:{node.lineno}: imports {name}")
                        break
    assert not wrong, "route and page modules may not reach the database:\n" + "\n".join(wrong)
