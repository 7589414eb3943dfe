"""What a worker's render process does before its first build: the house style, and the
pipeline's imports, so the first build of a worker is not slower than the next."""

from __future__ import annotations


def warm() -> None:
    from service import pipeline  # noqa: F401 - imported for its side effect: a warm process
    from service.render import style

    style.install()
