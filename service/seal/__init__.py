"""The seal stage: a rendered draft pack → a signed PDF/A-3b file that carries its own definition.

    draft PDF ──► pdfa.prepare ──► pdfa.check ──► sign.sign ──► verify.verify
                  (PDF/A-3b, the    (pikepdf's     (PAdES B-B,    (signature, attachments,
                   definition        verdict,       incremental    re-render = first revision)
                   attached)         kept)          update)

The seal's metadata comes from the definition only (title, owner, ``as_of``), never the clock, so
the unsigned sealed file is reproducible from the definition it carries: that is what lets
``verify`` re-render it and compare bytes. The stage imports no other stage; the caller passes in
the function that renders a definition into a draft PDF.

``service.seal.sign`` and ``service.seal.verify`` are the modules (use ``sign.sign`` and
``verify.verify``); the package re-exports the signing function as ``sign_pdf`` so that no function
hides a module of the same name.
"""

from __future__ import annotations

import json
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from datetime import datetime

from service.seal.keys import SigningKey
from service.seal.pdfa import PdfaVerdict, check, prepare
from service.seal.sign import sign as sign_pdf
from service.seal.sign import unsigned_part
from service.seal.verify import Rerender, Step, VerifyReport

DEFINITION = "definition.json"
"""The attachment name of the definition a pack was rendered from."""


@dataclass(frozen=True)
class Sealed:
    signed: bytes
    unsigned: bytes
    pdfa: PdfaVerdict
    """pikepdf's verdict on the unsigned file (a signed file's field is a construct it does not check)."""


def seal_unsigned(
    draft_pdf: bytes,
    definition: bytes,
    sources: Mapping[str, bytes] | None = None,
    data: Mapping[str, bytes] | None = None,
) -> bytes:
    """The PDF/A-3b file for a draft, with the definition attached and dates from ``as_of``.

    ``sources`` are further files the pack was rendered from (the sign-off record), ``data`` the
    datasets as files (associated with relationship /Data)."""
    report = json.loads(definition)["report"]
    data = dict(data or {})
    return prepare(
        draft_pdf,
        attachments={DEFINITION: definition, **(sources or {}), **data},
        title=str(report["title"]),
        author=str(report["owner"]),
        created=datetime.fromisoformat(str(report["as_of"])),
        data_files=tuple(data),
    )


def seal(
    draft_pdf: bytes,
    definition: bytes,
    key: SigningKey,
    sources: Mapping[str, bytes] | None = None,
    data: Mapping[str, bytes] | None = None,
) -> Sealed:
    unsigned = seal_unsigned(draft_pdf, definition, sources, data)
    return Sealed(signed=sign_pdf(unsigned, key), unsigned=unsigned, pdfa=check(unsigned))


Drafted = tuple[bytes, dict[str, bytes], dict[str, bytes]]
"""What a renderer gives for sealing: the pack's PDF, its further sources, its data files."""


def rerender_with(render_draft: Callable[[bytes], bytes]) -> Rerender:
    """A ``rerender`` for ``verify`` of a pack sealed from its definition alone."""
    return rerender_from(lambda files: (render_draft(files[DEFINITION]), {}, {}))


def rerender_from(render: Callable[[dict[str, bytes]], Drafted]) -> Rerender:
    """A ``rerender`` for ``verify``: render the pack again from its attachments (``render`` reads
    the definition and any sign-off record and rebuilds every attachment), then seal it unsigned."""

    def rerender(attachments: dict[str, bytes]) -> bytes:
        if DEFINITION not in attachments:
            raise LookupError(f"the pack carries no {DEFINITION}")
        pdf, sources, data = render(attachments)
        return seal_unsigned(pdf, attachments[DEFINITION], sources, data)

    return rerender


__all__ = [
    "DEFINITION",
    "Drafted",
    "PdfaVerdict",
    "Rerender",
    "Sealed",
    "SigningKey",
    "Step",
    "VerifyReport",
    "check",
    "prepare",
    "rerender_from",
    "rerender_with",
    "seal",
    "seal_unsigned",
    "sign_pdf",
    "unsigned_part",
]
