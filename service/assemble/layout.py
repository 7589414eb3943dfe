"""Page geometry and paragraph styles of the pack: one calm house look."""

from __future__ import annotations

from functools import lru_cache

from reportlab.lib import colors
from reportlab.lib.pagesizes import A4
from reportlab.lib.styles import ParagraphStyle
from reportlab.lib.units import mm

from service.assemble import fonts

PAGE = A4
MARGIN = 20 * mm
FRAME_WIDTH = PAGE[0] - 2 * MARGIN

INK = colors.HexColor("#1a1a1a")
MUTED = colors.HexColor("#5c5c5c")
RULE = colors.HexColor("#c8c8c8")
BAND = colors.HexColor("#f3f3f3")
DRAFT = colors.HexColor("#a4001d")
STATUS_COLOURS = {
    "passed": colors.HexColor("#2f6b3a"),
    "corrected": colors.HexColor("#805a00"),
    "waived": colors.HexColor("#5a4a8a"),
    "failed": DRAFT,
    "advice": colors.HexColor("#1f5f8b"),
}


@lru_cache(maxsize=1)
def styles() -> dict[str, ParagraphStyle]:
    regular = fonts.register()
    base = ParagraphStyle(
        "body",
        fontName=regular,
        bulletFontName=regular,
        fontSize=9.5,
        leading=13.5,
        textColor=INK,
        spaceAfter=6,
    )
    return {
        "body": base,
        "small": ParagraphStyle("small", parent=base, fontSize=8, leading=10.5),
        "muted": ParagraphStyle("muted", parent=base, fontSize=8.5, leading=11.5, textColor=MUTED),
        "cell": ParagraphStyle("cell", parent=base, fontSize=7.5, leading=9.5, spaceAfter=0),
        "cell_head": ParagraphStyle(
            "cell_head", parent=base, fontName=fonts.BOLD, fontSize=7.5, leading=9.5, spaceAfter=0
        ),
        "title": ParagraphStyle(
            "title", parent=base, fontName=fonts.BOLD, fontSize=24, leading=29, spaceAfter=10
        ),
        "cover_meta": ParagraphStyle("cover_meta", parent=base, fontSize=10.5, leading=14),
        "cover_label": ParagraphStyle(
            "cover_label", parent=base, fontSize=10.5, leading=14, textColor=MUTED
        ),
        "cover_status": ParagraphStyle(
            "cover_status",
            parent=base,
            fontName=fonts.BOLD,
            fontSize=10.5,
            leading=14,
            textColor=DRAFT,
        ),
        "cover_signed": ParagraphStyle(
            "cover_signed",
            parent=base,
            fontName=fonts.BOLD,
            fontSize=10.5,
            leading=14,
            textColor=INK,
        ),
        "toc_major": ParagraphStyle(
            "toc_major", parent=base, fontName=fonts.BOLD, fontSize=9, leading=12, spaceAfter=0
        ),
        "toc_minor": ParagraphStyle(
            "toc_minor", parent=base, fontSize=8, leading=10.5, leftIndent=12, spaceAfter=0
        ),
        "grid_head": ParagraphStyle(
            "grid_head",
            parent=base,
            fontName=fonts.BOLD,
            fontSize=8.5,
            leading=11,
            spaceBefore=4,
            spaceAfter=3,
        ),
        "status": ParagraphStyle(
            "status",
            parent=base,
            fontName=fonts.BOLD,
            fontSize=13,
            leading=17,
            textColor=DRAFT,
            spaceBefore=14,
            spaceAfter=14,
        ),
        "h1": ParagraphStyle(
            "h1",
            parent=base,
            fontName=fonts.BOLD,
            fontSize=15,
            leading=19,
            spaceBefore=4,
            spaceAfter=8,
        ),
        "h2": ParagraphStyle(
            "h2",
            parent=base,
            fontName=fonts.BOLD,
            fontSize=11,
            leading=14,
            spaceBefore=10,
            spaceAfter=2,
        ),
        "subtitle": ParagraphStyle(
            "subtitle", parent=base, fontSize=8.5, leading=11, textColor=MUTED, spaceAfter=4
        ),
        "caution": ParagraphStyle(
            "caution",
            parent=base,
            fontSize=8.5,
            leading=12,
            borderColor=RULE,
            borderWidth=0.6,
            borderPadding=6,
            backColor=BAND,
            spaceBefore=8,
            spaceAfter=12,
        ),
    }
