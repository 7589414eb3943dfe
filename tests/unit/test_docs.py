"""The check catalogue in docs/ is generated from the registry, so it can never drift from it."""

from __future__ import annotations

from pathlib import Path

from service import pipeline  # noqa: F401  (registers every check)
from service.checks import registry

DOC = Path(__file__).parents[2] / "docs" / "checks.md"


def test_docs_checks_md_is_generated_from_the_registry() -> None:
    assert DOC.read_text() == registry.markdown(), "run `make docs` to regenerate docs/checks.md"


def test_every_check_is_in_the_generated_docs() -> None:
    text = registry.markdown()
    for check in registry.CHECKS:
        assert f"`{check}`" in text
