"""Place each chart's vector PDF page into its slot as a form XObject, deterministically.

pikepdf's ``add_overlay`` names resources at random; here each chart gets a name we choose
(``/PlChart<n>``) and its own content stream, so the same inputs give the same bytes.
"""

from __future__ import annotations

import contextlib
import io
from collections.abc import Mapping, Sequence

import pikepdf

from service.assemble.pack import Slot
from service.errors import RenderFailed


def place(
    document: bytes,
    slots: list[Slot],
    charts: Sequence[bytes],
    page_of: Mapping[str, tuple[int, int]],
) -> bytes:
    """Put each slot's chart into ``document``: ``page_of[slot.chart_id]`` is (file, page) in
    ``charts``, the drawn chart files."""
    if not slots:  # a pack of tables and narrative only
        return _tidy(document)
    try:
        with contextlib.ExitStack() as stack:
            pdf = stack.enter_context(pikepdf.open(io.BytesIO(document)))
            # the sources stay open until the destination is saved
            sources = [stack.enter_context(pikepdf.open(io.BytesIO(c))) for c in charts]
            for number, slot in enumerate(slots):
                page = pdf.pages[slot.page]
                file, at = page_of[slot.chart_id]
                chart_page = sources[file].pages[at]
                form = pdf.copy_foreign(chart_page.as_form_xobject())
                name = page.add_resource(
                    form, pikepdf.Name.XObject, name=pikepdf.Name(f"/PlChart{number}")
                )
                rect = pikepdf.Rectangle(slot.x, slot.y, slot.x + slot.width, slot.y + slot.height)
                placement = page.calc_form_xobject_placement(
                    form, pikepdf.Name(str(name)), rect, allow_shrink=True, allow_expand=True
                )
                page.contents_add(pikepdf.Stream(pdf, placement), prepend=False)
            return _save(pdf)
    except (pikepdf.PdfError, KeyError, IndexError) as exc:
        raise RenderFailed.logged("the charts could not be placed in the pack", exc) from exc


def _tidy(document: bytes) -> bytes:
    with pikepdf.open(io.BytesIO(document)) as pdf:
        return _save(pdf)


def _save(pdf: pikepdf.Pdf) -> bytes:
    for page in pdf.pages:
        if "/Trans" in page.obj:
            del page.obj["/Trans"]  # reportlab's empty transition dicts (PDF/A dislikes them)
    out = io.BytesIO()
    pdf.save(
        out,
        deterministic_id=True,
        compress_streams=True,
        object_stream_mode=pikepdf.ObjectStreamMode.generate,
    )
    return out.getvalue()
