"""The ``plumbline`` command: schema, checks, check, render, walkthrough, verify, keys, serve,
worker.

Exit codes: 0 success; 1 an unwaived check failed (``render`` still writes the draft); 2 the input is
invalid (every problem is printed with its path) or cannot be read; 3 a fault inside Plumbline.
"""

from __future__ import annotations

import argparse
import json
import os
import sys
import uuid
from collections.abc import Callable
from datetime import datetime
from pathlib import Path
from typing import Any, TextIO, TypeVar

from pydantic import ValidationError

from service import __version__, logs
from service.config import Settings, get_settings
from service.errors import (
    MAX_LISTED_PROBLEMS,
    InvalidDefinition,
    PlumblineError,
    RenderTimeout,
    Unreadable,
    listing,
)

EXIT_OK, EXIT_FAILED_CHECKS, EXIT_INVALID, EXIT_INTERNAL = 0, 1, 2, 3

T = TypeVar("T")


def main(argv: list[str] | None = None) -> int:
    logs.route_warnings()  # a library's warning says what happened, not where it is installed
    parser = _parser()
    args = parser.parse_args(argv)
    settings = _settings() if hasattr(args, "run") else None
    if settings is None:
        if not hasattr(args, "run"):
            parser.print_help()
        return EXIT_INVALID
    try:
        return int(args.run(args, settings))
    except InvalidDefinition as exc:
        return _invalid(exc, json_out=getattr(args, "json", False))
    except PlumblineError as exc:
        print(f"error: {exc.message}", file=sys.stderr)
        return EXIT_INVALID if exc.status < 500 else EXIT_INTERNAL
    except BrokenPipeError:  # the reader stopped reading (``| head``): not a fault, nothing to say
        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())  # no second error at exit
        return EXIT_OK
    except Exception as exc:  # noqa: BLE001 - the one last-resort handler: no traceback for users
        incident = uuid.uuid4().hex[:12]
        print(
            f"internal error (incident {incident}): {type(exc).__name__}: {exc}. This is a fault "
            "in Plumbline, not in your definition; please report it with the incident id and the "
            "definition.",
            file=sys.stderr,
        )
        return EXIT_INTERNAL


def _settings() -> Settings | None:
    """The configuration, or ``None`` after saying plainly what in it is wrong."""
    try:
        return get_settings()
    except ValidationError as exc:
        problems = "; ".join(
            (f"PLUMBLINE_{'__'.join(str(p) for p in e['loc']).upper()}: " if e["loc"] else "")
            + str(e["msg"]).removeprefix("Value error, ")
            for e in exc.errors()
        )
        print(f"configuration error: {problems}", file=sys.stderr)
        return None


DESCRIPTION = (
    "Turn a JSON report definition into a checked, reviewed and sealed PDF pack.\n"
    "Run 'plumbline COMMAND --help' for the options of one command."
)

EPILOG = """exit codes:
  0  success
  1  an unwaived check failed (render still writes the draft) or a step failed
  2  the input is invalid (every problem is printed with its path) or unreadable
  3  a fault inside Plumbline (printed with an incident id)"""


class _Formatter(argparse.RawDescriptionHelpFormatter):
    """Plain text as written (the description is not rewrapped), and each command's summary on
    its own name's line: argparse measures subcommand names without their indent, so a long one
    such as ``walkthrough`` would otherwise push its summary onto the next line."""

    def __init__(self, prog: str) -> None:
        super().__init__(prog, max_help_position=24)

    def add_argument(self, action: argparse.Action) -> None:
        super().add_argument(action)
        if action.help is not argparse.SUPPRESS:
            for choice in self._iter_indented_subactions(action):
                width = len(self._format_action_invocation(choice)) + self._current_indent
                self._action_max_length = max(self._action_max_length, width)


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="plumbline", description=DESCRIPTION, epilog=EPILOG, formatter_class=_Formatter
    )
    parser.add_argument("--version", action="version", version=f"plumbline {__version__}")
    sub = parser.add_subparsers(metavar="COMMAND", title="commands")

    def command(name: str, summary: str) -> argparse.ArgumentParser:
        """One subcommand: its line in the list, and the same line atop its own help."""
        return sub.add_parser(
            name,
            help=summary,
            description=summary[0].upper() + summary[1:] + ".",
            formatter_class=_Formatter,
        )

    p = command("schema", "print the definition's JSON Schema")
    p.set_defaults(run=_schema)

    p = command("checks", "list every check: rule, threshold, source")
    p.add_argument("--json", action="store_true", help="machine-readable output")
    p.add_argument("--markdown", action="store_true", help="the catalogue as Markdown")
    p.set_defaults(run=_checks)

    p = command("check", "validate a definition and run its checks")
    p.add_argument("definition", type=Path, help="the report definition (a JSON file)")
    p.add_argument("--json", action="store_true", help="machine-readable output")
    _budget_flags(p)
    p.set_defaults(run=_check)

    p = command("render", "check a definition and render a draft PDF")
    p.add_argument("definition", type=Path, help="the report definition (a JSON file)")
    p.add_argument("-o", "--output", type=Path, required=True, help="where to write the PDF")
    p.add_argument("--json", action="store_true", help="machine-readable output")
    p.add_argument(
        "--workers",
        type=int,
        default=None,
        help="processes that draw charts (default PLUMBLINE_RENDER_WORKERS, else every core)",
    )
    p.add_argument(
        "--no-cache", action="store_true", help="draw every chart afresh, ignoring the chart cache"
    )
    p.add_argument(
        "--progress",
        action=argparse.BooleanOptionalAction,
        default=None,
        help="show a progress bar on standard error (default: when it is a terminal)",
    )
    _budget_flags(p)
    p.set_defaults(run=_render)

    p = command("verify", "verify a sealed pack, step by step")
    p.add_argument("pack", type=Path, help="the sealed PDF")
    p.add_argument(
        "--trust",
        type=Path,
        action="append",
        default=[],
        help="a trusted certificate (PEM); repeatable; default: the development certificate",
    )
    p.add_argument(
        "--no-rerender", action="store_true", help="skip re-rendering the attached definition"
    )
    p.add_argument(
        "--no-archive",
        action="store_true",
        help="do not compare the file with the archive's record of the sealed pack",
    )
    p.add_argument("--json", action="store_true", help="machine-readable output")
    p.set_defaults(run=_verify)

    p = command("walkthrough", "review, sign off and seal with demo keys")
    p.add_argument("definition", type=Path, help="the report definition (a JSON file)")
    p.add_argument("-o", "--output", type=Path, required=True, help="where to write the sealed PDF")
    p.set_defaults(run=_walkthrough)

    p = command("worker", "run a build worker for PLUMBLINE_QUEUE_URL")
    p.add_argument("celery_args", nargs=argparse.REMAINDER, help="further Celery worker options")
    p.set_defaults(run=_worker)

    p = command("keys", "create or revoke API keys")
    _keys_actions(p)

    p = command("serve", "start the HTTP service and review pages")
    p.add_argument("--host", default=None, help="address to listen on (default PLUMBLINE_HOST)")
    p.add_argument(
        "--port", type=int, default=None, help="port to listen on (default PLUMBLINE_PORT)"
    )
    p.set_defaults(run=_serve)
    return parser


def _budget_flags(p: argparse.ArgumentParser) -> None:
    """The time and memory budget of a command that reads a definition, as the service has."""
    p.add_argument(
        "--time-limit",
        type=float,
        default=None,
        metavar="SECONDS",
        help="stop past this many seconds (default PLUMBLINE_RENDER_TIMEOUT_S; 0: no limit)",
    )
    p.add_argument(
        "--memory-limit",
        type=int,
        default=None,
        metavar="MB",
        help="stop past this much memory (default PLUMBLINE_WORKER_MEMORY_MB; 0: no limit)",
    )


def _within_budget(
    args: argparse.Namespace, settings: Settings, job: Callable[..., T], *a: Any, **kw: Any
) -> T:
    """Run ``job`` in a process of its own under the command's time and memory budget, as the
    service runs its jobs; past either it is stopped (exit 2), with a message naming the flag."""
    from service.runner.budget import run_alone
    from service.runner.pool import RenderMemory

    seconds = settings.render_timeout_s if args.time_limit is None else args.time_limit
    megabytes = settings.worker_memory_mb if args.memory_limit is None else args.memory_limit
    try:
        return run_alone(job, *a, timeout=max(0.0, seconds), memory_mb=max(0, megabytes), **kw)
    except RenderTimeout:
        raise RenderTimeout(
            f"the command was stopped after its time budget of {seconds:g} s; give a smaller "
            "definition, or raise --time-limit SECONDS (0: no limit; default PLUMBLINE_RENDER_TIMEOUT_S)"
        ) from None
    except RenderMemory:
        raise RenderMemory(
            f"the command was stopped at its memory limit of {megabytes} MB; give a smaller "
            "definition, or raise --memory-limit MB (0: no limit; default PLUMBLINE_WORKER_MEMORY_MB)"
        ) from None


def _keys_actions(p: argparse.ArgumentParser) -> None:
    """The actions of plumbline keys: create and revoke."""
    actions = p.add_subparsers(metavar="ACTION", title="actions")
    c = actions.add_parser(
        "create",
        help="make a key; its secret is shown once",
        description="Make an API key; its secret is shown once and only a hash is stored.",
        formatter_class=_Formatter,
    )
    c.add_argument("--name", required=True, help="the person or system the key belongs to")
    c.add_argument(
        "--person",
        metavar="PERSON_ID",
        help="give an existing person another key (the id printed with their first key); "
        "default: the key is for a new person, whose name must not read like anyone else's",
    )
    c.add_argument(
        "--role",
        action="append",
        required=True,
        choices=["author", "reviewer", "approver", "auditor", "admin"],
        help="repeatable",
    )
    c.add_argument(
        "--family", action="append", required=True, help="a report-id prefix, or '*'; repeatable"
    )
    c.add_argument("--expires", type=_aware_time, help="ISO 8601 time with a zone")
    c.add_argument(
        "--allow-expired",
        action="store_true",
        help="make the key even if --expires has passed (refused otherwise)",
    )
    c.set_defaults(run=_keys_create)
    r = actions.add_parser(
        "revoke", help="revoke a key", description="Revoke an API key.", formatter_class=_Formatter
    )
    r.add_argument("key_id", help="the key's id, as printed by keys create")
    r.set_defaults(run=_keys_revoke)


def _read(path: Path) -> bytes:
    try:
        return path.read_bytes()
    except OSError as exc:
        raise Unreadable(f"cannot read {path}: {exc.strerror}") from None


def _invalid(exc: InvalidDefinition, *, json_out: bool) -> int:
    listed = listing(exc.problems)
    if json_out:
        print(json.dumps(listed, indent=2, default=str))
    else:
        print(f"invalid definition: {exc.message}", file=sys.stderr)
        for problem in exc.problems[:MAX_LISTED_PROBLEMS]:
            print(f"  {problem.line()}", file=sys.stderr)
        if listed["problems_truncated"]:
            more = len(exc.problems) - MAX_LISTED_PROBLEMS
            print(
                f"  … and {more} more (the first {MAX_LISTED_PROBLEMS} are listed)", file=sys.stderr
            )
    return EXIT_INVALID


def _schema(args: argparse.Namespace, settings: Settings) -> int:
    from service.definition.schema import definition_schema

    print(json.dumps(definition_schema(), indent=2))
    return EXIT_OK


def _checks(args: argparse.Namespace, settings: Settings) -> int:
    from service import pipeline  # noqa: F401  (registers the checks)
    from service.checks import registry

    catalogue = registry.catalogue()
    if args.markdown:
        print(registry.markdown(), end="")
        return EXIT_OK
    if args.json:
        print(json.dumps(catalogue, indent=2))
        return EXIT_OK
    for spec in catalogue:
        powers = []
        powers.append("corrects automatically" if spec["correctable"] else "cannot correct")
        powers.append("waivable" if spec["waivable"] else "not waivable")
        print(f"{spec['id']}  —  {spec['title']}")
        print(f"    applies to: {', '.join(spec['intents'])} ({', '.join(spec['forms'])})")
        print(f"    measures:   {spec['measures']}")
        print(f"    threshold:  {spec['threshold']}")
        print(f"    source:     {spec['source']}")
        print(f"    {'; '.join(powers)}")
    return EXIT_OK


def _report(checked_results: list[dict[str, Any]], summary: str, unused: list[str]) -> None:
    for r in checked_results:
        measured = "" if r["measured"] is None else f" [{r['measured']}]"
        print(f"  {r['status']:<9} {r['chart']} / {r['check']}{measured}: {r['explanation']}")
    for waiver in unused:
        print(f"  note: the waiver for {waiver} was not needed")
    print(summary)


def _check(args: argparse.Namespace, settings: Settings) -> int:
    from service.runner.budget import check_definition

    raw = _read(args.definition)
    checked = _within_budget(args, settings, check_definition, raw, settings.limits)
    results = checked["checks"]
    if args.json:
        print(
            json.dumps(
                {
                    "report": checked["report"],
                    "blocked": checked["blocked"],
                    "summary": checked["summary"],
                    "results": results,
                    "unused_waivers": checked["unused_waivers"],
                },
                indent=2,
            )
        )
    else:
        _report(results, checked["line"], checked["unused_waivers"])
        _blocked_message(checked["blocked"], results)
    return EXIT_FAILED_CHECKS if checked["blocked"] else EXIT_OK


def _blocked_message(blocked: bool, results: list[dict[str, Any]]) -> None:
    if not blocked:
        return
    failed = [f"{r['check']} on {r['chart']}" for r in results if r["status"] == "failed"]
    print(
        f"BLOCKED: the pack cannot be signed off until these are fixed or waived: "
        f"{', '.join(failed)}",
        file=sys.stderr,
    )


def _render(args: argparse.Namespace, settings: Settings) -> int:
    from service.archive import files
    from service.render.options import from_settings
    from service.runner.workers import build_pack

    if args.workers is not None:
        settings = settings.model_copy(update={"render_workers": args.workers})
    options = from_settings(settings, cache=not args.no_cache)
    shown = sys.stderr.isatty() if args.progress is None else args.progress
    bar = ProgressBar(sys.stderr) if shown else None
    try:
        raw = _read(args.definition)
        built = _within_budget(
            args, settings, build_pack, raw, settings.limits, options=options, progress=bar
        )
    finally:
        if bar is not None:
            bar.close()
    files.write_atomic(args.output, built.pdf)
    if args.json:
        print(
            json.dumps(
                {
                    "pdf": str(args.output),
                    "bytes": len(built.pdf),
                    "blocked": built.blocked,
                    "summary": built.summary,
                    "results": built.results,
                    "unused_waivers": built.unused_waivers,
                },
                indent=2,
            )
        )
    else:
        if built.blocked:
            _report(built.results, built.summary, built.unused_waivers)
        print(f"wrote {args.output} ({len(built.pdf):,} bytes)")
        print(built.summary)
        _blocked_message(built.blocked, built.results)
    return EXIT_FAILED_CHECKS if built.blocked else EXIT_OK


class ProgressBar:
    """A one-line bar of charts drawn, redrawn in place (``\\r``) as a build goes."""

    WIDTH = 30

    def __init__(self, stream: TextIO) -> None:
        self.stream = stream
        self.shown = ""

    def __call__(self, stage: str, done: int, total: int) -> None:
        if total:
            filled = self.WIDTH * done // total
            line = f"[{'#' * filled}{'.' * (self.WIDTH - filled)}] {done}/{total} charts, {stage}"
        else:
            line = f"{stage}…"
        if line != self.shown:
            self.stream.write("\r" + line.ljust(len(self.shown)))
            self.stream.flush()
            self.shown = line

    def close(self) -> None:
        if self.shown:
            self.stream.write("\n")
            self.stream.flush()


def _verify(args: argparse.Namespace, settings: Settings) -> int:
    from service.archive import db
    from service.render.options import from_settings
    from service.seal import keys, verify
    from service.workflow import sealing

    roots = [_read(path) for path in args.trust]
    development = keys.development_certificate(settings.data_dir / "keys")
    if not roots and development is not None:
        roots = [development]
    rerender = None
    if not args.no_rerender:
        rerender = sealing.rerender(settings.limits, from_settings(settings).workers)
    report = verify.verify(_read(args.pack), trust_roots=roots, rerender=rerender)
    if not args.no_archive:
        if db.exists(settings.database_url):
            sealing.compare_with_archive(report, db.connect(settings.database_url))
        else:
            print(f"(no archive at {settings.database_url}: the file is verified on its own)")
    if args.json:
        print(json.dumps(report.as_dict(), indent=2))
    else:
        for step in report.steps:
            print(f"{'ok  ' if step.ok else 'FAIL'}  {step.name}: {step.detail}")
        print("verified" if report.ok else "NOT verified: see the failed steps above")
    return EXIT_OK if report.ok else EXIT_FAILED_CHECKS


def _walkthrough(args: argparse.Namespace, settings: Settings) -> int:
    from service.archive import db
    from service.render.options import from_settings
    from service.seal import keys, verify
    from service.workflow import sealing, walkthrough

    definition = _read(args.definition)
    walked = walkthrough.review_and_seal(definition, settings, say=lambda line: print(f"  {line}"))
    walkthrough.write(args.output, walked.sealed_pdf)
    print(f"wrote {args.output} ({len(walked.sealed_pdf):,} bytes, SHA-256 {walked.seal.sha256})")
    pdfa = walked.seal.pdfa
    verdict = "passed" if pdfa["ok"] else f"{pdfa['verdict']}: {'; '.join(pdfa['messages'][:3])}"
    print(f"{pdfa['standard']} check by {pdfa['validator']}: {verdict}")
    roots = [keys.development_certificate(settings.data_dir / "keys") or b""]
    if settings.seal_cert is not None:
        roots = [settings.seal_cert.read_bytes()]
    report = verify.verify(
        walked.sealed_pdf,
        trust_roots=roots,
        rerender=sealing.rerender(settings.limits, from_settings(settings).workers),
    )
    sealing.compare_with_archive(report, db.connect(settings.database_url))
    for step in report.steps:
        print(f"  {'ok  ' if step.ok else 'FAIL'}  {step.name}: {step.detail[:160]}")
    print("verified" if report.ok else "NOT verified: see the failed steps above")
    return EXIT_OK if report.ok else EXIT_FAILED_CHECKS


def _worker(args: argparse.Namespace, settings: Settings) -> int:
    from service.app import worker

    if not settings.queue_url:
        print("error: set PLUMBLINE_QUEUE_URL (e.g. redis://127.0.0.1:6379/0)", file=sys.stderr)
        return EXIT_INVALID
    return worker(settings, args.celery_args)


def _aware_time(text: str) -> datetime:
    value = datetime.fromisoformat(text)
    if value.tzinfo is None:
        raise argparse.ArgumentTypeError("give a time zone, e.g. 2027-01-31T00:00:00+00:00")
    return value


def _keys_create(args: argparse.Namespace, settings: Settings) -> int:
    from service.archive import db
    from service.workflow import keys

    settings.data_dir.mkdir(parents=True, exist_ok=True)
    sessions = db.connect(settings.database_url)
    key_id, secret = keys.create(
        sessions,
        name=args.name,
        roles={keys.Role(v) for v in args.role},
        families=set(args.family),
        expires=args.expires,
        allow_expired=args.allow_expired,
        person=args.person,
    )
    print(f"key {key_id}")
    print(f"secret (shown once; store it now): {secret}")
    print(f"person {keys.person_of(sessions, key_id)} (give them another key: --person)")
    return EXIT_OK


def _keys_revoke(args: argparse.Namespace, settings: Settings) -> int:
    from service.archive import db
    from service.workflow import keys

    done = keys.revoke(db.connect(settings.database_url), key_id=args.key_id)
    print(f"revoked {args.key_id}" if done else f"{args.key_id} was already revoked")
    return EXIT_OK


def _serve(args: argparse.Namespace, settings: Settings) -> int:
    from service.app import serve

    return serve(settings, host=args.host, port=args.port)


if __name__ == "__main__":
    sys.exit(main())
