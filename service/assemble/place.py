"""Place each chart's vector PDF page into its slot as a form XObject, deterministically.

pikepdf's ``add_overlay`` names resources at random; here each chart gets a name we choose
(``/PlChart<n>``) and its own content stream, so the same inputs give the same bytes.
"""

from __future__ import annotations

import io
from collections.abc import Mapping

import pikepdf

from service.assemble.pack import Slot
from service.errors import RenderFailed


def place(document: bytes, slots: list[Slot], charts: bytes, page_of: Mapping[str, int]) -> bytes:
    """Put page ``page_of[slot.chart_id]`` of ``charts`` into each slot of ``document``."""
    if not slots:  # a pack of tables and narrative only
        return _tidy(document)
    try:
        with pikepdf.open(io.BytesIO(document)) as pdf, pikepdf.open(io.BytesIO(charts)) as source:
            # ``source`` stays open until the destination is saved
            for number, slot in enumerate(slots):
                page = pdf.pages[slot.page]
                chart_page = source.pages[page_of[slot.chart_id]]
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
        raise RenderFailed(f"the charts could not be placed in the pack: {exc}") from exc


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
