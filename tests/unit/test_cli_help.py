"""``plumbline --help`` lists every command in plain text.

The commands are read from the parser itself, so a command added later is checked without editing
this file; nested commands (``keys create``) are checked through their parent's help.
"""

from __future__ import annotations

import argparse
import re

import pytest

from service import cli

MARKUP = re.compile(r"`|\*|:[a-z]+:|\.\. [a-z]+::")
"""Backticks, asterisks, reST roles (``:class:``) and directives (``.. note::``)."""


def _commands(parser: argparse.ArgumentParser) -> dict[str, argparse.ArgumentParser]:
    found: dict[str, argparse.ArgumentParser] = {}
    for action in parser._actions:
        if isinstance(action, argparse._SubParsersAction):
            found.update(action.choices)
    return found


def _summaries(parser: argparse.ArgumentParser) -> dict[str, str | None]:
    summaries: dict[str, str | None] = {}
    for action in parser._actions:
        if isinstance(action, argparse._SubParsersAction):
            summaries.update({choice.dest: choice.help for choice in action._choices_actions})
    return summaries


def _paths(
    parser: argparse.ArgumentParser, prefix: tuple[str, ...] = ()
) -> list[tuple[tuple[str, ...], argparse.ArgumentParser]]:
    """Every parser with subcommands, with the words that reach it."""
    children = _commands(parser)
    if not children:
        return []
    found = [(prefix, parser)]
    for name, child in children.items():
        found += _paths(child, (*prefix, name))
    return found


def _help(capsys: pytest.CaptureFixture[str], words: list[str]) -> str:
    with pytest.raises(SystemExit) as stopped:
        cli.main([*words, "--help"])
    assert stopped.value.code == 0
    captured = capsys.readouterr()
    assert captured.err == ""
    return captured.out


def test_the_parser_has_the_commands_we_document() -> None:
    names = set(_commands(cli._parser()))
    assert {"schema", "checks", "check", "render", "walkthrough", "verify", "keys"} <= names
    assert {"serve", "worker"} <= names


@pytest.mark.parametrize(
    "words", [list(words) for words, _ in _paths(cli._parser())], ids=lambda w: " ".join(w) or "top"
)
def test_help_lists_every_command_on_one_line_in_plain_text(
    capsys: pytest.CaptureFixture[str], words: list[str], monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.setenv("COLUMNS", "80")
    parser = dict(_paths(cli._parser()))[tuple(words)]
    text = _help(capsys, words)
    assert not MARKUP.search(text), MARKUP.search(text)
    summaries = _summaries(parser)
    assert summaries
    for name, summary in summaries.items():
        assert summary, f"{name} has no summary"
        assert re.search(rf"^ +{re.escape(name)} +{re.escape(summary)}$", text, re.M), (
            f"{name} is not listed with its summary on one line:\n{text}"
        )


@pytest.mark.parametrize("name", sorted(_commands(cli._parser())))
def test_each_command_help_is_plain_text(capsys: pytest.CaptureFixture[str], name: str) -> None:
    text = _help(capsys, [name])
    assert text.startswith(f"usage: plumbline {name}")
    assert not MARKUP.search(text), MARKUP.search(text)


def test_a_reader_that_stops_reading_is_not_an_internal_error() -> None:
    """``plumbline check … | head -1`` once printed "internal error … BrokenPipeError"."""
    import subprocess
    import sys
    from pathlib import Path

    root = Path(__file__).resolve().parents[2]
    command = [
        sys.executable,
        "-m",
        "service.cli",
        "check",
        "sample_requests/first-definition.json",
    ]
    with subprocess.Popen(
        command, cwd=root, stdout=subprocess.PIPE, stderr=subprocess.PIPE
    ) as process:
        assert process.stdout is not None
        assert process.stderr is not None
        process.stdout.readline()
        process.stdout.close()  # as `head -1` does
        errors = process.stderr.read().decode()
        assert process.wait(timeout=120) == 0
    assert "internal error" not in errors
    assert "Traceback" not in errors
